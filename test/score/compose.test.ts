// The one composition: a take's bytes in, the score record out; hashes, identity and shards.
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { BvhParseError, InputError, UsageError } from '../../src/errors/index.js';
import { SHIPPED_NORMS } from '../../src/cli/gait.js';
import { scoreTake, type ScoreOptions } from '../../src/score/compose.js';
import { metricNames } from '../../src/score/columns.js';
import { sha256Hex } from '../../src/score/hash.js';
import { sidecarPath, takeIdentity } from '../../src/score/identity.js';
import { modelKey } from '../../src/score/record.js';
import { parseShard, shardOf } from '../../src/score/shard.js';
import { DEFAULT_STAGES, type ScoreStage } from '../../src/score/stages.js';
import { synthesizeTake } from '../../src/synth/index.js';

const root = mkdtempSync(join(tmpdir(), 'jointloom-score-'));
afterAll(() => rmSync(root, { recursive: true, force: true }));

const options: ScoreOptions = {
  tool: 'jointloom', toolVersion: '0.0.0-test', lowpassHz: 6, steadyOnly: true,
  normsFile: SHIPPED_NORMS, normsSha256: null, model: { file: null, file_sha256: null, used: false },
};
// 10 s at 100 Hz, the walker's defaults: 1.3 m/s and 110 steps/min (src/synth/options.ts defaults).
const synth = synthesizeTake({ seed: 4242, duration: 10, frameRate: 100 });
const bytes = Buffer.from(synth.bvhText, 'utf8');

describe('sha256Hex', () => {
  it('matches the published test vectors', () => {
    // FIPS 180-2, appendix B.1 ("abc") and the empty message (NIST example values).
    expect(sha256Hex('abc')).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
    expect(sha256Hex(new Uint8Array(0))).toBe('e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855');
  });
});

describe('scoreTake', () => {
  const rec = scoreTake(bytes, 'walk.bvh', options);
  it('carries provenance: tool version, no model (null hash), the take hash and the options', () => {
    expect(rec.provenance.tool_version).toBe('0.0.0-test');
    expect(rec.provenance.model).toEqual({ file: null, file_sha256: null, used: false });
    expect(modelKey(rec.provenance.model)).toBe('none');
    expect(rec.take.sha256).toBe(sha256Hex(bytes));
    expect(rec.provenance.take_sha256).toBe(rec.take.sha256);
    expect(rec.provenance.options).toEqual({ lowpass_hz: 6, steady_only: true, norms_file: SHIPPED_NORMS, norms_sha256: null });
    expect(rec.provenance.stages.map((s) => s.name)).toEqual(['gait', 'norms', 'forecast', 'coupling']);
    // 10 s at 100 Hz is 1000 frames (hand-computed).
    expect(rec.take.frames).toBe(1000);
    expect(rec.take.duration_s).toBe(10);
  });
  it('has every column of every stage, and gait numbers near what the walker was asked for', () => {
    expect(Object.keys(rec.metrics)).toEqual(metricNames(DEFAULT_STAGES));
    // The walker's set cadence (110 steps/min) and speed (1.3 m/s); within 3 % (stride-to-stride variability of the walker).
    expect(rec.metrics['gait.cadence_steps_per_min']!).toBeGreaterThan(110 * 0.97);
    expect(rec.metrics['gait.cadence_steps_per_min']!).toBeLessThan(110 * 1.03);
    expect(Math.abs(rec.metrics['gait.speed_m_per_s']! - 1.3)).toBeLessThan(1.3 * 0.03);
    // Stance near 60 % of the cycle at normal speed (Perry & Burnfield, recalled from memory: about 60/40).
    expect(Math.abs(rec.metrics['gait.stance_pct_left']! - 60)).toBeLessThan(4);
    // The flags count equals the flag list, and every flag is beyond |SI| 10 % (common practice threshold).
    expect(rec.metrics['gait.asymmetry_flags']).toBe(rec.flags.length);
    for (const f of rec.flags) expect(Math.abs(f.value)).toBeGreaterThan(10);
    expect(rec.metrics['norms.gps_overall_deg']).not.toBeNull();
  });
  it('an extra stage adds its own columns and detail, leaving the rest as it was (how forecast and coupling slot in)', () => {
    const extra: ScoreStage = {
      name: 'probe', version: 1, metrics: ['frames_per_second', 'missing'],
      run: (ctx) => ({ metrics: { frames_per_second: 1 / ctx.imported.take.frameTime }, detail: { seen_gait: ctx.gait !== undefined } }),
    };
    const r2 = scoreTake(bytes, 'walk.bvh', options, [...DEFAULT_STAGES, extra]);
    expect(r2.metrics['probe.frames_per_second']).toBe(100); // 1 / 0.01 s, hand-computed
    expect(r2.metrics['probe.missing']).toBeNull();
    expect(r2.detail.probe).toEqual({ seen_gait: true });
    for (const k of Object.keys(rec.metrics)) expect(r2.metrics[k]).toBe(rec.metrics[k]);
  });
  it('a corrupt take raises the parse error with its place', () => {
    const cut = bytes.subarray(0, Math.floor(bytes.length / 3));
    const bad = Buffer.concat([cut, Buffer.from('\n1.0 abc\n')]);
    expect(() => scoreTake(bad, 'bad.bvh', options)).toThrow(BvhParseError);
  });
});

describe('takeIdentity', () => {
  it('reads subject and session from the sidecar beside the take', () => {
    const take = join(root, 'a', 'walk1.bvh');
    mkdirSync(join(root, 'a'), { recursive: true });
    writeFileSync(take, '');
    expect(sidecarPath(take)).toBe(join(root, 'a', 'walk1.json'));
    writeFileSync(sidecarPath(take), JSON.stringify({ subject: 'Q07', session: 3, date: '2031-02-02' }));
    expect(takeIdentity(take, root)).toEqual({ subject: 'Q07', session: '3', date: '2031-02-02', from: 'sidecar' });
  });
  it('falls back to <subject>/<session>/<take>.bvh below the root', () => {
    const take = join(root, 'clinic', 'Q08', 'visit-2', 'walk.bvh');
    mkdirSync(join(root, 'clinic', 'Q08', 'visit-2'), { recursive: true });
    writeFileSync(take, '');
    expect(takeIdentity(take, join(root, 'clinic'))).toEqual({ subject: 'Q08', session: 'visit-2', date: null, from: 'folders' });
  });
  it('without either, or with a broken sidecar, is an InputError saying what to add', () => {
    const take = join(root, 'lone.bvh');
    writeFileSync(take, '');
    expect(() => takeIdentity(take, root)).toThrow(InputError);
    expect(() => takeIdentity(take, root)).toThrow(/add lone\.json/);
    writeFileSync(join(root, 'lone.json'), '{ not json');
    expect(() => takeIdentity(take, root)).toThrow(/not valid JSON/);
    writeFileSync(join(root, 'lone.json'), '{"subject": "Q09"}');
    expect(() => takeIdentity(take, root)).toThrow(/needs "subject" and "session"/);
  });
});

describe('shards', () => {
  it('parses K/N and refuses anything else', () => {
    expect(parseShard('2/4')).toEqual({ k: 2, n: 4 });
    for (const bad of ['0/4', '5/4', '1/0', 'x', '1-2']) expect(() => parseShard(bad)).toThrow(UsageError);
  });
  it('takes the shard from the first four bytes of SHA-256 of the path', () => {
    // SHA-256("abc") begins ba7816bf (FIPS 180-2); 0xba7816bf = 3128432319, mod 4 = 3, so shard 4 of 4 (hand-computed).
    expect(shardOf('abc', 4)).toBe(4);
    // mod 3: 3128432319 = 3 × 1042810773, remainder 0, so shard 1 of 3 (hand-computed).
    expect(shardOf('abc', 3)).toBe(1);
    // Windows separators count as forward slashes.
    expect(shardOf('S01\\a.bvh', 5)).toBe(shardOf('S01/a.bvh', 5));
  });
  it('puts every path in exactly one shard', () => {
    const paths = Array.from({ length: 200 }, (_, i) => `P${i % 13}/s${i % 3}/take-${i}.bvh`);
    const counts = new Array<number>(4).fill(0);
    for (const p of paths) {
      const s = shardOf(p, 4);
      expect(s).toBeGreaterThanOrEqual(1);
      expect(s).toBeLessThanOrEqual(4);
      counts[s - 1]!++;
    }
    expect(counts.reduce((a, b) => a + b, 0)).toBe(200);
    for (const c of counts) expect(c).toBeGreaterThan(20); // not all in one shard
  });
});
