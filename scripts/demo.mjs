// The main job on the fictional clinic's demo takes, through the built CLI exactly as a user runs it.
// Run by `npm run demo` after `npm run build`. Writes everything under out/demo/.
import { spawnSync } from 'node:child_process';
import { mkdirSync, readFileSync, readdirSync, rmSync } from 'node:fs';
import { join, resolve } from 'node:path';

const root = resolve(import.meta.dirname, '..');
const cli = join(root, 'dist', 'cli', 'main.js');
const takesDir = join(root, 'demo-takes');
const outDir = join(root, 'out', 'demo');
mkdirSync(outDir, { recursive: true });

/** Runs the CLI and returns its stdout; stops the demo with the CLI's message on failure. */
function jointloom(args) {
  const r = spawnSync(process.execPath, [cli, ...args], { encoding: 'utf8' });
  if (r.status !== 0) {
    process.stderr.write(r.stderr);
    console.error(`demo: "jointloom ${args.join(' ')}" exited with status ${r.status}`);
    process.exit(1);
  }
  return r.stdout;
}

const takes = readdirSync(takesDir).filter((f) => f.endsWith('.bvh')).sort();
console.log(`jointloom demo: ${takes.length} takes of the fictional Quillbrook Gait Studio (demo-takes/)\n`);

// 1. Batch-score the clinic's takes into a fresh ledger and write the cohort report.
const ledger = join(outDir, 'jointloom-ledger.sqlite');
for (const f of [ledger, `${ledger}-wal`, `${ledger}-shm`]) rmSync(f, { force: true });
const batch = JSON.parse(jointloom(['batch', takesDir, '--ledger', ledger, '--out', outDir, '--json', '--quiet']));
console.log(`batch: ${batch.scored} takes scored, ${batch.failed.length} failed, ${batch.workers} workers, ${batch.elapsed_s.toFixed(1)} s -> ${ledger}`);

// 2. The gait figures of every take, with an HTML gait report each.
console.log('\ntake                   units up  cadence speed  stance L/R   knee peak L/R  GPS °  largest asymmetry');
const fx = (v, d) => (v === null || v === undefined ? '–' : v.toFixed(d));
for (const t of takes) {
  const path = join(takesDir, t);
  const info = JSON.parse(jointloom(['inspect', path, '--json']));
  const html = join(outDir, t.replace(/\.bvh$/, '.gait.html'));
  const g = JSON.parse(jointloom(['gait', path, '--json', '--html', html]));
  const flag = g.asymmetry_flags[0]?.text ?? 'none beyond |SI| 10 %';
  const gps = g.norms?.scores?.gps?.overall ?? g.norms?.gps?.overall ?? null;
  console.log(
    `${t.padEnd(22)} ${info.units.padEnd(5)} ${info.up.padEnd(2)}  ${fx(g.cadence_steps_per_min, 1).padStart(6)}  ${fx(g.speed_m_per_s, 2)}  ` +
      `${fx(g.stance_pct.left, 1)}/${fx(g.stance_pct.right, 1)}    ${fx(g.knee_flexion_peak_swing_deg.left, 1)}/${fx(g.knee_flexion_peak_swing_deg.right, 1)}    ${fx(gps, 2).padStart(5)}  ${flag}`,
  );
}
// 3. The model's view of each take, from the cohort table the batch wrote: the forecast of the next second
// (model against the stride-mean baseline, irregular steps) and the left/right coupling asymmetry.
const rows = parseCsv(readFileSync(batch.report.csv, 'utf8'));
const head = rows[0], col = (r, name) => r[head.indexOf(name)];
const num = (v, d) => (v === '' || v === undefined ? '–' : Number(v).toFixed(d));
console.log('\ntake                   forecast 1 s mm (stride mean)  irregular  coupling asymmetry [95 %]      side   controls p90');
for (const r of rows.slice(1).sort((a, b) => col(a, 'take').localeCompare(col(b, 'take')))) {
  const side = col(r, 'coupling.side_right') === '' ? '–' : col(r, 'coupling.side_right') === '1' ? 'right' : 'left';
  console.log(
    `${col(r, 'take').padEnd(22)} ${num(col(r, 'forecast.mpjpe_1s_mm'), 1).padStart(6)} (${num(col(r, 'forecast.stride_mean_1s_mm'), 1)})`.padEnd(54) +
      `${num(col(r, 'forecast.irregular_steps'), 0).padStart(5)}      ${num(col(r, 'coupling.asymmetry_score'), 2).padStart(5)} [${num(col(r, 'coupling.asymmetry_ci_low'), 2)} to ${num(col(r, 'coupling.asymmetry_ci_high'), 2)}]`.padEnd(42) +
      `${side.padEnd(6)} ${num(col(r, 'coupling.control_p90'), 2)}`,
  );
}
console.log(`\ncohort report: ${batch.report.html}`);
console.log(`cohort table:  ${batch.report.csv}`);
console.log(`gait reports:  ${outDir}/*.gait.html (bands from the synthetic reference, not clinical)`);
console.log('\nCaution: a research and quality aid, not a diagnostic device; results are reviewed by a qualified clinician.');

/** Returns the rows of a CSV text (RFC 4180 quoting: "" inside quoted fields). */
function parseCsv(text) {
  const rows = [];
  let row = [], field = '', quoted = false;
  for (let i = 0; i < text.length; i++) {
    const ch = text[i];
    if (quoted) {
      if (ch === '"' && text[i + 1] === '"') { field += '"'; i++; }
      else if (ch === '"') quoted = false;
      else field += ch;
    } else if (ch === '"') quoted = true;
    else if (ch === ',') { row.push(field); field = ''; }
    else if (ch === '\n' || ch === '\r') {
      if (ch === '\r' && text[i + 1] === '\n') i++;
      row.push(field); rows.push(row); row = []; field = '';
    } else field += ch;
  }
  if (field !== '' || row.length) { row.push(field); rows.push(row); }
  return rows;
}
