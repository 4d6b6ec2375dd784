// A progress bar for long work: drawn on a TTY only, silent with --quiet, with --json or when piped.
import cliProgress from 'cli-progress';

export interface Progress {
  /** Sets the total and the current count, with a short status text. */
  update(done: number, total: number, status?: string): void;
  stop(): void;
}

/** Returns a progress bar on stderr when it is a TTY and `quiet` is false, else a no-op. */
export function progressBar(label: string, quiet: boolean): Progress {
  if (quiet || !process.stderr.isTTY) return { update: () => undefined, stop: () => undefined };
  const bar = new cliProgress.SingleBar(
    { format: `${label} [{bar}] {value}/{total} {status}`, stream: process.stderr, hideCursor: true, clearOnComplete: false, barsize: 30 },
    cliProgress.Presets.shades_classic,
  );
  let started = false;
  return {
    update(done, total, status = '') {
      if (!started) { bar.start(total, done, { status }); started = true; }
      else { bar.setTotal(total); bar.update(done, { status }); }
    },
    stop() { if (started) bar.stop(); },
  };
}
