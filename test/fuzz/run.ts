// Long mutation fuzz of the BVH parser: `npx tsx test/fuzz/run.ts [--cases N] [--seed N] [--file-every N] [--loose-columns]`.
// Case i uses seed (seed + i); a failing case replays alone with `--seed <its seed> --cases 1`.
// Exit status 1 when any case fails.
import { writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runFuzz } from './mutate.js';

/** Returns the value of `--name N` from argv, or the fallback. */
function intFlag(args: string[], name: string, fallback: number): number {
  const i = args.indexOf(name);
  if (i < 0) return fallback;
  const v = Number(args[i + 1]);
  if (!Number.isInteger(v) || v < 0) {
    process.stderr.write(`${name} wants a whole number, got ${args[i + 1] ?? 'nothing'}\n`);
    process.exit(2);
  }
  return v;
}

const args = process.argv.slice(2);
const cases = intFlag(args, '--cases', 100_000);
const seed = intFlag(args, '--seed', 1);
const fileEvery = intFlag(args, '--file-every', 50);
const strictColumns = !args.includes('--loose-columns');

const summary = runFuzz({
  cases,
  seed,
  fileEvery,
  strictColumns,
  progressEvery: 10_000,
  onProgress: (done) => process.stderr.write(`  ${done} cases…\n`),
});

const lines = [
  'BVH parser mutation fuzz',
  `  cases          ${summary.cases} (seeds ${seed} to ${seed + cases - 1})`,
  `  takes          ${summary.takes}`,
  `  parse errors   ${summary.errors}`,
  `  failures       ${summary.failures.length}`,
  `  file checks    ${summary.fileChecks} (readBvhFile compared with parseBvh every ${fileEvery || 'never'})`,
  `  slowest case   ${summary.slowest.ms.toFixed(2)} ms (seed ${summary.slowest.seed}: ${summary.slowest.recipe})`,
  `  total time     ${(summary.totalMs / 1000).toFixed(1)} s`,
];
for (const f of summary.failures.slice(0, 20)) {
  const path = join(tmpdir(), `jointloom-fuzz-${f.seed}.bvh`);
  if (f.input) writeFileSync(path, f.input);
  lines.push(`  FAIL seed ${f.seed} [${f.recipe}]: ${f.detail}`);
  lines.push(`       input saved to ${path}; replay: npx tsx test/fuzz/run.ts --seed ${f.seed} --cases 1`);
}
if (summary.failures.length > 20) lines.push(`  … and ${summary.failures.length - 20} more failures`);
process.stdout.write(lines.join('\n') + '\n');
process.exit(summary.failures.length ? 1 : 0);
