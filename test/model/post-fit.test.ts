// The post-fit phase (src/model/post-fit.ts): the twin's readout and spread calibration on a worker
// thread, and half of the model's readout training data made there, give the same bits as on the calling thread, also when only the spread is recalibrated (the
// readouts kept), and the model's own are not changed by where the twin's ran.
import { describe, expect, it } from 'vitest';
import { resolveModelConfig } from '../../src/model/config.js';
import { createModel, type CouplingModel } from '../../src/model/model.js';
import { postFit, type PostFitInput } from '../../src/model/post-fit.js';
import { statsOfTakes } from '../../src/model/train.js';
import { SMALL, synthTrainingTake } from './takes.js';

describe('post-fit phase', () => {
  it('gives the same readouts and spreads with the twin on a worker thread as on one thread', async () => {
    const takes = [1, 2, 3].map((s) => synthTrainingTake(s, 9));
    const c = resolveModelConfig(SMALL), stats = statsOfTakes(takes, c);
    const pair = (): [CouplingModel, CouplingModel] => [createModel(c, stats, { seed: 4 }), createModel({ ...c, noCoupling: true }, stats, { seed: 5 })];
    const input: PostFitInput = { train: takes.slice(0, 2), valid: takes.slice(2), calibration: takes.slice(2), stride: 20, validStride: 15, readout: true };
    const [m1, t1] = pair(), [m2, t2] = pair();
    const one = await postFit(m1, t1, input, 1);
    const two = await postFit(m2, t2, input, 2);
    expect(one.twin!.windows).toBeGreaterThan(0);
    expect(one.twin!.readout!.fit).not.toBeNull();
    for (const [a, b] of [[m1, m2], [t1, t2]] as const) {
      expect(b.spreadScale).toBe(a.spreadScale);
      expect(b.spreadAdapt).toEqual(a.spreadAdapt);
      expect(b.readout === null).toBe(a.readout === null);
      if (a.readout) expect(Array.from(b.readout!.weights)).toEqual(Array.from(a.readout.weights));
      expect(b.readout?.jitter?.threshold).toBe(a.readout?.jitter?.threshold);
      if (a.readout?.jitter) expect(Array.from(b.readout!.jitter!.robust.weights)).toEqual(Array.from(a.readout.jitter.robust.weights));
    }
    expect(two.twin!.readout!.fit!.validError).toEqual(one.twin!.readout!.fit!.validError);
    // The model's readout training data were made half on the worker: the same fit.
    expect(two.model.readout!.fit!.validError).toEqual(one.model.readout!.fit!.validError);
    expect(two.model.readout!.fit!.trainWindows).toBe(one.model.readout!.fit!.trainWindows);
    expect(two.twin!.readout!.jittered).toEqual(one.twin!.readout!.jittered);
    // Spread only (the readouts kept): the worker calibrates the twin with its readout, as one thread does.
    // The twin gets its fitted readout whether or not the keep test took it, so that one is there to calibrate with.
    t1.readout = one.twin!.readout!.fit!.readout;
    t2.readout = structuredClone(t1.readout);
    const spreadOnly = { ...input, readout: false };
    const [a, b] = [await postFit(m1, t1, spreadOnly, 1), await postFit(m2, t2, spreadOnly, 2)];
    expect(a.twin!.readout).toBeNull();
    expect(t2.readout).not.toBeNull();
    expect(b.twin!.spreadScale).toBe(a.twin!.spreadScale);
    expect(t2.spreadScale).toBe(t1.spreadScale);
    expect(m2.spreadScale).toBe(m1.spreadScale);
  }, 180_000);
});
