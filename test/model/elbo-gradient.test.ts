// Finite-difference check of the whole ELBO's gradient (encoder, factor heads, prior, decoder, noise
// levels) on a tiny configuration in float64, for every parameter group, with match pairing and
// restricted labeling on (with the default stride prior's fixed steps), for the no-coupling variant, and
// with the kinematic step in place of the stride prior. Central differences with h = 1e-5 on O(1)
// losses agree with a correct analytic gradient to about 1e-8 (truncation O(h²), rounding O(ε/h));
// 1e-5 relative leaves room for the many terms summed.
import { describe, expect, it } from 'vitest';
import { resolveModelConfig } from '../../src/model/config.js';
import { elboBackward, elboForward } from '../../src/model/elbo.js';
import { createModel } from '../../src/model/model.js';
import { createWorkspace } from '../../src/model/workspace.js';
import { Pcg32 } from '../../src/nn/prng.js';
import { identityStats, randomBatch, TINY } from './support.js';

function check(extra: Partial<typeof TINY>, groups: number[]): { worst: number; names: string[] } {
  const c = resolveModelConfig({ ...TINY, ...extra });
  const model = createModel(c, identityStats(c.nodes), { seed: 3, precision: 64 });
  // Move every weight off its initial value so that no gradient is zero by symmetry (e.g. A = I, w2 ≈ 0).
  const jitter = new Pcg32(11, 1);
  const v = model.store.valueView();
  for (let i = 0; i < v.length; i++) v[i] = v[i]! + 0.3 * jitter.gauss();
  const ws = createWorkspace(model, groups.length);
  const batch = randomBatch(c, groups.length, v, 5, groups);
  const loss = () => elboForward(model, ws, batch, new Pcg32(9, 2)).total;
  model.store.zeroGrads();
  loss();
  elboBackward(model, ws, batch);
  const g = Float64Array.from(model.store.gradView());
  const h = 1e-5;
  let worst = 0;
  const names: string[] = [];
  for (const p of model.store.params) {
    let seen = false;
    for (let i = 0; i < p.size; i++) {
      const k = p.offset + i, keep = v[k]!;
      v[k] = keep + h;
      const up = loss();
      v[k] = keep - h;
      const down = loss();
      v[k] = keep;
      const num = (up - down) / (2 * h);
      worst = Math.max(worst, Math.abs(num - g[k]!) / (1 + Math.abs(g[k]!)));
      if (g[k] !== 0) seen = true;
    }
    if (seen) names.push(p.name);
  }
  return { worst, names };
}

describe('ELBO gradient', () => {
  it('matches central finite differences for every parameter, with match pairing, labeling and the take signature', () => {
    const { worst, names } = check({ signatureWeight: 3 }, [0, 0, 1]);
    expect(worst).toBeLessThan(1e-5);
    // Every parameter group receives gradient (none is cut off from the loss).
    for (const n of ['enc.gru.wx', 'enc.gru.uh', 'enc.static.wa', 'enc.static.wLv', 'enc.dynamic.wb', 'enc.dynamic.bMu', 'prior.A', 'prior.c', 'prior.lv',
      'dec.msg.wa', 'dec.msg.wb', 'dec.msg.wz', 'dec.gate.w', 'dec.up.w1x', 'dec.up.w1m', 'dec.up.node', 'dec.up.w2', 'noise.recon', 'noise.rollout', 'enc.sig.w', 'enc.sig.b'])
      expect(names).toContain(n);
  });

  it('matches finite differences with a residual scale on the learned change of state', () => {
    const { worst, names } = check({ residualScale: 0.3 }, [0, 0, 1]);
    expect(worst).toBeLessThan(1e-5);
    for (const n of ['enc.gru.wx', 'dec.msg.wz', 'dec.up.w1x', 'dec.up.w2', 'dec.up.b2', 'noise.rollout']) expect(names).toContain(n);
  });

  it('matches finite differences with the static KL weighed apart from the dynamic KL', () => {
    const { worst, names } = check({ beta: 0.7, staticBeta: 0.2 }, [0, 0, 1]);
    expect(worst).toBeLessThan(1e-5);
    for (const n of ['enc.static.wa', 'enc.static.wMu', 'enc.static.wLv', 'enc.dynamic.wLv']) expect(names).toContain(n);
  });

  it('adds the static KL at its own weight, which a stored configuration without one takes from β', () => {
    expect(resolveModelConfig({ ...TINY, beta: 0.4 }).staticBeta).toBe(0.4);
    expect(resolveModelConfig({ ...TINY, beta: 0.4, staticBeta: 0.1 }).staticBeta).toBe(0.1);
    expect(() => resolveModelConfig({ ...TINY, staticBeta: -1 })).toThrow(/staticBeta/);
    const c = resolveModelConfig({ ...TINY, beta: 0.7, staticBeta: 0.2, signatureWeight: 3 });
    const model = createModel(c, identityStats(c.nodes), { seed: 3, precision: 64 });
    const batch = randomBatch(c, 3, model.store.valueView(), 5, [0, 0, 1]);
    const r = elboForward(model, createWorkspace(model, 3), batch, new Pcg32(9, 2));
    expect(r.klStatic).toBeGreaterThan(0);
    // The loss as the objective's definition writes it (elbo.ts), term by term.
    expect(r.total).toBeCloseTo(r.recon + c.rolloutWeight * r.rollout + 0.2 * r.klStatic + 0.7 * r.klDynamic + c.labelWeight * r.label + c.signatureWeight * r.signature, 10);
    expect(r.signature).toBeGreaterThan(0);
  });

  it('matches finite differences with the signature term at another weight and labeling off; no signatures, no term', () => {
    const { worst, names } = check({ signatureWeight: 5, restrictedLabeling: false }, [0, 0, 1]);
    expect(worst).toBeLessThan(1e-5);
    for (const n of ['enc.sig.w', 'enc.sig.b', 'enc.static.wMu', 'enc.static.wLv']) expect(names).toContain(n);
    const c = resolveModelConfig({ ...TINY, signatureWeight: 5 });
    const model = createModel(c, identityStats(c.nodes), { seed: 3, precision: 64 });
    const batch = randomBatch(c, 3, model.store.valueView(), 5, [0, 0, 1]);
    expect(elboForward(model, createWorkspace(model, 3), { ...batch, signature: undefined }, new Pcg32(9, 2)).signature).toBe(0);
    // Switched off, the model has no signature weights at all (so older model files keep their layout).
    const plain = createModel({ ...c, signatureWeight: 0 }, identityStats(c.nodes), { seed: 3 });
    expect(plain.params.sigW).toBeNull();
    expect(plain.store.params.some((p) => p.name.startsWith('enc.sig'))).toBe(false);
  });

  it('computes the signature term by hand on one pair (2 nodes, 1 static dimension)', () => {
    // Hand-computed: with posterior means m, log-variances −∞ (tiny) and no sampling, s = m; the read is
    // s·w + b per feature; the term is Σ_features (s·w + b − y)² / P per window, P = 2 ordered pairs.
    const c = resolveModelConfig({ ...TINY, nodes: 2, staticDims: 1, signatureWeight: 1, restrictedLabeling: false });
    const model = createModel(c, identityStats(2), { seed: 4, precision: 64 });
    const batch = randomBatch(c, 1, model.store.valueView(), 6, [0]);
    const ws = createWorkspace(model, 1);
    const r = elboForward(model, ws, batch, new Pcg32(1, 1), false);
    const w = model.params.sigW!.value, b = model.params.sigB!.value, y = batch.signature!;
    let want = 0;
    for (let k = 0; k < 2; k++) for (let g = 0; g < 4; g++) want += (ws.muSg[k]! * w[g]! + b[g]! - y[k * 4 + g]!) ** 2 / 2;
    expect(r.signature).toBeCloseTo(want, 12);
  });

  it('matches finite differences without match pairing and labeling', () => {
    expect(check({ matchPairing: false, restrictedLabeling: false }, [0, 0]).worst).toBeLessThan(1e-5);
  });

  it('matches finite differences with the kinematic step in place of the stride prior (which is the default)', () => {
    const { worst, names } = check({ stridePrior: false }, [0, 0, 1]);
    expect(worst).toBeLessThan(1e-5);
    for (const n of ['enc.gru.wx', 'enc.dynamic.wb', 'prior.A', 'dec.msg.wz', 'dec.up.w1x', 'dec.up.w2', 'noise.rollout']) expect(names).toContain(n);
    expect(check({ stridePrior: false, noCoupling: true }, [0, 1]).worst).toBeLessThan(1e-5);
  });

  it('matches finite differences with no coupling, which has no message weights and runs no encoder', () => {
    const { worst, names } = check({ noCoupling: true }, [0, 1]);
    expect(worst).toBeLessThan(1e-5);
    expect(names.some((n) => n.startsWith('dec.msg') || n.startsWith('dec.gate') || n === 'dec.up.w1m')).toBe(false);
    expect(names.some((n) => n.startsWith('enc.') || n.startsWith('prior.'))).toBe(false);
    expect(names).toContain('dec.up.w1x');
  });
});
