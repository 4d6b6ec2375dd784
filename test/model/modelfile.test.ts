// The model file: a save/load round trip restores the very same model (weights bit for bit, so the same
// forecast), and every kind of damaged or foreign file is refused with an InputError naming the file and
// the problem. The checksum is SHA-256 (FIPS 180-4) of the stored weight bytes, recomputed here with
// node:crypto as the reference.
import { createHash } from 'node:crypto';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors/index.js';
import { resolveModelConfig } from '../../src/model/config.js';
import { createModel } from '../../src/model/model.js';
import { loadModel, MODEL_FORMAT, modelToJson, saveModel } from '../../src/model/modelfile.js';
import { identityStats, TINY } from './support.js';

const dir = mkdtempSync(join(tmpdir(), 'jointloom-modelfile-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function savedModel(name: string) {
  const c = resolveModelConfig(TINY);
  const model = createModel(c, identityStats(c.nodes), { seed: 21 });
  model.spreadScale = 1.25;
  const path = join(dir, name);
  saveModel(path, model, null, { note: 'kept' });
  return { model, path };
}

/** Writes a damaged copy of a saved file's JSON and returns its path. */
function damaged(name: string, edit: (j: Record<string, any>) => void): string {
  const { path } = savedModel(`${name}-src.json`);
  const j = JSON.parse(readFileSync(path, 'utf8'));
  edit(j);
  const out = join(dir, `${name}.json`);
  writeFileSync(out, JSON.stringify(j));
  return out;
}

function refusal(path: string): string {
  try {
    loadModel(path);
  } catch (e) {
    expect(e).toBeInstanceOf(InputError);
    expect((e as Error).message).toContain(path);
    return (e as Error).message;
  }
  throw new Error('the file was accepted');
}

describe('model file', () => {
  it('round-trips weights bit for bit, with config, statistics, spread and extras', () => {
    const { model, path } = savedModel('ok.json');
    const loaded = loadModel(path);
    const a = model.store.valueView(), b = loaded.model.store.valueView();
    expect(Buffer.from(b.buffer, b.byteOffset, b.byteLength).equals(Buffer.from(a.buffer, a.byteOffset, a.byteLength))).toBe(true);
    expect(loaded.model.config).toEqual(model.config);
    expect(Array.from(loaded.model.stats.sd)).toEqual(Array.from(model.stats.sd));
    expect(loaded.model.spreadScale).toBe(1.25);
    expect(loaded.extras).toEqual({ note: 'kept' });
    const j = JSON.parse(readFileSync(path, 'utf8'));
    expect(j.format).toBe(MODEL_FORMAT);
    expect(j.weights.sha256).toBe(createHash('sha256').update(Buffer.from(j.weights.base64, 'base64')).digest('hex'));
    expect(modelToJson(loaded.model).weights.sha256).toBe(j.weights.sha256);
  });

  it('refuses a missing file, a truncated file and a file that is not JSON', () => {
    expect(refusal(join(dir, 'absent.json'))).toMatch(/cannot read/);
    const { path } = savedModel('trunc-src.json');
    const text = readFileSync(path, 'utf8');
    const cut = join(dir, 'trunc.json');
    writeFileSync(cut, text.slice(0, Math.floor(text.length / 2)));
    expect(refusal(cut)).toMatch(/not valid JSON/);
  });

  it('refuses another format or schema version', () => {
    expect(refusal(damaged('fmt', (j) => (j.format = 'other-model')))).toMatch(/format/);
    expect(refusal(damaged('ver', (j) => (j.version = 99)))).toMatch(/schema version 99/);
  });

  it('refuses a checksum mismatch and truncated weights', () => {
    const flip = damaged('sum', (j) => {
      const bytes = Buffer.from(j.weights.base64, 'base64');
      bytes[10] = bytes[10]! ^ 1;
      j.weights.base64 = bytes.toString('base64');
    });
    expect(refusal(flip)).toMatch(/SHA-256/);
    const short = damaged('short', (j) => {
      const bytes = Buffer.from(j.weights.base64, 'base64').subarray(0, 400);
      j.weights.base64 = bytes.toString('base64');
      j.weights.sha256 = createHash('sha256').update(bytes).digest('hex');
    });
    expect(refusal(short)).toMatch(/truncated/);
  });

  it('refuses a node set, layout or configuration that does not match', () => {
    expect(refusal(damaged('nodes', (j) => (j.nodes = ['a', 'b'])))).toMatch(/node set/);
    expect(refusal(damaged('layout', (j) => (j.layout[0].name = 'renamed')))).toMatch(/layout/);
    expect(refusal(damaged('cfg', (j) => (j.config.hidden = 0)))).toMatch(/configuration/);
    expect(refusal(damaged('count', (j) => (j.config.hidden = 5)))).toMatch(/layout|weights/);
  });
});
