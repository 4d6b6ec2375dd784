// Reads the viewer's API from the server that served the page (same origin only).
import type { ViewEvents, ViewFactors, ViewForecast, ViewGait, ViewPairs, ViewTake } from '../../src/view/types.js';

async function getJson<T>(path: string): Promise<T> {
  const res = await fetch(path, { cache: 'no-store' });
  if (!res.ok) throw new Error(`${path}: ${res.status} ${res.statusText}`);
  return (await res.json()) as T;
}

export interface LoadedTake {
  take: ViewTake;
  positions: Float32Array;
  events: ViewEvents;
  gait: ViewGait;
  pairs: ViewPairs | null;
  /** The model's factor heat, when the server has a model (else null). */
  factors: ViewFactors | null;
}

/** Returns the take, its display positions, events, gait summary and pair measure. */
export async function loadTake(): Promise<LoadedTake> {
  const take = await getJson<ViewTake>('./api/take');
  const [bytes, events, gait, pairs, factors] = await Promise.all([
    fetch('.' + take.positions.path, { cache: 'no-store' }).then((r) => {
      if (!r.ok) throw new Error(`${take.positions.path}: ${r.status}`);
      return r.arrayBuffer();
    }),
    getJson<ViewEvents>('./api/events'),
    getJson<ViewGait>('./api/gait'),
    take.features.pairs ? getJson<ViewPairs>('./api/pairs') : Promise.resolve(null),
    take.features.factors ? getJson<ViewFactors>('./api/factors') : Promise.resolve(null),
  ]);
  const expected = take.displayFrames * take.joints.length * 3 * 4;
  if (bytes.byteLength !== expected) throw new Error(`positions: expected ${expected} bytes, got ${bytes.byteLength}`);
  return { take, positions: new Float32Array(bytes), events, gait, pairs, factors };
}

/** Returns the model's forecast from time t (seconds) with `samples` samples; throws with the server's message. */
export async function fetchForecast(t: number, samples: number): Promise<ViewForecast> {
  const res = await fetch(`./api/forecast?t=${t.toFixed(4)}&samples=${samples}`, { cache: 'no-store' });
  if (!res.ok) {
    const body = (await res.json().catch(() => null)) as { error?: string } | null;
    throw new Error(body?.error ?? `forecast: ${res.status} ${res.statusText}`);
  }
  return (await res.json()) as ViewForecast;
}
