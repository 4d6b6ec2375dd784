// Seeded mutation fuzzing of the BVH parser, shared by test/bvh/fuzz.test.ts and test/fuzz/run.ts.
// A case is fully determined by its seed: pick a base text (a fixture or a freshly synthesized take),
// apply 1-4 mutations, parse, and check the outcome is a sound Take or a well-formed BvhParseError.
import { readdirSync, readFileSync, rmSync, writeFileSync, mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { parseBvh, readBvhFile } from '../../src/bvh/parse.js';
import { writeBvh } from '../../src/bvh/write.js';
import type { Take } from '../../src/bvh/take.js';
import { BvhParseError } from '../../src/errors/index.js';
import { Prng } from './prng.js';
import { randomTake } from './random-take.js';

/** Longest a single parse may take before the case counts as a failure (a hang guard). */
export const CASE_TIME_LIMIT_MS = 2000;

const FIXTURE_DIR = fileURLToPath(new URL('../fixtures/bvh/', import.meta.url));

/** Returns the fixture texts as byte strings (one char per byte, latin1), sorted by file name. */
export function loadCorpus(): { name: string; text: string }[] {
  return readdirSync(FIXTURE_DIR)
    .filter((f) => f.endsWith('.bvh'))
    .sort()
    .map((name) => ({ name, text: readFileSync(join(FIXTURE_DIR, name)).toString('latin1') }));
}

const INSERTS = [
  '0', '7', '-', '+', '.', 'e', 'E', '-0', '1e', '{', '}', '{ }', '\n', '\r\n', '\r', ' ', '\t', '\u0000', ':',
  'HIERARCHY', 'ROOT', 'ROOT x', 'JOINT', 'JOINT y\n{', 'End Site', 'OFFSET', 'OFFSET 1 2 3', 'CHANNELS', 'CHANNELS 3',
  'Xrotation', 'Yposition', 'MOTION', 'Frames:', 'Frame Time:', 'Frame', 'Time:', '\xef\xbb\xbf', '\xff\xfe', '\xc3\x28',
];

const NUMBER_SWAPS = [
  '1e308', '1e309', '-1e400', '1e-400', '5e-324', '2.2250738585072014e-308', '1.7976931348623157e308', 'NaN', 'nan',
  '-nan', 'Infinity', '-inf', '1e999999', '1e-999999', '0x10', '1.2.3', '--1', '+-1', '.', '-.', '1e+', '.e1', '00000',
  '9'.repeat(400), '0.' + '0'.repeat(80) + '1', '1'.repeat(30) + 'e-30', '-0', '4294967296', '1e12', '100000001',
  '99999999', '0.0', '1,5', '1_000', '١٢', '',
];

/** A named text mutation over a byte string; returns the mutated string. */
type Mutation = (s: string, rng: Prng) => string;

/** Returns [start, end) spans of every number-looking token in s. */
function numberSpans(s: string): [number, number][] {
  const out: [number, number][] = [];
  const re = /[-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?/g;
  let m: RegExpExecArray | null;
  while ((m = re.exec(s)) !== null) out.push([m.index, m.index + m[0].length]);
  return out;
}

/** Returns the [start, end) span of each line including its "\n". */
function lineSpans(s: string): [number, number][] {
  const out: [number, number][] = [];
  let a = 0;
  for (let i = 0; i < s.length; i++) if (s.charCodeAt(i) === 10) { out.push([a, i + 1]); a = i + 1; }
  if (a < s.length) out.push([a, s.length]);
  return out;
}

const at = (s: string, rng: Prng) => rng.int(0, s.length);

/** The mutation operators, by name (names appear in failure reports). */
export const MUTATIONS: Record<string, Mutation> = {
  flipBit(s, rng) {
    if (!s.length) return s;
    const i = rng.int(0, s.length - 1);
    return s.slice(0, i) + String.fromCharCode(s.charCodeAt(i) ^ (1 << rng.int(0, 7))) + s.slice(i + 1);
  },
  randomByte(s, rng) {
    const i = at(s, rng);
    return s.slice(0, i) + String.fromCharCode(rng.int(0, 255)) + s.slice(i + (rng.chance(0.5) ? 1 : 0));
  },
  deleteBytes(s, rng) {
    const i = at(s, rng);
    return s.slice(0, i) + s.slice(i + rng.int(1, 16));
  },
  insertToken(s, rng) {
    const i = at(s, rng);
    const tok = rng.pick(INSERTS);
    return s.slice(0, i) + (rng.chance(0.5) ? ` ${tok} ` : tok) + s.slice(i);
  },
  duplicateLine(s, rng) {
    const lines = lineSpans(s);
    if (!lines.length) return s;
    const [a, b] = rng.pick(lines);
    const n = rng.chance(0.1) ? rng.int(2, 50) : 1;
    return s.slice(0, b) + s.slice(a, b).repeat(n) + s.slice(b);
  },
  removeLine(s, rng) {
    const lines = lineSpans(s);
    if (!lines.length) return s;
    const [a, b] = rng.pick(lines);
    return s.slice(0, a) + s.slice(b);
  },
  swapLines(s, rng) {
    const lines = lineSpans(s);
    if (lines.length < 2) return s;
    const i = rng.int(0, lines.length - 2);
    const [a, b] = lines[i]!;
    const [, d] = lines[i + 1]!;
    return s.slice(0, a) + s.slice(b, d) + s.slice(a, b) + s.slice(d);
  },
  truncate(s, rng) {
    return s.slice(0, at(s, rng));
  },
  truncateAtLine(s, rng) {
    const lines = lineSpans(s);
    if (!lines.length) return s;
    return s.slice(0, rng.pick(lines)[1]);
  },
  replaceNumber(s, rng) {
    const spans = numberSpans(s);
    if (!spans.length) return s;
    const [a, b] = rng.pick(spans);
    return s.slice(0, a) + rng.pick(NUMBER_SWAPS) + s.slice(b);
  },
  channelCount(s, rng) {
    const re = /CHANNELS[ \t]+(\d+)/g;
    const hits: [number, number][] = [];
    let m: RegExpExecArray | null;
    while ((m = re.exec(s)) !== null) hits.push([m.index + m[0].length - m[1]!.length, m.index + m[0].length]);
    if (!hits.length) return s;
    const [a, b] = rng.pick(hits);
    const n = Number(s.slice(a, b));
    const next = rng.pick([String(n + 1), String(n - 1), '0', '6', '7', '-1', '3.0', '1e0', 'x', '999999999999']);
    return s.slice(0, a) + next + s.slice(b);
  },
  channelName(s, rng) {
    const re = /[XYZ](?:position|rotation)/g;
    const hits: number[] = [];
    let m: RegExpExecArray | null;
    while ((m = re.exec(s)) !== null) hits.push(m.index);
    if (!hits.length) return s;
    const a = rng.pick(hits);
    const repl = rng.pick(['', 'Xrotation', 'Zposition', 'Wrotation', 'xrotation', 'Xrotation Yrotation']);
    return s.slice(0, a) + repl + s.slice(a + 9);
  },
  framesHeader(s, rng) {
    return s.replace(/Frames:[ \t]*(\S*)/, (_all, n: string) => {
      const k = Number(n) || 0;
      return `Frames: ${rng.pick([String(k + 1), String(k - 1), String(k + rng.int(2, 9)), '0', '-1', '1e12', '100000000', '100000001', '2.5', 'many'])}`;
    });
  },
  frameTime(s, rng) {
    return s.replace(/Frame Time:[ \t]*(\S*)/, () => `Frame Time: ${rng.pick(['0', '-0', '-0.01', '1e-7', '1e-6', '60', '61', '1e400', 'NaN', '0.008342', ''])}`);
  },
  // Mutations that usually keep the text valid, so that sound Takes are checked as well as errors.
  validNumber(s, rng) {
    const spans = numberSpans(s);
    if (!spans.length) return s;
    const [a, b] = rng.pick(spans);
    const v = rng.pick([0, -0, 1e-300, 1e300, 5e-324, Math.PI, -Math.E * 1e5, rng.next() * 1e6 - 5e5, rng.int(-99, 99)]);
    const text = rng.chance(0.5) ? String(v) : v.toExponential(rng.int(0, 16)).toUpperCase();
    return s.slice(0, a) + text + s.slice(b);
  },
  respace(s, rng) {
    const re = /[ \t]+/g;
    const hits: [number, number][] = [];
    let m: RegExpExecArray | null;
    while ((m = re.exec(s)) !== null) hits.push([m.index, m.index + m[0].length]);
    if (!hits.length) return s;
    const [a, b] = rng.pick(hits);
    return s.slice(0, a) + rng.pick([' ', '\t', '   ', ' \t ', '\t\t']) + s.slice(b);
  },
  blankLine(s, rng) {
    const lines = lineSpans(s);
    if (!lines.length) return s;
    const [, b] = rng.pick(lines);
    return s.slice(0, b) + rng.pick(['\n', '\r\n', '  \n', '\t\n']) + s.slice(b);
  },
  braces(s, rng) {
    const spans: number[] = [];
    for (let i = 0; i < s.length; i++) if (s[i] === '{' || s[i] === '}') spans.push(i);
    if (!spans.length) return s;
    const i = rng.pick(spans);
    return rng.chance(0.5) ? s.slice(0, i) + s.slice(i + 1) : s.slice(0, i) + s[i] + s.slice(i);
  },
};

const MUTATION_NAMES = Object.keys(MUTATIONS);

export interface CaseResult {
  seed: number;
  kind: 'take' | 'error' | 'failure';
  ms: number;
  /** The base text and mutations applied, for the failure report. */
  recipe: string;
  /** What went wrong, for failures. */
  detail?: string;
  /** The input bytes (kept only for failures). */
  input?: Uint8Array;
}

/** Returns the mutated input of a case and how it was made; deterministic in the seed. */
export function makeInput(seed: number, corpus: { name: string; text: string }[]): { input: Uint8Array; recipe: string } {
  const rng = new Prng(seed);
  let base: string;
  let recipe: string;
  if (rng.chance(0.35) || corpus.length === 0) {
    const t = randomTake(rng, { maxJoints: 8, maxFrames: 5, maxRoots: 2, negativeZero: true });
    const decimals = rng.chance(0.5) ? undefined : rng.int(0, 6);
    base = Buffer.from(writeBvh(t, { decimals, eol: rng.chance(0.2) ? '\r\n' : '\n', indent: rng.chance(0.5) ? '\t' : '  ' }), 'utf8').toString('latin1');
    recipe = `synth(J=${t.joints.length},F=${t.frameCount},dec=${decimals ?? 'exact'})`;
  } else {
    const c = rng.pick(corpus);
    base = c.text;
    recipe = c.name;
  }
  const n = rng.chance(0.6) ? 1 : rng.int(2, 4);
  const steps: string[] = [];
  for (let k = 0; k < n; k++) {
    const name = rng.pick(MUTATION_NAMES);
    base = MUTATIONS[name]!(base, rng);
    steps.push(name);
  }
  return { input: Buffer.from(base, 'latin1'), recipe: `${recipe} + ${steps.join(', ')}` };
}

/** Returns a description of what is unsound about a parsed take, or null when it is sound. */
export function checkTake(t: Take): string | null {
  if (!(Number.isFinite(t.frameTime) && t.frameTime > 0)) return `frameTime ${t.frameTime}`;
  if (!Number.isInteger(t.frameCount) || t.frameCount < 1) return `frameCount ${t.frameCount}`;
  if (t.frameCount * t.channelCount !== t.values.length) return `frameCount*channelCount ${t.frameCount}*${t.channelCount} !== values.length ${t.values.length}`;
  if (!(t.values instanceof Float64Array)) return 'values is not a Float64Array';
  for (let i = 0; i < t.values.length; i++) if (!Number.isFinite(t.values[i]!)) return `value ${i} is ${t.values[i]}`;
  let running = 0;
  for (let j = 0; j < t.joints.length; j++) {
    const jt = t.joints[j]!;
    if (!jt.offset.every(Number.isFinite) || jt.offset.length !== 3) return `joint ${j} offset ${jt.offset}`;
    if (!(jt.parent >= -1 && jt.parent < j)) return `joint ${j} parent ${jt.parent}`;
    if (jt.channelStart !== running) return `joint ${j} channelStart ${jt.channelStart}, expected ${running}`;
    if (jt.endSite && jt.channels.length) return `End Site ${j} has channels`;
    if (new Set(jt.channels).size !== jt.channels.length) return `joint ${j} repeats a channel`;
    running += jt.channels.length;
  }
  if (running !== t.channelCount) return `channelCount ${t.channelCount}, joints sum to ${running}`;
  if (!Array.isArray(t.warnings) || !t.warnings.every((w) => typeof w === 'string')) return 'warnings are not strings';
  return null;
}

/** Returns a description of what is wrong with a parse error, or null when it is well formed. */
export function checkError(e: BvhParseError, file: string): string | null {
  if (!(Number.isInteger(e.line) && e.line >= 1)) return `error line ${e.line}`;
  if (!(Number.isInteger(e.column) && e.column >= 1)) return `error column ${e.column}`;
  if (!e.message.startsWith(`${file}:${e.line}:${e.column}: expected `)) return `message form: ${e.message.slice(0, 120)}`;
  if (!e.expected) return 'empty expected';
  return null;
}

export interface FuzzOptions {
  cases: number;
  seed: number;
  /** Also read every n-th case through a temp file and compare with the in-memory result (0: never). */
  fileEvery?: number;
  /** Also require error columns ≥ 1 (the vitest run and the standalone runner do; off only with the runner's --loose-columns). */
  strictColumns?: boolean;
  /** Called every `progressEvery` cases. */
  onProgress?: (done: number) => void;
  progressEvery?: number;
}

export interface FuzzSummary {
  cases: number;
  takes: number;
  errors: number;
  failures: CaseResult[];
  slowest: { seed: number; ms: number; recipe: string };
  fileChecks: number;
  totalMs: number;
}

/** Returns the outcome of one case: a take, an error, or a failure with its reason. */
export function runCase(seed: number, corpus: { name: string; text: string }[], options: { compareFile?: string; strictColumns?: boolean } = {}): CaseResult {
  const { input, recipe } = makeInput(seed, corpus);
  const file = 'fuzz.bvh';
  const t0 = performance.now();
  let take: Take | null = null;
  let error: unknown = null;
  try {
    take = parseBvh(input, { file });
  } catch (e) {
    error = e;
  }
  const ms = performance.now() - t0;
  const fail = (detail: string): CaseResult => ({ seed, kind: 'failure', ms, recipe, detail, input });
  if (ms > CASE_TIME_LIMIT_MS) return fail(`took ${ms.toFixed(1)} ms (limit ${CASE_TIME_LIMIT_MS})`);
  if (error !== null) {
    if (!(error instanceof BvhParseError)) return fail(`threw ${(error as Error)?.name ?? typeof error}: ${(error as Error)?.message ?? String(error)}`);
    const bad = checkError(error, file);
    if (bad && (options.strictColumns || !bad.startsWith('error column'))) return fail(bad);
  } else {
    const bad = checkTake(take!);
    if (bad) return fail(bad);
  }
  if (options.compareFile) {
    writeFileSync(options.compareFile, input);
    let ft: Take | null = null;
    let fe: unknown = null;
    try {
      ft = readBvhFile(options.compareFile, { file });
    } catch (e) {
      fe = e;
    }
    if (error !== null) {
      if (!(fe instanceof BvhParseError) || fe.message !== (error as Error).message) return fail(`file read disagrees: ${fe === null ? 'a Take' : (fe as Error).message} vs ${(error as Error).message}`);
    } else if (fe !== null || !sameTake(ft!, take!)) {
      return fail(`file read disagrees: ${fe === null ? 'a different Take' : (fe as Error).message}`);
    }
  }
  return { seed, kind: error === null ? 'take' : 'error', ms, recipe };
}

function sameTake(a: Take, b: Take): boolean {
  if (a.frameTime !== b.frameTime || a.frameCount !== b.frameCount || a.channelCount !== b.channelCount) return false;
  if (a.headerFrameCount !== b.headerFrameCount || a.joints.length !== b.joints.length) return false;
  if (JSON.stringify(a.joints) !== JSON.stringify(b.joints) || JSON.stringify(a.warnings) !== JSON.stringify(b.warnings)) return false;
  for (let i = 0; i < a.values.length; i++) if (!Object.is(a.values[i], b.values[i])) return false;
  return a.values.length === b.values.length;
}

/** Returns the summary of `cases` cases with seeds seed, seed+1, …; a case replays alone with --seed <its seed> --cases 1. */
export function runFuzz(options: FuzzOptions): FuzzSummary {
  const corpus = loadCorpus();
  const dir = options.fileEvery ? mkdtempSync(join(tmpdir(), 'jointloom-fuzz-')) : null;
  const summary: FuzzSummary = { cases: 0, takes: 0, errors: 0, failures: [], slowest: { seed: options.seed, ms: -1, recipe: '' }, fileChecks: 0, totalMs: 0 };
  const t0 = performance.now();
  try {
    for (let i = 0; i < options.cases; i++) {
      const seed = (options.seed + i) >>> 0;
      const compare = dir && options.fileEvery && i % options.fileEvery === 0 ? join(dir, 'case.bvh') : undefined;
      const r = runCase(seed, corpus, { compareFile: compare, strictColumns: options.strictColumns });
      summary.cases++;
      if (compare) summary.fileChecks++;
      if (r.kind === 'take') summary.takes++;
      else if (r.kind === 'error') summary.errors++;
      else summary.failures.push(r);
      if (r.ms > summary.slowest.ms) summary.slowest = { seed, ms: r.ms, recipe: r.recipe };
      if (options.onProgress && options.progressEvery && (i + 1) % options.progressEvery === 0) options.onProgress(i + 1);
    }
  } finally {
    if (dir) rmSync(dir, { recursive: true, force: true });
  }
  summary.totalMs = performance.now() - t0;
  return summary;
}
