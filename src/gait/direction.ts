// The local walking direction from the pelvis path, and the walking passes it implies: stretches where
// the pelvis moves fast enough for walking and its heading changes slowly. Standing, turning on the spot
// and sharp turns are left out, each with its reason.
import type { GaitInput } from './input.js';
import type { EventDetection, WalkingPass } from './types.js';

/** Standard gravity, m/s² (used to scale the speed threshold by leg length, as in the Froude number). */
const G = 9.80665;

/** Options of the walking-direction finder; every field has a default. */
export interface DirectionOptions {
  /** Half-width of the window over which the pelvis velocity is averaged, seconds (default 0.5: about one stride in all). */
  halfWindowS?: number;
  /** Least walking speed as a fraction of √(g · leg length) (default 0.1: 0.29 m/s for a 0.86 m leg). */
  minSpeedFroude?: number;
  /** Heading rate above which the path counts as a turn, degrees per second (default 35). */
  maxHeadingRateDegS?: number;
  /** Pelvis yaw rate above which a slow stretch counts as turning on the spot, degrees per second (default 30). */
  spotTurnRateDegS?: number;
  /** Shortest walking pass kept, seconds (default 1.2). */
  minPassS?: number;
  /** Longest gap between two walking stretches that is bridged, seconds (default 0.25). */
  bridgeS?: number;
}

/** What the direction finder returns: per-frame signals, the passes, and the stretches left out. */
export interface DirectionResult {
  /** Unit horizontal walking direction, frames x 3, everywhere the pelvis moves (zero where it stands still). */
  direction: Float64Array;
  /** Same as `direction` but zero outside the walking passes. */
  passDirection: Float64Array;
  /** Horizontal pelvis speed averaged over the window, m/s. */
  speed: Float64Array;
  /** Rate of change of the walking heading, rad/s (signed, positive counter-clockwise seen from above). */
  headingRate: Float64Array;
  /** Speed threshold used, m/s. */
  minSpeed: number;
  passes: WalkingPass[];
  excluded: EventDetection['excluded'];
}

type Reason = EventDetection['excluded'][number]['reason'];
const WALK = 0, STAND = 1, TURN = 2, OTHER = 3;
const REASONS: Reason[] = ['standing', 'standing', 'turning', 'not walking'];

/** Returns the unwrapped angle series of (x, y) pairs given by `xy(f, out)`; frames where the vector vanishes keep the last angle. */
function unwrappedAngle(n: number, xs: Float64Array, ys: Float64Array, out: Float64Array): Float64Array {
  let prev = 0, have = false;
  for (let f = 0; f < n; f++) {
    const x = xs[f]!, y = ys[f]!;
    if (x * x + y * y < 1e-18) { out[f] = prev; continue; }
    let a = Math.atan2(y, x);
    if (have) {
      while (a - prev > Math.PI) a -= 2 * Math.PI;
      while (a - prev < -Math.PI) a += 2 * Math.PI;
    }
    out[f] = a; prev = a; have = true;
  }
  return out;
}

/** Returns the central-difference rate of `a` over ±k frames (one-sided at the ends), per second. */
function rateOf(a: Float64Array, n: number, k: number, fps: number, out: Float64Array): Float64Array {
  for (let f = 0; f < n; f++) {
    const i0 = Math.max(0, f - k), i1 = Math.min(n - 1, f + k);
    out[f] = i1 > i0 ? ((a[i1]! - a[i0]!) * fps) / (i1 - i0) : 0;
  }
  return out;
}

/** Returns the local walking direction, speed, heading rate, the walking passes and the excluded stretches of a take. */
export function walkingDirection(input: GaitInput, options: DirectionOptions = {}): DirectionResult {
  const F = input.frames, J = input.jointCount, fps = input.fps;
  const p = input.role.pelvis, lh = input.role.l_hip, rh = input.role.r_hip;
  const h = Math.max(1, Math.round((options.halfWindowS ?? 0.5) * fps));
  const minSpeed = (options.minSpeedFroude ?? 0.1) * Math.sqrt(G * input.legLengthM);
  const maxRate = ((options.maxHeadingRateDegS ?? 35) * Math.PI) / 180;
  const spotRate = ((options.spotTurnRateDegS ?? 30) * Math.PI) / 180;
  const pos = input.positions;

  // Pelvis velocity averaged over ±h frames: the mean of the velocity over the window is the chord.
  const vx = new Float64Array(F), vy = new Float64Array(F), speed = new Float64Array(F);
  const direction = new Float64Array(F * 3);
  for (let f = 0; f < F; f++) {
    const i0 = Math.max(0, f - h), i1 = Math.min(F - 1, f + h);
    if (i1 === i0) continue;
    const a = (i0 * J + p) * 3, b = (i1 * J + p) * 3, s = fps / (i1 - i0);
    const x = (pos[b]! - pos[a]!) * s, y = (pos[b + 1]! - pos[a + 1]!) * s;
    vx[f] = x; vy[f] = y;
    const v = Math.hypot(x, y);
    speed[f] = v;
    if (v > 1e-9) { direction[f * 3] = x / v; direction[f * 3 + 1] = y / v; }
  }
  const k = Math.max(1, Math.round(0.25 * fps));
  const heading = unwrappedAngle(F, vx, vy, new Float64Array(F));
  const headingRate = rateOf(heading, F, k, fps, new Float64Array(F));

  // Pelvis yaw from the hip-to-hip line, for turning on the spot where the path heading means nothing.
  const hx = new Float64Array(F), hy = new Float64Array(F);
  for (let f = 0; f < F; f++) {
    const a = (f * J + lh) * 3, b = (f * J + rh) * 3;
    hx[f] = pos[a]! - pos[b]!; hy[f] = pos[a + 1]! - pos[b + 1]!;
  }
  const yawRate = rateOf(unwrappedAngle(F, hx, hy, new Float64Array(F)), F, h, fps, new Float64Array(F));

  const cls = new Uint8Array(F);
  for (let f = 0; f < F; f++) {
    if (speed[f]! >= minSpeed) cls[f] = Math.abs(headingRate[f]!) <= maxRate ? WALK : TURN;
    else cls[f] = Math.abs(yawRate[f]!) > spotRate ? TURN : STAND;
  }
  // Bridge short breaks inside walking, then drop walking stretches too short to hold a stride.
  relabelRuns(cls, (c, len, before, after) => c !== WALK && before === WALK && after === WALK && len <= Math.round((options.bridgeS ?? 0.25) * fps) ? WALK : c);
  relabelRuns(cls, (c, len) => (c === WALK && len < Math.round((options.minPassS ?? 1.2) * fps) ? OTHER : c));

  const passes: WalkingPass[] = [];
  const excluded: EventDetection['excluded'] = [];
  const passDirection = new Float64Array(F * 3);
  forRuns(cls, (c, start, end) => {
    if (c !== WALK) {
      const last = excluded[excluded.length - 1];
      const reason = REASONS[c]!;
      if (last && last.endFrame === start && last.reason === reason) last.endFrame = end;
      else excluded.push({ startFrame: start, endFrame: end, reason });
      return;
    }
    let sx = 0, sy = 0;
    for (let f = start; f < end; f++) {
      sx += direction[f * 3]!; sy += direction[f * 3 + 1]!;
      passDirection[f * 3] = direction[f * 3]!; passDirection[f * 3 + 1] = direction[f * 3 + 1]!;
    }
    const n = Math.hypot(sx, sy) || 1;
    passes.push({ index: passes.length, startFrame: start, endFrame: end, direction: [sx / n, sy / n, 0] });
  });
  return { direction, passDirection, speed, headingRate, minSpeed, passes, excluded };
}

/** Calls `fn(class, start, endExclusive)` for every run of equal labels. */
function forRuns(cls: Uint8Array, fn: (c: number, start: number, end: number) => void): void {
  let s = 0;
  for (let f = 1; f <= cls.length; f++) if (f === cls.length || cls[f] !== cls[s]) { fn(cls[s]!, s, f); s = f; }
}

/** Relabels every run by `fn(label, length, labelBefore, labelAfter)` (-1 at the ends); returns the labels. */
function relabelRuns(cls: Uint8Array, fn: (c: number, len: number, before: number, after: number) => number): Uint8Array {
  const runs: [number, number, number][] = [];
  forRuns(cls, (c, s, e) => runs.push([c, s, e]));
  runs.forEach(([c, s, e], i) => {
    const nc = fn(c, e - s, i > 0 ? runs[i - 1]![0] : -1, i + 1 < runs.length ? runs[i + 1]![0] : -1);
    if (nc !== c) cls.fill(nc, s, e);
  });
  return cls;
}
