// The step's sub-batch structure: each shard's gradient depends only on its windows and its own noise
// stream, so computing the shards in another order (as worker threads would) and reducing them in index
// order gives the very same bits as the sequential step.
import { describe, expect, it } from 'vitest';
import { windowRefs } from '../../src/model/batch.js';
import { resolveModelConfig } from '../../src/model/config.js';
import { elboBackward, elboForward } from '../../src/model/elbo.js';
import { createModel } from '../../src/model/model.js';
import { createStepRunner, statsOfTakes, train } from '../../src/model/train.js';
import { trainParallel } from '../../src/model/parallel.js';
import { reduceInOrder } from '../../src/nn/params.js';
import { Pcg32 } from '../../src/nn/prng.js';
import { SMALL, synthTrainingTake } from './takes.js';

describe('sharded gradient', () => {
  it('is bit-identical when the shards are computed in reverse order and reduced in index order', () => {
    const takes = [synthTrainingTake(21, 6), synthTrainingTake(22, 6)];
    const c = resolveModelConfig(SMALL);
    const model = createModel(c, statsOfTakes(takes, c), { seed: 2 });
    const runner = createStepRunner(model, takes, 8, 2);
    const refs = windowRefs(takes, c, 7).slice(0, 8), groups = refs.map((_, i) => i >> 1);
    runner.gradient(refs, groups, 1234);
    const sequential = Float32Array.from(model.store.gradView());
    const parts: Float32Array[] = [new Float32Array(0), new Float32Array(0)];
    for (const i of [1, 0]) {
      const s = runner.shards[i]!;
      model.store.zeroGrads();
      const b = s.builder.fill(refs.slice(i * 4, i * 4 + 4), groups.slice(i * 4, i * 4 + 4));
      elboForward(model, s.ws, b, new Pcg32(1234, i + 1));
      elboBackward(model, s.ws, b);
      parts[i] = Float32Array.from(model.store.gradView());
    }
    const reduced = reduceInOrder(parts, new Float32Array(sequential.length));
    for (let k = 0; k < reduced.length; k++) reduced[k] = reduced[k]! * 0.5;
    expect(Buffer.from(reduced.buffer).equals(Buffer.from(sequential.buffer))).toBe(true);
    expect(Math.max(...Array.from(sequential, Math.abs))).toBeGreaterThan(0);
  });
});

describe('training on worker threads', () => {
  it('gives the same weights, bit for bit, as the single-thread run for one seed', async () => {
    const takes = [synthTrainingTake(23, 6), synthTrainingTake(24, 6), synthTrainingTake(25, 6)];
    const options = { config: SMALL, seed: 5, epochs: 1, batchSize: 8, shards: 2, maxStepsPerEpoch: 3, validSubjects: ['walker-25'] };
    const one = train(takes, options).model.store.valueView();
    const two = (await trainParallel(takes, options)).model.store.valueView();
    expect(Buffer.from(two.buffer, two.byteOffset, two.byteLength).equals(Buffer.from(one.buffer, one.byteOffset, one.byteLength))).toBe(true);
  });
});
