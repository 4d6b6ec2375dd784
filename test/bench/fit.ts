// Bench section: `jointloom fit` on one synthesized 30-s take from scratch (a fictional walker, 120 Hz),
// the built CLI as a child process, wall time from start to the model file written: import, the gait
// phase for restricted labeling, the model, its retrained no-coupling twin, their pair readouts and the
// spread calibration.
// With one subject the take's last quarter is held out in time for early stopping (src/model/split.ts).
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { loadModel } from '../../src/model/modelfile.js';
import { synthesizeTake } from '../../src/synth/index.js';
import { buildCli, builtCli, repo } from './built-cli.js';
import { ratio, type Section } from './report.js';

interface Pair { before: number; after: number }
interface FitSummary {
  epochs_run: number; best_epoch: number; steps: number; ms_per_step: number; twin: { best_epoch: number } | null;
  readout: { model: { kept: boolean; dropped: string | null; valid_knot_error_clean: Pair | null; valid_knot_error_jittered: Pair | null } | null };
}

/** Returns the row on the model's pair readout: the held-out knot error after it, or why none was kept. */
function readoutRow(r: FitSummary['readout']['model']): Section['rows'][number] {
  if (!r?.kept) return { name: 'pair readout', value: NaN, unit: '', note: `none kept${r?.dropped ? `: ${r.dropped}` : ''}` };
  const m = (x: number | undefined) => (1000 * (x ?? NaN)).toFixed(1);
  return { name: 'pair readout, held-out knot error', value: 1000 * (r.valid_knot_error_clean?.after ?? NaN), unit: 'mLL', note: `milli-leg-lengths; ${m(r.valid_knot_error_clean?.before)} before it; jittered copies ${m(r.valid_knot_error_jittered?.before)} -> ${m(r.valid_knot_error_jittered?.after)}` };
}

/** Returns the single-take fit section (one run: a fit is long, and its time is the figure itself). */
export function runFitBench(): Section {
  buildCli();
  const dir = mkdtempSync(join(tmpdir(), 'jointloom-bench-fit-'));
  try {
    const take = join(dir, 'F001-1-walk.bvh'), out = join(dir, 'model.json');
    writeFileSync(take, synthesizeTake({ seed: 4242, duration: 30 }).bvhText);
    const t0 = performance.now();
    const r = spawnSync(process.execPath, [builtCli, 'fit', take, '-o', out, '--json', '--quiet'], { cwd: repo, encoding: 'utf8' });
    const seconds = (performance.now() - t0) / 1000;
    if (r.status !== 0) throw new Error(`fit exited ${r.status}: ${r.stderr.trim()}`);
    const s = JSON.parse(r.stdout) as FitSummary;
    const mm = loadModel(out).training?.validForecastMm ?? [];
    const best = mm[s.best_epoch + 1];
    return {
      title: 'fitting one 30-s take from scratch (jointloom fit, 2 threads)',
      rows: [
        { name: 'fit, wall time', value: seconds, unit: 's', note: 'model, no-coupling twin, pair readouts and spread calibration; one run' },
        { name: 'model epochs run', value: s.epochs_run, unit: '', note: `best ${s.best_epoch + 1}; ${s.steps} steps of 16 windows` },
        { name: 'ms per step', value: s.ms_per_step, unit: 'ms' },
        { name: 'held-out error, untrained', value: mm[0] ?? NaN, unit: 'mm', note: 'the stride prior alone; the take\'s last quarter, mean over the forecast second' },
        { name: 'held-out error, best epoch', value: best ?? NaN, unit: 'mm' },
        readoutRow(s.readout.model),
      ],
      ratios: [ratio('fit one 30-s take from scratch (s)', seconds, '<=', 90, 'issue target')],
      notes: ['the built CLI (dist/); fitting the default cohort (npm run train:default) reports its own time'],
    };
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}
