// Display positions of a take: every stride-th frame (at most 60 Hz), metres, Y up, as float32.
// Decimation is for drawing only; analysis (gait, events) always runs on every recorded frame.
import type { Take } from '../bvh/take.js';
import { planFk, poseFrame } from '../skeleton/fk.js';
import { rotationToZ } from '../skeleton/axes.js';
import type { ResolvedFrame } from '../skeleton/frame.js';
import { ROLE_NAMES } from '../skeleton/roles.js';
import type { ViewJoint, ViewSide } from './types.js';

/** Highest frame rate the viewer draws; faster takes are decimated to it. */
export const DISPLAY_MAX_HZ = 60;

/** Returns the frame step that brings `fps` down to at most `maxHz` (1 when already at or below). */
export function displayStride(fps: number, maxHz = DISPLAY_MAX_HZ): number {
  // The small tolerance keeps 60.0000001 Hz (a frame time printed as 0.016667) at stride 1.
  return Math.max(1, Math.ceil(fps / maxHz - 1e-6));
}

/** Returns the 3x3 row-major matrix from file axes to the display frame (metres, Y up, right-handed). */
export function displayMatrix(frame: ResolvedFrame): Float64Array {
  const s = frame.units.metresPerUnit;
  const R = rotationToZ(frame.up.vector);
  // Canonical Z-up (x, y, z) to three's Y-up (x, z, -y): rows (1 0 0), (0 0 1), (0 -1 0); det +1.
  const M = new Float64Array(9);
  for (let c = 0; c < 3; c++) {
    M[c] = s * R[c]!;
    M[3 + c] = s * R[6 + c]!;
    M[6 + c] = -s * R[3 + c]!;
  }
  return M;
}

/** Returns the display positions: ceil(frames / stride) x joints x 3 float32, in the display frame. */
export function displayPositions(take: Take, frame: ResolvedFrame, stride: number): Float32Array {
  const J = take.joints.length;
  const n = Math.ceil(take.frameCount / stride);
  const out = new Float32Array(n * J * 3);
  const M = displayMatrix(frame);
  const plan = planFk(take);
  const pos = new Float64Array(J * 3);
  const rot = new Float64Array(J * 9);
  for (let d = 0; d < n; d++) {
    poseFrame(plan, take.values, d * stride, pos, rot);
    const o = d * J * 3;
    for (let j = 0; j < J; j++) {
      const x = pos[j * 3]!, y = pos[j * 3 + 1]!, z = pos[j * 3 + 2]!;
      out[o + j * 3] = M[0]! * x + M[1]! * y + M[2]! * z;
      out[o + j * 3 + 1] = M[3]! * x + M[4]! * y + M[5]! * z;
      out[o + j * 3 + 2] = M[6]! * x + M[7]! * y + M[8]! * z;
    }
  }
  return out;
}

/** Returns the lowest height (Y) of any joint over the display positions, or 0 when there are none. */
export function floorHeight(positions: Float32Array): number {
  let min = Infinity;
  for (let i = 1; i < positions.length; i += 3) if (positions[i]! < min) min = positions[i]!;
  return Number.isFinite(min) ? min : 0;
}

/** Returns the viewer's joint list: name, parent, side and role. A joint is on a side when it plays a
 * side role, descends from one, or (a clavicle) leads only to one side's roles and to no trunk role. */
export function viewJoints(take: Take, frame: ResolvedFrame): ViewJoint[] {
  const J = take.joints.length;
  const roleOf: (string | null)[] = new Array(J).fill(null);
  for (const r of ROLE_NAMES) {
    const a = frame.roles.roles[r];
    if (a) roleOf[a.joint] = r;
  }
  // Bottom-up: which kinds of role each subtree holds (bit 1 left, 2 right, 4 trunk); parents precede children.
  const holds = new Uint8Array(J);
  for (let j = J - 1; j >= 0; j--) {
    const r = roleOf[j];
    if (r) holds[j] |= r.startsWith('l_') ? 1 : r.startsWith('r_') ? 2 : 4;
    const p = take.joints[j]!.parent;
    if (p >= 0) holds[p] |= holds[j]!;
  }
  const sides: ViewSide[] = [];
  return take.joints.map((joint, j) => {
    const role = roleOf[j]!;
    let side: ViewSide = joint.parent >= 0 ? sides[joint.parent]! : 'centre';
    if (role?.startsWith('l_') || (!role && holds[j] === 1)) side = 'left';
    else if (role?.startsWith('r_') || (!role && holds[j] === 2)) side = 'right';
    sides[j] = side;
    return { name: joint.name, parent: joint.parent, side, role, endSite: joint.endSite };
  });
}
