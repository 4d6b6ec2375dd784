// The surprise timeline's flags: points above median + 4 MAD (hand-computed below), and flagged points
// within 0.5 s of each other merged into one episode with its peak.
import { describe, expect, it } from 'vitest';
import { flagSurprises, irregularEpisodes } from '../../src/model/evaluate.js';

describe('irregular flags', () => {
  it('flags above median + 4 MAD', () => {
    // Values 1, 2, 3, 4, 5, 6, 20: median 4; |v − 4| = 3, 2, 1, 0, 1, 2, 16 → MAD 2; limit 4 + 8 = 12.
    expect(flagSurprises([1, 2, 3, 4, 5, 6, 20])).toEqual([false, false, false, false, false, false, true]);
    // Fewer than five values: nothing to judge against.
    expect(flagSurprises([1, 1, 1, 9])).toEqual([false, false, false, false]);
    expect(flagSurprises([1, null, 2, 3, 4, 5, 6, 20])[1]).toBe(false);
  });

  it('merges flagged points within 0.5 s into one episode with its peak, and keeps distant ones apart', () => {
    const t = (time_s: number, surprise: number, irregular: boolean) => ({ time_s, surprise, irregular });
    const timeline = [t(9.0, 0.3, false), t(9.2, 0.8, true), t(9.4, 1.1, true), t(9.6, 0.9, true), t(9.8, 0.4, false),
      t(10.0, 0.85, true), t(12.0, 0.3, false), t(14.0, 0.9, true)];
    expect(irregularEpisodes(timeline)).toEqual([
      // 10.0 is 0.4 s after 9.6, the episode's last flagged point: it joins.
      { start_s: 9.2, end_s: 10.0, peak_s: 9.4, peak: 1.1 },
      { start_s: 14.0, end_s: 14.0, peak_s: 14.0, peak: 0.9 },
    ]);
    expect(irregularEpisodes(timeline, 0.3)).toHaveLength(3);
    expect(irregularEpisodes([t(1, 0.2, false)])).toEqual([]);
  });
});
