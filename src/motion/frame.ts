// The window frame: defined from the last observed step alone, and its maps to and from the world
// (the track's canonical frame: metres, Z up).
//
//   origin   the pelvis at the last observed step e (all three coordinates: the pelvis is at (0, 0, 0),
//            the feet near z = −1; not projected to the floor, so a file whose floor is not at zero
//            gives the same windows)
//   x        forward: the horizontal direction of the pelvis displacement from step e − H to step e
//            (H = 0.5 s of observed steps by default); when the pelvis moved less than
//            minHeadingSpeed · legLength · H / rate (standing), the hips line instead: left = l_hip −
//            r_hip at step e, forward = left × up; with neither, the canonical +X. The chord of a
//            curved path points along the tangent at its middle, so on a turn of rate ω the heading
//            lags the path by ω·H/2 (2° on an 8 m circle, 4-6° on 3-4 m circles at walking speed);
//            sideways pelvis sway within H adds up to about 4° on straight walks
//   z        the canonical up (+Z); y = z × x, the subject's left; right-handed
//   scale    positions are divided by the leg length (rest pose), velocities too (leg lengths per second)
//
// World → window:  q = Rᵀ (p − origin) / L,  with R's columns x, y, z above (a yaw by `heading`).
import { mirrorState, STATE_SIZE } from './reflect.js';
import type { Track } from './track.js';

/** What set the heading of a window frame. */
export type HeadingSource = 'motion' | 'hips' | 'none';

/** A window's frame: origin (metres, canonical), heading as cos/sin of the yaw of x, scale = leg length. */
export interface WindowFrame {
  origin: Float64Array;
  cos: number;
  sin: number;
  /** Metres per window unit (the leg length). */
  scale: number;
  heading: HeadingSource;
  /** Set on a mirrored window: its state is reflected (reflect.ts) before the map to the world. */
  mirror: Int32Array | null;
}

/** Returns a fresh frame at the world origin with no heading (identity). */
export function identityFrame(): WindowFrame {
  return { origin: new Float64Array(3), cos: 1, sin: 0, scale: 1, heading: 'none', mirror: null };
}

/** Node indices a frame needs, looked up once per track. */
export interface FrameNodes {
  pelvis: number;
  lHip: number;
  rHip: number;
}

/** Returns the pelvis and hip node indices of a track; throws when its node list lacks them. */
export function frameNodes(track: Track): FrameNodes {
  const at = (r: string) => {
    const i = (track.nodes as readonly string[]).indexOf(r);
    if (i < 0) throw new RangeError(`the track's node list has no ${r}, which the window frame needs`);
    return i;
  };
  return { pelvis: at('pelvis'), lHip: at('l_hip'), rHip: at('r_hip') };
}

/**
 * Writes into `out` and returns the frame of a window whose last observed step is `e`, reading only
 * steps e − headingSteps and e of the track.
 */
export function frameAt(track: Track, nodes: FrameNodes, e: number, headingSteps: number, minHeadingSpeed: number, out: WindowFrame): WindowFrame {
  const P = track.positions, N = track.nodeCount;
  const pe = (e * N + nodes.pelvis) * 3;
  out.origin[0] = P[pe]!;
  out.origin[1] = P[pe + 1]!;
  out.origin[2] = P[pe + 2]!;
  out.scale = track.legLength;
  out.mirror = null;
  const H = Math.min(headingSteps, e);
  let fx = 0, fy = 0;
  let source: HeadingSource = 'none';
  if (H > 0) {
    const ps = ((e - H) * N + nodes.pelvis) * 3;
    const dx = P[pe]! - P[ps]!, dy = P[pe + 1]! - P[ps + 1]!;
    const d = Math.hypot(dx, dy);
    if (d > 0 && d >= (minHeadingSpeed * track.legLength * H) / track.rate) {
      fx = dx / d; fy = dy / d; source = 'motion';
    }
  }
  if (source === 'none') {
    const l = (e * N + nodes.lHip) * 3, r = (e * N + nodes.rHip) * 3;
    const lx = P[l]! - P[r]!, ly = P[l + 1]! - P[r + 1]!;
    const d = Math.hypot(lx, ly);
    // forward = left × up = (ly, −lx, 0) for up = +Z.
    if (d > 1e-9) { fx = ly / d; fy = -lx / d; source = 'hips'; }
    else { fx = 1; fy = 0; }
  }
  out.cos = fx;
  out.sin = fy;
  out.heading = source;
  return out;
}

/**
 * Returns `out` holding window state (steps × nodes × 6) mapped to the world: positions in metres in the
 * canonical frame, velocities in metres per second. A mirrored frame reflects the state back first.
 * `out` may be `state` (in place).
 */
export function frameToWorld(frame: WindowFrame, state: Float64Array, out: Float64Array): Float64Array {
  const src = frame.mirror ? mirrorState(state, frame.mirror, out) : state;
  const { cos: c, sin: s, scale: L } = frame;
  const ox = frame.origin[0]!, oy = frame.origin[1]!, oz = frame.origin[2]!;
  const n = Math.floor(src.length / STATE_SIZE) * STATE_SIZE;
  for (let o = 0; o < n; o += STATE_SIZE) {
    const x = src[o]!, y = src[o + 1]!, z = src[o + 2]!, u = src[o + 3]!, v = src[o + 4]!, w = src[o + 5]!;
    out[o] = ox + L * (c * x - s * y);
    out[o + 1] = oy + L * (s * x + c * y);
    out[o + 2] = oz + L * z;
    out[o + 3] = L * (c * u - s * v);
    out[o + 4] = L * (s * u + c * v);
    out[o + 5] = L * w;
  }
  return out;
}

/**
 * Returns `out` holding world state (steps × nodes × 6: metres, metres per second, canonical frame)
 * in the window frame; the inverse of frameToWorld. `out` may be `world`.
 */
export function worldToFrame(frame: WindowFrame, world: Float64Array, out: Float64Array): Float64Array {
  const { cos: c, sin: s } = frame;
  const k = 1 / frame.scale;
  const ox = frame.origin[0]!, oy = frame.origin[1]!, oz = frame.origin[2]!;
  const n = Math.floor(world.length / STATE_SIZE) * STATE_SIZE;
  for (let o = 0; o < n; o += STATE_SIZE) {
    const dx = world[o]! - ox, dy = world[o + 1]! - oy, dz = world[o + 2]! - oz;
    const u = world[o + 3]!, v = world[o + 4]!, w = world[o + 5]!;
    out[o] = k * (c * dx + s * dy);
    out[o + 1] = k * (c * dy - s * dx);
    out[o + 2] = k * dz;
    out[o + 3] = k * (c * u + s * v);
    out[o + 4] = k * (c * v - s * u);
    out[o + 5] = k * w;
  }
  return frame.mirror ? mirrorState(out, frame.mirror, out) : out;
}
