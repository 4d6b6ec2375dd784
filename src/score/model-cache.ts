// Model files read once per process: batch workers score many takes with one model.
import { loadModel, type LoadedModel } from '../model/modelfile.js';

const cache = new Map<string, LoadedModel>();

/** Returns the model file at `path`, loaded on first use. */
export function cachedModel(path: string): LoadedModel {
  let m = cache.get(path);
  if (!m) { m = loadModel(path); cache.set(path, m); }
  return m;
}
