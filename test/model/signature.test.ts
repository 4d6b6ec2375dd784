// The take signature's features on signals with hand-computed values, its pair mirror and its
// standardisation (population z-scores, common practice). Hand facts used: over whole periods sampled evenly, sin has mean 0 and RMS 1/√2;
// two signals proportional with factors a and −b have correlation −1.
import { describe, expect, it } from 'vitest';
import { allOrderedPairs } from '../../src/nn/pairs.js';
import { allPairs } from '../../src/motion/roles.js';
import { BatchBuilder, windowRefs } from '../../src/model/batch.js';
import { resolveModelConfig } from '../../src/model/config.js';
import { createModel } from '../../src/model/model.js';
import { SIGNATURE_FEATURES, standardiseSignatures, takeSignature, windowSignature } from '../../src/model/signature.js';
import { statsOfTakes, withSignatures } from '../../src/model/train.js';
import { SMALL, synthTrainingTake } from './takes.js';

/** Window state (steps × 3 nodes × 6): node 0 still, node 1 at x = A sin, node 2 at x = −B sin and z = C cos. */
function threeNodes(steps: number, A: number, B: number, C: number): Float64Array {
  const s = new Float64Array(steps * 18), w = (2 * Math.PI) / 20;
  for (let t = 0; t < steps; t++) {
    const o = t * 18, sn = Math.sin(w * t), cs = Math.cos(w * t);
    s[o + 6] = 0.3 + A * sn; // node 1 x, offset from node 0 (an offset is no motion)
    s[o + 9] = A * w * cs;
    s[o + 12] = -B * sn;
    s[o + 14] = 0.5 + C * cs;
    s[o + 15] = -B * w * cs;
    s[o + 17] = -C * w * sn;
  }
  return s;
}

describe('take signature', () => {
  const pairs = allOrderedPairs(3), G = SIGNATURE_FEATURES;
  const at = (i: number, j: number) => { for (let k = 0; k < pairs.count; k++) if (pairs.senders[k] === i && pairs.receivers[k] === j) return k; return -1; };

  it('gives the relative motion SD per axis and the velocity correlation of each pair (hand-computed)', () => {
    // 60 steps = 3 whole periods of 20 steps.
    const out = windowSignature(threeNodes(60, 0.2, 0.1, 0.05), 60, 3, pairs, new Float64Array(pairs.count * G));
    const k01 = at(0, 1) * G, k12 = at(1, 2) * G, k21 = at(2, 1) * G;
    expect(out[k01]).toBeCloseTo(0.2 / Math.SQRT2, 12); // x: A sin against a still node
    expect(out[k01 + 1]).toBeCloseTo(0, 12);
    expect(out[k01 + 3]).toBe(0); // a still node is coupled to nothing
    expect(out[k12]).toBeCloseTo((0.2 + 0.1) / Math.SQRT2, 12); // x: −B sin − A sin
    expect(out[k12 + 2]).toBeCloseTo(0.05 / Math.SQRT2, 12); // z: C cos
    // Velocities: node 1 (A w cos, 0, 0), node 2 (−B w cos, 0, −C w sin): cross = −A B w² Σcos², norms
    // A w √Σcos² and w √(B² Σcos² + C² Σsin²), with Σcos² = Σsin² over whole periods.
    expect(out[k12 + 3]).toBeCloseTo(-0.1 / Math.hypot(0.1, 0.05), 12);
    for (let g = 0; g < G; g++) expect(out[k21 + g]).toBeCloseTo(out[k12 + g]!, 12); // symmetric in the pair
  });

  it('maps each pair to its mirror image, and standardises each feature on the training takes', () => {
    // Nodes 1 and 2 are a left/right pair, node 0 the middle.
    const mirror = allPairs(3, Int32Array.from([0, 2, 1])).mirror;
    expect(mirror[at(0, 1)]).toBe(at(0, 2));
    expect(mirror[at(1, 2)]).toBe(at(2, 1));
    for (let k = 0; k < pairs.count; k++) expect(mirror[mirror[k]!]).toBe(k);
    const raw = [0.1, 0.3, 0.2].map((a) => windowSignature(threeNodes(60, a, 0.1, 0.05), 60, 3, pairs, new Float64Array(pairs.count * G)));
    const held = windowSignature(threeNodes(60, 0.4, 0.1, 0.05), 60, 3, pairs, new Float64Array(pairs.count * G));
    const std = standardiseSignatures([...raw, held, null], 3);
    expect(std[4]).toBeNull();
    // Node 0 → 1's x feature is A/√2 (first test), so the three training takes standardise to the z-scores
    // of 0.1, 0.3, 0.2 (population SD): −√1.5, +√1.5, 0; the held-out take's 0.4 to (0.4 − 0.2)/SD = 2√1.5.
    const x01 = at(0, 1) * G, z = Math.sqrt(1.5);
    expect([0, 1, 2, 3].map((t) => std[t]![x01]!)).toEqual([expect.closeTo(-z, 9), expect.closeTo(z, 9), expect.closeTo(0, 9), expect.closeTo(2 * z, 9)]);
    // A feature that does not vary over the training takes (node 0 → 1 along y: 0) stays finite (SD floor).
    expect(Number.isFinite(std[3]![x01 + 1]!)).toBe(true);
  });

  it('attaches standardised signatures to training and held-out takes, and a mirrored window reads its mirror pairs', () => {
    const config = resolveModelConfig({ ...SMALL, signatureWeight: 272 });
    const takes = [synthTrainingTake(1, 6), synthTrainingTake(2, 6), synthTrainingTake(3, 6)];
    const { train, valid } = withSignatures(takes.slice(0, 2), takes.slice(2), config);
    const all = allOrderedPairs(config.nodes), mirror = allPairs(config.nodes, takes[0]!.track.nodeMirror).mirror;
    for (const t of [...train, ...valid]) expect(t.signature?.length).toBe(all.count * G);
    // The held-out take is standardised with the training takes' statistics (not its own).
    const raw = takes.map((t) => takeSignature(t.track, config, all));
    expect(Array.from(valid[0]!.signature!)).toEqual(Array.from(standardiseSignatures(raw, 2)[2]!));
    const model = createModel(config, statsOfTakes(train, config));
    const builder = new BatchBuilder(config, model.stats, train, 2, model.store);
    const ref = windowRefs(train, config, 9)[0]!;
    const batch = builder.fill([{ ...ref, mirrored: false }, { ...ref, mirrored: true }], [0, 1]);
    const sig = train[ref.take]!.signature!, per = all.count * G;
    for (let k = 0; k < all.count; k++)
      for (let g = 0; g < G; g++) {
        expect(batch.signature![k * G + g]).toBe(sig[k * G + g]);
        expect(batch.signature![per + k * G + g]).toBe(sig[mirror[k]! * G + g]);
      }
    // Without the term, nothing is attached and batches carry no signatures.
    const off = withSignatures(takes.slice(0, 2), [], resolveModelConfig({ ...SMALL, signatureWeight: 0 }));
    expect(off.train[0]!.signature).toBeUndefined();
    expect(new BatchBuilder(config, model.stats, off.train, 2, model.store).batch.signature).toBeUndefined();
  });
});
