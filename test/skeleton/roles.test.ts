// Joint roles on the role fixtures and on hand-written trees. Expected roles come from construction:
// test/fixtures/roles/bodies.ts records, for every joint it builds, the role the joint was built to play
// and the side it was built on (byGeometry) or named for (byNames); see the comments there.
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { readBvhFile } from '../../src/bvh/parse.js';
import { writeBvh } from '../../src/bvh/write.js';
import { InputError } from '../../src/errors/index.js';
import { restPose } from '../../src/skeleton/fk.js';
import { isEndName, isTwistName, nameTokens, partOfName, sideOfName, stripNamespace } from '../../src/skeleton/names.js';
import { loadRoleMapFile, parseRoleMap } from '../../src/skeleton/rolefile.js';
import { inferRoles, ROLE_NAMES, type RoleMap } from '../../src/skeleton/roles.js';
import { STYLES, buildBody, style, takeFromTree, type TreeSpec } from '../fixtures/roles/bodies.js';

const FIXTURES = join(import.meta.dirname, '..', 'fixtures', 'roles');

/** Returns role → joint name (null where absent). */
function names(roles: RoleMap): Record<string, string | null> {
  return Object.fromEntries(ROLE_NAMES.map((r) => [r, roles[r]?.name ?? null]));
}

describe('names', () => {
  it('strips namespaces and splits words at separators and camel humps', () => {
    expect(stripNamespace('rig:Char01:LeftArm')).toBe('LeftArm');
    expect(stripNamespace('grp|body|Hips')).toBe('Hips');
    expect(nameTokens('LeftUpLeg')).toEqual(['left', 'up', 'leg']);
    expect(nameTokens('LThigh')).toEqual(['l', 'thigh']);
    expect(nameTokens('lShin')).toEqual(['l', 'shin']);
    expect(nameTokens('thigh.L')).toEqual(['thigh', 'l']);
    expect(nameTokens('Char01:Spine_02')).toEqual(['spine', '02']);
    expect(nameTokens('rig_b:IndexLft1')).toEqual(['index', 'lft', '1']);
    expect(nameTokens('FEMUR_LFT')).toEqual(['femur', 'lft']);
  });

  it('reads left/right tokens in the common spellings', () => {
    // Each spelling from the role brief: prefixes Left, L_, l, L., suffixes _L, .L, Lft, _left, namespaces.
    for (const n of ['LeftUpLeg', 'L_Thigh', 'lShin', 'L.Knee', 'knee_L', 'knee.L', 'FootLft', 'shin_left', 'rig:LeftArm', 'Char01:L-Hand', 'HIP_LT', 'leftfoot'])
      expect(sideOfName(n), n).toBe('l');
    for (const n of ['RightForeArm', 'R_Calf', 'rElbow', 'R.Wrist', 'wrist_R', 'toe.R', 'HandRgt', 'ankle_right', 'Char01:RightHand', 'KNEE_RT', 'rightarm'])
      expect(sideOfName(n), n).toBe('r');
    for (const n of ['Spine', 'Hips', 'Neck_1', 'LeftToRight', 'q053', 'Leg', 'Lumbar', 'Root']) expect(sideOfName(n), n).toBeNull();
  });

  it('reads body-part words, most specific first, and marks twist and end joints', () => {
    const cases: Array<[string, string]> = [
      ['LeftUpLeg', 'thigh'], ['R_Thigh', 'thigh'], ['lShin', 'shank'], ['LeftLeg', 'shank'], ['calf_L', 'shank'], ['KNEE_LT', 'shank'],
      ['LeftFoot', 'foot'], ['ankle_R', 'foot'], ['ToeBaseLft', 'toe'], ['LeftArm', 'upperarm'], ['upperarm_L', 'upperarm'],
      ['LeftForeArm', 'forearm'], ['ELBOW_RT', 'forearm'], ['lHand', 'hand'], ['Wrist.L', 'hand'], ['CollarLft', 'clavicle'],
      ['L_Clavicle', 'clavicle'], ['Spine02', 'spine'], ['Neck_1', 'neck'], ['Skull', 'head'], ['ArmTwistLft', 'twist'],
    ];
    for (const [n, part] of cases) expect(partOfName(n), n).toBe(part);
    expect(partOfName('q053')).toBeNull();
    expect(isTwistName('rig_b:ForeArmTwistRgt')).toBe(true);
    expect(isTwistName('ForeArmRgt')).toBe(false);
    expect(isEndName('LeftHand_End')).toBe(true);
    expect(isEndName('HeadTip')).toBe(true);
    expect(isEndName('Head')).toBe(false);
  });
});

describe('roles on the fixture styles (built in memory)', () => {
  for (const st of STYLES) {
    it(`${st.id}: every role as built`, () => {
      const b = buildBody(st);
      const d = inferRoles(b.take);
      // Default side policy follows unambiguous names, so the expected map is the one by names.
      expect(names(d.roles)).toEqual(b.byNames);
      for (const r of ROLE_NAMES) {
        const a = d.roles[r];
        if (!a) continue;
        expect(a.confidence, r).toBeGreaterThan(0);
        expect(a.confidence, r).toBeLessThanOrEqual(1);
        expect(a.evidence.length, r).toBeGreaterThan(10);
        expect(b.take.joints[a.joint]!.name).toBe(a.name);
      }
    });
  }

  it('puts the subject\'s left on +X for Y-up facing +Z and on −X for Z-up facing +Y (left = up × forward)', () => {
    // Right-handed cross products, by hand: (0,1,0) × (0,0,1) = (1,0,0); (0,0,1) × (0,1,0) = (−1,0,0).
    const y = inferRoles(buildBody(style('camel-prefix-cm-yup')).take);
    expect(y.restUp).toEqual([0, 1, 0]);
    expect(y.forward).toEqual([0, 0, 1]);
    const yTake = buildBody(style('camel-prefix-cm-yup')).take;
    expect(restPose(yTake)[y.roles.l_hip!.joint * 3]).toBe(9); // built 9 cm to the left of the pelvis
    const z = inferRoles(buildBody(style('suffix-cm-zup')).take);
    expect(z.restUp).toEqual([0, 0, 1]);
    expect(z.forward).toEqual([0, 1, 0]);
    const zTake = buildBody(style('suffix-cm-zup')).take;
    expect(restPose(zTake)[z.roles.l_hip!.joint * 3]).toBe(-9);
    expect(z.roles.l_hip!.name).toBe('thigh_L');
    // Facing −Z turns left to −X: (0,1,0) × (0,0,−1) = (−1,0,0).
    const q = inferRoles(buildBody(style('opaque-codes')).take);
    expect(q.forward).toEqual([0, 0, -1]);
    expect(restPose(buildBody(style('opaque-codes')).take)[q.roles.l_hip!.joint * 3]).toBe(-9);
  });

  it('agrees with names and geometry on a clean export, and says so', () => {
    const d = inferRoles(buildBody(style('twist-clavicle-lft-rgt')).take);
    expect(d.sides).toEqual([
      { limb: 'legs', source: 'names+geometry', conflict: false },
      { limb: 'arms', source: 'names+geometry', conflict: false },
    ]);
    expect(d.warnings).toEqual([]);
    expect(d.roles.l_shoulder!.evidence).toContain("'rig_b:CollarLft' before it is taken as clavicle");
  });

  it('falls back on geometry when names carry no side, with a warning', () => {
    const b = buildBody(style('opaque-codes'));
    const d = inferRoles(b.take);
    expect(names(d.roles)).toEqual(b.byGeometry);
    expect(d.sides.map((s) => s.source)).toEqual(['geometry', 'geometry']);
    expect(d.warnings.filter((w) => w.includes('no clear left/right token'))).toHaveLength(2);
  });
});

describe('conflicting names', () => {
  it('takes sides from geometry when both legs carry the same side token', () => {
    // The mirrored style's names with every right joint renamed left: both chains say left.
    const b = buildBody({ ...style('mirrored-export'), mirrored: false, name: (k, s, i) => style('mirrored-export').name(k, s ? 'l' : null, i) });
    const d = inferRoles(b.take);
    expect(d.sides.map((x) => x.source)).toEqual(['geometry', 'geometry']);
    expect(d.warnings).toContain("Both legs are named left; their sides come from the rest-pose geometry alone.");
    // Built on the subject's left (+X): the hip at x = +9 is l_hip.
    expect(restPose(b.take)[d.roles.l_hip!.joint * 3]).toBe(9);
  });
});

describe('mirrored export', () => {
  const b = buildBody(style('mirrored-export'));

  it('follows the names by default and warns with the evidence', () => {
    const d = inferRoles(b.take);
    expect(names(d.roles)).toEqual(b.byNames);
    expect(d.roles.l_knee!.name).toBe('Left_Knee');
    expect(d.sides).toEqual([
      { limb: 'legs', source: 'names', conflict: true },
      { limb: 'arms', source: 'names', conflict: true },
    ]);
    const legWarn = d.warnings.find((w) => w.includes('disagree on the legs'));
    expect(legWarn).toContain("'Left_Thigh' is named left but lies on the subject's right");
    expect(legWarn).toContain('-9.0 units'); // built 9 cm to the subject's right
    expect(legWarn).toContain('mirrored export');
    expect(d.warnings.some((w) => w.includes('disagree on the arms'))).toBe(true);
    expect(d.roles.l_hip!.confidence).toBeLessThan(0.6);
  });

  it('follows the names when asked, with the same warning', () => {
    const d = inferRoles(b.take, { sides: 'names' });
    expect(names(d.roles)).toEqual(b.byNames);
    expect(d.warnings.some((w) => w.includes('Sides follow the names as asked'))).toBe(true);
  });

  it('follows the geometry when asked, with the warning', () => {
    const d = inferRoles(b.take, { sides: 'geometry' });
    expect(names(d.roles)).toEqual(b.byGeometry);
    expect(d.roles.l_knee!.name).toBe('Right_Knee');
    expect(d.sides.every((s) => s.source === 'geometry' && s.conflict)).toBe(true);
    expect(d.warnings.some((w) => w.includes('Sides follow the geometry as asked'))).toBe(true);
  });

  it('never differs between policies on a clean export', () => {
    const clean = buildBody(style('camel-prefix-cm-yup')).take;
    expect(names(inferRoles(clean, { sides: 'geometry' }).roles)).toEqual(names(inferRoles(clean, { sides: 'names' }).roles));
  });
});

// Legs branch from a joint below the root that is not on the spine; a zero-offset joint starts each leg.
// Built by hand (cm, Y up, facing +Z): Hips at 97, PelvisBlock 2 below, hip joints 3 lower and 9 aside.
const leg = (s: 'L' | 'R', x: number): TreeSpec => ({
  name: `${s}HipRoot`, offset: [0, 0, 0], children: [{
    name: `${s}Thigh`, offset: [x, -3, 0], children: [{
      name: `${s}Knee`, offset: [0, -43, 0], children: [{
        name: `${s}Ankle`, offset: [0, -42, 0], children: [{ name: `${s}Toe`, offset: [0, -6, 12], end: [0, 0, 6] }],
      }],
    }],
  }],
});
const arm = (s: 'L' | 'R', x: number): TreeSpec => ({
  name: `${s}Shoulder`, offset: [17 * x, 17, 0], children: [{
    name: `${s}Elbow`, offset: [29 * x, 0, 0], children: [{ name: `${s}Wrist`, offset: [23 * x, 0, 0], end: [18 * x, 0, 0] }],
  }],
});
const separatePelvis: TreeSpec = {
  name: 'Hips', offset: [0, 97, 0], children: [
    { name: 'PelvisBlock', offset: [0, -2, 0], children: [leg('L', 9), leg('R', -9)] },
    { name: 'Spine', offset: [0, 14, 0], children: [{
      name: 'Chest', offset: [0, 18, 0], children: [arm('L', 1), arm('R', -1), { name: 'Neck', offset: [0, 21, 0], children: [{ name: 'Head', offset: [0, 10, 0], end: [0, 15, 0] }] }],
    }] },
  ],
};

describe('hand-written trees', () => {
  it('finds the pelvis where the legs branch, not at the root, and skips zero-offset leg joints', () => {
    const d = inferRoles(takeFromTree(separatePelvis));
    // Expected from the tree above: legs branch from PelvisBlock; LHipRoot sits on it, LThigh moves away.
    expect(names(d.roles)).toEqual({
      pelvis: 'PelvisBlock', spine: 'Spine', thorax: 'Chest', neck: 'Neck', head: 'Head',
      l_hip: 'LThigh', l_knee: 'LKnee', l_ankle: 'LAnkle', l_toe: 'LToe', l_shoulder: 'LShoulder', l_elbow: 'LElbow', l_wrist: 'LWrist',
      r_hip: 'RThigh', r_knee: 'RKnee', r_ankle: 'RAnkle', r_toe: 'RToe', r_shoulder: 'RShoulder', r_elbow: 'RElbow', r_wrist: 'RWrist',
    });
    expect(d.evidence.some((e) => e.includes("also carries the neck"))).toBe(true);
  });

  it('leaves roles the skeleton lacks null and lists them', () => {
    // Legs and a short trunk only: no arms, so no thorax, neck or head either.
    const legsOnly: TreeSpec = { name: 'Hips', offset: [0, 97, 0], children: [leg('L', 9), leg('R', -9), { name: 'Back', offset: [0, 10, 0], end: [0, 10, 0] }] };
    const d = inferRoles(takeFromTree(legsOnly));
    expect(d.roles.pelvis!.name).toBe('Hips');
    expect(d.roles.l_knee!.name).toBe('LKnee');
    expect(d.roles.r_toe!.name).toBe('RToe');
    for (const r of ['spine', 'thorax', 'neck', 'head', 'l_shoulder', 'l_elbow', 'l_wrist', 'r_shoulder', 'r_elbow', 'r_wrist'] as const) expect(d.roles[r], r).toBeNull();
    expect(d.warnings.some((w) => w.startsWith('Only one mirrored pair'))).toBe(true);
    expect(d.warnings).toContain('No joint was found for: spine, thorax, neck, head, l_shoulder, l_elbow, l_wrist, r_shoulder, r_elbow, r_wrist.');
  });

  it('reports a skeleton without limb pairs instead of guessing', () => {
    const stick: TreeSpec = { name: 'Base', offset: [0, 0, 0], children: [{ name: 'Pole', offset: [0, 100, 0], end: [0, 50, 0] }] };
    const d = inferRoles(takeFromTree(stick));
    expect(ROLE_NAMES.every((r) => d.roles[r] === null)).toBe(true);
    expect(d.warnings[0]).toContain('No mirrored pair of limbs');
  });
});

describe('role-map override file', () => {
  const b = buildBody(style('opaque-codes'));
  const dir = mkdtempSync(join(tmpdir(), 'jl-roles-'));
  const file = (name: string, text: string) => {
    const p = join(dir, name);
    writeFileSync(p, text);
    return p;
  };

  it('replaces the named roles and keeps the rest inferred', () => {
    const auto = inferRoles(b.take);
    const p = file('swap.json', JSON.stringify({ l_knee: auto.roles.r_knee!.name, r_knee: auto.roles.l_knee!.name, neck: null }));
    const ov = loadRoleMapFile(p, b.take);
    const d = inferRoles(b.take, { overrides: ov });
    expect(d.roles.l_knee!.name).toBe(auto.roles.r_knee!.name);
    expect(d.roles.l_knee!.confidence).toBe(1);
    expect(d.roles.l_knee!.evidence).toBe(`Set by the role-map file '${p}'.`);
    expect(d.roles.neck).toBeNull();
    expect(d.roles.l_hip).toEqual(auto.roles.l_hip);
    expect(d.warnings.some((w) => w.includes(`sets l_knee to '${auto.roles.r_knee!.name}'`))).toBe(true);
  });

  it('names the file and the key for an unknown role', () => {
    const p = file('badrole.json', '{ "l_kne": "q153" }');
    expect(() => loadRoleMapFile(p, b.take)).toThrow(InputError);
    expect(() => loadRoleMapFile(p, b.take)).toThrow(`${p}: unknown role "l_kne"`);
  });

  it('names the file, the key and the joint for a joint the take lacks, with near names', () => {
    const p = file('badjoint.json', '{ "l_knee": "q15" }');
    expect(() => loadRoleMapFile(p, b.take)).toThrow(InputError);
    expect(() => loadRoleMapFile(p, b.take)).toThrow(`${p}: role "l_knee" names joint "q15", which the take does not have (similar: 'q153', 'q156').`);
    // The opaque style codes the knee as part 15, plus 3 for left and 6 for right: q153, q156.
  });

  it('refuses bad JSON, a non-object, a non-string value, a joint given twice and a missing file', () => {
    expect(() => loadRoleMapFile(file('bad.json', '{ "l_knee": '), b.take)).toThrow(/bad\.json: the role-map file is not valid JSON/);
    expect(() => loadRoleMapFile(file('arr.json', '["l_knee"]'), b.take)).toThrow(/arr\.json: the role-map file must hold one JSON object/);
    expect(() => loadRoleMapFile(file('num.json', '{ "head": 3 }'), b.take)).toThrow(/num\.json: role "head" must name a joint as a string/);
    expect(() => loadRoleMapFile(file('twice.json', '{ "head": "q040", "neck": "q040" }'), b.take)).toThrow(/twice\.json: joint "q040" is given to two roles, "head" and "neck"/);
    expect(() => loadRoleMapFile(join(dir, 'none.json'), b.take)).toThrow(InputError);
    expect(() => loadRoleMapFile(join(dir, 'none.json'), b.take)).toThrow(/none\.json: cannot read the role-map file \(ENOENT\)/);
  });

  it('parses text the same as a file', () => {
    expect(parseRoleMap('{ "pelvis": "q010" }', 'inline', b.take)).toEqual({ file: 'inline', roles: { pelvis: b.take.joints.findIndex((j) => j.name === 'q010') } });
  });
});

describe('role fixture files', () => {
  for (const st of STYLES) {
    const path = join(FIXTURES, `${st.id}.bvh`);
    it(`${st.id}.bvh is what make-fixtures.ts writes`, () => {
      expect(readFileSync(path, 'utf8')).toBe(writeBvh(buildBody(st).take, { decimals: 6 }));
    });
    it(`${st.id}.bvh: every role as built, read through the parser`, () => {
      const take = readBvhFile(path);
      expect(names(inferRoles(take).roles)).toEqual(buildBody(st).byNames);
    });
  }
});
