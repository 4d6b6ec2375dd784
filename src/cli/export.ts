// `jointloom export <take>`: joint world positions for chosen frames as JSON or CSV.
import type { Command } from 'commander';
import { UsageError } from '../errors/index.js';
import { planFk, poseFrame } from '../skeleton/fk.js';
import { importTake } from '../skeleton/import.js';
import { positionsToCsv, positionsToJson } from '../report/positions.js';
import { choiceOption, emit, newCommand } from './program.js';
import { importOptionsFrom, withImportOptions, type ImportFlags } from './import-options.js';

/** Returns the frame indices a --frames list names ("0,5,9" or ranges "10-20"), checked against the take. */
export function parseFrameList(text: string, frameCount: number, file: string): number[] {
  const out: number[] = [];
  for (const part of text.split(',').map((s) => s.trim())) {
    const m = /^(\d+)(?:-(\d+))?$/.exec(part);
    if (!m) throw new UsageError(`--frames: "${part}" is not a frame index or range (e.g. 0,5,9 or 10-20).`);
    const a = Number(m[1]);
    const b = m[2] === undefined ? a : Number(m[2]);
    if (b < a) throw new UsageError(`--frames: range "${part}" runs backwards.`);
    if (b >= frameCount) throw new UsageError(`${file}: frame ${b} is out of range; the take has frames 0 to ${frameCount - 1}.`);
    for (let f = a; f <= b; f++) out.push(f);
  }
  if (out.length === 0) throw new UsageError('--frames: no frames named.');
  return out;
}

interface ExportFlags extends ImportFlags {
  frames?: string;
  all?: boolean;
  metres?: boolean;
  format: 'json' | 'csv';
  endSites?: boolean;
  output?: string;
}

/** Registers `export` on the program. */
export function register(program: Command): void {
  const cmd = newCommand('export')
    .description('write joint world positions of chosen frames (file units and axes unless --metres); first frame by default')
    .argument('<take>', 'BVH file')
    .option('--frames <list>', 'frame indices from 0, comma separated, ranges allowed: 0,5,9 or 100-200')
    .option('--all', 'every frame')
    .option('--metres', 'convert positions to metres (axes stay as in the file)')
    .option('--format <format>', 'json or csv', choiceOption(['json', 'csv'] as const), 'json')
    .option('--end-sites', 'include End Sites')
    .option('-o, --output <file>', 'write to a file (atomically) instead of stdout');
  withImportOptions(cmd).action((path: string, flags: ExportFlags) => {
    if (flags.all && flags.frames) throw new UsageError('--frames and --all exclude each other.');
    const imported = importTake(path, importOptionsFrom(flags));
    const { take, frame } = imported;
    const frames = flags.all ? Array.from({ length: take.frameCount }, (_, i) => i) : parseFrameList(flags.frames ?? '0', take.frameCount, path);
    const keep = take.joints.map((j, i) => (flags.endSites || !j.endSite ? i : -1)).filter((i) => i >= 0);
    const scale = flags.metres ? frame.units.metresPerUnit : 1;
    const plan = planFk(take);
    const J = take.joints.length;
    const pos = new Float64Array(J * 3);
    const rot = new Float64Array(J * 9);
    const out = new Float64Array(frames.length * keep.length * 3);
    frames.forEach((f, k) => {
      poseFrame(plan, take.values, f, pos, rot);
      keep.forEach((j, n) => {
        const o = (k * keep.length + n) * 3;
        out[o] = pos[j * 3]! * scale;
        out[o + 1] = pos[j * 3 + 1]! * scale;
        out[o + 2] = pos[j * 3 + 2]! * scale;
      });
    });
    for (const w of imported.warnings) process.stderr.write(`jointloom: warning: ${w}\n`);
    const table = {
      joints: keep.map((j) => take.joints[j]!.name),
      units: flags.metres ? 'm' : frame.units.units,
      up: frame.up.sign < 0 ? `-${frame.up.up}` : frame.up.up,
      frameTime: take.frameTime,
      frames,
      positions: out,
    };
    emit(flags.format === 'csv' ? positionsToCsv(table) : positionsToJson(table), flags.output);
  });
  program.addCommand(cmd);
}
