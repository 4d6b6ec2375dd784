// The model file: versioned JSON holding the format tag, the schema version, the node (role) set, the
// normalisation statistics, the configuration, the training summary, the parameter layout and the
// weights as base64 little-endian Float32 with their SHA-256. Loading rebuilds the model from its own
// configuration and refuses, with an InputError naming the file and the problem, anything that is not
// exactly such a file: unreadable or truncated JSON, another format or version, a node set or layout
// that does not match, a wrong weight count or a checksum mismatch.
import { createHash } from 'node:crypto';
import { readFileSync } from 'node:fs';
import { InputError } from '../errors/index.js';
import { statsFromJson, statsToJson, type MotionStatsJson } from '../motion/normalise.js';
import { writeFileAtomic } from '../util/atomic.js';
import { resolveModelConfig, type ModelConfig } from './config.js';
import { createModel, type CouplingModel } from './model.js';
import { READOUT_BACKCAST, READOUT_BACKCAST_STEPS, READOUT_LAGS, readoutFeaturesPerNode, readoutKnots, readoutPriorSteps, type PairReadout } from './readout.js';
import type { SpreadAdapt } from './spread.js';
import type { TrainingSummary } from './train.js';

/** Format tag and schema version of model files. */
export const MODEL_FORMAT = 'jointloom-coupling-model';
export const MODEL_VERSION = 1;

/** The JSON form of a model file. */
export interface ModelFileJson {
  format: typeof MODEL_FORMAT;
  version: typeof MODEL_VERSION;
  nodes: string[];
  config: ModelConfig;
  stats: MotionStatsJson;
  spreadScale: number;
  /** How the noise SD follows each window's backcast error (absent in files written before it: a fixed spread). */
  spreadAdapt?: SpreadAdapt | null;
  /** The pair readout (absent in files written before it, or before it was fitted: no correction). */
  readout?: ReadoutJson | null;
  training: TrainingSummary | null;
  /** Extra data other layers store with the model (e.g. normative factor statistics); plain JSON. */
  extras: Record<string, unknown>;
  layout: { name: string; shape: number[] }[];
  weights: Float32Block;
}

/** Values stored as base64 little-endian Float32 with their SHA-256. */
export interface Float32Block { dtype: 'float32'; count: number; sha256: string; base64: string }

/** The JSON form of a pair readout: its layout, then feature means, feature SDs, target means and weights as one Float32 block. */
export interface ReadoutJson {
  senders: PairReadout['senders'];
  lambda: number;
  knots: number[];
  priorSteps: number[];
  lags: number[];
  backcast: number;
  backcastSteps: number[];
  values: Float32Block;
  /** The jitter switch: the measured capture jitter above which the robust readout (same layout and senders) corrects a window. */
  jitter?: { threshold: number; readout: ReadoutJson } | null;
}

/** Returns the number of weights of a readout of `senders` under a configuration. */
function readoutWeightCount(c: ModelConfig, senders: PairReadout['senders']): number {
  const per = readoutFeaturesPerNode(c), out = readoutKnots(c).length * 3;
  return senders === 'all' ? c.nodes * per * c.nodes * out : c.nodes * per * out;
}

/** Returns values as a base64 little-endian Float32 block with its SHA-256 (the weights and the readout values). */
function float32Block(values: ArrayLike<number>): Float32Block {
  const f32 = Float32Array.from(values);
  const bytes = Buffer.from(f32.buffer, f32.byteOffset, f32.byteLength);
  if (!littleEndian()) swap32(bytes);
  return { dtype: 'float32', count: f32.length, sha256: createHash('sha256').update(bytes).digest('hex'), base64: bytes.toString('base64') };
}

/** Returns the values of a Float32 block of `count` values checked by length, checksum and finiteness; `bad` throws, naming `what` (plural) and `one`. */
function readFloat32Block(b: Float32Block, count: number, what: string, one: string, bad: (why: string) => never): Float32Array {
  const bytes = Buffer.from(b.base64, 'base64');
  if (bytes.length !== count * 4) bad(`the ${what} hold ${bytes.length} bytes, ${count * 4} expected (truncated?)`);
  if (createHash('sha256').update(bytes).digest('hex') !== b.sha256) bad(`the ${what} do not match their SHA-256 checksum (the file is corrupt)`);
  if (!littleEndian()) swap32(bytes);
  const f32 = new Float32Array(bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.length));
  for (let i = 0; i < f32.length; i++) if (!Number.isFinite(f32[i]!)) bad(`${one} ${i} is not a finite number`);
  return f32;
}

function readoutToJson(r: PairReadout): ReadoutJson {
  const all = new Float64Array(r.featureMean.length * 2 + r.targetMean.length + r.weights.length);
  all.set(r.featureMean, 0);
  all.set(r.featureSd, r.featureMean.length);
  all.set(r.targetMean, 2 * r.featureMean.length);
  all.set(r.weights, 2 * r.featureMean.length + r.targetMean.length);
  return {
    senders: r.senders, lambda: r.lambda, knots: [...r.knots], priorSteps: [...r.priorSteps], lags: [...READOUT_LAGS],
    backcast: READOUT_BACKCAST, backcastSteps: [...READOUT_BACKCAST_STEPS], values: float32Block(all),
    ...(r.jitter ? { jitter: { threshold: r.jitter.threshold, readout: readoutToJson({ ...r.jitter.robust, jitter: null }) } } : {}),
  };
}

/** Returns the readout of its JSON form, checked against the model's configuration; `bad` throws. */
function readoutFromJson(v: unknown, c: ModelConfig, bad: (why: string) => never): PairReadout {
  if (typeof v !== 'object' || v === null) return bad('the readout block is malformed');
  const r = v as Partial<ReadoutJson>;
  if (r.senders !== 'all' && r.senders !== 'self') bad(`the readout's senders are ${JSON.stringify(r.senders)}, expected "all" or "self"`);
  const same = (a: unknown, b: readonly number[]) => Array.isArray(a) && a.length === b.length && a.every((x, i) => x === b[i]);
  if (!same(r.knots, readoutKnots(c)) || !same(r.priorSteps, readoutPriorSteps(c)) || !same(r.lags, READOUT_LAGS) || r.backcast !== READOUT_BACKCAST || !same(r.backcastSteps, READOUT_BACKCAST_STEPS))
    bad('its readout layout (knots, prior steps, lags, backcast) is not the one this build computes; refit the model');
  if (typeof r.lambda !== 'number' || !(r.lambda >= 0)) bad('the readout lambda must be a number ≥ 0');
  const d = c.nodes * readoutFeaturesPerNode(c), m = c.nodes * readoutKnots(c).length * 3, w = readoutWeightCount(c, r.senders!);
  const b = r.values;
  if (!b || b.dtype !== 'float32' || typeof b.base64 !== 'string' || typeof b.sha256 !== 'string' || b.count !== 2 * d + m + w)
    bad(`the readout values block is missing or malformed (${2 * d + m + w} values expected)`);
  const f = Float64Array.from(readFloat32Block(b!, b!.count, 'readout values', 'readout value', bad));
  const featureSd = f.slice(d, 2 * d);
  if (featureSd.some((x) => !(x > 0))) bad('a readout feature SD is not positive');
  const out: PairReadout = { senders: r.senders!, lambda: r.lambda!, knots: readoutKnots(c), priorSteps: readoutPriorSteps(c), featureMean: f.slice(0, d), featureSd, targetMean: f.slice(2 * d, 2 * d + m), weights: f.slice(2 * d + m), jitter: null };
  if (r.jitter !== undefined && r.jitter !== null) {
    const j = r.jitter;
    if (typeof j !== 'object' || typeof j.threshold !== 'number' || !(j.threshold >= 0) || !Number.isFinite(j.threshold)) bad('the readout jitter switch needs a finite threshold ≥ 0');
    if (typeof j.readout !== 'object' || j.readout === null || (j.readout as Partial<ReadoutJson>).jitter) bad('the readout jitter switch holds no plain robust readout');
    const robust = readoutFromJson(j.readout, c, (why) => bad(`robust readout: ${why}`));
    if (robust.senders !== out.senders) bad('the robust readout reads other senders than the readout');
    out.jitter = { threshold: j.threshold, robust };
  }
  return out;
}

/** Returns the model as a model-file JSON value. */
export function modelToJson(model: CouplingModel, training: TrainingSummary | null = null, extras: Record<string, unknown> = {}): ModelFileJson {
  return {
    format: MODEL_FORMAT, version: MODEL_VERSION, nodes: [...model.stats.nodes], config: { ...model.config },
    stats: statsToJson(model.stats), spreadScale: model.spreadScale, spreadAdapt: model.spreadAdapt,
    ...(model.readout ? { readout: readoutToJson(model.readout) } : {}), training, extras,
    layout: model.store.params.map((p) => ({ name: p.name, shape: [...p.shape] })),
    weights: float32Block(model.store.valueView()),
  };
}

/** Writes the model file atomically and returns its path. */
export function saveModel(path: string, model: CouplingModel, training: TrainingSummary | null = null, extras: Record<string, unknown> = {}): string {
  return writeFileAtomic(path, JSON.stringify(modelToJson(model, training, extras)) + '\n');
}

/** A loaded model with what was stored beside it. */
export interface LoadedModel {
  model: CouplingModel;
  training: TrainingSummary | null;
  extras: Record<string, unknown>;
}

/** Returns the model read from `path`; throws InputError naming the file and the problem when it cannot be used. */
export function loadModel(path: string): LoadedModel {
  let text: string;
  try {
    text = readFileSync(path, 'utf8');
  } catch (e) {
    throw new InputError(`${path}: cannot read the model file (${(e as NodeJS.ErrnoException).code ?? (e as Error).message}).`);
  }
  let value: unknown;
  try {
    value = JSON.parse(text);
  } catch {
    throw new InputError(`${path}: the model file is not valid JSON (corrupt or truncated).`);
  }
  return modelFromJson(value, path);
}

/** Returns the model of a parsed model-file value; `source` names it in errors. */
export function modelFromJson(value: unknown, source: string): LoadedModel {
  const bad = (why: string): never => {
    throw new InputError(`${source}: not a usable jointloom model file: ${why}.`);
  };
  if (typeof value !== 'object' || value === null || Array.isArray(value)) return bad('expected a JSON object');
  const v = value as Partial<ModelFileJson>;
  if (v.format !== MODEL_FORMAT) bad(`format is ${JSON.stringify(v.format)}, expected "${MODEL_FORMAT}"`);
  if (v.version !== MODEL_VERSION) bad(`schema version ${JSON.stringify(v.version)} is not supported (this build reads version ${MODEL_VERSION})`);
  let config: ModelConfig;
  try {
    // A stored configuration without a signature weight was trained without the signature term.
    config = resolveModelConfig({ signatureWeight: 0, ...(v.config as Partial<ModelConfig>) });
  } catch (e) {
    return bad(`its configuration is invalid (${(e as Error).message})`);
  }
  if (typeof v.config !== 'object' || v.config === null) bad('the configuration is missing');
  const stats = statsFromJson(v.stats, source);
  if (!Array.isArray(v.nodes) || v.nodes.length !== config.nodes || v.nodes.some((n, i) => n !== stats.nodes[i]))
    bad(`its node set (${JSON.stringify(v.nodes)}) does not match its configuration and statistics`);
  const w = v.weights;
  if (!w || typeof w !== 'object' || w.dtype !== 'float32' || typeof w.base64 !== 'string' || typeof w.sha256 !== 'string' || typeof w.count !== 'number')
    return bad('the weights block is missing or malformed');
  const model = createModel(config, stats, { seed: 1 });
  const size = model.store.size;
  const layout = model.store.params.map((p) => `${p.name}[${p.shape.join('x')}]`);
  if (!Array.isArray(v.layout) || v.layout.length !== layout.length || v.layout.some((p, i) => `${p?.name}[${Array.isArray(p?.shape) ? p.shape.join('x') : ''}]` !== layout[i]))
    bad('its parameter layout does not match the layout of its configuration');
  if (w.count !== size) bad(`it holds ${w.count} weights, its configuration needs ${size}`);
  model.store.valueView().set(readFloat32Block(w, size, 'weights', 'weight', bad) as never);
  const spread = v.spreadScale;
  if (typeof spread !== 'number' || !(spread > 0) || !Number.isFinite(spread)) bad('spreadScale must be a finite positive number');
  model.spreadScale = spread!;
  const adapt = v.spreadAdapt;
  if (adapt !== undefined && adapt !== null) {
    if (typeof adapt !== 'object' || typeof adapt.exponent !== 'number' || typeof adapt.reference !== 'number' || !(adapt.exponent >= 0 && adapt.exponent <= 4) || !(adapt.reference > 0) || !Number.isFinite(adapt.reference))
      bad('spreadAdapt must hold an exponent in 0..4 and a finite positive reference');
    model.spreadAdapt = { exponent: adapt.exponent, reference: adapt.reference };
  }
  if (v.readout !== undefined && v.readout !== null) model.readout = readoutFromJson(v.readout, config, bad);
  const extras = typeof v.extras === 'object' && v.extras !== null ? v.extras : {};
  return { model, training: (v.training ?? null) as TrainingSummary | null, extras };
}

function littleEndian(): boolean {
  return new Uint8Array(new Uint32Array([1]).buffer)[0] === 1;
}

function swap32(b: Buffer): void {
  b.swap32();
}
