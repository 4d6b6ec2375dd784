// The shell of every self-contained HTML report: inline CSS, header, caution, footer; no network.
import { escapeXml } from './svg.js';

const STYLE = `
:root { --ink: #1d2433; --muted: #5a6275; --rule: #d7dbe3; --paper: #ffffff; --tint: #f3f5f9; --left: #0f7b74; --right: #b3541e; }
* { box-sizing: border-box; }
body { margin: 0; font: 15px/1.45 system-ui, -apple-system, "Segoe UI", "DejaVu Sans", sans-serif; color: var(--ink); background: var(--paper); }
main { max-width: 1180px; margin: 0 auto; padding: 24px 28px 40px; }
h1 { font-size: 24px; margin: 0 0 4px; }
h2 { font-size: 18px; margin: 28px 0 10px; padding-bottom: 4px; border-bottom: 1px solid var(--rule); }
.sub { color: var(--muted); margin: 0 0 14px; }
.caution { border-left: 4px solid #6b4fa3; background: #f4f1fa; padding: 10px 14px; margin: 14px 0; }
.warn { border-left: 4px solid #b38a00; background: #fbf6e4; padding: 8px 14px; margin: 8px 0; }
table { border-collapse: collapse; margin: 6px 0 12px; font-variant-numeric: tabular-nums; }
th, td { padding: 4px 10px; border-bottom: 1px solid var(--rule); text-align: right; }
th:first-child, td:first-child { text-align: left; }
thead th { background: var(--tint); font-weight: 600; }
.grid-plots { display: grid; grid-template-columns: repeat(auto-fill, minmax(440px, 1fr)); gap: 14px; }
.plot { background: var(--paper); border: 1px solid var(--rule); border-radius: 4px; width: 100%; height: auto; display: block; }
.plot .plot-title { font-size: 14px; font-weight: 600; fill: var(--ink); }
.plot .tick { font-size: 11px; fill: var(--muted); }
.plot .axis-label { font-size: 12px; fill: var(--ink); }
.plot .legend { font-size: 11px; fill: var(--ink); }
.plot .grid { stroke: #eceef3; stroke-width: 1; }
.plot .zero { stroke: #9aa1b1; stroke-width: 1; }
.plot .frame { fill: none; stroke: #b9bfcc; stroke-width: 1; }
.plot .reference { fill: #8c93a3; fill-opacity: 0.22; stroke: none; }
.side-left { color: var(--left); font-weight: 600; }
.side-right { color: var(--right); font-weight: 600; }
dl.facts { display: grid; grid-template-columns: max-content 1fr; gap: 2px 16px; margin: 6px 0; }
dl.facts dt { color: var(--muted); }
dl.facts dd { margin: 0; }
footer { margin-top: 32px; color: var(--muted); font-size: 13px; }
@media print { main { max-width: none; } .plot { break-inside: avoid; } }
`;

export interface PageSpec {
  title: string;
  subtitle: string;
  caution: string;
  body: string;
  footer: string;
}

/** Returns a complete HTML document with the given body sections; everything inline. */
export function htmlPage(p: PageSpec): string {
  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>${escapeXml(p.title)}</title>
<style>${STYLE}</style>
</head>
<body>
<main>
<h1>${escapeXml(p.title)}</h1>
<p class="sub">${escapeXml(p.subtitle)}</p>
<p class="caution" role="note"><strong>Caution.</strong> ${escapeXml(p.caution.replace(/^Caution:\s*/, ''))}</p>
${p.body}
<footer>${escapeXml(p.footer)}</footer>
</main>
</body>
</html>
`;
}

/** Returns an HTML table from a header row and body rows (cells are escaped unless marked raw). */
export function htmlTable(head: string[], rows: (string | number | null | { raw: string })[][]): string {
  const cell = (c: string | number | null | { raw: string }) =>
    c === null ? '–' : typeof c === 'object' ? c.raw : escapeXml(String(c));
  return `<table><thead><tr>${head.map((h) => `<th>${escapeXml(h)}</th>`).join('')}</tr></thead><tbody>${rows
    .map((r) => `<tr>${r.map((c) => `<td>${cell(c)}</td>`).join('')}</tr>`)
    .join('')}</tbody></table>`;
}
