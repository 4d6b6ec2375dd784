// The inspect and export commands as a user runs them: output shapes, units, frames and exit codes.
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { runCli } from './run.js';

const ROLES = 'test/fixtures/roles';
const tmp = mkdtempSync(join(tmpdir(), 'jointloom-cli-'));
afterAll(() => rmSync(tmp, { recursive: true, force: true }));

// A two-joint take written by hand: root at (0, 90, 0) cm with a child 40 cm below it, rotated
// about Z by 90 degrees in frame 1, so the child moves to (40, 90, 0) (Rz(90°)·(0, -40, 0) = (40, 0, 0)).
const TINY = `HIERARCHY
ROOT Root
{
  OFFSET 0 0 0
  CHANNELS 6 Xposition Yposition Zposition Zrotation Xrotation Yrotation
  JOINT Child
  {
    OFFSET 0 -40 0
    CHANNELS 3 Zrotation Xrotation Yrotation
    End Site
    {
      OFFSET 0 -10 0
    }
  }
}
MOTION
Frames: 2
Frame Time: 0.01
0 90 0 0 0 0 0 0 0
0 90 0 90 0 0 0 0 0
`;
const tiny = join(tmp, 'tiny.bvh');
writeFileSync(tiny, TINY);

describe('inspect', () => {
  it('--json has the documented fields', async () => {
    const r = await runCli(['inspect', `${ROLES}/camel-prefix-cm-yup.bvh`, '--json']);
    expect(r.code).toBe(0);
    const j = JSON.parse(r.stdout);
    for (const k of ['joints', 'frames', 'fps', 'units', 'up', 'roles', 'warnings']) expect(j).toHaveProperty(k);
    expect(j.units).toBe('cm');
    expect(j.up).toBe('y');
    expect(j.roles.l_knee).toBe('lShin');
    expect(j.roles.pelvis).toBe('Hub');
    expect(Object.keys(j.roles)).toHaveLength(19);
  });

  it('reports a Z-up take in metres when --units and --up say so, with the override in the evidence', async () => {
    const r = await runCli(['inspect', `${ROLES}/suffix-cm-zup.bvh`, '--json', '--units', 'm']);
    const j = JSON.parse(r.stdout);
    expect(j.up).toBe('z');
    expect(j.units).toBe('m');
    expect(j.units_overridden).toBe(true);
    expect(j.units_evidence[0]).toMatch(/set by the caller/);
  });

  it('prints a readable summary', async () => {
    const r = await runCli(['inspect', `${ROLES}/camel-prefix-cm-yup.bvh`]);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/frame rate\s+30\.000 Hz/);
    expect(r.stdout).toMatch(/l_knee\s+lShin/);
  });

  it('a missing file: one line on stderr, exit 1', async () => {
    const r = await runCli(['inspect', join(tmp, 'nope.bvh')]);
    expect(r.code).toBe(1);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
    expect(r.stderr).toContain('nope.bvh');
  });

  it('a malformed file: file:line:column on one line, exit 1', async () => {
    const bad = join(tmp, 'bad.bvh');
    writeFileSync(bad, 'HIERARCHY\nROOT a\n{\n OFFSET 0 0\n}\n');
    const r = await runCli(['inspect', bad]);
    expect(r.code).toBe(1);
    expect(r.stderr.trim()).toBe(`jointloom: ${bad}:5:1: expected an OFFSET number, found "}"`);
  });

  it('usage errors exit 2', async () => {
    expect((await runCli(['inspect'])).code).toBe(2);
    expect((await runCli(['inspect', tiny, '--units', 'furlongs'])).code).toBe(2);
    expect((await runCli(['inspect', tiny, '--sides', 'both'])).code).toBe(2);
  });

  it('--help carries the caution', async () => {
    const r = await runCli(['inspect', '--help']);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/not a diagnostic device/);
    expect(r.stdout).toMatch(/qualified clinician/);
  });
});

describe('export', () => {
  it('JSON shape, file units, hand-computed positions, End Sites left out', async () => {
    const r = await runCli(['export', tiny, '--frames', '0,1', '--units', 'cm']);
    expect(r.code).toBe(0);
    const j = JSON.parse(r.stdout);
    expect(j.joints).toEqual(['Root', 'Child']);
    expect(j.units).toBe('cm');
    expect(j.frames.map((f: { index: number }) => f.index)).toEqual([0, 1]);
    expect(j.frames[0].positions).toEqual([[0, 90, 0], [0, 50, 0]]);
    expect(j.frames[1].positions).toEqual([[0, 90, 0], [40, 90, 0]]);
  });

  it('--metres scales, --end-sites adds the End Site', async () => {
    const r = await runCli(['export', tiny, '--frames', '1', '--metres', '--end-sites', '--units', 'cm']);
    const j = JSON.parse(r.stdout);
    expect(j.units).toBe('m');
    expect(j.joints).toEqual(['Root', 'Child', 'Child_End']);
    // End Site: Rz(90°)·(0, -10, 0) = (10, 0, 0) beyond the child, so (50, 90, 0) cm = (0.5, 0.9, 0) m.
    expect(j.frames[0].positions).toEqual([[0, 0.9, 0], [0.4, 0.9, 0], [0.5, 0.9, 0]]);
  });

  it('CSV with --all to a file, written whole', async () => {
    const out = join(tmp, 'pos.csv');
    const r = await runCli(['export', tiny, '--all', '--format', 'csv', '-o', out, '--units', 'cm']);
    expect(r.code).toBe(0);
    const lines = readFileSync(out, 'utf8').trim().split('\n');
    expect(lines[0]).toBe('frame,time_s,Root_x,Root_y,Root_z,Child_x,Child_y,Child_z');
    expect(lines[2]).toBe('1,0.01,0,90,0,40,90,0');
  });

  it('frame out of range and conflicting options are usage errors naming the file', async () => {
    const r = await runCli(['export', tiny, '--frames', '5']);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('tiny.bvh: frame 5 is out of range');
    expect((await runCli(['export', tiny, '--frames', '0', '--all'])).code).toBe(2);
    expect((await runCli(['export', tiny, '--frames', 'x'])).code).toBe(2);
  });

  it('an output in a missing folder is one line naming that file (not the temp file beside it), exit 1', async () => {
    const out = join(tmp, 'no-such-folder', 'pos.json');
    const r = await runCli(['export', tiny, '-o', out]);
    expect(r.code).toBe(1);
    // The tiny take's role and unit warnings come first; the error is the one line that is not a warning.
    expect(r.stderr.trim().split('\n').filter((l) => !l.startsWith('jointloom: warning:'))).toEqual([`jointloom: ${out}: no such file or folder`]);
  });
});
