// The no-coupling switch removes the pair messages from the model itself (no message weights exist, so
// none can receive gradient), and with coupling a node's predicted next state depends on the other
// nodes' states while without it it depends on its own state alone (the definition of the baseline).
import { describe, expect, it } from 'vitest';
import { resolveModelConfig } from '../../src/model/config.js';
import { decoderFactors, decoderForward } from '../../src/model/decoder.js';
import { encoderForward } from '../../src/model/encoder.js';
import { elboBackward, elboForward } from '../../src/model/elbo.js';
import { createModel } from '../../src/model/model.js';
import { createWorkspace } from '../../src/model/workspace.js';
import { Pcg32 } from '../../src/nn/prng.js';
import type { CouplingModel } from '../../src/model/model.js';
import { identityStats, randomBatch, TINY } from './support.js';

/** Returns the model with its learned change's last layer drawn small (the stride prior starts it at zero, which would hide every path through it). */
function withLearnedChange(model: CouplingModel): CouplingModel {
  const rng = new Pcg32(13, 3), w = model.params.upW2.value;
  for (let i = 0; i < w.length; i++) w[i] = 0.1 * rng.gauss();
  return model;
}

/** Returns node 0's predicted next state at the last observed step, with node `poke` of the input moved by 0.5 in x. */
function nextOfNode0(noCoupling: boolean, poke: number | null, residualScale = 1): Float64Array {
  const c = resolveModelConfig({ ...TINY, noCoupling, residualScale });
  const model = withLearnedChange(createModel(c, identityStats(c.nodes), { seed: 4, precision: 64 }));
  const ws = createWorkspace(model, 1);
  const batch = randomBatch(c, 1, model.store.values, 8);
  encoderForward(model, ws, batch, new Pcg32(1, 1), { sample: false, priorNoise: false });
  decoderFactors(model, ws, 1, 0);
  const rc = ws.rollout[0]!, W = c.nodes * 6;
  const x = Float64Array.from(batch.state.subarray((c.observe - 1) * W, c.observe * W));
  if (poke !== null) x[poke * 6] = x[poke * 6]! + 0.5;
  rc.x = x;
  rc.points[0] = c.observe / c.dynamicStride - 1;
  return Float64Array.from(decoderForward(model, ws, rc, 1).subarray(0, 6));
}

describe('no-coupling switch', () => {
  it('builds no message or gate weights, so the message path has no gradient at all', () => {
    const c = resolveModelConfig({ ...TINY, noCoupling: true });
    const model = createModel(c, identityStats(c.nodes), { seed: 1, precision: 64 });
    const names = model.store.params.map((p) => p.name);
    expect(names.filter((n) => n.startsWith('dec.msg') || n.startsWith('dec.gate') || n === 'dec.up.w1m')).toEqual([]);
    expect(model.params.msgWa).toBeNull();
    // The full model has them, with non-zero gradient after one backward pass.
    const full = withLearnedChange(createModel(resolveModelConfig(TINY), identityStats(c.nodes), { seed: 1, precision: 64 }));
    const ws = createWorkspace(full, 2);
    const batch = randomBatch(full.config, 2, full.store.values, 3, [0, 0]);
    full.store.zeroGrads();
    elboForward(full, ws, batch, new Pcg32(2, 2));
    elboBackward(full, ws, batch);
    const g = full.store.get('dec.msg.wa').grad;
    expect(Math.max(...Array.from(g, Math.abs))).toBeGreaterThan(0);
  });

  it('makes a node ignore the other nodes, which it reads through messages otherwise', () => {
    // Moving node 1 changes node 0's prediction only when messages exist (by construction of the decoder).
    const base = nextOfNode0(false, null), moved = nextOfNode0(false, 1);
    expect(Math.max(...base.map((v, i) => Math.abs(v - moved[i]!)))).toBeGreaterThan(1e-6);
    const baseNc = nextOfNode0(true, null), movedNc = nextOfNode0(true, 1);
    expect(Array.from(movedNc)).toEqual(Array.from(baseNc));
    // Its own state still matters.
    const self = nextOfNode0(true, 0);
    expect(Math.max(...self.map((v, i) => Math.abs(v - baseNc[i]!)))).toBeGreaterThan(1e-6);
  });
});

describe('residual scale', () => {
  it('multiplies the learned change of state and nothing else (same weights, hand-checked ratio)', () => {
    // x(t + 1) = x(t) + ρ·learned + prior step: the difference from the input state (which also carries the
    // stride prior's fixed step, the same for both) must scale by exactly ρ2/ρ1 once that step is taken out.
    const one = nextOfNode0(false, null, 1), quarter = nextOfNode0(false, null, 0.25), zero = nextOfNode0(false, null, 1e-12);
    for (let i = 0; i < 6; i++) expect(quarter[i]! - zero[i]!).toBeCloseTo(0.25 * (one[i]! - zero[i]!), 10);
    expect(Math.max(...one.map((v, i) => Math.abs(v - zero[i]!)))).toBeGreaterThan(1e-3);
  });

  it('loads as 1 for a stored configuration written before it existed, and refuses a non-positive one', () => {
    const stored = { ...TINY, stridePrior: true, priorHistory: 4, priorRegistration: true };
    expect(resolveModelConfig(stored).residualScale).toBe(1);
    expect(resolveModelConfig({ ...stored, residualScale: 0.05 }).residualScale).toBe(0.05);
    expect(() => resolveModelConfig({ residualScale: 0 })).toThrow(/residualScale/);
  });
});
