// When to ask the server for a forecast and which of its steps to draw: while playing, the forecast
// plays forward over its second and a new one is asked for once playback passes its end (or leaves it);
// when paused or scrubbed to another time, a new one is asked for from there after a short pause.
import type { ViewForecast, ViewForecastInfo } from '../../src/view/types.js';
import { fetchForecast } from './api.js';
import type { ForecastView } from './forecast-view.js';

/** What the panel shows of the forecast. */
export type ForecastState =
  | { kind: 'off' }
  | { kind: 'waiting'; fromS: number }
  | { kind: 'early'; firstS: number }
  | { kind: 'error'; message: string }
  | { kind: 'shown'; forecast: ViewForecast };

/** Milliseconds a paused time must hold before its forecast is asked for. */
export const FORECAST_DEBOUNCE_MS = 150;

export class ForecastControl {
  on = false;
  /** Forecasts received (for tests and the bench). */
  received = 0;
  /** Forecast step drawn, or 0 when nothing is drawn. */
  step = 0;
  private inFlight: number | null = null;
  private scheduled: number | null = null;
  private timer: ReturnType<typeof setTimeout> | null = null;
  private failed: { step: number; message: string } | null = null;
  private lastState = '';

  constructor(
    private readonly view: ForecastView,
    private readonly info: ViewForecastInfo,
    private readonly onState: (s: ForecastState) => void,
    private readonly samples = 8,
  ) {}

  /** Turns the overlay on or off. */
  setOn(on: boolean): void {
    this.on = on;
    if (!on) this.cancel();
  }

  /** Draws the forecast step for time tS (seconds) and asks for a new forecast when one is due. */
  update(tS: number, playing: boolean): void {
    if (!this.on) {
      this.view.setStep(null);
      this.step = 0;
      return this.report({ kind: 'off' });
    }
    const rate = this.info.rate;
    const target = Math.round(tS * rate);
    const f = this.view.forecast;
    const k = f ? Math.round((tS - f.time_s) * rate) : -1;
    const covers = f !== null && k >= 0 && k <= f.steps;
    this.view.setStep(covers ? Math.max(1, k) : null);
    this.step = covers ? Math.max(1, k) : 0;

    const first = Math.round(this.info.firstS * rate), last = Math.round(this.info.lastS * rate);
    if (target < first || target > last) {
      this.cancel();
      if (!covers) return this.report({ kind: 'early', firstS: this.info.firstS });
    } else if (playing) {
      if (this.timer) this.cancel();
      if (!covers && this.inFlight === null && this.failed?.step !== target) this.request(target);
    } else if ((!f || f.endStep !== target) && this.inFlight !== target && this.scheduled !== target && this.failed?.step !== target) {
      this.cancel();
      this.scheduled = target;
      this.timer = setTimeout(() => {
        this.timer = null;
        this.scheduled = null;
        this.request(target);
      }, FORECAST_DEBOUNCE_MS);
    }
    if (this.failed && !covers) return this.report({ kind: 'error', message: this.failed.message });
    if (covers) return this.report({ kind: 'shown', forecast: f! });
    this.report({ kind: 'waiting', fromS: target / rate });
  }

  private cancel(): void {
    if (this.timer) clearTimeout(this.timer);
    this.timer = null;
    this.scheduled = null;
  }

  private request(step: number): void {
    this.inFlight = step;
    fetchForecast(step / this.info.rate, this.samples).then(
      (f) => {
        this.inFlight = null;
        this.failed = null;
        this.received++;
        this.view.setForecast(f);
      },
      (err: unknown) => {
        this.inFlight = null;
        this.failed = { step, message: err instanceof Error ? err.message : String(err) };
      },
    );
  }

  /** Passes the state on when it changed (the panel is rebuilt only then). */
  private report(s: ForecastState): void {
    const key = s.kind === 'shown' ? `shown:${s.forecast.endStep}:${s.forecast.samples.length}` : s.kind === 'waiting' ? 'waiting' : s.kind === 'error' ? `error:${s.message}` : s.kind;
    if (key === this.lastState) return;
    this.lastState = key;
    this.onState(s);
  }
}
