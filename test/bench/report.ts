// Result shapes shared by the benchmark sections, and the plain-text table printer.

/** One measured figure. */
export interface Row {
  name: string;
  value: number;
  unit: string;
  /** Optional detail (median of n, method, input). */
  note?: string;
}

/** One target ratio with its verdict. */
export interface Ratio {
  name: string;
  value: number;
  /** "≥" or "≤" and the bound. */
  op: '>=' | '<=';
  target: number;
  pass: boolean;
  note?: string;
}

/** What each benchmark section returns. */
export interface Section {
  title: string;
  rows: Row[];
  ratios: Ratio[];
  notes: string[];
}

/** Returns a ratio record with its PASS/MISS verdict. */
export function ratio(name: string, value: number, op: '>=' | '<=', target: number, note?: string): Ratio {
  const pass = op === '>=' ? value >= target : value <= target;
  return note === undefined ? { name, value, op, target, pass } : { name, value, op, target, pass, note };
}

function fmt(v: number): string {
  if (!Number.isFinite(v)) return String(v);
  const a = Math.abs(v);
  if (a >= 1e6) return v.toExponential(3);
  if (a >= 100) return v.toFixed(0);
  if (a >= 10) return v.toFixed(1);
  return v.toFixed(a >= 1 ? 2 : 4);
}

/** Returns the sections as an aligned plain-text report. */
export function formatSections(sections: Section[]): string {
  const out: string[] = [];
  for (const s of sections) {
    out.push('', `== ${s.title} ==`);
    const w = Math.max(...s.rows.map((r) => r.name.length), 10);
    for (const r of s.rows) out.push(`  ${r.name.padEnd(w)}  ${fmt(r.value).padStart(10)} ${r.unit.padEnd(9)} ${r.note ?? ''}`.trimEnd());
    if (s.ratios.length) {
      out.push('', '  targets:');
      const wr = Math.max(...s.ratios.map((r) => r.name.length));
      for (const r of s.ratios)
        out.push(`  ${r.pass ? 'PASS' : 'MISS'}  ${r.name.padEnd(wr)}  ${fmt(r.value).padStart(8)}  (target ${r.op === '>=' ? '≥' : '≤'} ${r.target})${r.note ? `  ${r.note}` : ''}`);
    }
    for (const n of s.notes) out.push(`  note: ${n}`);
  }
  return out.join('\n');
}
