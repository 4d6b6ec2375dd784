// The causal gait phase for restricted labeling: hand-computed values from a few contact times.
import { describe, expect, it } from 'vitest';
import { causalPhase } from '../../src/motion/phase.js';

describe('causalPhase', () => {
  it('runs from the last contact over the stride before it, and is unknown before two contacts or after a pause', () => {
    // Contacts at 1.0, 2.0 and 3.1 s; 10 steps per second, 60 steps.
    const p = causalPhase([1.0, 2.0, 3.1], 60, 10);
    expect(p[15]).toBeNaN(); // 1.5 s: one contact so far
    expect(p[20]).toBeCloseTo(0, 12); // 2.0 s: a new cycle
    expect(p[25]).toBeCloseTo(Math.PI, 12); // 2.5 s: half of the 1.0-s stride before
    expect(p[31]).toBeCloseTo(0, 12); // 3.1 s: the next cycle
    expect(p[36]).toBeCloseTo((2 * Math.PI * 0.5) / 1.1, 12); // 3.6 s: 0.5 s into a cycle, over the 1.1-s stride before
    expect(p[50]).toBeNaN(); // 5.0 s: 1.9 s after the last contact, beyond 1.5 strides
    for (const v of p) if (!Number.isNaN(v)) { expect(v).toBeGreaterThanOrEqual(0); expect(v).toBeLessThan(2 * Math.PI); }
  });

  it('reads no contact after the step: dropping later contacts leaves earlier steps unchanged', () => {
    const all = causalPhase([1.0, 2.0, 3.1, 4.2], 60, 10), cut = causalPhase([1.0, 2.0, 3.1], 60, 10);
    expect(Array.from(cut.subarray(0, 42))).toEqual(Array.from(all.subarray(0, 42)));
  });
});
