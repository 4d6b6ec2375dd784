// The take's frame of reference resolved once: units, up axis and joint roles, each detected with
// evidence or set by the caller (the CLI's --units, --up, --sides and role-map file).
import type { Take } from '../bvh/take.js';
import { UsageError } from '../errors/index.js';
import { inferRoles, type RoleDetection, type RoleOverrides, type SidePolicy } from './roles.js';
import { detectUnits, detectUp, METRES_PER_UNIT, type UnitsDetection, type Units, type UpAxis, type UpDetection } from './units.js';

export interface FrameOptions {
  units?: Units;
  up?: UpAxis | '-y' | '-z';
  sides?: SidePolicy;
  roleMap?: RoleOverrides;
  /** World positions frames x joints x 3, when already computed (saves a pass for up detection). */
  positions?: Float64Array;
}

export interface ResolvedFrame {
  units: UnitsDetection & { overridden: boolean };
  up: UpDetection & { overridden: boolean };
  roles: RoleDetection;
}

/** Returns the units named by a command-line value (m, cm, mm, in/inch/inches); throws UsageError otherwise. */
export function parseUnits(text: string): Units {
  const t = text.trim().toLowerCase();
  const map: Record<string, Units> = { m: 'm', metre: 'm', metres: 'm', meter: 'm', meters: 'm', cm: 'cm', mm: 'mm', in: 'in', inch: 'in', inches: 'in' };
  const u = map[t];
  if (!u) throw new UsageError(`--units must be one of m, cm, mm, in (got "${text}").`);
  return u;
}

/** Returns the up axis named by a command-line value (y, z, -y, -z); throws UsageError otherwise. */
export function parseUp(text: string): UpAxis | '-y' | '-z' {
  const t = text.trim().toLowerCase().replace(/^\+/, '');
  if (t === 'y' || t === 'z' || t === '-y' || t === '-z') return t;
  throw new UsageError(`--up must be y or z (or -y, -z for a take written upside down), got "${text}".`);
}

/** Returns units, up axis and roles of a take, detections replaced by the caller's values where given. */
export function resolveFrame(take: Take, options: FrameOptions = {}): ResolvedFrame {
  const roles = inferRoles(take, { sides: options.sides, overrides: options.roleMap });
  const units = detectUnits(take, roles.roles);
  const up = detectUp(take, options.positions, roles.roles);
  let unitsOut: ResolvedFrame['units'] = { ...units, overridden: false };
  if (options.units) {
    const same = options.units === units.units;
    unitsOut = {
      ...units,
      units: options.units,
      metresPerUnit: METRES_PER_UNIT[options.units],
      confidence: 1,
      overridden: true,
      evidence: [`Units set by the caller to ${options.units}${same ? ', as detected' : `; the detection alone would have chosen ${units.units}`}.`, ...units.evidence],
    };
  }
  let upOut: ResolvedFrame['up'] = { ...up, overridden: false };
  if (options.up) {
    const axis: UpAxis = options.up.endsWith('z') ? 'z' : 'y';
    const sign: 1 | -1 = options.up.startsWith('-') ? -1 : 1;
    const vector: [number, number, number] = axis === 'z' ? [0, 0, sign] : [0, sign, 0];
    const same = axis === up.up && sign === up.sign;
    upOut = {
      ...up,
      up: axis,
      sign,
      vector,
      confidence: 1,
      overridden: true,
      evidence: [`Up axis set by the caller to ${options.up}${same ? ', as detected' : `; the detection alone would have chosen ${up.sign < 0 ? '-' : ''}${up.up}`}.`, ...up.evidence],
    };
  }
  return { units: unitsOut, up: upOut, roles };
}
