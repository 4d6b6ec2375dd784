// The node set, its mirror map, the pair list and its mirror map, and how missing roles are handled.
import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors/index.js';
import { DEFAULT_PAIRS, MOTION_NODES, NODE_COUNT, NODE_MIRROR, allPairs, nodeSources, pairIndex } from '../../src/motion/roles.js';
import { trackFromImported } from '../../src/motion/track.js';
import { ROLE_NAMES } from '../../src/skeleton/roles.js';
import { importSynth } from './support.js';

describe('nodes', () => {
  it('are 17 importer roles, without spine and neck, midline first', () => {
    expect(NODE_COUNT).toBe(17);
    for (const n of MOTION_NODES) expect(ROLE_NAMES as readonly string[]).toContain(n);
    expect(MOTION_NODES).not.toContain('spine');
    expect(MOTION_NODES).not.toContain('neck');
    expect(new Set(MOTION_NODES).size).toBe(17);
    expect(MOTION_NODES.slice(0, 3)).toEqual(['pelvis', 'thorax', 'head']);
  });

  it('mirror l_ onto r_ and the midline onto itself, as an involution', () => {
    MOTION_NODES.forEach((n, i) => {
      const m = MOTION_NODES[NODE_MIRROR[i]!]!;
      // By the naming rule of the roles: l_x ↔ r_x; pelvis, thorax, head are on the midline.
      const expected = n.startsWith('l_') ? `r_${n.slice(2)}` : n.startsWith('r_') ? `l_${n.slice(2)}` : n;
      expect(m).toBe(expected);
      expect(NODE_MIRROR[NODE_MIRROR[i]!]).toBe(i);
    });
  });
});

describe('pairs', () => {
  it('are every ordered pair of distinct nodes: 17 · 16 = 272', () => {
    expect(DEFAULT_PAIRS.count).toBe(272);
    const seen = new Set<string>();
    for (let p = 0; p < DEFAULT_PAIRS.count; p++) {
      const i = DEFAULT_PAIRS.sender[p]!, j = DEFAULT_PAIRS.receiver[p]!;
      expect(i).not.toBe(j);
      expect(pairIndex(i, j)).toBe(p);
      seen.add(`${i},${j}`);
    }
    expect(seen.size).toBe(272);
  });

  it('mirror (i, j) onto (mirror i, mirror j), as an involution', () => {
    const { sender, receiver, mirror } = DEFAULT_PAIRS;
    for (let p = 0; p < DEFAULT_PAIRS.count; p++) {
      const q = mirror[p]!;
      expect(sender[q]).toBe(NODE_MIRROR[sender[p]!]);
      expect(receiver[q]).toBe(NODE_MIRROR[receiver[p]!]);
      expect(mirror[q]).toBe(p);
    }
    // Hand-picked: left hip → left knee mirrors to right hip → right knee; pelvis → head to itself.
    const ix = (n: string) => MOTION_NODES.indexOf(n as (typeof MOTION_NODES)[number]);
    expect(mirror[pairIndex(ix('l_hip'), ix('l_knee'))]).toBe(pairIndex(ix('r_hip'), ix('r_knee')));
    expect(mirror[pairIndex(ix('pelvis'), ix('head'))]).toBe(pairIndex(ix('pelvis'), ix('head')));
    expect(mirror[pairIndex(ix('l_wrist'), ix('r_ankle'))]).toBe(pairIndex(ix('r_wrist'), ix('l_ankle')));
  });

  it('build for a smaller node list too', () => {
    // Three nodes a, l_b, r_b: 3 · 2 = 6 pairs; (a, l_b) mirrors to (a, r_b).
    const p = allPairs(3, new Int32Array([0, 2, 1]));
    expect(p.count).toBe(6);
    expect(p.mirror[pairIndex(0, 1, 3)]).toBe(pairIndex(0, 2, 3));
  });
});

describe('missing roles', () => {
  it('raise InputError naming the file and the role', () => {
    const imp = importSynth('no-knee.bvh', { seed: 2, duration: 3 });
    imp.frame.roles.roles.l_knee = null;
    expect(() => nodeSources(imp)).toThrow(InputError);
    expect(() => nodeSources(imp)).toThrow(/no-knee\.bvh.*l_knee/);
  });

  it('fill the thorax from the shoulders and the head from the neck', () => {
    const full = importSynth('full.bvh', { seed: 2, duration: 3 });
    const imp = importSynth('no-chest.bvh', { seed: 2, duration: 3 });
    imp.frame.roles.roles.thorax = null;
    imp.frame.roles.roles.head = null;
    const tr = trackFromImported(imp), ref = trackFromImported(full);
    expect(tr.fallbacks.length).toBe(2);
    const N = tr.nodeCount;
    const ix = (n: string) => MOTION_NODES.indexOf(n as (typeof MOTION_NODES)[number]);
    const neckJoint = full.frame.roles.roles.neck!.joint;
    expect(nodeSources(imp).a[ix('head')]).toBe(neckJoint);
    for (let k = 0; k < tr.steps; k += 17)
      for (let a = 0; a < 3; a++) {
        // The midpoint of the two shoulders, by definition of the fallback.
        const mid = 0.5 * (ref.positions[(k * N + ix('l_shoulder')) * 3 + a]! + ref.positions[(k * N + ix('r_shoulder')) * 3 + a]!);
        expect(tr.positions[(k * N + ix('thorax')) * 3 + a]).toBeCloseTo(mid, 12);
      }
    const noNeck = importSynth('bare.bvh', { seed: 2, duration: 3 });
    noNeck.frame.roles.roles.head = null;
    noNeck.frame.roles.roles.neck = null;
    expect(() => nodeSources(noNeck)).toThrow(/bare\.bvh.*head.*neck/);
  });
});
