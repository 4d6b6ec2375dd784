// Viridis, the perceptually uniform colour map of van der Walt and Smith (matplotlib 2.0 default, 2015),
// as nine evenly spaced sRGB stops of the published 256-entry table, interpolated linearly between them.

/** The nine stops, sRGB 0-255, at t = 0, 1/8, ..., 1. */
export const VIRIDIS_STOPS: readonly (readonly [number, number, number])[] = [
  [68, 1, 84], [71, 44, 122], [59, 81, 139], [44, 113, 142], [33, 144, 141],
  [39, 173, 129], [92, 200, 99], [170, 220, 50], [253, 231, 37],
];

/** Writes the viridis colour at t (clamped to [0, 1]) into out as sRGB 0-1 and returns out. */
export function viridis(t: number, out: Float32Array | number[], o = 0): Float32Array | number[] {
  const x = Math.min(1, Math.max(0, Number.isFinite(t) ? t : 0)) * (VIRIDIS_STOPS.length - 1);
  const i = Math.min(VIRIDIS_STOPS.length - 2, Math.floor(x));
  const f = x - i;
  const a = VIRIDIS_STOPS[i]!, b = VIRIDIS_STOPS[i + 1]!;
  for (let k = 0; k < 3; k++) out[o + k] = (a[k]! + f * (b[k]! - a[k]!)) / 255;
  return out;
}
