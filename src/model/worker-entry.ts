// How the model's worker threads start: the compiled worker module beside this one, or, when running from
// the TypeScript sources (tests, tsx), a bootstrap that registers tsx's loader and imports the .ts source.
import { existsSync } from 'node:fs';
import { createRequire } from 'node:module';
import { fileURLToPath, pathToFileURL } from 'node:url';

/** Returns the code (or file) and eval switch of a Worker running the module `name` of this folder (e.g. 'shard-worker'). */
export function workerEntry(name: string): { code: string; eval: boolean } {
  const here = fileURLToPath(import.meta.url);
  if (here.endsWith('.ts')) return tsWorkerEntry(here.replace(/worker-entry\.ts$/, `${name}.ts`));
  const js = here.replace(/worker-entry\.js$/, `${name}.js`);
  if (!existsSync(js)) throw new Error(`the worker module ${js} is missing`);
  return { code: js, eval: false };
}

/** Returns the eval code of a Worker running the TypeScript module at `path` through tsx's loader (from the sources only: tests, tsx, scripts). */
export function tsWorkerEntry(path: string): { code: string; eval: true } {
  const api = pathToFileURL(createRequire(import.meta.url).resolve('tsx/esm/api').replace(/index\.cjs$/, 'index.mjs')).href;
  const src = pathToFileURL(path).href;
  return { code: `import(${JSON.stringify(api)}).then((m) => { m.register(); return import(${JSON.stringify(src)}); });`, eval: true };
}
