// The local walking direction and the walking passes, on synthetic takes with known path geometry.
import { describe, expect, it } from 'vitest';
import { walkingDirection } from '../../src/gait/direction.js';
import { detectEvents } from '../../src/gait/events.js';
import { type GaitInput, prepareGait } from '../../src/gait/input.js';
import { resolveImported } from '../../src/skeleton/import.js';
import { type SynthOptions, synthesizeTake } from '../../src/synth/index.js';

function gaitOf(name: string, options: Partial<SynthOptions> & { seed: number }): GaitInput {
  return prepareGait(resolveImported(name, synthesizeTake(options).take));
}

/** Pelvis horizontal position at frame f. */
function pelvisXY(g: GaitInput, f: number): [number, number] {
  const o = (f * g.jointCount + g.role.pelvis) * 3;
  return [g.positions[o]!, g.positions[o + 1]!];
}

/**
 * Least-squares circle through points (Kåsa 1976, "A circle fitting procedure and its error analysis",
 * IEEE Trans. Instrum. Meas. 25): minimise Σ (x² + y² + D x + E y + F)², a linear problem; centre (−D/2, −E/2).
 */
function kasaCentre(pts: [number, number][]): [number, number] {
  // Normal equations A·[D E F] = b with rows [x y 1] and right side −(x² + y²).
  const A = [[0, 0, 0], [0, 0, 0], [0, 0, 0]], b = [0, 0, 0];
  for (const [x, y] of pts) {
    const r = [x, y, 1], z = -(x * x + y * y);
    for (let i = 0; i < 3; i++) { b[i] += r[i]! * z; for (let j = 0; j < 3; j++) A[i]![j] += r[i]! * r[j]!; }
  }
  const det = (m: number[][]) => m[0]![0]! * (m[1]![1]! * m[2]![2]! - m[1]![2]! * m[2]![1]!) - m[0]![1]! * (m[1]![0]! * m[2]![2]! - m[1]![2]! * m[2]![0]!) + m[0]![2]! * (m[1]![0]! * m[2]![1]! - m[1]![1]! * m[2]![0]!);
  const d = det(A);
  const col = (k: number) => A.map((row, i) => row.map((v, j) => (j === k ? b[i]! : v)));
  return [-det(col(0)) / d / 2, -det(col(1)) / d / 2];
}

describe('walking direction on a curved path', () => {
  // A circle of radius 4 m: heading rate about v / r = 0.3 rad/s (17°/s), under the 35°/s turn threshold.
  const g = gaitOf('circle.bvh', { seed: 41, duration: 18, path: { kind: 'circle', radius: 4, turn: 'left' } });
  const res = walkingDirection(g);

  it('keeps the whole gentle curve as one walking pass', () => {
    expect(res.passes.length).toBe(1);
    expect(res.passes[0]!.endFrame - res.passes[0]!.startFrame).toBe(g.frames);
    expect(res.excluded).toEqual([]);
  });

  it('follows the tangent of the circle, perpendicular to the radius, within 3°', () => {
    const pts: [number, number][] = [];
    for (let f = 0; f < g.frames; f += 4) pts.push(pelvisXY(g, f));
    const [cx, cy] = kasaCentre(pts);
    // Geometry: the mean distance from the fitted centre is the path radius, 4 m (pelvis sway aside).
    const radius = pts.reduce((a, [x, y]) => a + Math.hypot(x - cx, y - cy), 0) / pts.length;
    expect(radius).toBeGreaterThan(3.9);
    expect(radius).toBeLessThan(4.1);
    const margin = Math.round(g.fps); // the window is one-sided within half a second of the ends
    let worst = 0, sign = 0;
    for (let f = margin; f < g.frames - margin; f++) {
      const [x, y] = pelvisXY(g, f);
      const rx = x - cx, ry = y - cy, rn = Math.hypot(rx, ry);
      const dx = res.direction[f * 3]!, dy = res.direction[f * 3 + 1]!;
      expect(Math.hypot(dx, dy)).toBeCloseTo(1, 9);
      worst = Math.max(worst, Math.abs((dx * rx + dy * ry) / rn));
      const cross = rx * dy - ry * dx; // + when moving counter-clockwise seen from above (Z up)
      if (sign === 0) sign = Math.sign(cross);
      expect(Math.sign(cross)).toBe(sign);
    }
    expect(worst).toBeLessThan(Math.sin((3 * Math.PI) / 180));
    // A left turn seen from above with Z up in a right-handed frame is counter-clockwise.
    expect(sign).toBe(1);
  });
});

describe('walking direction through a 180° turn', () => {
  // An oval walkway: 6 m straight, a half circle of radius 1.2 m, 6 m back. At the walker's speed in the
  // turn (about 1 m/s) the heading changes by v / r ≈ 0.8 rad/s (48°/s), above the 35°/s threshold.
  const L = 6, r = 1.2;
  const g = gaitOf('walkway.bvh', { seed: 42, duration: 14, speed: 1.3, path: { kind: 'walkway', length: L, radius: r, turn: 'left' } });
  const res = walkingDirection(g);

  it('splits the take into passes in opposite directions, the turn left out', () => {
    // 14 s: out along the first straight, the turn, back along the second and into the next turn.
    expect(res.passes.length).toBe(2);
    const [a, b] = res.passes as [typeof res.passes[0], typeof res.passes[0]];
    const dot = a.direction[0] * b.direction[0] + a.direction[1] * b.direction[1];
    expect(dot).toBeLessThan(-0.98); // cos 168°
    const turns = res.excluded.filter((e) => e.reason === 'turning');
    expect(turns.length).toBe(2);
    expect(turns[1]!.endFrame).toBe(g.frames);
    expect(turns[0]!.startFrame).toBe(a.endFrame);
    expect(turns[0]!.endFrame).toBe(b.startFrame);
    for (let f = turns[0]!.startFrame; f < turns[0]!.endFrame; f++) expect(res.passDirection[f * 3]! ** 2 + res.passDirection[f * 3 + 1]! ** 2).toBe(0);
  });

  it('puts the excluded stretch around the apex of the half circle', () => {
    // Walkway geometry: the apex of the turn lies L + r ahead of the start and r to the side.
    const a = res.passes[0]!;
    const turn = res.excluded.find((e) => e.reason === 'turning')!;
    const mid = Math.round((turn.startFrame + turn.endFrame) / 2);
    const [x0, y0] = pelvisXY(g, 0), [x, y] = pelvisXY(g, mid);
    const fwd = (x - x0) * a.direction[0] + (y - y0) * a.direction[1];
    const side = Math.abs(-(x - x0) * a.direction[1] + (y - y0) * a.direction[0]);
    expect(fwd).toBeGreaterThan(L + r - 0.3);
    expect(fwd).toBeLessThan(L + r + 0.3);
    expect(side).toBeGreaterThan(r - 0.3);
    expect(side).toBeLessThan(r + 0.3);
  });

  it('detects no events inside the turn', () => {
    const det = detectEvents(g);
    const turn = det.excluded.find((e) => e.reason === 'turning')!;
    expect(det.events.length).toBeGreaterThan(10);
    for (const e of det.events) expect(e.frame < turn.startFrame || e.frame >= turn.endFrame).toBe(true);
    expect(new Set(det.events.map((e) => e.pass))).toEqual(new Set([0, 1]));
  });
});
