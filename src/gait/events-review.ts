// Events given by the user (read back from a reviewed events file) turned into a full detection: the walking
// passes and direction come from the take as usual, and each event's pass, steadiness and foot-velocity
// cross-check are recomputed around the frame the user gave.
import { InputError } from '../errors/index.js';
import { walkingDirection } from './direction.js';
import { velocityContact, velocityToeOff } from './events-check.js';
import { eventWarnings, markSteady } from './events-steady.js';
import { type EventOptions, makeEvent, passOf, resolveBias, sideSignals, takeStridePeriod } from './events.js';
import type { GaitInput } from './input.js';
import type { EventDetection, GaitEvent, WalkingPass } from './types.js';

/**
 * Returns the detection built on the given events (source 'file'): passes and direction from the take,
 * events outside every pass assigned to the nearest one, steadiness and cross-checks recomputed.
 */
export function detectionFromEvents(input: GaitInput, given: readonly GaitEvent[], options: EventOptions = {}): EventDetection {
  if (given.length === 0) throw new InputError(`${input.path}: the events file holds no events`);
  const bias = resolveBias(options.bias);
  const disagreeFrames = options.disagreeFrames ?? 2;
  const dir = walkingDirection(input, options);
  let passes: WalkingPass[] = dir.passes;
  const excluded = [...dir.excluded];
  if (passes.length === 0) {
    // The user says there is walking where the detector found none: one pass over the events.
    const a = Math.min(...given.map((e) => e.frame)), b = Math.max(...given.map((e) => e.frame)) + 1;
    const P = input.positions, J = input.jointCount, p = input.role.pelvis;
    const dx = P[(b - 1) * J * 3 + p * 3]! - P[a * J * 3 + p * 3]!, dy = P[(b - 1) * J * 3 + p * 3 + 1]! - P[a * J * 3 + p * 3 + 1]!;
    const n = Math.hypot(dx, dy) || 1;
    passes = [{ index: 0, startFrame: a, endFrame: b, direction: [dx / n, dy / n, 0] }];
    for (let f = a; f < b; f++) { dir.passDirection[f * 3] = dx / n; dir.passDirection[f * 3 + 1] = dy / n; }
  }
  const signals = sideSignals(input, dir.direction);
  const T = takeStridePeriod(input, signals, { ...dir, passes });
  const reach = Math.max(2, 0.15 * (Number.isFinite(T) ? T : input.fps));
  const events = given.map((g) => {
    const s = g.side === 'left' ? 0 : 1;
    const ic = g.kind === 'initial_contact';
    // The raw detection the method would have reported for this event: its time less the bias.
    const raw = (g.time - (ic ? bias.contact : bias.toeOff)) * input.fps;
    const rawCheck = ic ? velocityContact(signals[s]!.vz, raw, reach) : velocityToeOff(signals[s]!.vz, raw, reach);
    const e = makeEvent(input, g.side, g.kind, raw, rawCheck, bias, disagreeFrames, nearestPass(passes, g.frame), 'file');
    e.frame = g.frame;
    e.time = g.time;
    return e;
  });
  events.sort((a, b) => a.time - b.time || (a.side < b.side ? -1 : 1));
  markSteady(events, options.steadyOnly ?? true);
  return { events, passes, excluded, direction: dir.passDirection, warnings: eventWarnings(input.path, events, disagreeFrames) };
}

/** Returns the pass holding `frame`, else the one nearest to it. */
function nearestPass(passes: WalkingPass[], frame: number): number {
  const inside = passOf(passes, frame);
  if (inside >= 0) return inside;
  let best = 0, bd = Infinity;
  for (const ps of passes) {
    const d = frame < ps.startFrame ? ps.startFrame - frame : frame - (ps.endFrame - 1);
    if (d < bd) { bd = d; best = ps.index; }
  }
  return best;
}
