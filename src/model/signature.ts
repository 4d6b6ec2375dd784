// The take signature: a few take-level numbers per ordered pair of joints that the static factors are
// trained to carry (the signature term of the ELBO, elbo.ts). Per pair i → j, averaged over the take's
// windows (window frame, leg lengths, observed steps only):
//   0-2  SD over the window of the relative position p_j − p_i along x (forward), y (left) and z (up):
//        how far the two joints move against each other (a joint's range of motion shows in its
//        neighbours' pairs);
//   3    correlation of the two joints' velocities over the window's steps and the three axes: in phase
//        (+1) or in anti-phase (−1), as the two legs in walking.
// Each feature is then standardised per pair over the training takes (standardiseSignatures). The
// signature is a training target only: the encoder never reads it, it reads the window, so a static factor
// trained to match it says what the take's whole length says about the pair, from one window.
//
// Why it exists: with the stride prior holding the take's own strides, the decoder had no use for the static
// factors (their KL stayed at 0.03 nats a dimension, their ICC within a take at 0.37), so they were no
// take-level code. The signature gives them one; it is off by default (config.ts says why).
import type { PairList } from '../nn/pairs.js';
import type { Track } from '../motion/track.js';
import { windowsOf } from '../motion/window.js';
import { STATE_SIZE } from '../motion/reflect.js';
import { modelWindowOptions, type ModelConfig } from './config.js';

/** Signature features per ordered pair. */
export const SIGNATURE_FEATURES = 4;
/** Steps between the windows a signature averages over. */
export const SIGNATURE_STRIDE = 15;
/** Least SD of a feature over the training takes when standardising (leg lengths or correlation units). */
const SIGNATURE_SD_FLOOR = 1e-4;

/** Writes into out (P × G) the signature features of one window's observed state (steps × N × 6, window frame). */
export function windowSignature(observed: Float64Array, steps: number, nodes: number, pairs: PairList, out: Float64Array): Float64Array {
  const W = nodes * STATE_SIZE, G = SIGNATURE_FEATURES;
  // Per node: mean position and velocity per axis, and the velocity's summed squared deviation.
  const mean = new Float64Array(nodes * STATE_SIZE), vss = new Float64Array(nodes);
  for (let t = 0; t < steps; t++) for (let i = 0; i < W; i++) mean[i] = mean[i]! + observed[t * W + i]!;
  for (let i = 0; i < W; i++) mean[i] = mean[i]! / steps;
  for (let n = 0; n < nodes; n++) {
    let s = 0;
    for (let t = 0; t < steps; t++)
      for (let a = 3; a < 6; a++) {
        const d = observed[t * W + n * STATE_SIZE + a]! - mean[n * STATE_SIZE + a]!;
        s += d * d;
      }
    vss[n] = s;
  }
  for (let k = 0; k < pairs.count; k++) {
    const i = pairs.senders[k]! * STATE_SIZE, j = pairs.receivers[k]! * STATE_SIZE;
    let sx = 0, sy = 0, sz = 0, cross = 0;
    for (let t = 0; t < steps; t++) {
      const o = t * W;
      const dx = observed[o + j]! - observed[o + i]! - (mean[j]! - mean[i]!);
      const dy = observed[o + j + 1]! - observed[o + i + 1]! - (mean[j + 1]! - mean[i + 1]!);
      const dz = observed[o + j + 2]! - observed[o + i + 2]! - (mean[j + 2]! - mean[i + 2]!);
      sx += dx * dx;
      sy += dy * dy;
      sz += dz * dz;
      for (let a = 3; a < 6; a++) cross += (observed[o + i + a]! - mean[i + a]!) * (observed[o + j + a]! - mean[j + a]!);
    }
    const den = Math.sqrt(vss[pairs.senders[k]!]! * vss[pairs.receivers[k]!]!);
    out[k * G] = Math.sqrt(sx / steps);
    out[k * G + 1] = Math.sqrt(sy / steps);
    out[k * G + 2] = Math.sqrt(sz / steps);
    // A joint that does not move against the frame (no velocity spread) is coupled to nothing.
    out[k * G + 3] = den > 1e-12 ? cross / den : 0;
  }
  return out;
}

/** Returns the raw (unstandardised) signature of a take: the mean of its windows' signatures; null when it has no window. */
export function takeSignature(track: Track, config: ModelConfig, pairs: PairList): Float64Array | null {
  const G = SIGNATURE_FEATURES, acc = new Float64Array(pairs.count * G), one = new Float64Array(pairs.count * G);
  let n = 0;
  for (const w of windowsOf(track, SIGNATURE_STRIDE, modelWindowOptions(config))) {
    windowSignature(w.observed, w.observe, config.nodes, pairs, one);
    for (let i = 0; i < acc.length; i++) acc[i] = acc[i]! + one[i]!;
    n++;
  }
  if (n === 0) return null;
  for (let i = 0; i < acc.length; i++) acc[i] = acc[i]! / n;
  return acc;
}

/**
 * Returns the signatures standardised per pair and feature by their mean and SD over the first `statsFrom`
 * signatures (the training takes), so that held-out takes are read on the training scale; null entries
 * stay null. (A variant that scaled each pair's left/right difference apart from the walkers' spread was
 * measured worse on eval:asymmetry: DEVELOPERS.md.)
 */
export function standardiseSignatures(raw: readonly (Float64Array | null)[], statsFrom = raw.length): (Float64Array | null)[] {
  const L = raw.find((s) => s)?.length ?? 0;
  const sum = new Float64Array(L), sq = new Float64Array(L);
  let n = 0;
  for (const s of raw.slice(0, statsFrom)) {
    if (!s) continue;
    for (let i = 0; i < L; i++) {
      sum[i] = sum[i]! + s[i]!;
      sq[i] = sq[i]! + s[i]! * s[i]!;
    }
    n++;
  }
  if (n === 0) return raw.map(() => null);
  const mean = sum.map((v) => v / n);
  const sd = sq.map((v, i) => Math.max(SIGNATURE_SD_FLOOR, Math.sqrt(Math.max(0, v / n - mean[i]! * mean[i]!))));
  return raw.map((s) => (s ? Float64Array.from({ length: L }, (_, i) => (s[i]! - mean[i]!) / sd[i]!) : null));
}
