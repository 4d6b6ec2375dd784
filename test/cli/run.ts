// Runs the jointloom program in-process with stdout and stderr captured, for CLI tests.
import { buildProgram } from '../../src/cli/main.js';
import { runProgram } from '../../src/cli/program.js';

export interface CliResult {
  code: number;
  stdout: string;
  stderr: string;
}

/** Returns the exit code and the captured output of `jointloom <args>`. */
export async function runCli(args: string[]): Promise<CliResult> {
  let stdout = '';
  let stderr = '';
  const out = process.stdout.write.bind(process.stdout);
  const err = process.stderr.write.bind(process.stderr);
  process.stdout.write = ((chunk: string | Uint8Array) => ((stdout += String(chunk)), true)) as typeof process.stdout.write;
  process.stderr.write = ((chunk: string | Uint8Array) => ((stderr += String(chunk)), true)) as typeof process.stderr.write;
  const saved = process.exitCode;
  try {
    const program = buildProgram();
    program.configureOutput({ writeOut: (s) => (stdout += s), writeErr: (s) => (stderr += s) });
    for (const c of program.commands) c.configureOutput({ writeOut: (s) => (stdout += s), writeErr: (s) => (stderr += s) });
    const code = await runProgram(program, ['node', 'jointloom', ...args]);
    return { code, stdout, stderr };
  } finally {
    process.stdout.write = out;
    process.stderr.write = err;
    process.exitCode = saved;
  }
}
