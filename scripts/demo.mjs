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
console.log('take                     frames    Hz  units  up  roles  warnings');
for (const t of takes) {
  const j = JSON.parse(jointloom(['inspect', join(takesDir, t), '--json']));
  const found = Object.values(j.roles).filter((v) => v !== null).length;
  console.log(`${t.padEnd(24)} ${String(j.frames).padStart(6)} ${String(j.fps).padStart(5)}  ${j.units.padEnd(5)}  ${j.up.padEnd(2)}  ${String(found).padStart(2)}/19  ${j.warnings.length}`);
}

const first = join(takesDir, takes[0]);
const csv = join(outDir, 'positions.csv');
jointloom(['export', first, '--frames', '0-99', '--metres', '--format', 'csv', '-o', csv]);
console.log(`\njoint positions of the first 100 frames of ${takes[0]} in metres: ${csv}`);
const synth = join(outDir, 'synthetic-walk.bvh');
console.log(jointloom(['synth', '--seed', '42', '--duration', '20', '--out', synth, '--truth', join(outDir, 'synthetic-walk.truth.json')]).trim());
console.log('\nCaution: a research and quality aid, not a diagnostic device; results are reviewed by a qualified clinician.');
