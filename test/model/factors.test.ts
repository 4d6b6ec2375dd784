// The factor machinery by construction: match pairing averages the static posteriors of windows of one
// group and gives them one shared sample; without it each window keeps its own; the dynamic factors past
// the observed part follow the prior's mean d_j = d_{j−1}·A + c when rolled without noise (hand-computed
// from the stored A and c); restricted labeling adds nothing when no phase is known.
import { describe, expect, it } from 'vitest';
import { observedPoints, resolveModelConfig, totalPoints } from '../../src/model/config.js';
import { elboForward } from '../../src/model/elbo.js';
import { encoderForward } from '../../src/model/encoder.js';
import { createModel } from '../../src/model/model.js';
import { createWorkspace } from '../../src/model/workspace.js';
import { Pcg32 } from '../../src/nn/prng.js';
import { identityStats, randomBatch, TINY } from './support.js';

function encoded(matchPairing: boolean, groups: number[]) {
  const c = resolveModelConfig({ ...TINY, matchPairing });
  const model = createModel(c, identityStats(c.nodes), { seed: 6, precision: 64 });
  const ws = createWorkspace(model, groups.length);
  const batch = randomBatch(c, groups.length, model.store.values, 4, groups);
  encoderForward(model, ws, batch, new Pcg32(3, 3), { sample: true, priorNoise: false });
  return { c, model, ws, batch, per: ws.pairs.count * c.staticDims };
}

describe('static factors and match pairing', () => {
  it('windows of one group share the averaged posterior and one sample', () => {
    const { ws, per } = encoded(true, [0, 1, 0]);
    const row = (buf: ArrayLike<number>, b: number) => Array.from(buf as Float64Array).slice(b * per, (b + 1) * per);
    expect(row(ws.sS, 2)).toEqual(row(ws.sS, 0));
    expect(row(ws.sS, 1)).not.toEqual(row(ws.sS, 0));
    // The shared posterior is the mean of the two windows' own posteriors (hand-computed here).
    const mu0 = row(ws.muS, 0), mu2 = row(ws.muS, 2);
    row(ws.muSg, 0).forEach((v, i) => expect(v).toBeCloseTo(0.5 * (mu0[i]! + mu2[i]!), 14));
    expect(row(ws.muS, 0)).not.toEqual(row(ws.muS, 2));
  });

  it('without match pairing every window keeps its own posterior and sample', () => {
    const { ws, per } = encoded(false, [0, 1, 0]);
    const row = (buf: ArrayLike<number>, b: number) => Array.from(buf as Float64Array).slice(b * per, (b + 1) * per);
    expect(row(ws.muSg, 0)).toEqual(row(ws.muS, 0));
    expect(row(ws.sS, 2)).not.toEqual(row(ws.sS, 0));
  });
});

describe('dynamic factors', () => {
  it('are rolled forward past the observed part by the prior mean', () => {
    const { c, model, ws, batch } = encoded(true, [0, 0]);
    const D = c.dynamicDims, K = observedPoints(c), Kt = totalPoints(c), BP = batch.size * ws.pairs.count;
    expect(Kt).toBeGreaterThan(K);
    const A = model.params.priorA.value, cc = model.params.priorC.value;
    for (let j = K; j < Kt; j++)
      for (let i = 0; i < BP; i++)
        for (let q = 0; q < D; q++) {
          let v = cc[q]!;
          for (let r = 0; r < D; r++) v += ws.d[((j - 1) * BP + i) * D + r]! * A[r * D + q]!;
          expect(ws.d[(j * BP + i) * D + q]).toBeCloseTo(v, 12);
        }
  });

  it('restricted labeling costs nothing where no phase is known and something where it is', () => {
    const { model, ws, batch } = encoded(true, [0, 0]);
    const withPhase = elboForward(model, ws, batch, new Pcg32(1, 1)).label;
    batch.phase.fill(NaN);
    const without = elboForward(model, ws, batch, new Pcg32(1, 1)).label;
    expect(withPhase).toBeGreaterThan(0);
    expect(without).toBe(0);
  });
});
