// Left/right mirror augmentation. A mirrored window is the window of the subject reflected across the
// sagittal plane of its own frame: y → −y for positions and velocities, l_ and r_ nodes swapped (so the
// left hip still lies at positive y). Pair-valued arrays follow the pair mirror map (i, j) ↔ (mi, mj).
// Mirroring twice is the identity, bit for bit.
//
// toWorld of a mirrored window reflects the state back before mapping it to the world, so a forecast
// made on a mirrored window lands on the original take's world (useful for averaging both readings).
import { frameToWorld } from './frame.js';
import { mirrorState } from './reflect.js';
import type { Track } from './track.js';
import type { Window } from './window.js';

export { mirrorState } from './reflect.js';

/** Returns a new window holding `win` mirrored (its frame marked as reflected; toWorld undoes it). */
export function mirrorWindow(win: Window, nodeMirror: Int32Array): Window {
  const futureStore = new Float64Array(win.futureStore.length);
  const future = futureStore.subarray(0, win.future.length);
  mirrorState(win.future, nodeMirror, future);
  const historyStore = new Float64Array(win.historyStore.length);
  const history = historyStore.subarray(0, win.history.length);
  mirrorState(win.history, nodeMirror, history);
  const frame = { ...win.frame, origin: Float64Array.from(win.frame.origin), mirror: win.frame.mirror ? null : nodeMirror };
  const out: Window = {
    ...win,
    observed: mirrorState(win.observed, nodeMirror, new Float64Array(win.observed.length)),
    future, futureStore, history, historyStore, frame,
    mirrored: !win.mirrored,
    toWorld: (state, o) => frameToWorld(out.frame, state, o),
  };
  return out;
}

/**
 * Returns `out` holding pair values (pairs × width, pair-major) with every pair's values moved to its
 * mirror pair. For scalars per pair; vector values with a y component need that component negated too.
 * `out` may be `values`.
 */
export function mirrorPairValues(values: Float64Array, pairMirror: Int32Array, width: number, out: Float64Array): Float64Array {
  const P = pairMirror.length;
  for (let p = 0; p < P; p++) {
    const m = pairMirror[p]!;
    if (m < p) continue;
    const a = p * width, b = m * width;
    for (let c = 0; c < width; c++) {
      const x = values[a + c]!, y = values[b + c]!;
      out[a + c] = y;
      out[b + c] = x;
    }
  }
  return out;
}

/**
 * Returns the take's track reflected across the world's vertical x-z plane (canonical y → −y) with the
 * l_ and r_ nodes swapped: the mirror-image walker, whose windows are the original's mirrored windows
 * (the heading frame follows the reflected motion). Applied twice it is the identity, bit for bit.
 */
export function mirrorTrack(track: Track): Track {
  const N = track.nodeCount, positions = new Float64Array(track.positions.length);
  for (let k = 0; k < track.steps; k++) {
    for (let i = 0; i < N; i++) {
      const src = (k * N + track.nodeMirror[i]!) * 3, dst = (k * N + i) * 3;
      positions[dst] = track.positions[src]!;
      positions[dst + 1] = -track.positions[src + 1]!;
      positions[dst + 2] = track.positions[src + 2]!;
    }
  }
  return { ...track, path: `${track.path} (mirrored)`, positions };
}
