// Shared pieces of every command: the caution on --help, output to stdout or a file, error reporting.
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { dirname, join } from 'node:path';
import { Command, CommanderError, InvalidArgumentError } from 'commander';
import { UsageError, UserError } from '../errors/index.js';
import { writeFileAtomic } from '../util/atomic.js';
import { CAUTION } from './caution.js';

/** Returns the package version (read once from package.json two folders up, in src/ and dist/ alike). */
export const VERSION: string = (() => {
  const here = dirname(fileURLToPath(import.meta.url));
  return (JSON.parse(readFileSync(join(here, '..', '..', 'package.json'), 'utf8')) as { version: string }).version;
})();

/** Returns a new sub-command with the caution appended to its help. */
export function newCommand(name: string): Command {
  return new Command(name).addHelpText('after', `\n${CAUTION}\n`).showHelpAfterError('(run with --help for usage)');
}

/** Writes text to stdout, or atomically to `file` when given. */
export function emit(text: string, file?: string): void {
  if (file && file !== '-') writeFileAtomic(file, text.endsWith('\n') ? text : text + '\n');
  else process.stdout.write(text.endsWith('\n') ? text : text + '\n');
}

/** Returns a commander parser for a finite number option within [min, max]. */
export function numberOption(min: number, max: number, integer = false): (v: string) => number {
  return (v: string) => {
    const n = Number(v);
    if (v.trim() === '' || !Number.isFinite(n) || n < min || n > max || (integer && !Number.isInteger(n)))
      throw new InvalidArgumentError(`expected ${integer ? 'a whole number' : 'a number'} from ${min} to ${max}, got "${v}".`);
    return n;
  };
}

/** Returns a commander parser that accepts one of `choices`. */
export function choiceOption<T extends string>(choices: readonly T[]): (v: string) => T {
  return (v: string) => {
    if (!(choices as readonly string[]).includes(v)) throw new InvalidArgumentError(`expected one of ${choices.join(', ')}, got "${v}".`);
    return v as T;
  };
}

/** Runs the program on argv, turning user errors into one stderr line and the documented exit code. */
export async function runProgram(program: Command, argv: string[]): Promise<number> {
  // Every command at every depth throws instead of exiting, so errors reach the handler below.
  const override = (c: Command): void => { c.exitOverride(); c.commands.forEach(override); };
  override(program);
  try {
    await program.parseAsync(argv);
    return typeof process.exitCode === 'number' ? process.exitCode : 0;
  } catch (err) {
    if (err instanceof CommanderError) {
      if (err.code === 'commander.helpDisplayed' || err.code === 'commander.version' || err.code === 'commander.help') return 0;
      return 2; // commander has already printed its one-line message
    }
    if (err instanceof UserError) {
      process.stderr.write(`jointloom: ${err.message}\n`);
      return err.exitCode;
    }
    if (isNodeFsError(err)) {
      process.stderr.write(`jointloom: ${err.path ?? ''}: ${fsReason(err.code)}\n`);
      return 1;
    }
    throw err;
  }
}

function isNodeFsError(err: unknown): err is NodeJS.ErrnoException {
  return err instanceof Error && typeof (err as NodeJS.ErrnoException).code === 'string' && typeof (err as NodeJS.ErrnoException).syscall === 'string';
}

function fsReason(code: string | undefined): string {
  switch (code) {
    case 'ENOENT': return 'no such file or folder';
    case 'EACCES': case 'EPERM': return 'permission denied';
    case 'EISDIR': return 'is a folder, expected a file';
    case 'ENOTDIR': return 'a part of the path is not a folder';
    case 'ENOSPC': return 'no space left on the device';
    default: return `cannot be read or written (${code})`;
  }
}

/** Throws a UsageError; for option checks that commander cannot express. */
export function usage(message: string): never {
  throw new UsageError(message);
}
