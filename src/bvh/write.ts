// Take → BVH text. With the default shortest round-trip number format, parse(write(t)) equals t.
import type { Take } from './take.js';

export interface WriteOptions {
  /** Fixed decimals for frame values; omit for the shortest text that reads back to the same double. */
  decimals?: number;
  /** Indentation unit; a tab by default. */
  indent?: string;
  /** Line ending; "\n" by default. */
  eol?: string;
}

/** Returns the number as BVH text: fixed decimals when asked, else the shortest exact form. */
function formatNumber(v: number, decimals: number | undefined): string {
  if (decimals === undefined) return Object.is(v, -0) ? '-0' : String(v);
  const s = v.toFixed(decimals);
  // Avoid "-0.0000" for values that round to zero.
  return /^-0\.?0*$/.test(s) ? s.slice(1) : s;
}

/** Returns the BVH text of a take. */
export function writeBvh(take: Take, options: WriteOptions = {}): string {
  const ind = options.indent ?? '\t';
  const eol = options.eol ?? '\n';
  const dec = options.decimals;
  const lines: string[] = ['HIERARCHY'];
  const kids: number[][] = take.joints.map(() => []);
  const roots: number[] = [];
  take.joints.forEach((j, i) => (j.parent >= 0 ? kids[j.parent]!.push(i) : roots.push(i)));
  const off = (o: readonly number[]) => o.map((v) => formatNumber(v, undefined)).join(' ');
  const emit = (j: number, depth: number) => {
    const joint = take.joints[j]!;
    const pad = ind.repeat(depth);
    if (joint.endSite) {
      lines.push(`${pad}End Site`, `${pad}{`, `${pad}${ind}OFFSET ${off(joint.offset)}`, `${pad}}`);
      return;
    }
    lines.push(`${pad}${joint.parent < 0 ? 'ROOT' : 'JOINT'} ${joint.name}`, `${pad}{`);
    lines.push(`${pad}${ind}OFFSET ${off(joint.offset)}`);
    lines.push(`${pad}${ind}CHANNELS ${joint.channels.length}${joint.channels.length ? ' ' + joint.channels.join(' ') : ''}`);
    for (const k of kids[j]!) emit(k, depth + 1);
    lines.push(`${pad}}`);
  };
  for (const r of roots) emit(r, 0);
  lines.push('MOTION', `Frames: ${take.frameCount}`, `Frame Time: ${formatNumber(take.frameTime, undefined)}`);
  const C = take.channelCount;
  const row = new Array<string>(C);
  for (let f = 0; f < take.frameCount; f++) {
    for (let c = 0; c < C; c++) row[c] = formatNumber(take.values[f * C + c]!, dec);
    lines.push(row.join(' '));
  }
  return lines.join(eol) + eol;
}
