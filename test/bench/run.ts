// `npm run bench`: builds a long synthetic take and runs each benchmark section on it, printing a
// table with target ratios (PASS/MISS), or JSON with --json. --quick uses a 1-minute take instead of 10.
// Sections live in their own modules under test/bench/ and return a Section; add new ones to SECTIONS.
import { rmSync } from 'node:fs';
import { dirname } from 'node:path';
import { buildBenchInput, type BenchInput } from './take-source.js';
import { runParseFk } from './parse-fk.js';
import { formatSections, type Section } from './report.js';

interface RunOptions {
  json: boolean;
  quick: boolean;
}

type SectionRunner = (input: BenchInput, options: RunOptions) => Section | Promise<Section>;

const SECTIONS: SectionRunner[] = [
  (input, o) => runParseFk({ input, reps: o.quick ? 9 : 7, threeReps: o.quick ? 5 : 3, memoryReps: 3 }),
  async (_input, o) => (await import('./train-step.js')).runTrainStep({ reps: o.quick ? 3 : 5, cpuReps: o.quick ? 1 : 2 }),
  async (input) => (await import('./viewer.js')).runViewer({ input }),
  async (_input, o) => (await import('./model-step.js')).runModelStep({ reps: o.quick ? 3 : 5 }),
  async (_input, o) => (await import('./batch.js')).runBatchBench({ reps: o.quick ? 1 : 3, cohort: o.quick ? 10 : 100 }),
  async () => (await import('./fit.js')).runFitBench(),
];

function parseArgs(argv: string[]): RunOptions {
  const known = new Set(['--json', '--quick']);
  for (const a of argv) if (!known.has(a)) throw new Error(`unknown option ${a} (use --json, --quick)`);
  return { json: argv.includes('--json'), quick: argv.includes('--quick') };
}

async function main(): Promise<void> {
  const options = parseArgs(process.argv.slice(2));
  const seconds = options.quick ? 60 : 600;
  const input = await buildBenchInput(seconds);
  try {
    const sections: Section[] = [];
    for (const run of SECTIONS) sections.push(await run(input, options));
    const meta = {
      take: `${seconds / 60} min at 120 Hz`,
      source: input.source,
      node: process.version,
      platform: `${process.platform} ${process.arch}`,
    };
    if (options.json) {
      process.stdout.write(JSON.stringify({ ...meta, sections }, null, 2) + '\n');
    } else {
      process.stdout.write(`jointloom benchmark: ${meta.take}, ${meta.node} ${meta.platform}\ninput: ${meta.source}\n`);
      process.stdout.write(formatSections(sections) + '\n');
    }
  } finally {
    rmSync(dirname(input.path), { recursive: true, force: true });
  }
}

main().catch((e: Error) => {
  process.stderr.write(`bench: ${e.message}\n`);
  process.exitCode = 1;
});
