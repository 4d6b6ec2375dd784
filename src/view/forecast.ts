// The viewer's forecast endpoint: the coupling model's forecast from a chosen time of the take, turned
// to the display frame, scored where the take holds the recorded future. The track is built once at
// start; the last few answers are kept.
import { basename } from 'node:path';
import type { LoadedModel } from '../model/modelfile.js';
import { createEvaluator, forecastAt, type Evaluator } from '../model/evaluate.js';
import { HORIZONS_S } from '../model/metrics.js';
import { nodeSources } from '../motion/roles.js';
import { trackFromImported, type Track } from '../motion/track.js';
import type { ImportedTake } from '../skeleton/import.js';
import { viewFactors } from './factors.js';
import type { ViewForecast, ViewForecastInfo } from './types.js';

/** Default and largest number of samples a forecast request may ask for. */
export const FORECAST_SAMPLES_DEFAULT = 8;
export const FORECAST_SAMPLES_MAX = 32;
/** Answers kept (most recent first out last). */
const CACHE_SIZE = 8;

/** Bones of the 17 model nodes, by role name: pelvis-hips, the leg chains, the arm chains, the trunk. */
const BONE_NAMES: readonly [string, string][] = [
  ['pelvis', 'thorax'], ['thorax', 'head'],
  ...(['l_', 'r_'] as const).flatMap((s): [string, string][] => [
    ['pelvis', `${s}hip`], [`${s}hip`, `${s}knee`], [`${s}knee`, `${s}ankle`], [`${s}ankle`, `${s}toe`],
    ['thorax', `${s}shoulder`], [`${s}shoulder`, `${s}elbow`], [`${s}elbow`, `${s}wrist`],
  ]),
];

/** A refused request: the status and a message for the JSON error body. */
export interface ForecastRefusal {
  status: 400;
  error: string;
}

/** Returns node index pairs of the bones among `nodes` (pairs with a missing node are left out). */
export function forecastBones(nodes: readonly string[]): [number, number][] {
  const out: [number, number][] = [];
  for (const [a, b] of BONE_NAMES) {
    const i = nodes.indexOf(a), j = nodes.indexOf(b);
    if (i >= 0 && j >= 0) out.push([i, j]);
  }
  return out;
}

/** Writes canonical (Z up) positions as display-frame (x, z, −y) numbers rounded to 0.1 mm; returns out. */
export function canonicalToDisplay(src: Float64Array, offset: number, length: number, out: number[]): number[] {
  const r = (v: number) => Math.round(v * 1e4) / 1e4;
  for (let i = offset; i < offset + length; i += 3) out.push(r(src[i]!), r(src[i + 2]!), r(-src[i + 1]!));
  return out;
}

/** The forecasts one take can be asked for with one model. */
export class ForecastService {
  readonly track: Track;
  readonly info: ViewForecastInfo;
  private readonly evaluators = new Map<number, Evaluator>();
  private readonly cache = new Map<string, Buffer>();
  private readonly nodeJoints: [number, number][];
  private readonly bones: [number, number][];
  private factorBytes: Buffer | null = null;

  constructor(imported: ImportedTake, private readonly loaded: LoadedModel, modelPath: string) {
    const c = loaded.model.config;
    this.track = trackFromImported(imported, { rate: c.rate });
    const src = nodeSources(imported, this.track.nodes);
    this.nodeJoints = this.track.nodes.map((_, i) => [src.a[i]!, src.b[i]!]);
    this.bones = forecastBones(this.track.nodes);
    this.info = {
      model: basename(modelPath), rate: c.rate, observeS: c.observe / c.rate, horizonS: c.forecast / c.rate,
      firstS: c.observe / c.rate, lastS: (this.track.steps - 1) / c.rate, nodes: [...this.track.nodes], bones: this.bones,
    };
  }

  /** Returns the JSON bytes of the forecast for the query (t, samples), or why it is refused. */
  answer(query: URLSearchParams): Buffer | ForecastRefusal {
    const c = this.loaded.model.config;
    const tText = query.get('t');
    const t = tText === null || tText.trim() === '' ? NaN : Number(tText);
    if (!Number.isFinite(t)) return { status: 400, error: 't must be a time in seconds, e.g. /api/forecast?t=3.5' };
    const nText = query.get('samples');
    const samples = nText === null ? FORECAST_SAMPLES_DEFAULT : Number(nText);
    if (!Number.isInteger(samples) || samples < 2 || samples > FORECAST_SAMPLES_MAX)
      return { status: 400, error: `samples must be a whole number from 2 to ${FORECAST_SAMPLES_MAX}` };
    const end = Math.round(t * c.rate);
    if (end < c.observe || end >= this.track.steps)
      return { status: 400, error: `t = ${t} s is outside ${this.info.firstS.toFixed(2)} to ${this.info.lastS.toFixed(2)} s (${this.info.observeS} s must be observed before it)` };
    const key = `${end}:${samples}`;
    const hit = this.cache.get(key);
    if (hit) {
      this.cache.delete(key);
      this.cache.set(key, hit);
      return hit;
    }
    const bytes = Buffer.from(JSON.stringify(this.compute(end, samples)));
    this.cache.set(key, bytes);
    if (this.cache.size > CACHE_SIZE) this.cache.delete(this.cache.keys().next().value!);
    return bytes;
  }

  /** Returns the JSON bytes of the factor heat (computed on the first call). */
  factors(): Buffer {
    this.factorBytes ??= Buffer.from(JSON.stringify(viewFactors(this.track, this.loaded, this.nodeJoints)));
    return this.factorBytes;
  }

  /** Returns the forecast from track step `end` with `samples` samples, in the display frame. */
  compute(end: number, samples: number): ViewForecast {
    let ev = this.evaluators.get(samples);
    if (!ev) {
      if (this.evaluators.size >= 4) this.evaluators.clear();
      ev = createEvaluator({ model: this.loaded.model }, samples);
      this.evaluators.set(samples, ev);
    }
    const p = forecastAt(this.track, end, ev);
    const r = p.result, L = r.steps * r.nodeCount * 3;
    const sampleList: number[][] = [];
    for (let s = 0; s < r.sampleCount; s++) sampleList.push(canonicalToDisplay(r.samples, s * L, L, []));
    return {
      format: 'jointloom-view-forecast', version: 1,
      time_s: p.time_s, endStep: end, rate: this.track.rate, steps: r.steps,
      nodes: [...this.track.nodes], nodeJoints: this.nodeJoints, bones: this.bones,
      frame: 'display: metres, Y up, right-handed ((x, z, -y) of the canonical Z-up frame)',
      mean: canonicalToDisplay(r.mean, 0, L, []),
      samples: sampleList,
      scores: p.mpjpe_mm
        ? { horizons_s: [...HORIZONS_S], mpjpe_mm: p.mpjpe_mm as Record<string, number[]>, coverage_90: p.coverage_90, surprise: p.surprise }
        : null,
    };
  }
}
