// Importing a take: parse the file, then resolve units, up axis and joint roles once, with evidence.
import type { Take } from '../bvh/take.js';
import { readBvhFile } from '../bvh/parse.js';
import { resolveFrame, type FrameOptions, type ResolvedFrame } from './frame.js';
import { loadRoleMapFile } from './rolefile.js';

export interface ImportOptions {
  units?: FrameOptions['units'];
  up?: FrameOptions['up'];
  sides?: FrameOptions['sides'];
  /** Path of a role-map JSON file whose roles replace the inferred ones. */
  roleMapFile?: string;
}

/** A take with its frame of reference and every warning of the parse and the detections. */
export interface ImportedTake {
  path: string;
  take: Take;
  frame: ResolvedFrame;
  warnings: string[];
}

/** Returns the take at `path` parsed and resolved; throws BvhParseError or InputError on bad input. */
export function importTake(path: string, options: ImportOptions = {}): ImportedTake {
  const take = readBvhFile(path);
  return resolveImported(path, take, options);
}

/** Returns a parsed take resolved (units, up, roles) under the given options. */
export function resolveImported(path: string, take: Take, options: ImportOptions = {}): ImportedTake {
  const roleMap = options.roleMapFile ? loadRoleMapFile(options.roleMapFile, take) : undefined;
  const frame = resolveFrame(take, { units: options.units, up: options.up, sides: options.sides, roleMap });
  const warnings = [...take.warnings, ...frame.roles.warnings];
  if (!frame.units.overridden && frame.units.confidence < 0.6)
    warnings.push(`${path}: units are uncertain (${frame.units.units}, confidence ${frame.units.confidence.toFixed(2)}); pass --units to set them.`);
  if (!frame.up.overridden && frame.up.confidence < 0.6)
    warnings.push(`${path}: the up axis is uncertain (${frame.up.up}, confidence ${frame.up.confidence.toFixed(2)}); pass --up to set it.`);
  return { path, take, frame, warnings };
}
