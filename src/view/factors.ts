// The viewer's factor endpoint: the coupling model's pair factors over the take, per unordered node pair
// (both orders averaged), as static heat (KL of the static posterior from its prior) and dynamic heat per
// window (size of the dynamic factors), with the ranked coupling asymmetry when the model holds
// normative figures. Computed once, on the first request.
import { coupleNames, couplingAsymmetry, storedCouplingNorms } from '../analysis/coupling-asymmetry.js';
import { storedJointProfiles } from '../analysis/joint-profiles.js';
import { staticKl, takeFactors } from '../analysis/factors.js';
import type { LoadedModel } from '../model/modelfile.js';
import { pairIndex } from '../motion/roles.js';
import type { Track } from '../motion/track.js';
import type { ViewFactorPair, ViewFactors } from './types.js';

/** Seconds between the windows read for the heat, and the most windows read (long takes space them out). */
export const FACTOR_EVERY_S = 0.2;
export const FACTOR_MOST_WINDOWS = 300;

const r4 = (v: number) => Math.round(v * 1e4) / 1e4;

/** Returns the factor heat of a track; `nodeJoints[i][0]` is the display joint node i is drawn at. */
export function viewFactors(track: Track, loaded: LoadedModel, nodeJoints: readonly [number, number][]): ViewFactors {
  const model = loaded.model, c = model.config, N = c.nodes;
  const everyS = Math.max(FACTOR_EVERY_S, track.steps / track.rate / FACTOR_MOST_WINDOWS);
  const f = takeFactors(model, track, { everyS });
  const S = f.staticDims, D = f.dynamicDims, W = f.windowEnds.length, P = f.pairs;
  const kl = (p: number) => staticKl(f, p);
  const size = (w: number, p: number) => {
    let s = 0;
    for (let d = 0; d < D; d++) s += f.dynamicSeries[(w * P + p) * D + d]! ** 2;
    return Math.sqrt(s);
  };
  const pairs: ViewFactorPair[] = [];
  let sLo = Infinity, sHi = -Infinity, dLo = Infinity, dHi = -Infinity;
  for (let i = 0; i < N; i++)
    for (let j = i + 1; j < N; j++) {
      const pij = pairIndex(i, j, N), pji = pairIndex(j, i, N);
      const st = (kl(pij) + kl(pji)) / 2;
      const dyn = Array.from({ length: W }, (_, w) => r4((size(w, pij) + size(w, pji)) / 2));
      sLo = Math.min(sLo, st); sHi = Math.max(sHi, st);
      for (const v of dyn) { dLo = Math.min(dLo, v); dHi = Math.max(dHi, v); }
      pairs.push({ a: nodeJoints[i]![0], b: nodeJoints[j]![0], label: `${track.nodes[i]}–${track.nodes[j]}`, static: r4(st), dynamic: dyn });
    }
  const norms = storedCouplingNorms(loaded.extras, P, S);
  const a = norms ? couplingAsymmetry(f, norms, { profiles: storedJointProfiles(loaded.extras, coupleNames(), S) }) : null;
  return {
    format: 'jointloom-view-factors', version: 1,
    times: Array.from(f.times, (t) => r4(t)), pairs,
    staticRange: [r4(sLo), r4(sHi)], dynamicRange: [r4(dLo), r4(dHi)],
    asymmetry: a ? {
      summary: a.summary, side: a.side, joint: a.joint, pattern: a.pattern,
      ranked: a.ranked.slice(0, 10).map((r) => ({ pair: r.pair, mirror: r.mirror, score: r4(r.score), ci_low: r4(r.ciLow), ci_high: r4(r.ciHigh), side: r.side })),
    } : null,
  };
}
