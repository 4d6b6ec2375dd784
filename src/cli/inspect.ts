// `jointloom inspect <take>`: what the importer made of a take, with the evidence for every guess.
import type { Command } from 'commander';
import { frameRate, type Take } from '../bvh/take.js';
import { importTake, type ImportedTake } from '../skeleton/import.js';
import { ROLE_NAMES } from '../skeleton/roles.js';
import { emit, newCommand } from './program.js';
import { importOptionsFrom, withImportOptions, type ImportFlags } from './import-options.js';

/** Returns the machine-readable inspection of an imported take. */
export function inspectJson(t: ImportedTake): Record<string, unknown> {
  const { take, frame } = t;
  const real = take.joints.filter((j) => !j.endSite);
  return {
    file: t.path,
    joints: real.length,
    end_sites: take.joints.length - real.length,
    joint_names: real.map((j) => j.name),
    channels: take.channelCount,
    frames: take.frameCount,
    header_frames: take.headerFrameCount,
    fps: round(frameRate(take), 6),
    frame_time_s: take.frameTime,
    duration_s: round(take.frameCount * take.frameTime, 6),
    units: frame.units.units,
    units_overridden: frame.units.overridden,
    units_confidence: round(frame.units.confidence, 3),
    units_evidence: frame.units.evidence,
    up: frame.up.sign < 0 ? `-${frame.up.up}` : frame.up.up,
    up_overridden: frame.up.overridden,
    up_confidence: round(frame.up.confidence, 3),
    up_evidence: frame.up.evidence,
    roles: Object.fromEntries(ROLE_NAMES.map((r) => [r, frame.roles.roles[r]?.name ?? null])),
    role_details: Object.fromEntries(
      ROLE_NAMES.map((r) => {
        const a = frame.roles.roles[r];
        return [r, a ? { joint: a.joint, name: a.name, confidence: round(a.confidence, 3), evidence: a.evidence } : null];
      }),
    ),
    role_evidence: frame.roles.evidence,
    warnings: t.warnings,
  };
}

function round(v: number, digits: number): number {
  const k = 10 ** digits;
  return Math.round(v * k) / k;
}

/** Returns the human-readable inspection text. */
export function inspectText(t: ImportedTake): string {
  const { take, frame } = t;
  const real = take.joints.filter((j) => !j.endSite).length;
  const lines: string[] = [t.path];
  const row = (k: string, v: string) => lines.push(`  ${k.padEnd(12)}${v}`);
  row('joints', `${real} (+${take.joints.length - real} End Sites), ${take.channelCount} channels, ${rootsText(take)}`);
  row('frames', `${take.frameCount}${take.headerFrameCount !== take.frameCount ? ` (header says ${take.headerFrameCount})` : ''}`);
  row('frame rate', `${fmt(frameRate(take), 3)} Hz (frame time ${Number(take.frameTime.toPrecision(6))} s)`);
  row('duration', `${fmt(take.frameCount * take.frameTime, 2)} s`);
  row('units', `${frame.units.units}${frame.units.overridden ? ' (set by --units)' : ''}, confidence ${fmt(frame.units.confidence, 2)}`);
  for (const e of frame.units.evidence) lines.push(`                - ${e}`);
  row('up axis', `${frame.up.sign < 0 ? '-' : '+'}${frame.up.up}${frame.up.overridden ? ' (set by --up)' : ''}, confidence ${fmt(frame.up.confidence, 2)}`);
  for (const e of frame.up.evidence) lines.push(`                - ${e}`);
  lines.push('  roles');
  const width = Math.max(...ROLE_NAMES.map((r) => (frame.roles.roles[r]?.name ?? '-').length), 6);
  for (const r of ROLE_NAMES) {
    const a = frame.roles.roles[r];
    lines.push(`    ${r.padEnd(11)} ${(a?.name ?? '-').padEnd(width)}  ${a ? fmt(a.confidence, 2) : '    '}  ${a?.evidence ?? 'not found in this skeleton'}`);
  }
  if (frame.roles.evidence.length) {
    lines.push('  role evidence');
    for (const e of frame.roles.evidence) lines.push(`    - ${e}`);
  }
  lines.push(`  warnings    ${t.warnings.length ? '' : 'none'}`);
  for (const w of t.warnings) lines.push(`    ! ${w}`);
  return lines.join('\n');
}

function rootsText(take: Take): string {
  const roots = take.joints.filter((j) => j.parent < 0).map((j) => j.name);
  return roots.length === 1 ? `root ${roots[0]}` : `${roots.length} roots (${roots.join(', ')})`;
}

function fmt(v: number, digits: number): string {
  return v.toFixed(digits);
}

/** Registers `inspect` on the program. */
export function register(program: Command): void {
  const cmd = newCommand('inspect')
    .description('show what jointloom reads from a BVH take: joints, frames, frame rate, units and up axis with evidence, joint roles, warnings')
    .argument('<take>', 'BVH file')
    .option('--json', 'machine-readable output');
  withImportOptions(cmd).action((path: string, flags: ImportFlags & { json?: boolean }) => {
    const t = importTake(path, importOptionsFrom(flags));
    emit(flags.json ? JSON.stringify(inspectJson(t), null, 2) : inspectText(t));
  });
  program.addCommand(cmd);
}
