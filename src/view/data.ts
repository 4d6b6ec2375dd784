// Everything the viewer's API serves for one take, computed once when `jointloom view` starts.
import { endianness } from 'node:os';
import { basename } from 'node:path';
import { analyzeGait, gaitResultJson } from '../gait/analyze.js';
import { UserError } from '../errors/index.js';
import type { ImportedTake } from '../skeleton/import.js';
import { displayPositions, displayStride, floorHeight, viewJoints } from './display.js';
import { pairDistanceSpread } from './pairs.js';
import type { ViewEvents, ViewGait, ViewPairs, ViewTake } from './types.js';

/** The API's payloads, ready to send. */
export interface ViewData {
  take: ViewTake;
  /** Display positions as little-endian float32 bytes. */
  positions: Buffer;
  events: ViewEvents;
  gait: ViewGait;
  pairs: ViewPairs;
}

export interface ViewDataOptions {
  /** Tool version for the gait result's provenance. */
  version: string;
  /** Caution shown in the page footer. */
  caution: string;
  /** Highest display rate in Hz (default 60). */
  maxHz?: number;
}

/** Returns the viewer's payloads for an imported take (gait analysis on every frame, display decimated). */
export function buildViewData(imported: ImportedTake, options: ViewDataOptions): ViewData {
  const { take, frame } = imported;
  const fps = 1 / take.frameTime;
  const stride = displayStride(fps, options.maxHz);
  const f32 = displayPositions(take, frame, stride);
  const positions = Buffer.from(f32.buffer, f32.byteOffset, f32.byteLength);
  if (endianness() === 'BE') positions.swap32();
  const joints = viewJoints(take, frame);
  const file = basename(imported.path);

  let gait: ViewGait;
  let events: ViewEvents;
  try {
    const analysis = analyzeGait(imported);
    gait = { available: true, result: gaitResultJson(analysis, { tool: 'jointloom', version: options.version, file }) };
    events = {
      events: analysis.detection.events.map((e) => ({ side: e.side, kind: e.kind, frame: e.frame, time: e.time, steady: e.steady, disagree: e.disagree })),
      passes: analysis.detection.passes.map((q) => ({ index: q.index, startS: q.startFrame / fps, endS: q.endFrame / fps })),
      note: analysis.detection.events.length ? null : 'no gait events were found in this take',
    };
  } catch (err) {
    if (!(err instanceof UserError)) throw err;
    gait = { available: false, reason: err.message };
    events = { events: [], passes: [], note: err.message };
  }

  const displayFrames = Math.ceil(take.frameCount / stride);
  const viewTake: ViewTake = {
    format: 'jointloom-view-take',
    version: 1,
    file,
    sourceFps: fps,
    sourceFrames: take.frameCount,
    stride,
    displayFps: fps / stride,
    displayFrames,
    durationS: take.frameCount * take.frameTime,
    joints,
    pelvis: frame.roles.roles.pelvis?.joint ?? 0,
    floorY: floorHeight(f32),
    units: frame.units.units,
    up: `${frame.up.sign < 0 ? '-' : '+'}${frame.up.up}`,
    positions: { path: '/api/positions', byteLength: positions.byteLength, layout: `${displayFrames} frames x ${joints.length} joints x 3, float32 little-endian, metres, Y up` },
    features: { gait: gait.available, pairs: true, forecast: false, factors: false },
    forecast: null,
    warnings: imported.warnings,
    caution: options.caution,
  };
  return { take: viewTake, positions, events, gait, pairs: pairDistanceSpread(take, frame) };
}
