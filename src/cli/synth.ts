// `jointloom synth`: a synthetic walking take with its ground-truth sidecar.
import type { Command } from 'commander';
import { SYNTH_FLAGS, synthesizeTake, synthOptionsFromFlags } from '../synth/index.js';
import { writeFilesAtomic, type FileToWrite } from '../util/atomic.js';
import { newCommand } from './program.js';

/** Flags that take no value. */
const SWITCHES = new Set(['all-positions']);

/** Returns commander's camelCase attribute name for a kebab-case flag. */
function attr(flag: string): string {
  return flag.replace(/-([a-z])/g, (_, c: string) => c.toUpperCase());
}

/** Registers `synth` on the program. */
export function register(program: Command): void {
  const cmd = newCommand('synth')
    .description('synthesize a walking take (BVH) from the parametric walker, with a ground-truth sidecar (events, gait phase, parameters)')
    .requiredOption('--out <file>', 'BVH file to write')
    .option('--truth <file>', 'ground-truth JSON sidecar to write')
    .option('--quiet', 'print nothing on success');
  for (const [flag, help] of Object.entries(SYNTH_FLAGS)) {
    if (SWITCHES.has(flag)) cmd.option(`--${flag}`, help);
    else cmd.option(`--${flag} <value>`, help);
  }
  cmd.addHelpText('afterAll', '\nSynthetic takes are for demonstration and validation only; they describe no real person.\n');
  cmd.action((flags: Record<string, string | boolean | undefined>) => {
    const raw: Record<string, string | boolean | undefined> = {};
    for (const flag of Object.keys(SYNTH_FLAGS)) {
      const v = flags[attr(flag)];
      raw[flag] = SWITCHES.has(flag) ? (v ? 'true' : undefined) : v;
    }
    const { take, truth, bvhText } = synthesizeTake(synthOptionsFromFlags(raw));
    const files: FileToWrite[] = [{ path: String(flags.out), data: bvhText }];
    if (flags.truth) files.push({ path: String(flags.truth), data: JSON.stringify(truth, null, 1) + '\n' });
    writeFilesAtomic(files);
    if (!flags.quiet) {
      const secs = take.frameCount * take.frameTime;
      process.stdout.write(`wrote ${flags.out}: ${take.frameCount} frames at ${Math.round(1 / take.frameTime)} Hz (${secs.toFixed(1)} s), ${take.joints.filter((j) => !j.endSite).length} joints${flags.truth ? `; truth in ${flags.truth}` : ''}\n`);
    }
  });
  program.addCommand(cmd);
}
