// Events files: CSV and JSON round trips, hand-edited files, and bad rows reported with file and line.
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { InputError, UsageError } from '../../src/errors/index.js';
import { detectEvents } from '../../src/gait/events.js';
import { eventsFormatOf, parseEvents, readEvents, writeEvents } from '../../src/gait/events-io.js';
import { detectionFromEvents } from '../../src/gait/events-review.js';
import { prepareGait } from '../../src/gait/input.js';
import type { GaitEvent } from '../../src/gait/types.js';
import { resolveImported } from '../../src/skeleton/import.js';
import { synthesizeTake } from '../../src/synth/index.js';

const FPS = 120, FRAMES = 2400;
const ev = (side: GaitEvent['side'], kind: GaitEvent['kind'], time: number, extra: Partial<GaitEvent> = {}): GaitEvent => ({
  side, kind, frame: Math.round(time * FPS), time, checkFrame: Math.round(time * FPS) + 1, disagree: false, pass: 0, steady: true, source: 'detected', ...extra,
});
// A small set with sub-frame times (bias-corrected), a missing cross-check and a non-steady event.
const EVENTS: GaitEvent[] = [
  ev('left', 'initial_contact', 0.504167, { steady: false }),
  ev('right', 'toe_off', 0.601234, { checkFrame: null, disagree: true }),
  ev('right', 'initial_contact', 1.052083),
  ev('left', 'toe_off', 1.148),
  ev('left', 'initial_contact', 1.6, { pass: 1 }),
];

const dir = mkdtempSync(join(tmpdir(), 'jointloom-events-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
const file = (name: string, text: string) => { const p = join(dir, name); writeFileSync(p, text); return p; };

describe('round trip', () => {
  for (const format of ['csv', 'json'] as const) {
    it(`keeps side, kind, frame and time through ${format}`, () => {
      const text = writeEvents(EVENTS, FPS, format);
      const back = readEvents(file(`take.${format}`, text), FPS, FRAMES);
      expect(back.length).toBe(EVENTS.length);
      back.forEach((b, i) => {
        const a = EVENTS[i]!;
        expect([b.side, b.kind, b.frame]).toEqual([a.side, a.kind, a.frame]);
        expect(b.time).toBeCloseTo(a.time, 6); // written to the microsecond
        expect([b.pass, b.steady, b.checkFrame, b.disagree]).toEqual([a.pass, a.steady, a.checkFrame, a.disagree]);
        expect(b.source).toBe('file');
      });
    });
  }

  it('chooses the format by extension', () => {
    expect(eventsFormatOf('a/b.CSV')).toBe('csv');
    expect(eventsFormatOf('b.json')).toBe('json');
    expect(() => eventsFormatOf('b.txt')).toThrow(UsageError);
  });

  it('reads a minimal hand-written CSV: only side, kind and frame or time, quotes, CRLF, comments, any order', () => {
    const text = '\ufeff# reviewed\r\n"kind",side,time,frame\r\nIC,L,,12\r\n"toe-off",right,0.5,\r\n\r\ninitial_contact,R,1.25,150\r\n';
    const back = parseEvents(text, 'hand.csv', 'csv', FPS, FRAMES);
    // frame 12 at 120 fps is 0.1 s; time 0.5 s is frame 60; 1.25 s is frame 150 exactly.
    expect(back.map((e) => [e.side, e.kind, e.frame, e.time])).toEqual([
      ['left', 'initial_contact', 12, 0.1], ['right', 'toe_off', 60, 0.5], ['right', 'initial_contact', 150, 1.25],
    ]);
    expect(back.every((e) => e.pass === -1 && e.steady && e.checkFrame === null && !e.disagree)).toBe(true);
  });
});

describe('review cycle: detect, write, read back, recompute', () => {
  it('gives back the same events, passes, steadiness and cross-checks when nothing was edited', () => {
    const g = prepareGait(resolveImported('cycle.bvh', synthesizeTake({ seed: 21, duration: 10 }).take));
    const det = detectEvents(g);
    for (const format of ['csv', 'json'] as const) {
      const read = readEvents(file(`cycle.${format}`, writeEvents(det.events, g.fps, format)), g.fps, g.frames);
      const back = detectionFromEvents(g, read);
      expect(back.passes).toEqual(det.passes);
      expect(back.events.map((e) => [e.side, e.kind, e.frame, e.pass, e.steady, e.checkFrame, e.disagree]))
        .toEqual(det.events.map((e) => [e.side, e.kind, e.frame, e.pass, e.steady, e.checkFrame, e.disagree]));
    }
  });
});

describe('bad rows name the file and line', () => {
  const csv = (rows: string) => `# header next\nside,kind,frame,time\n${rows}`;
  const cases: [string, string, RegExp][] = [
    ['side', 'left,initial_contact,10,\nmiddle,toe_off,20,\n', /^bad\.csv:4: side "middle" is not one of left, right$/],
    ['kind', 'left,heel_strike,10,\n', /^bad\.csv:3: kind "heel_strike" is not one of initial_contact, toe_off$/],
    ['missing side', ',toe_off,10,\n', /^bad\.csv:3: missing side/],
    ['non-numeric frame', 'left,toe_off,ten,\n', /^bad\.csv:3: frame "ten" is not a number$/],
    ['fractional frame', 'left,toe_off,10.5,\n', /^bad\.csv:3: frame 10.5 is not a whole number of at least 0$/],
    ['frame past the end', 'left,toe_off,2400,\n', /^bad\.csv:3: frame 2400 is past the take's last frame \(2399\)$/],
    ['neither frame nor time', 'left,toe_off,,\n', /^bad\.csv:3: give a frame or a time for the event$/],
    // 120 at 120 fps is 1.000 s; 1.1 s is 12 frames away, more than half a frame.
    ['frame and time disagree', 'left,toe_off,120,1.1\n', /^bad\.csv:3: frame 120 and time 1\.1 s disagree \(frame 120 is at 1\.000000 s at 120 fps\)/],
    ['time outside', 'left,toe_off,,-1\n', /^bad\.csv:3: time -1 s lies outside the take/],
    ['duplicate', 'left,toe_off,10,\nright,toe_off,10,\nleft,toe_off,10,\n', /^bad\.csv:5: left toe_off at frame 10 is already given on line 3$/],
    ['too many cells', 'left,toe_off,10,,extra\n', /^bad\.csv:3: 5 cells but the header names 4 columns$/],
  ];
  for (const [name, rows, re] of cases)
    it(name, () => {
      const p = file('bad.csv', csv(rows));
      expect(() => readEvents(p, FPS, FRAMES)).toThrow(InputError);
      try { readEvents(p, FPS, FRAMES); } catch (e) { expect((e as Error).message.slice(dir.length + 1)).toMatch(re); }
    });

  it('a header without side, or without frame and time, is refused on its line', () => {
    expect(() => parseEvents('\nkind,frame\n', 'h.csv', 'csv', FPS, FRAMES)).toThrow(/^h\.csv:2: the header lacks the side column/);
    expect(() => parseEvents('side,kind,pass\n', 'h.csv', 'csv', FPS, FRAMES)).toThrow(/^h\.csv:1: the header needs a frame or a time column$/);
    expect(() => parseEvents('# only a comment\n', 'h.csv', 'csv', FPS, FRAMES)).toThrow(/^h\.csv: the events file is empty/);
    expect(() => parseEvents('side,kind,frame\n', 'h.csv', 'csv', FPS, FRAMES)).toThrow(/^h\.csv: the events file holds no events$/);
  });

  it('JSON: the line of the bad event, syntax errors with line and column, and a frame rate mismatch', () => {
    const good = writeEvents(EVENTS, FPS, 'json');
    // The writer puts one event a line after 5 header lines, so event 3 sits on line 8.
    const bad = good.replace('"side":"right","kind":"initial_contact"', '"side":"up","kind":"initial_contact"');
    expect(() => parseEvents(bad, 'e.json', 'json', FPS, FRAMES)).toThrow(/^e\.json:8: side "up" is not one of left, right$/);
    const broken = good.replace('"version": 1,', '"version": 1');
    expect(() => parseEvents(broken, 'e.json', 'json', FPS, FRAMES)).toThrow(/^e\.json:4:3: not valid JSON/);
    expect(() => parseEvents(good, 'e.json', 'json', 100, FRAMES)).toThrow('e.json: the events were written for a take at 120 fps, but this take runs at 100 fps');
    expect(() => parseEvents('{"events": [1]}', 'e.json', 'json', FPS, FRAMES)).toThrow(/^e\.json:1: event 1 is not an object$/);
    expect(() => parseEvents('[]', 'e.json', 'json', FPS, FRAMES)).toThrow(/^e\.json:1: expected an object with an "events" array/);
    const spread = '{\n "events": [\n  {"side": "left", "kind": "ic", "frame": 5},\n\n  {"side": "left",\n   "kind": "to", "frame": -2}\n ]\n}';
    expect(() => parseEvents(spread, 'e.json', 'json', FPS, FRAMES)).toThrow(/^e\.json:5: frame -2 is not a whole number of at least 0$/);
  });

  it('a missing file is an InputError naming it', () => {
    expect(() => readEvents(join(dir, 'none.csv'), FPS, FRAMES)).toThrow(/none\.csv: cannot read the events file \(ENOENT\)$/);
  });
});
