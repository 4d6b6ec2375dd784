// Speed strata: dimensionless speed v / √(g L) (Hof 1996) and the band a take is scored against.
import { describe, expect, it } from 'vitest';
import { chooseBand } from '../../src/norms/bands.js';
import type { NormsBand, NormsFile } from '../../src/norms/format.js';
import { FAST_ABOVE, SLOW_BELOW, dimensionlessSpeed, stratumOf } from '../../src/norms/strata.js';

/** A band that only carries what the choice reads. */
const band = (strides: number): NormsBand => ({
  strides, takes: 3, speed_dimensionless: { mean: 0.4, sd: 0.01, min: 0.39, max: 0.41 }, curves: {}, parameters: {}, profile: null, deviation: null, deviation_note: 'none',
});
const norms = (bands: NormsFile['bands'], skipped: NormsFile['skipped_bands'] = []) => ({ bands, skipped_bands: skipped }) as unknown as NormsFile;

describe('speed strata', () => {
  it('v / √(g L): 1.3 m/s on a 0.86 m leg is 0.4476 (hand-computed, g = 9.80665)', () => {
    expect(dimensionlessSpeed(1.3, 0.86)).toBeCloseTo(1.3 / Math.sqrt(9.80665 * 0.86), 14);
    expect(dimensionlessSpeed(1.3, 0.86)).toBeCloseTo(0.4476, 4);
  });

  it('slow below 0.35, fast above 0.55, self-selected between (edges belong to self-selected)', () => {
    expect([SLOW_BELOW, FAST_ABOVE]).toEqual([0.35, 0.55]);
    expect(stratumOf(0.2)).toBe('slow');
    expect(stratumOf(0.3499)).toBe('slow');
    expect(stratumOf(0.35)).toBe('self_selected');
    expect(stratumOf(0.45)).toBe('self_selected');
    expect(stratumOf(0.55)).toBe('self_selected');
    expect(stratumOf(0.5501)).toBe('fast');
    expect(stratumOf(NaN)).toBeNull();
  });

  it('a take is scored against its own stratum when the reference holds it', () => {
    const n = norms({ all: band(300), slow: band(100), self_selected: band(120), fast: band(80) });
    expect(chooseBand(n, 0.3).name).toBe('slow');
    expect(chooseBand(n, 0.45).name).toBe('self_selected');
    expect(chooseBand(n, 0.6).name).toBe('fast');
    expect(chooseBand(n, 0.6).note).toBeNull();
  });

  it('else the band of all speeds, with a note saying why', () => {
    const onlyAll = norms({ all: band(300) });
    const c = chooseBand(onlyAll, 0.3);
    expect(c.name).toBe('all');
    expect(c.stratum).toBe('slow');
    expect(c.note).toMatch(/built without speed bands/);
    const skipped = norms({ all: band(300), self_selected: band(200) }, [{ band: 'fast', strides: 12, reason: 'few' }]);
    expect(chooseBand(skipped, 0.7).note).toMatch(/too few control strides/);
    expect(chooseBand(skipped, 0.2).note).toMatch(/no take at that speed/);
    const thin = norms({ all: band(300), slow: band(10) });
    expect(chooseBand(thin, 0.2).note).toMatch(/10 strides are fewer than 20/);
    expect(chooseBand(thin, null).note).toMatch(/no usable stride speed/);
  });
});
