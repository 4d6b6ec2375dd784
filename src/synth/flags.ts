// Command-line flags to walker options: the mapping the `synth` command uses, with typed usage errors.
import { UsageError } from '../errors/index.js';
import type { EulerOrder } from '../skeleton/euler.js';
import type { NamingStyle } from './naming.js';
import type { PathSpec, SideImpairment, StumbleSpec, SynthOptions } from './options.js';
import type { LengthUnit, UpAxis } from './skeleton.js';

/** Flag names understood by synthOptionsFromFlags, each with a one-line help text (the CLI may list them). */
export const SYNTH_FLAGS: Record<string, string> = {
  seed: 'trial seed (integer, required)',
  'subject-seed': "subject seed: the person's natural left/right differences (default: the trial seed)",
  height: 'body height in metres (default 1.75)',
  speed: 'walking speed in m/s (default 1.3)',
  cadence: 'cadence in steps per minute (default 110)',
  duration: 'take length in seconds (default 30)',
  fps: 'frames per second (default 120)',
  stance: 'stance share of the cycle, 0..1 (default: from speed)',
  'step-width': 'step width in metres (default 0.1)',
  'toe-out': 'toe-out angle in degrees (default 6)',
  order: 'rotation channel order: XYZ XZY YXZ YZX ZXY ZYX or mixed (default ZXY)',
  units: 'length unit: m cm mm in (default cm)',
  up: 'up axis: Y or Z (default Y)',
  naming: 'joint naming style: camel snake dotted prefixed caps (default camel)',
  'all-positions': 'write position channels on every joint',
  decimals: 'fixed decimals of frame values (default by unit)',
  'stride-cv': 'stride-time coefficient of variation (default 0.015)',
  'step-cv': 'step-length coefficient of variation (default 0.02)',
  asymmetry: 'scale of natural left/right differences (default 1)',
  'noise-deg': 'sensor jitter on rotation channels, SD in degrees (default 0)',
  'noise-mm': 'sensor jitter on root positions, SD in mm (default 0)',
  path: 'straight, circle, walkway or serpentine (default straight)',
  radius: 'circle or turn radius in metres',
  length: 'walkway straight length in metres',
  turn: 'turn direction: left or right',
  heading: 'initial heading in degrees',
  'impair-left': 'left-side impairment, e.g. knee=0.5,hip=0.8,ankle=0.7,stance=0.5,step=0.3,arm=0.2,compensate',
  'impair-right': 'right-side impairment, same form as --impair-left',
  stumble: 'stumbles as time:side[:severity], comma-separated, e.g. 12.5:left,20:right:0.6',
};

const num = (name: string, v: string | boolean | undefined): number | undefined => {
  if (v === undefined) return undefined;
  const x = typeof v === 'string' ? Number(v) : NaN;
  if (typeof v !== 'string' || v.trim() === '' || !Number.isFinite(x)) throw new UsageError(`--${name} expects a number (got ${String(v)})`);
  return x;
};

const str = (name: string, v: string | boolean | undefined): string | undefined => {
  if (v === undefined) return undefined;
  if (typeof v !== 'string' || v === '') throw new UsageError(`--${name} expects a value`);
  return v;
};

/** Returns the side impairment described by text such as "knee=0.5,ankle=0.8,compensate". */
export function parseImpairment(flag: string, text: string): SideImpairment {
  const keys: Record<string, keyof SideImpairment> = {
    hip: 'hipRange', knee: 'kneeRange', ankle: 'ankleRange', stance: 'stanceShortening', step: 'stepShortening', arm: 'armSwing',
  };
  const out: SideImpairment = {};
  for (const part of text.split(',').map((p) => p.trim()).filter(Boolean)) {
    if (part === 'compensate') { out.compensate = true; continue; }
    const [k, v] = part.split('=');
    const key = keys[k ?? ''];
    const x = Number(v);
    if (!key || v === undefined || !Number.isFinite(x))
      throw new UsageError(`--${flag}: cannot read "${part}" (use hip, knee, ankle, stance, step or arm = a number 0..1, or compensate)`);
    (out as Record<string, number>)[key] = x;
  }
  return out;
}

/** Returns walker options from command-line flags (names as in SYNTH_FLAGS); unknown flags are left to the caller. */
export function synthOptionsFromFlags(flags: Record<string, string | boolean | undefined>): Partial<SynthOptions> & { seed: number } {
  const seed = num('seed', flags.seed);
  if (seed === undefined) throw new UsageError('--seed is required (an integer)');
  const o: Partial<SynthOptions> & { seed: number } = { seed };
  const set = <K extends keyof SynthOptions>(k: K, v: SynthOptions[K] | undefined) => { if (v !== undefined) o[k] = v; };
  set('subjectSeed', num('subject-seed', flags['subject-seed']));
  set('height', num('height', flags.height));
  set('speed', num('speed', flags.speed));
  set('cadence', num('cadence', flags.cadence));
  set('duration', num('duration', flags.duration));
  set('frameRate', num('fps', flags.fps));
  set('stanceFraction', num('stance', flags.stance));
  set('stepWidth', num('step-width', flags['step-width']));
  set('toeOutDeg', num('toe-out', flags['toe-out']));
  const order = str('order', flags.order);
  if (order !== undefined) set('rotationOrder', order.toUpperCase() === 'MIXED' ? 'mixed' : (order.toUpperCase() as EulerOrder));
  set('units', str('units', flags.units) as LengthUnit | undefined);
  const up = str('up', flags.up);
  if (up !== undefined) set('upAxis', up.toUpperCase() as UpAxis);
  set('naming', str('naming', flags.naming) as NamingStyle | undefined);
  if (flags['all-positions'] !== undefined) set('positionsOnAllJoints', flags['all-positions'] !== 'false');
  set('decimals', num('decimals', flags.decimals));
  set('strideTimeCv', num('stride-cv', flags['stride-cv']));
  set('stepLengthCv', num('step-cv', flags['step-cv']));
  set('asymmetry', num('asymmetry', flags.asymmetry));
  const nd = num('noise-deg', flags['noise-deg']), nm = num('noise-mm', flags['noise-mm']);
  if (nd !== undefined || nm !== undefined) set('noise', { rotationDeg: nd ?? 0, positionMm: nm ?? 0 });
  const kind = str('path', flags.path);
  const radius = num('radius', flags.radius), length = num('length', flags.length), turn = str('turn', flags.turn);
  if (kind !== undefined || radius !== undefined || length !== undefined || turn !== undefined) {
    if (turn !== undefined && turn !== 'left' && turn !== 'right') throw new UsageError(`--turn expects left or right (got ${turn})`);
    const path: PathSpec = { kind: (kind ?? 'straight') as PathSpec['kind'] };
    if (radius !== undefined) path.radius = radius;
    if (length !== undefined) path.length = length;
    if (turn !== undefined) path.turn = turn;
    set('path', path);
  }
  set('initialHeadingDeg', num('heading', flags.heading));
  const il = str('impair-left', flags['impair-left']), ir = str('impair-right', flags['impair-right']);
  if (il !== undefined || ir !== undefined) {
    const imp: SynthOptions['impairments'] = {};
    if (il !== undefined) imp.left = parseImpairment('impair-left', il);
    if (ir !== undefined) imp.right = parseImpairment('impair-right', ir);
    set('impairments', imp);
  }
  const st = str('stumble', flags.stumble);
  if (st !== undefined) {
    const list: StumbleSpec[] = st.split(',').map((p) => {
      const [t, side, sev] = p.trim().split(':');
      const time = Number(t);
      if (!Number.isFinite(time) || (side !== 'left' && side !== 'right') || (sev !== undefined && !Number.isFinite(Number(sev))))
        throw new UsageError(`--stumble: cannot read "${p}" (use time:side[:severity], e.g. 12.5:left)`);
      return sev === undefined ? { time, side } : { time, side, severity: Number(sev) };
    });
    set('stumbles', list);
  }
  return o;
}
