// `jointloom forecast <take>`: the next second of motion from a chosen time, scored against the
// recorded future (model, no-coupling twin, every baseline), or a surprise timeline with --every.
import type { Command } from 'commander';
import { existsSync } from 'node:fs';
import { UsageError } from '../errors/index.js';
import { trackFromImported, type Track } from '../motion/track.js';
import { createEvaluator, episodeSpan, flagSurprises, forecastAt, irregularEpisodes, type ForecastPoint, type MethodName } from '../model/evaluate.js';
import { HORIZONS_S } from '../model/metrics.js';
import { defaultModelPath } from '../model/default-model.js';
import { loadModel } from '../model/modelfile.js';
import { twinOf } from '../model/pair-fit.js';
import { domainCheckJson, domainWarning, modelDomainCheck } from '../model/domain.js';
import { importTake } from '../skeleton/import.js';
import { writeFileAtomic } from '../util/atomic.js';
import { emit, newCommand, numberOption } from './program.js';
import { progressBar } from './progress.js';
import { importOptionsFrom, withImportOptions, type ImportFlags } from './import-options.js';

export { defaultModelPath };

interface ForecastFlags extends ImportFlags {
  model?: string;
  at?: number;
  every?: number;
  samples: number;
  json?: boolean;
  csv?: string;
  quiet?: boolean;
}

const METHODS: MethodName[] = ['model', 'no_coupling', 'stride_mean', 'last_stride', 'constant_velocity', 'zero_motion'];
const r1 = (v: number) => Math.round(v * 10) / 10;

/** Returns the JSON form of one forecast point. */
function pointJson(p: ForecastPoint, track: Track, withPredicted: boolean): Record<string, unknown> {
  const mpjpe: Record<string, Record<string, number> | null> = {};
  for (const m of METHODS) {
    const e = p.mpjpe_mm?.[m];
    mpjpe[m] = e ? Object.fromEntries(HORIZONS_S.map((h, i) => [String(h === 1 ? '1.0' : h), r1(e[i]!)])) : null;
  }
  const out: Record<string, unknown> = {
    time_s: Math.round(p.time_s * 1000) / 1000,
    horizons_s: [...HORIZONS_S],
    mpjpe_mm: mpjpe,
    coverage_90: p.coverage_90 === null ? null : Math.round(p.coverage_90 * 1000) / 1000,
    surprise: p.surprise === null ? null : Math.round(p.surprise * 1000) / 1000,
    readout: p.result.readout,
    capture_jitter_mll: p.result.captureJitter === null ? null : r1(1000 * p.result.captureJitter),
  };
  if (withPredicted) {
    const r = p.result, N = r.nodeCount;
    const step = (buf: Float64Array, o: number) => Array.from({ length: N }, (_, n) => [0, 1, 2].map((a) => Math.round(buf[o + n * 3 + a]! * 1e5) / 1e5));
    out.predicted = {
      frame: 'canonical: metres, right-handed, Z up',
      nodes: [...track.nodes],
      rate: track.rate,
      mean: Array.from({ length: r.steps }, (_, k) => step(r.mean, k * N * 3)),
      samples: Array.from({ length: r.sampleCount }, (_, s) => Array.from({ length: r.steps }, (_, k) => step(r.samples, (s * r.steps + k) * N * 3))),
    };
  }
  return out;
}

/** Returns the CSV of the predicted positions: mean and every sample, one row per step and node. */
function predictedCsv(p: ForecastPoint, track: Track): string {
  const r = p.result, N = r.nodeCount;
  const rows = ['series,step,time_s,node,x_m,y_m,z_m'];
  const put = (label: string, buf: Float64Array, base: number) => {
    for (let k = 0; k < r.steps; k++)
      for (let n = 0; n < N; n++) {
        const o = base + (k * N + n) * 3;
        rows.push(`${label},${k + 1},${(p.time_s + (k + 1) / track.rate).toFixed(4)},${track.nodes[n]},${buf[o]!.toFixed(5)},${buf[o + 1]!.toFixed(5)},${buf[o + 2]!.toFixed(5)}`);
      }
  };
  put('mean', r.mean, 0);
  for (let s = 0; s < r.sampleCount; s++) put(`sample${s + 1}`, r.samples, s * r.steps * N * 3);
  return rows.join('\n') + '\n';
}

/** Registers `forecast` on the program. */
export function register(program: Command): void {
  const cmd = newCommand('forecast')
    .description('forecast the next second of motion from a time in the take with a spread of samples; where the take holds the recorded future, score it against the no-coupling twin and the baselines')
    .argument('<take>', 'BVH file')
    .option('--model <file>', 'model file from `jointloom fit` (default: the model shipped with jointloom)')
    .option('--at <seconds>', 'time of the last observed frame (default: the middle of the take)', numberOption(0, 1e7))
    .option('--every <seconds>', 'forecast every so many seconds: a surprise timeline that flags irregular steps', numberOption(0.05, 1e4))
    .option('--samples <n>', 'forecast samples', numberOption(2, 1000, true), 20)
    .option('--json', 'machine-readable output')
    .option('--csv <file>', 'write the predicted positions (mean and samples) as CSV; with --every, the surprise timeline')
    .option('--quiet', 'no progress bar (with --every)');
  withImportOptions(cmd).action((path: string, flags: ForecastFlags) => {
    if (flags.at !== undefined && flags.every !== undefined) throw new UsageError('--at and --every exclude each other.');
    const modelPath = flags.model ?? defaultModelPath();
    if (!flags.model && !existsSync(modelPath)) throw new UsageError(`no default model at ${modelPath}; train one with \`jointloom fit\` and pass --model.`);
    const loaded = loadModel(modelPath);
    const noCoupling = twinOf(loaded, modelPath);
    const model = loaded.model;
    const track = trackFromImported(importTake(path, importOptionsFrom(flags)), { rate: model.config.rate });
    const c = model.config;
    if (track.steps < c.observe + 1) throw new UsageError(`${path}: the take is ${(track.steps / track.rate).toFixed(2)} s long; a forecast needs at least ${((c.observe + 1) / track.rate).toFixed(2)} s observed.`);
    const ev = createEvaluator({ model, noCoupling }, flags.samples);
    const domain = modelDomainCheck(c, track);
    if (!domain.inside && !flags.json) process.stderr.write(`jointloom: warning: ${path}: ${domainWarning(domain, 'its forecast')}\n`);
    const domainJson = domainCheckJson(domain);
    if (flags.every !== undefined) {
      const step = Math.max(1, Math.round(flags.every * track.rate));
      const points: ForecastPoint[] = [];
      const ends: number[] = [];
      for (let e = c.observe; e + c.forecast < track.steps; e += step) ends.push(e);
      const bar = progressBar('forecast', Boolean(flags.quiet || flags.json));
      try {
        for (const e of ends) {
          points.push(forecastAt(track, e, ev));
          bar.update(points.length, ends.length, `${(e / track.rate).toFixed(1)} s`);
        }
      } finally { bar.stop(); }
      const flagsOut = flagSurprises(points.map((p) => p.surprise));
      const timeline = points.map((p, i) => ({ time_s: Math.round(p.time_s * 1000) / 1000, surprise: p.surprise === null ? null : Math.round(p.surprise * 1000) / 1000, mpjpe_1s_mm: p.mpjpe_mm ? r1(p.mpjpe_mm.model[2]!) : null, irregular: flagsOut[i], readout: p.result.readout }));
      const irregular = timeline.filter((t) => t.irregular).map((t) => t.time_s);
      const episodes = irregularEpisodes(timeline);
      if (flags.csv) writeFileAtomic(flags.csv, ['time_s,surprise,mpjpe_1s_mm,irregular', ...timeline.map((t) => `${t.time_s},${t.surprise ?? ''},${t.mpjpe_1s_mm ?? ''},${t.irregular ? 1 : 0}`)].join('\n') + '\n');
      if (flags.json) emit(JSON.stringify({ file: path, model: modelPath, every_s: flags.every, timeline, irregular_s: irregular, episodes, domain: domainJson }));
      else {
        const lines = [`${path}: ${points.length} forecasts every ${flags.every} s with ${modelPath}`, '  time s   surprise   1-s error mm   '];
        for (const t of timeline) lines.push(`  ${t.time_s.toFixed(2).padStart(6)}   ${(t.surprise ?? NaN).toFixed(2).padStart(8)}   ${String(t.mpjpe_1s_mm ?? '-').padStart(12)}   ${t.irregular ? 'irregular' : ''}`);
        const robust = timeline.filter((t) => t.readout === 'jitter-robust').length;
        if (robust) lines.push(`  noisy capture: the jitter-robust pair readout corrected ${robust} of ${timeline.length} forecasts`);
        lines.push(episodes.length ? `  irregular motion to review near ${episodes.map((e) => episodeSpan(e, 2)).join(', ')}` : '  no irregular step found');
        emit(lines.join('\n'));
      }
      return;
    }
    const at = flags.at ?? (track.steps / track.rate) / 2;
    const end = Math.round(at * track.rate);
    if (end < c.observe || end >= track.steps) throw new UsageError(`${path}: --at ${at} s is outside ${(c.observe / track.rate).toFixed(2)} to ${((track.steps - 1) / track.rate).toFixed(2)} s (2 s must be observed before it).`);
    const p = forecastAt(track, end, ev);
    if (flags.csv) writeFileAtomic(flags.csv, predictedCsv(p, track));
    if (flags.json) emit(JSON.stringify({ file: path, model: modelPath, ...pointJson(p, track, true), domain: domainJson }));
    else {
      const lines = [`${path}: forecast of 1 s from ${p.time_s.toFixed(2)} s with ${p.result.sampleCount} samples (${modelPath})`];
      if (!p.mpjpe_mm) lines.push('  the take ends before the forecast second, so there is nothing to score it against');
      else {
        lines.push(`  mean per-joint position error, mm   ${HORIZONS_S.map((h) => `${h.toFixed(2)} s`.padStart(8)).join('')}`);
        for (const m of METHODS) {
          const e = p.mpjpe_mm[m];
          if (e) lines.push(`  ${m.replace(/_/g, ' ').padEnd(35)}${e.map((v) => v.toFixed(1).padStart(8)).join('')}`);
        }
        lines.push(`  90 % band covers ${(100 * p.coverage_90!).toFixed(1)} % of the recorded future positions`);
      }
      if (p.result.readout === 'jitter-robust') lines.push(`  noisy capture: frame-to-frame jitter ${(1000 * p.result.captureJitter!).toFixed(1)} milli-leg-lengths, so the jitter-robust pair readout corrected this forecast`);
      emit(lines.join('\n'));
    }
  });
  program.addCommand(cmd);
}
