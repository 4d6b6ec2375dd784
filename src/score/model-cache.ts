// Model files read once per process (batch workers score many takes with one model), and the take's
// model-rate track built once per take for the model-based stages.
import type { ModelConfig } from '../model/config.js';
import { modelDomainCheck, type DomainCheck } from '../model/domain.js';
import { loadModel, type LoadedModel } from '../model/modelfile.js';
import { trackFromImported, type Track } from '../motion/track.js';
import type { StageContext } from './stages.js';

const cache = new Map<string, LoadedModel>();

/** Returns the model file at `path`, loaded on first use. */
export function cachedModel(path: string): LoadedModel {
  let m = cache.get(path);
  if (!m) { m = loadModel(path); cache.set(path, m); }
  return m;
}

/** Returns the take's track at `rate`, built on first use and shared by the stages after it. */
export function modelTrack(ctx: StageContext, rate: number): Track {
  if (!ctx.track || ctx.track.rate !== rate) ctx.track = trackFromImported(ctx.imported, { rate });
  return ctx.track;
}

/** Returns the take's domain check (model-free; computed on first use and shared by the stages after it). */
export function takeDomain(ctx: StageContext, c: ModelConfig): DomainCheck {
  ctx.domain ??= modelDomainCheck(c, modelTrack(ctx, c.rate));
  return ctx.domain;
}
