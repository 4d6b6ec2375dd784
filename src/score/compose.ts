// The one composition "take in, every result out": bytes of a BVH take and the options in, a score
// record out. Commands, batch workers and the viewer server all call scoreTake.
import { parseBvh } from '../bvh/parse.js';
import { readNormsFile, type NormsFile } from '../norms/format.js';
import { resolveImported } from '../skeleton/import.js';
import { sha256Hex } from './hash.js';
import { RECORD_FORMAT, RECORD_VERSION, type ModelRef, type ScoreRecord } from './record.js';
import { DEFAULT_STAGES, type ScoreStage, type StageContext } from './stages.js';

/** What scoring needs besides the take. */
export interface ScoreOptions {
  tool: string;
  toolVersion: string;
  lowpassHz: number | null;
  steadyOnly: boolean;
  /** Reference norms file, or null for no norm scores. */
  normsFile: string | null;
  normsSha256: string | null;
  model: ModelRef;
}

const r3 = (v: number | null | undefined) => (v === null || v === undefined || !Number.isFinite(v) ? null : Math.round(v * 1000) / 1000);

const normsCache = new Map<string, NormsFile>();

/** Returns the norms file at `path`, read once per process. */
export function cachedNorms(path: string): NormsFile {
  let n = normsCache.get(path);
  if (!n) { n = readNormsFile(path); normsCache.set(path, n); }
  return n;
}

/** Returns the score record of the take in `bytes` (its file name `path`); throws the typed errors of import and gait. */
export function scoreTake(bytes: Uint8Array, path: string, o: ScoreOptions, stages: readonly ScoreStage[] = DEFAULT_STAGES): ScoreRecord {
  const sha = sha256Hex(bytes);
  const take = parseBvh(bytes, { file: path });
  const imported = resolveImported(path, take);
  const ctx: StageContext = {
    imported, lowpassHz: o.lowpassHz, steadyOnly: o.steadyOnly,
    norms: o.normsFile ? { file: o.normsFile, data: cachedNorms(o.normsFile) } : null,
    modelFile: o.model.file,
  };
  const metrics: Record<string, number | null> = {};
  const detail: Record<string, unknown> = {};
  const flags: ScoreRecord['flags'] = [];
  const warnings: string[] = [];
  let usedModel = false;
  for (const s of stages) {
    const r = s.run(ctx);
    for (const name of s.metrics) metrics[`${s.name}.${name}`] = r3(r.metrics[name]);
    if (r.flags) flags.push(...r.flags);
    if (r.detail !== undefined) detail[s.name] = r.detail;
    if (r.warnings) warnings.push(...r.warnings);
    usedModel ||= r.usedModel === true;
  }
  const fps = 1 / take.frameTime;
  return {
    format: RECORD_FORMAT,
    version: RECORD_VERSION,
    take: { path, sha256: sha, bytes: bytes.byteLength, frames: take.frameCount, fps: r3(fps) ?? 0, duration_s: r3(take.frameCount / fps) ?? 0 },
    provenance: {
      tool: o.tool, tool_version: o.toolVersion,
      model: { ...o.model, used: usedModel },
      take_sha256: sha,
      options: { lowpass_hz: o.lowpassHz, steady_only: o.steadyOnly, norms_file: o.normsFile, norms_sha256: o.normsSha256 },
      stages: stages.map((s) => ({ name: s.name, version: s.version })),
    },
    metrics, flags, detail, warnings,
  };
}
