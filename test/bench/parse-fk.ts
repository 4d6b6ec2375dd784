// Benchmark section: BVH parse and forward kinematics, jointloom side by side with three.js's
// BVHLoader + scene graph on the same text, a bare number scan as the practical limit, and the peak
// memory of a parse measured in child processes.
import { spawnSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { parseBvh, readBvhFile } from '../../src/bvh/index.js';
import { forwardKinematics } from '../../src/skeleton/fk.js';
import { loadWithThree, poseWithThree, positionChannelAxes } from '../reference/three-fk.js';
import { bareScan, motionStart } from './bare-scan.js';
import { measure, measureInterleaved, median } from './stats.js';
import { ratio, type Section } from './report.js';
import type { BenchInput } from './take-source.js';

export interface ParseFkOptions {
  input: BenchInput;
  /** Repetitions of the fast measurements (jointloom, bare scan); three.js gets fewer. */
  reps: number;
  threeReps: number;
  memoryReps: number;
}

const MB = 1e6;

interface ChildMemory {
  peakRssBytes: number;
  peakSource: string;
  arrayBuffersBefore: number;
  arrayBuffersAfter: number;
  values: number;
  gc: boolean;
}

function runChild(mode: 'baseline' | 'parse', path: string): ChildMemory {
  const script = fileURLToPath(new URL('./memory-child.ts', import.meta.url));
  const res = spawnSync(process.execPath, ['--expose-gc', '--import', 'tsx', script, mode, path], { encoding: 'utf8' });
  if (res.status !== 0) throw new Error(`memory child (${mode}) failed: ${res.stderr}`);
  return JSON.parse(res.stdout.trim().split('\n').pop()!) as ChildMemory;
}

/** Returns the parse / FK section: timings, throughputs, memory, and the four target ratios. */
export function runParseFk(opts: ParseFkOptions): Section {
  const { input, reps, threeReps, memoryReps } = opts;
  const bytes = readFileSync(input.path);
  const text = bytes.toString('utf8');
  const size = bytes.length;
  const notes: string[] = [];

  // (a) jointloom parse, from the file in chunks and from bytes in memory (and, for reference, a string).
  // (b) jointloom FK over all frames into a preallocated buffer.
  // (d) bare scan of the MOTION bytes.
  // All measured round-robin in one loop, so a change of machine speed during the run hits them alike.
  const take = parseBvh(bytes);
  const F = take.frameCount;
  const J = take.joints.length;
  const out = new Float64Array(F * J * 3);
  const start = motionStart(bytes);
  const scratch = new Float64Array(take.values.length + take.channelCount);
  const fast = measureInterleaved(
    {
      file: () => readBvhFile(input.path),
      bytes: () => parseBvh(bytes),
      string: () => parseBvh(text),
      fk: () => forwardKinematics(take, 0, F, out),
      scan: () => bareScan(bytes, start, scratch),
    },
    2,
    reps,
  );
  const tFile = fast['file']!, tMem = fast['bytes']!, tStr = fast['string']!, tFk = fast['fk']!, tScan = fast['scan']!;

  // (c) three.js: BVHLoader.parse on the same text, then its scene graph over every frame.
  const tThreeParse = measure(() => loadWithThree(text), 1, threeReps);
  const loaded = loadWithThree(text);
  const axes = positionChannelAxes(text);
  const tThreeFk = measure(() => poseWithThree(loaded.bones, loaded.tracks, [], axes), 1, threeReps);
  const three = poseWithThree(loaded.bones, loaded.tracks, [], axes);
  // Same work check: root-relative positions agree (float32 tracks on three's side).
  let worst = 0;
  for (let f = 0; f < Math.min(F, three.frames); f++)
    for (let j = 1; j < J; j++)
      for (let a = 0; a < 3; a++) {
        const o = f * J * 3;
        const d = Math.abs(out[o + j * 3 + a]! - out[o + a]! - (three.positions[o + j * 3 + a]! - three.positions[o + a]!));
        if (!(d <= worst)) worst = d;
      }
  notes.push(`three.js and jointloom root-relative joint positions differ by at most ${worst.toExponential(2)} file units over ${F} frames (three's tracks are float32).`);

  // (d) the bare scan reads the same numbers as the parser.
  const scanned = bareScan(bytes, start, scratch);
  let same = scanned === take.values.length;
  for (let k = 0; same && k < scanned; k++) if (scratch[k] !== take.values[k]) same = false;
  notes.push(`bare scan read ${scanned} numbers${same ? ', bit-identical to the parser' : ', NOT identical to the parser (check the file format)'}.`);
  const motionBytes = size - start;

  // (e) peak memory: child processes, max RSS of a parse minus max RSS of a child that only loads the parser.
  const base: number[] = [];
  const parse: number[] = [];
  let child: ChildMemory | null = null;
  for (let i = 0; i < memoryReps; i++) {
    base.push(runChild('baseline', input.path).peakRssBytes);
    child = runChild('parse', input.path);
    parse.push(child.peakRssBytes);
  }
  base.sort((a, b) => a - b);
  parse.sort((a, b) => a - b);
  const peak = median(parse) - median(base);
  const retained = child ? child.arrayBuffersAfter - child.arrayBuffersBefore : NaN;

  const jlParseFk = tMem.median + tFk.median;
  const threeParseFk = tThreeParse.median + tThreeFk.median;
  const rows = [
    { name: 'file size', value: size / MB, unit: 'MB', note: `${F} frames x ${take.channelCount} channels, ${J} joints (End Sites included); MB = 10^6 bytes` },
    { name: '(a) readBvhFile', value: size / MB / tFile.median, unit: 'MB/s', note: `${ms(tFile.median)} median of ${tFile.reps} (file in page cache, 1 MiB chunks)` },
    { name: '(a) parseBvh(bytes)', value: size / MB / tMem.median, unit: 'MB/s', note: `${ms(tMem.median)} median of ${tMem.reps}` },
    { name: '    parseBvh(string)', value: size / MB / tStr.median, unit: 'MB/s', note: `${ms(tStr.median)} median of ${tStr.reps} (includes UTF-8 encoding)` },
    { name: '(b) jointloom FK', value: F / tFk.median, unit: 'frames/s', note: `${ms(tFk.median)} median of ${tFk.reps}, all frames` },
    { name: '(c) three BVHLoader.parse', value: size / MB / tThreeParse.median, unit: 'MB/s', note: `${ms(tThreeParse.median)} median of ${tThreeParse.reps}` },
    { name: '(c) three scene-graph FK', value: F / tThreeFk.median, unit: 'frames/s', note: `${ms(tThreeFk.median)} median of ${tThreeFk.reps} (set position/quaternion, updateMatrixWorld, read world positions)` },
    { name: '(d) bare scan', value: motionBytes / MB / tScan.median, unit: 'MB/s', note: `${ms(tScan.median)} median of ${tScan.reps} over the ${(motionBytes / MB).toFixed(1)} MB MOTION section` },
    { name: '(e) peak parse memory', value: peak / MB, unit: 'MB', note: `peak RSS of a parsing child minus a loading-only child, median of ${memoryReps}; take's arrays ${(retained / MB).toFixed(1)} MB` },
    { name: 'parse+FK jointloom', value: jlParseFk * 1000, unit: 'ms', note: 'parseBvh(bytes) + FK' },
    { name: 'parse+FK three.js', value: threeParseFk * 1000, unit: 'ms', note: 'BVHLoader.parse(text) + scene-graph FK' },
  ];
  notes.push(
    `memory method: each child runs "node --expose-gc --import tsx test/bench/memory-child.ts"; the baseline child loads the parser and exits, the parsing child also runs readBvhFile on the file; peak = median peak RSS of parsing children minus that of baseline children. Peak RSS is ${child?.peakSource === 'VmHWM' ? 'VmHWM from /proc/self/status (getrusage maxRSS would carry over the forked parent image)' : 'process.resourceUsage().maxRSS'}.`,
  );
  return {
    title: 'parse and forward kinematics',
    rows,
    ratios: [
      ratio('parse+FK speed-up vs three.js', threeParseFk / jlParseFk, '>=', 10, 'both from memory, same text'),
      ratio('readBvhFile parse MB/s', size / MB / tFile.median, '>=', 150),
      ratio('parse time / bare-scan time', tMem.median / tScan.median, '<=', 2, 'parseBvh(bytes) vs bare scan'),
      ratio('peak memory / file size', peak / size, '<=', 4),
    ],
    notes,
  };
}

function ms(s: number): string {
  return `${(s * 1000).toFixed(1)} ms`;
}
