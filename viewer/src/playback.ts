// The playback clock: current time, play/pause, speed, frame steps and looping over the display frames.

/** Speeds the speed control offers, slowest first. */
export const SPEEDS: readonly number[] = [0.25, 0.5, 1, 2, 4];

export class Playback {
  /** Seconds since the first display frame. */
  time = 0;
  playing = false;
  speed = 1;

  constructor(readonly frames: number, readonly fps: number) {}

  /** Returns the display frame shown at the current time. */
  get frame(): number {
    return Math.min(this.frames - 1, Math.max(0, Math.floor(this.time * this.fps + 1e-6)));
  }

  /** Returns the length of the loop in seconds (one frame period past the last frame). */
  get loopS(): number {
    return this.frames / this.fps;
  }

  /** Moves the clock on by dt seconds of wall time when playing, wrapping at the end; returns the frame. */
  advance(dtS: number): number {
    if (this.playing && dtS > 0) {
      this.time += dtS * this.speed;
      if (this.time >= this.loopS) this.time %= this.loopS;
    }
    return this.frame;
  }

  /** Jumps to display frame f (clamped) and returns it. */
  seek(f: number): number {
    this.time = Math.min(this.frames - 1, Math.max(0, Math.round(f))) / this.fps;
    return this.frame;
  }

  /** Pauses and moves by n display frames; returns the new frame. */
  step(n: number): number {
    this.playing = false;
    return this.seek(this.frame + n);
  }

  /** Returns the next speed up (dir 1) or down (dir -1) from the current one. */
  nextSpeed(dir: 1 | -1): number {
    let i = SPEEDS.indexOf(this.speed);
    if (i < 0) i = SPEEDS.indexOf(1);
    this.speed = SPEEDS[Math.min(SPEEDS.length - 1, Math.max(0, i + dir))]!;
    return this.speed;
  }
}
