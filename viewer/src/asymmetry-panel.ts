// The side panel's ranked coupling asymmetry: the summary sentence and the pairs that differ most from
// their mirror, with 95 % intervals and the side lying farther from the model's normative cohort.
import type { ViewFactors } from '../../src/view/types.js';

/** Fills `host` with the ranked asymmetry list, or a note saying why there is none. */
export function renderAsymmetry(host: HTMLElement, factors: ViewFactors | null, reason: string): void {
  host.replaceChildren();
  const note = (text: string) => { const p = document.createElement('p'); p.className = 'muted'; p.textContent = text; host.append(p); };
  if (!factors) return note(reason);
  const a = factors.asymmetry;
  if (!a) return note('the model holds no normative coupling figures');
  const p = document.createElement('p');
  p.textContent = a.summary;
  host.append(p);
  const table = document.createElement('table');
  table.className = 'asym';
  table.innerHTML = '<thead><tr><th>pair (against its mirror)</th><th>score</th><th>95 %</th><th>side</th></tr></thead>';
  const body = document.createElement('tbody');
  for (const r of a.ranked.slice(0, 8)) {
    const tr = document.createElement('tr');
    for (const text of [r.pair, r.score.toFixed(2), `${r.ci_low.toFixed(2)}–${r.ci_high.toFixed(2)}`, r.side]) {
      const td = document.createElement('td');
      td.textContent = text;
      tr.append(td);
    }
    tr.title = `${r.pair} against ${r.mirror}`;
    body.append(tr);
  }
  table.append(body);
  host.append(table);
}
