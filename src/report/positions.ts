// Joint world positions as JSON or CSV text, for `jointloom export`.

export interface PositionTable {
  /** Names of the joints in the table, in file order. */
  joints: string[];
  /** Unit label of the coordinates, e.g. "cm" or "m". */
  units: string;
  /** Up axis of the coordinates, "y" or "z". */
  up: string;
  /** Seconds per frame, for the CSV time column. */
  frameTime: number;
  /** Frame indices in the take. */
  frames: number[];
  /** Positions, frames.length x joints.length x 3. */
  positions: Float64Array;
}

/** Returns `v` rounded to 6 decimals for text output (sub-micrometre in metres, well below any mocap noise). */
function round6(v: number): number {
  const r = Math.round(v * 1e6) / 1e6;
  return r === 0 ? 0 : r;
}

/** Returns the table as JSON: {joints, units, up, frames: [{index, time_s, positions: [[x,y,z], ...]}]}. */
export function positionsToJson(t: PositionTable): string {
  const J = t.joints.length;
  const frames = t.frames.map((index, k) => {
    const positions: number[][] = new Array(J);
    for (let j = 0; j < J; j++) {
      const o = (k * J + j) * 3;
      positions[j] = [round6(t.positions[o]!), round6(t.positions[o + 1]!), round6(t.positions[o + 2]!)];
    }
    return { index, time_s: round6(index * t.frameTime), positions };
  });
  return JSON.stringify({ joints: t.joints, units: t.units, up: t.up, frames });
}

/** Returns CSV quoting of a header cell where it needs it (commas, quotes). */
function csvCell(s: string): string {
  return /[",\n\r]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

/** Returns the table as CSV: one row a frame, columns frame, time_s, then <joint>_x, _y, _z. */
export function positionsToCsv(t: PositionTable): string {
  const J = t.joints.length;
  const header = ['frame', 'time_s', ...t.joints.flatMap((n) => [`${n}_x`, `${n}_y`, `${n}_z`].map(csvCell))];
  const rows: string[] = [header.join(',')];
  const cells = new Array<string>(2 + 3 * J);
  t.frames.forEach((index, k) => {
    cells[0] = String(index);
    cells[1] = String(round6(index * t.frameTime));
    for (let n = 0; n < 3 * J; n++) cells[2 + n] = String(round6(t.positions[k * J * 3 + n]!));
    rows.push(cells.join(','));
  });
  return rows.join('\n') + '\n';
}
