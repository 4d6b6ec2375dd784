// The cohort report's histogram: values far outside the rest are named in a note instead of stretching
// the axis. Quartiles by linear interpolation (common practice; R's default, type 7), hand-computed.
import { describe, expect, it } from 'vitest';
import { histogramSvg, splitFarValues } from '../../src/report/cohort-svg.js';

describe('cohort histogram', () => {
  it('keeps values within three interquartile ranges of the quartiles and names the others', () => {
    // Hand-computed: sorted 1..8 and 100; quartiles at positions 2 and 6 of 0..8: 3 and 7, IQR 4, fences −9 and 19.
    const xs = [5, 100, 1, 2, 3, 4, 6, 7, 8];
    const { inside, outside } = splitFarValues(xs);
    expect(outside).toEqual([100]);
    expect(inside).toEqual([5, 1, 2, 3, 4, 6, 7, 8]);
    expect(splitFarValues([1, 1000, 2]).outside).toEqual([]);
    const svg = histogramSvg('score', 'score', xs);
    expect(svg).toContain('1 off the axis: 100');
    // The axis ends near the kept values, not at 100.
    expect(svg).not.toMatch(/>100<\/text><text class="tick"/);
    expect(histogramSvg('score', 'score', [1, 2, 3, 4])).not.toContain('off the axis');
  });
});
