// The worker pool of a batch: piscina threads running worker.ts (from source through tsx) or
// worker.js (built), one per core by default; or the calling thread when one worker is asked for
// and threads are not wanted.
import { availableParallelism } from 'node:os';
import { Piscina } from 'piscina';
import { scoreTask, type ScoreOutcome, type ScoreTask } from './worker.js';

/** Runs score tasks; `close` releases the threads. */
export interface ScorePool {
  workers: number;
  run(task: ScoreTask): Promise<ScoreOutcome>;
  close(): Promise<void>;
}

/** Returns the default worker count: one per core. */
export function defaultWorkers(): number {
  return Math.max(1, availableParallelism());
}

/** Returns the worker file next to this module and the Node flags its threads need (tsx for .ts). */
export function workerEntry(): { filename: string; execArgv: string[] } {
  const self = import.meta.url;
  const fromSource = /\.ts$/.test(new URL(self).pathname);
  const filename = new URL(fromSource ? './worker.ts' : './worker.js', self).href;
  return { filename, execArgv: fromSource ? ['--import', 'tsx'] : [] };
}

/** Returns a pool of `workers` threads (0 runs every task in the calling thread, for tests and tools). */
export function createScorePool(workers: number): ScorePool {
  if (workers === 0) {
    return { workers: 0, run: async (t) => scoreTask(t), close: async () => undefined };
  }
  const { filename, execArgv } = workerEntry();
  const pool = new Piscina({ filename, execArgv, minThreads: workers, maxThreads: workers, idleTimeout: 60_000 });
  return {
    workers,
    run: (t) => pool.run(t) as Promise<ScoreOutcome>,
    close: () => pool.destroy(),
  };
}
