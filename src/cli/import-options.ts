// The import options every take-reading command shares: --units, --up, --sides, --roles.
import type { Command } from 'commander';
import { parseUnits, parseUp } from '../skeleton/frame.js';
import type { ImportOptions } from '../skeleton/import.js';
import { choiceOption } from './program.js';

export interface ImportFlags {
  units?: string;
  up?: string;
  sides?: 'names' | 'geometry';
  roles?: string;
}

/** Adds the shared import options to a command and returns it. */
export function withImportOptions(cmd: Command): Command {
  return cmd
    .option('--units <units>', 'length units of the file: m, cm, mm or in (default: detected)')
    .option('--up <axis>', 'up axis of the file: y or z, -y or -z for an upside-down export (default: detected)')
    .option('--sides <source>', 'who decides left and right when joint names and geometry disagree: names or geometry', choiceOption(['names', 'geometry'] as const))
    .option('--roles <file>', 'role-map JSON file ({"l_knee": "JointName", ...}) overriding the inferred roles');
}

/** Returns the library's import options from parsed flags (throws UsageError on bad values). */
export function importOptionsFrom(flags: ImportFlags): ImportOptions {
  return {
    units: flags.units === undefined ? undefined : parseUnits(flags.units),
    up: flags.up === undefined ? undefined : parseUp(flags.up),
    sides: flags.sides,
    roleMapFile: flags.roles,
  };
}
