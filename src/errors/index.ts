// The typed errors jointloom raises for bad user input; the CLI turns them into one line and an exit code.

/** Base class of every error caused by the user's input rather than by a bug. */
export class UserError extends Error {
  /** Exit status the CLI uses: 1 for bad input, 2 for usage. */
  readonly exitCode: number;
  constructor(message: string, exitCode = 1) {
    super(message);
    this.name = 'UserError';
    this.exitCode = exitCode;
  }
}

/** A BVH file that cannot be read, with the place and what was expected there. */
export class BvhParseError extends UserError {
  readonly file: string;
  readonly line: number;
  readonly column: number;
  readonly expected: string;
  readonly found: string;
  readonly hint: string | undefined;
  constructor(file: string, line: number, column: number, expected: string, found: string, hint?: string) {
    super(`${file}:${line}:${column}: expected ${expected}, found ${found}${hint ? ` (${hint})` : ''}`);
    this.name = 'BvhParseError';
    this.file = file;
    this.line = line;
    this.column = column;
    this.expected = expected;
    this.found = found;
    this.hint = hint;
  }
}

/** A wrong command-line usage: bad flag value, missing argument. */
export class UsageError extends UserError {
  constructor(message: string) {
    super(message, 2);
    this.name = 'UsageError';
  }
}

/** Input that parses but cannot be used for the job asked (e.g. a file whose roles cannot be found). */
export class InputError extends UserError {
  constructor(message: string) {
    super(message, 1);
    this.name = 'InputError';
  }
}
