// The viewer's small rules, each against its source: loopback addresses (RFC 1122, RFC 4291), the display
// stride (hand-computed), the viridis table (matplotlib's published values), the playback clock and keys
// (hand-computed), and the pair distance spread (simple-statistics on three.js positions).
import { standardDeviation } from 'simple-statistics';
import { describe, expect, test } from 'vitest';
import { synthesizeTake } from '../../src/synth/index.js';
import { resolveImported } from '../../src/skeleton/import.js';
import { displayStride, displayMatrix } from '../../src/view/display.js';
import { hostHeaderAllowed, loopbackHost, originOf } from '../../src/view/host.js';
import { pairDistanceSpread } from '../../src/view/pairs.js';
import { UsageError } from '../../src/errors/index.js';
import { VIRIDIS_STOPS, viridis } from '../../src/report/viridis.js';
import { Playback } from '../../viewer/src/playback.js';
import { actionOf } from '../../viewer/src/keys.js';
import { pairPasses } from '../../viewer/src/pairlines-filter.js';
import { threeWorldPositions } from '../reference/three-fk.js';

describe('loopbackHost', () => {
  // RFC 1122 3.2.1.3: all of 127.0.0.0/8 is loopback; RFC 4291 2.5.3: ::1 is the IPv6 loopback.
  test.each([
    ['127.0.0.1', '127.0.0.1'], ['127.1.2.3', '127.1.2.3'], ['localhost', '127.0.0.1'],
    ['::1', '::1'], ['[::1]', '::1'], ['0:0:0:0:0:0:0:1', '::1'],
  ])('%s binds %s', (given, bound) => expect(loopbackHost(given)).toBe(bound));
  test.each(['0.0.0.0', '10.0.0.1', '128.0.0.1', '::', '::2', '::ffff:10.0.0.1', 'example.com', '', '127.0.0.256'])('%s is refused', (h) => {
    expect(() => loopbackHost(h)).toThrow(UsageError);
  });
  test('origins and Host headers', () => {
    expect(originOf('::1', 8080)).toBe('http://[::1]:8080');
    expect(originOf('127.0.0.1', 80)).toBe('http://127.0.0.1:80');
    expect(hostHeaderAllowed('127.0.0.1:5000', 5000)).toBe(true);
    expect(hostHeaderAllowed('LOCALHOST:5000', 5000)).toBe(true);
    expect(hostHeaderAllowed('[::1]:5000', 5000)).toBe(true);
    expect(hostHeaderAllowed('127.0.0.1:5001', 5000)).toBe(false);
    expect(hostHeaderAllowed('rebind.example:5000', 5000)).toBe(false);
    expect(hostHeaderAllowed(undefined, 5000)).toBe(false);
  });
});

describe('displayStride (hand-computed: the smallest whole step that brings the rate to 60 Hz or less)', () => {
  test.each([[30, 1], [50, 1], [60, 1], [1 / 0.016667, 1], [100, 2], [120, 2], [119.88, 2], [150, 3], [240, 4], [250, 5], [1000, 17]])('%d Hz -> %d', (fps, k) => {
    expect(displayStride(fps)).toBe(k);
  });
});

describe('displayMatrix', () => {
  const base = synthesizeTake({ seed: 3, duration: 2, frameRate: 60, units: 'cm', upAxis: 'Z' });
  test('a Z-up take in cm turns to Y up in metres, right-handed (hand-derived (x, y, z) -> (x, z, -y) / 100)', () => {
    const M = displayMatrix(resolveImported('z.bvh', base.take).frame);
    const expected = [1, 0, 0, 0, 0, 1, 0, -1, 0].map((v) => v * 0.01);
    for (let i = 0; i < 9; i++) expect(M[i]).toBeCloseTo(expected[i]!, 12);
  });
});

describe('viridis', () => {
  // matplotlib _cm_listed.py, _viridis_data entries 0, 128 and 255 (recalled from memory), times 255.
  test('the stops match the published table at both ends and the middle (within 1.5/255)', () => {
    const c = [0, 0, 0];
    for (const [t, ref] of [[0, [0.267004, 0.004874, 0.329415]], [1, [0.993248, 0.906157, 0.143936]], [0.5, [0.127568, 0.566949, 0.550556]]] as const) {
      viridis(t, c);
      for (let k = 0; k < 3; k++) expect(Math.abs(c[k]! - ref[k]!)).toBeLessThan(1.5 / 255);
    }
  });
  test('lightness rises monotonically (the map\'s design property; relative luminance of ITU-R BT.709 / sRGB)', () => {
    const lin = (v: number) => (v <= 0.04045 ? v / 12.92 : ((v + 0.055) / 1.055) ** 2.4);
    const lum = VIRIDIS_STOPS.map(([r, g, b]) => 0.2126 * lin(r / 255) + 0.7152 * lin(g / 255) + 0.0722 * lin(b / 255));
    for (let i = 1; i < lum.length; i++) expect(lum[i]!).toBeGreaterThan(lum[i - 1]!);
  });
  test('clamps outside [0, 1] and maps NaN to the low end', () => {
    expect(Array.from(viridis(-1, [0, 0, 0]))).toEqual(Array.from(viridis(0, [0, 0, 0])));
    expect(Array.from(viridis(2, [0, 0, 0]))).toEqual(Array.from(viridis(1, [0, 0, 0])));
    expect(Array.from(viridis(Number.NaN, [0, 0, 0]))).toEqual(Array.from(viridis(0, [0, 0, 0])));
  });
});

describe('Playback (hand-computed at 50 frames a second, 100 frames)', () => {
  test('time to frame, speed, step, clamp and loop', () => {
    const p = new Playback(100, 50);
    expect(p.frame).toBe(0);
    p.playing = true;
    expect(p.advance(0.5)).toBe(25); // 0.5 s x 50 Hz
    p.speed = 2;
    expect(p.advance(0.25)).toBe(50); // 0.25 s x 2 x 50 Hz = 25 more
    expect(p.advance(1.1)).toBe(60); // 2 + 0.5 + 1.1 x 2 = 3.2 s wraps at 2 s -> 1.2 s = frame 60
    expect(p.step(-70)).toBe(0);
    expect(p.playing).toBe(false);
    expect(p.seek(1e9)).toBe(99);
    expect(p.step(1)).toBe(99);
    p.speed = 1;
    expect(p.nextSpeed(1)).toBe(2);
    expect(p.nextSpeed(1)).toBe(4);
    expect(p.nextSpeed(1)).toBe(4);
    expect(p.nextSpeed(-1)).toBe(2);
  });
});

describe('keys', () => {
  const k = (key: string, shiftKey = false) => actionOf({ key, shiftKey, ctrlKey: false, metaKey: false, altKey: false });
  test('bindings', () => {
    expect(k(' ')).toBe('play');
    expect(k('ArrowLeft')).toBe('back');
    expect(k('ArrowLeft', true)).toBe('back1s');
    expect(k('P', true)).toBe('pairs');
    expect(k('?', true)).toBe('help');
    expect(k('x')).toBeNull();
    expect(actionOf({ key: 'p', shiftKey: false, ctrlKey: true, metaKey: false, altKey: false })).toBeNull();
  });
});

describe('pairDistanceSpread', () => {
  const synth = synthesizeTake({ seed: 9, duration: 3, frameRate: 60, units: 'cm' });
  const imported = resolveImported('walk.bvh', synth.take);
  const spread = pairDistanceSpread(synth.take, imported.frame);
  const ref = threeWorldPositions(synth.bvhText);
  const J = synth.take.joints.length;
  const dist = (a: number, b: number) =>
    Array.from({ length: ref.frames }, (_, f) => {
      const o = f * J * 3;
      return Math.hypot(ref.positions[o + a * 3]! - ref.positions[o + b * 3]!, ref.positions[o + a * 3 + 1]! - ref.positions[o + b * 3 + 1]!, ref.positions[o + a * 3 + 2]! - ref.positions[o + b * 3 + 2]!);
    });
  test('each value is the population SD (simple-statistics) of the three.js pair distance, in cm', () => {
    for (const label of ['l_hip–l_ankle', 'l_wrist–r_wrist', 'pelvis–head', 'l_ankle–r_ankle']) {
      const p = spread.pairs.find((x) => x.label === label)!;
      expect(p).toBeDefined();
      // File units are cm; the measure is in cm; 1e-3 cm is the value's rounding.
      expect(Math.abs(p.value - standardDeviation(dist(p.a, p.b)))).toBeLessThan(2e-3);
    }
  });
  test('a pair on one rigid segment spreads by almost nothing; two ankles by many cm', () => {
    expect(spread.pairs.find((x) => x.label === 'l_knee–l_ankle')!.value).toBeLessThan(0.05);
    expect(spread.pairs.find((x) => x.label === 'l_ankle–r_ankle')!.value).toBeGreaterThan(5);
  });
});

describe('pair filter (hand-counted on the 17 roles: 3 trunk, 7 a side)', () => {
  test('every pair lands in exactly the classes its sides say', () => {
    const roles = ['pelvis', 'thorax', 'head', ...['hip', 'knee', 'ankle', 'toe', 'shoulder', 'elbow', 'wrist'].flatMap((r) => [`l_${r}`, `r_${r}`])];
    const labels: string[] = [];
    for (let a = 0; a < roles.length; a++) for (let b = a + 1; b < roles.length; b++) labels.push(`${roles[a]}–${roles[b]}`);
    const count = (f: 'all' | 'same-side' | 'across' | 'trunk') => labels.filter((l) => pairPasses(l, f)).length;
    expect(count('all')).toBe(136); // C(17, 2)
    expect(count('same-side')).toBe(42); // 2 x C(7, 2)
    expect(count('across')).toBe(49); // 7 x 7
    expect(count('trunk')).toBe(45); // C(3, 2) + 3 x 14
    expect(count('same-side') + count('across') + count('trunk')).toBe(136);
  });
});
