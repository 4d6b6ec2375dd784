// Measurements of synthetic takes made only from the parsed BVH (forward kinematics), not from the walker's internals.
import { parseBvh } from '../../src/bvh/parse.js';
import type { Take } from '../../src/bvh/take.js';
import { planFk, poseFrame, restPose } from '../../src/skeleton/fk.js';
import type { SynthTruth } from '../../src/synth/index.js';

export interface Measured {
  take: Take;
  frames: number;
  dt: number;
  /** metres per file unit and the up-axis index */
  m: number;
  up: number;
  /** per side (0 left, 1 right): heights (m) of heel point, toe joint, toe tip per frame */
  heights: [Float64Array, Float64Array];
  /** per side: floor-plane positions (m) of the three points per frame, frames x 3 x 2 */
  plane: [Float64Array, Float64Array];
  /** per side: knee flexion (degrees) from the thigh and shank directions */
  knee: [Float64Array, Float64Array];
  /** root floor-plane position (m) per frame, frames x 2 */
  root: Float64Array;
}

/** Returns FK measurements of a take's text, with joints found by the names the truth sidecar documents. */
export function measure(text: string, truth: SynthTruth): Measured {
  const take = parseBvh(text, { file: 'test.bvh' });
  const up = truth.upAxis === 'Y' ? 1 : 2;
  const horiz = up === 1 ? [0, 2] : [0, 1];
  const m = truth.units.metresPerUnit;
  const J = take.joints.length;
  const idx = (name: string) => {
    const i = take.joints.findIndex((j) => j.name === name);
    if (i < 0) throw new Error(`no joint ${name}`);
    return i;
  };
  const rest = restPose(take);
  const plan = planFk(take);
  const pos = new Float64Array(J * 3), rot = new Float64Array(J * 9);
  const F = take.frameCount;
  const heights: [Float64Array, Float64Array] = [new Float64Array(F * 3), new Float64Array(F * 3)];
  const plane: [Float64Array, Float64Array] = [new Float64Array(F * 6), new Float64Array(F * 6)];
  const knee: [Float64Array, Float64Array] = [new Float64Array(F), new Float64Array(F)];
  const root = new Float64Array(F * 2);
  const sides = (['l', 'r'] as const).map((p) => {
    const names = truth.jointNames;
    const hip = idx(names[`${p}_hip`]), kn = idx(names[`${p}_knee`]), an = idx(names[`${p}_ankle`]), toe = idx(names[`${p}_toe`]);
    const tip = take.joints.findIndex((j) => j.parent === toe && j.endSite);
    // Virtual heel (the analysis side's rule): on the floor (toe-tip height) behind the ankle by
    // 0.3 x the horizontal ankle-to-toe-joint distance, carried rigidly by the ankle's world rotation.
    const heelRest = [0, 0, 0];
    for (const a of horiz) heelRest[a] = -0.3 * (rest[toe * 3 + a]! - rest[an * 3 + a]!);
    heelRest[up] = rest[tip * 3 + up]! - rest[an * 3 + up]!;
    return { hip, kn, an, toe, tip, heelRest };
  });
  for (let f = 0; f < F; f++) {
    poseFrame(plan, take.values, f, pos, rot, 0);
    root[f * 2] = pos[horiz[0]!]! * m;
    root[f * 2 + 1] = pos[horiz[1]!]! * m;
    sides.forEach((s, k) => {
      const r = s.an * 9;
      const heel = [0, 1, 2].map((a) => pos[s.an * 3 + a]! + rot[r + a * 3]! * s.heelRest[0]! + rot[r + a * 3 + 1]! * s.heelRest[1]! + rot[r + a * 3 + 2]! * s.heelRest[2]!);
      const pts = [heel, [0, 1, 2].map((a) => pos[s.toe * 3 + a]!), [0, 1, 2].map((a) => pos[s.tip * 3 + a]!)];
      pts.forEach((p, i) => {
        heights[k]![f * 3 + i] = p[up]! * m;
        plane[k]![f * 6 + i * 2] = p[horiz[0]!]! * m;
        plane[k]![f * 6 + i * 2 + 1] = p[horiz[1]!]! * m;
      });
      const t = [0, 1, 2].map((a) => pos[s.kn * 3 + a]! - pos[s.hip * 3 + a]!);
      const sh = [0, 1, 2].map((a) => pos[s.an * 3 + a]! - pos[s.kn * 3 + a]!);
      const c = (t[0]! * sh[0]! + t[1]! * sh[1]! + t[2]! * sh[2]!) / (Math.hypot(...t) * Math.hypot(...sh));
      knee[k]![f] = (Math.acos(Math.max(-1, Math.min(1, c))) * 180) / Math.PI;
    });
  }
  return { take, frames: F, dt: take.frameTime, m, up, heights, plane, knee, root };
}

/** Returns contact events found from heights: contact when the heel reaches tol after a swing, toe-off when all three points leave. */
export function detectEvents(h: Float64Array, frames: number, tol = 0.001): { ic: number[]; to: number[] } {
  const ic: number[] = [], to: number[] = [];
  let state = 0;
  for (let f = 0; f < frames; f++) {
    const heel = h[f * 3]!, down = heel <= tol || h[f * 3 + 1]! <= tol || h[f * 3 + 2]! <= tol;
    if (state === 0) state = down ? 1 : 2;
    else if (state === 2 && heel <= tol) { ic.push(f); state = 1; }
    else if (state === 1 && !down) { to.push(f); state = 2; }
  }
  return { ic, to };
}

/** Returns the largest floor-plane travel (m) of any foot point while it is within tol of the floor during a stance. */
export function maxStanceSlide(ms: Measured, side: 0 | 1, ic: number[], to: number[], tol = 0.001, skip: (f: number) => boolean = () => false): number {
  let worst = 0;
  for (const a of ic) {
    const b = to.find((x) => x > a);
    if (b === undefined || skip(a)) continue;
    for (let i = 0; i < 3; i++) {
      let fx = NaN, fz = NaN;
      for (let f = a; f < b; f++) {
        if (ms.heights[side]![f * 3 + i]! > tol) continue;
        const x = ms.plane[side]![f * 6 + i * 2]!, z = ms.plane[side]![f * 6 + i * 2 + 1]!;
        if (Number.isNaN(fx)) { fx = x; fz = z; continue; }
        worst = Math.max(worst, Math.hypot(x - fx, z - fz));
      }
    }
  }
  return worst;
}

/** Returns the peak knee flexion (degrees) of each complete swing (toe-off to next contact) of a side. */
export function swingKneePeaks(ms: Measured, side: 0 | 1, ic: number[], to: number[]): number[] {
  const out: number[] = [];
  for (const a of to) {
    const b = ic.find((x) => x > a);
    if (b === undefined) continue;
    let peak = -Infinity;
    for (let f = a; f < b; f++) peak = Math.max(peak, ms.knee[side]![f]!);
    out.push(peak);
  }
  return out;
}

/** Returns the median of a list. */
export function median(xs: readonly number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  const n = s.length;
  return n % 2 ? s[(n - 1) / 2]! : 0.5 * (s[n / 2 - 1]! + s[n / 2]!);
}
