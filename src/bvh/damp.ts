// An after-the-fact edit of a take: one joint's rotation channels pulled toward their mean over the take,
// v' = mean + keep · (v − mean) per channel. It narrows that joint's range of motion by the factor `keep`
// without touching any other channel, so an asymmetry check can be tried on an impairment that the
// walker synthesizer did not make itself.
import type { Take } from './take.js';

/** Returns a copy of `take` with joint `joint`'s rotation channels scaled toward their means by `keep` (0..1). */
export function dampJointRotations(take: Take, joint: number, keep: number): Take {
  const j = take.joints[joint];
  if (!j) throw new RangeError(`joint ${joint} is not in the take (it has ${take.joints.length})`);
  if (!(keep >= 0 && keep <= 1)) throw new RangeError(`keep must lie in 0..1, got ${keep}`);
  const values = Float64Array.from(take.values);
  const C = take.channelCount, F = take.frameCount;
  j.channels.forEach((name, k) => {
    if (!name.endsWith('rotation')) return;
    const c = j.channelStart + k;
    let mean = 0;
    for (let f = 0; f < F; f++) mean += values[f * C + c]!;
    mean /= Math.max(1, F);
    for (let f = 0; f < F; f++) values[f * C + c] = mean + keep * (values[f * C + c]! - mean);
  });
  return { ...take, joints: take.joints.map((x) => ({ ...x, offset: [...x.offset] as [number, number, number], channels: [...x.channels] })), values, warnings: [...take.warnings] };
}
