// A causal gait phase per track step for restricted labeling: at step t, the phase runs from the last
// initial contact at or before t over the duration of the stride before it (so it reads no contact after
// t). NaN before the second contact and after a gap longer than 1.5 strides (a pause or a turn).

/** Returns the phase in radians [0, 2π) per step of a track of `steps` steps at `rate`, from sorted contact times (s). */
export function causalPhase(contacts: readonly number[], steps: number, rate: number): Float64Array {
  const out = new Float64Array(steps).fill(NaN);
  let k = 0;
  for (let t = 0; t < steps; t++) {
    const time = t / rate;
    while (k + 1 < contacts.length && contacts[k + 1]! <= time) k++;
    if (k < 1 || contacts[k]! > time) continue;
    const last = contacts[k]!, stride = last - contacts[k - 1]!;
    if (!(stride > 0) || time - last > 1.5 * stride) continue;
    out[t] = Math.min(2 * Math.PI * ((time - last) / stride), 2 * Math.PI - 1e-9) % (2 * Math.PI);
  }
  return out;
}
