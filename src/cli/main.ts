#!/usr/bin/env node
// The jointloom command line: registers one command per file and maps errors to exit codes.
import { Command } from 'commander';
import { CAUTION } from './caution.js';
import { VERSION, runProgram } from './program.js';
import { register as registerInspect } from './inspect.js';
import { register as registerExport } from './export.js';
import { register as registerSynth } from './synth.js';
import { register as registerGait } from './gait.js';
import { register as registerNorms } from './norms.js';
import { register as registerFit } from './fit.js';
import { register as registerForecast } from './forecast.js';
import { register as registerCouplings } from './couplings.js';
import { register as registerBatch } from './batch.js';
import { register as registerLedger } from './ledger.js';
import { register as registerView } from './view.js';

/** Returns the program with every command registered. */
export function buildProgram(): Command {
  const program = new Command('jointloom')
    .description('Gait analysis from BVH motion capture: import, forward kinematics, joint roles, gait events, parameters, joint angles, symmetry and reference scores, a joint-pair coupling model that forecasts the next second, batch scoring into a ledger, a viewer, synthetic takes.')
    .version(VERSION)
    .addHelpText('after', `\nExit status: 0 success, 1 bad input, 2 usage error.\n\n${CAUTION}\n`)
    .showHelpAfterError('(run with --help for usage)');
  registerInspect(program);
  registerExport(program);
  registerGait(program);
  registerNorms(program);
  registerFit(program);
  registerForecast(program);
  registerCouplings(program);
  registerSynth(program);
  registerBatch(program);
  registerLedger(program);
  registerView(program);
  return program;
}

/**
 * Exits with `code` once everything written to stdout and stderr has left the process: on a pipe, Node
 * queues what the pipe cannot take at once (64 KiB on Linux) and process.exit would drop it. The
 * callback of an empty write runs after every earlier write of that stream.
 */
function exitAfterFlush(code: number): void {
  process.stdout.write('', () => process.stderr.write('', () => process.exit(code)));
}

const isMain = process.argv[1] !== undefined && import.meta.url === new URL(`file://${process.argv[1]}`).href;
if (isMain || process.argv[1]?.endsWith('/jointloom')) {
  runProgram(buildProgram(), process.argv).then(
    (code) => exitAfterFlush(code),
    (err: unknown) => {
      process.stderr.write(`jointloom: internal error: ${err instanceof Error ? err.stack : String(err)}\n`);
      exitAfterFlush(70);
    },
  );
}
