// The main job on the fictional clinic's demo takes, through the built CLI exactly as a user runs it.
// Run by `npm run demo` after `npm run build`. Writes everything under out/demo/.
import { spawnSync } from 'node:child_process';
import { mkdirSync, readdirSync } from 'node:fs';
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
console.log('take                   units up  cadence speed  stance L/R   knee peak L/R  largest asymmetry');
const fx = (v, d) => (v === null || v === undefined ? '–' : v.toFixed(d));
for (const t of takes) {
  const path = join(takesDir, t);
  const info = JSON.parse(jointloom(['inspect', path, '--json']));
  const html = join(outDir, t.replace(/\.bvh$/, '.gait.html'));
  const g = JSON.parse(jointloom(['gait', path, '--json', '--html', html]));
  const flag = g.asymmetry_flags[0]?.text ?? 'none beyond |SI| 10 %';
  console.log(
    `${t.padEnd(22)} ${info.units.padEnd(5)} ${info.up.padEnd(2)}  ${fx(g.cadence_steps_per_min, 1).padStart(6)}  ${fx(g.speed_m_per_s, 2)}  ` +
      `${fx(g.stance_pct.left, 1)}/${fx(g.stance_pct.right, 1)}    ${fx(g.knee_flexion_peak_swing_deg.left, 1)}/${fx(g.knee_flexion_peak_swing_deg.right, 1)}    ${flag}`,
  );
}
console.log(`\ngait reports (HTML, one per take): ${outDir}/*.gait.html`);

const first = join(takesDir, takes[0]);
const csv = join(outDir, 'positions.csv');
jointloom(['export', first, '--frames', '0-99', '--metres', '--format', 'csv', '-o', csv]);
console.log(`joint positions of the first 100 frames of ${takes[0]} in metres: ${csv}`);
const synth = join(outDir, 'synthetic-walk.bvh');
console.log(jointloom(['synth', '--seed', '42', '--duration', '20', '--out', synth, '--truth', join(outDir, 'synthetic-walk.truth.json')]).trim());
console.log('\nCaution: a research and quality aid, not a diagnostic device; results are reviewed by a qualified clinician.');
