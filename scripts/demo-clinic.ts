// The fictional clinic of the demo: its takes, their seeds and options, and how each file is rendered.
// Shared by scripts/make-demo-takes.ts (writes them) and the test that checks they regenerate exactly.
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { type SynthOptions, type SynthTruth, synthesizeTake } from '../src/synth/index.js';

export const CLINIC = 'Quillbrook Gait Studio';
export const DEMO_DIR = join(dirname(fileURLToPath(import.meta.url)), '..', 'demo-takes');

export interface DemoTake {
  file: string;
  subject: string;
  session: number;
  date: string;
  notes: string;
  options: Partial<SynthOptions> & { seed: number };
}

// Every subject, session, date and note below is invented.
export const DEMO_TAKES: DemoTake[] = [
  {
    file: 'S01-1-walk', subject: 'S01', session: 1, date: '2031-03-04',
    notes: 'Healthy adult, self-selected speed, straight walkway. Reference take.',
    options: { seed: 1101, subjectSeed: 11, height: 1.78, speed: 1.32, cadence: 110, duration: 22, frameRate: 100 },
  },
  {
    file: 'S01-2-walk', subject: 'S01', session: 2, date: '2031-04-15',
    notes: 'Healthy adult, second visit; exported in metres, Z up, XYZ channels, snake-case names.',
    options: { seed: 1102, subjectSeed: 11, height: 1.78, speed: 1.36, cadence: 112, duration: 22, frameRate: 100, units: 'm', upAxis: 'Z', rotationOrder: 'XYZ', naming: 'snake' },
  },
  {
    file: 'S02-1-walk', subject: 'S02', session: 1, date: '2031-03-11',
    notes: 'Right knee stiff (range about half of normal) with hip hiking and circumduction; slower.',
    options: { seed: 1201, subjectSeed: 12, height: 1.69, speed: 1.05, cadence: 102, duration: 25, frameRate: 100, naming: 'dotted', impairments: { right: { kneeRange: 0.5, compensate: true } } },
  },
  {
    file: 'S02-2-walk', subject: 'S02', session: 2, date: '2031-05-06',
    notes: 'Right knee range improved (about 80 % of normal), compensation gone; 120 Hz, YXZ channels.',
    options: { seed: 1202, subjectSeed: 12, height: 1.69, speed: 1.18, cadence: 106, duration: 20, frameRate: 120, naming: 'dotted', rotationOrder: 'YXZ', impairments: { right: { kneeRange: 0.8 } } },
  },
  {
    file: 'S03-1-walk', subject: 'S03', session: 1, date: '2031-03-18',
    notes: 'Painful left leg: shortened left stance, trunk lean over the left side, shorter left step.',
    options: { seed: 1301, subjectSeed: 13, height: 1.62, speed: 1.0, cadence: 104, duration: 24, frameRate: 100, naming: 'caps', units: 'mm', impairments: { left: { stanceShortening: 0.8, stepShortening: 0.4, compensate: true } } },
  },
  {
    file: 'S03-2-walk', subject: 'S03', session: 2, date: '2031-04-29',
    notes: 'Left stance nearly symmetric again. Noisy capture: marker jitter on every channel.',
    options: { seed: 1302, subjectSeed: 13, height: 1.62, speed: 1.15, cadence: 108, duration: 22, frameRate: 100, naming: 'caps', units: 'mm', noise: { rotationDeg: 0.6, positionMm: 1.5 }, impairments: { left: { stanceShortening: 0.2 } } },
  },
  {
    file: 'S04-1-walkway', subject: 'S04', session: 1, date: '2031-03-25',
    notes: 'Healthy adult on a 7 m walkway with 180° turns at each end; mixed per-joint channel orders.',
    options: { seed: 1401, subjectSeed: 14, height: 1.84, speed: 1.3, cadence: 108, duration: 30, frameRate: 100, naming: 'prefixed', rotationOrder: 'mixed', path: { kind: 'walkway', length: 7, radius: 1.1 } },
  },
  {
    file: 'S04-2-stumble', subject: 'S04', session: 2, date: '2031-05-13',
    notes: 'Straight walk with one stumble of the left swing near 11 s (see the truth sidecar); inches, ZYX.',
    options: { seed: 1402, subjectSeed: 14, height: 1.84, speed: 1.34, cadence: 110, duration: 22, frameRate: 100, naming: 'prefixed', units: 'in', rotationOrder: 'ZYX', stumbles: [{ time: 11, side: 'left' }] },
  },
  {
    file: 'S05-1-walk', subject: 'S05', session: 1, date: '2031-04-01',
    notes: 'Reduced left arm swing and left ankle range (stiff ankle, steppage compensation).',
    options: { seed: 1501, subjectSeed: 15, height: 1.73, speed: 1.2, cadence: 108, duration: 22, frameRate: 100, impairments: { left: { armSwing: 0.3, ankleRange: 0.5, compensate: true } } },
  },
  {
    file: 'S05-2-serpentine', subject: 'S05', session: 2, date: '2031-05-20',
    notes: 'Winding path (gentle left and right heading changes); Z up, centimetres, ZXY.',
    options: { seed: 1502, subjectSeed: 15, height: 1.73, speed: 1.25, cadence: 110, duration: 24, frameRate: 100, upAxis: 'Z', path: { kind: 'serpentine', amplitudeDeg: 25, wavelength: 7 }, impairments: { left: { armSwing: 0.5 } } },
  },
];

/** Returns JSON with two-space indentation but arrays of plain numbers kept on one line. */
export function compactJson(value: unknown): string {
  return JSON.stringify(value, null, 2).replace(/\[\s*((?:-?[\d.e+-]+|null)(?:,\s*(?:-?[\d.e+-]+|null))*)\s*\]/g, (_m, body: string) => `[${body.replace(/\s+/g, '')}]`) + '\n';
}

/** The three files of one demo take, as text. */
export interface RenderedTake {
  bvh: string;
  truth: string;
  session: string;
  truthObject: SynthTruth;
}

/** Returns the files of one demo take exactly as they are written to demo-takes/. */
export function renderDemoTake(t: DemoTake): RenderedTake {
  const { bvhText, truth } = synthesizeTake(t.options);
  return {
    bvh: bvhText,
    truth: compactJson(truth),
    session: compactJson({ clinic: CLINIC, subject: t.subject, session: t.session, date: t.date, notes: t.notes, invented: true }),
    truthObject: truth,
  };
}
