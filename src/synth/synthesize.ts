// synthesizeTake: options in, a BVH take of a parametric walker plus its ground-truth sidecar out.
import type { Take } from '../bvh/take.js';
import { parseBvh } from '../bvh/parse.js';
import { writeBvh } from '../bvh/write.js';
import type { EulerOrder } from '../skeleton/euler.js';
import { type SegmentLengths } from './anthropometry.js';
import { encodeFrame, makeEncoder, roundValues } from './encode.js';
import { findEvents, phaseOfFrames } from './events.js';
import { buildModel } from './model.js';
import { JOINT_KEYS, type JointKey, jointNames } from './naming.js';
import { type SynthOptions, defaultDecimals, resolveSynthOptions } from './options.js';
import { PelvisFrame, poseAt } from './pose.js';
import { Mulberry32, streamSeed } from './prng.js';
import { MIXED_ORDERS, UNIT_METRES, axisMap, buildSkeleton } from './skeleton.js';
import { type SynthTruth, type TruthSideEvents, type TruthStumble, meanCv, stanceFractions, strideTimes } from './truth.js';

/** Height (m) at or below which a foot point counts as on the floor when finding the truth events. */
export const CONTACT_TOLERANCE_M = 0.001;

/** The result of one synthesis: the take (parsed back from the text), its truth sidecar and the BVH text. */
export interface SynthResult {
  take: Take;
  truth: SynthTruth;
  bvhText: string;
}

/** Returns a synthetic walking take for the options (defaults fill the rest); same options, same bytes. */
export function synthesizeTake(options: Partial<SynthOptions> & { seed: number }): SynthResult {
  const o = resolveSynthOptions(options);
  const m = buildModel(o);
  const orders = {} as Record<JointKey, EulerOrder>;
  for (const k of JOINT_KEYS) orders[k] = o.jointOrders[k] ?? (o.rotationOrder === 'mixed' ? MIXED_ORDERS[k] : o.rotationOrder);
  const skel = buildSkeleton({ seg: m.seg, naming: o.naming, units: o.units, up: o.upAxis, orders, positionsOnAllJoints: o.positionsOnAllJoints });
  const F = Math.max(1, Math.round(o.duration * o.frameRate));
  const C = skel.channelCount;
  const values = new Float64Array(F * C);
  const enc = makeEncoder(skel, o.units, o.upAxis);
  const pf = new PelvisFrame();
  const locals = new Float64Array(JOINT_KEYS.length * 9);
  const root = new Float64Array(3);
  for (let f = 0; f < F; f++) {
    poseAt(m, f / o.frameRate, pf, locals, root);
    encodeFrame(enc, locals, root, values, f * C);
  }
  const decimals = o.decimals ?? defaultDecimals(o.units);
  roundValues(values, decimals);
  const take: Take = { joints: skel.joints, frameTime: 1 / o.frameRate, frameCount: F, channelCount: C, values, headerFrameCount: F, warnings: [] };

  // Truth events from the noise-free take's geometry.
  const upAxis = o.upAxis === 'Y' ? 1 : 2;
  const M = axisMap(o.upAxis);
  const scale = 1 / UNIT_METRES[o.units];
  const hv = m.heelVec;
  const heelRest: [number, number, number] = [0, 1, 2].map((a) => (M[a * 3]! * hv[0]! + M[a * 3 + 1]! * hv[1]! + M[a * 3 + 2]! * hv[2]!) * scale) as [number, number, number];
  const key = (k: JointKey) => JOINT_KEYS.indexOf(k);
  const ev = findEvents(take, {
    skel, ankleKey: [key('l_ankle'), key('r_ankle')], toeKey: [key('l_toe'), key('r_toe')], heelRest, up: upAxis, unitsPerMetre: scale, toleranceM: CONTACT_TOLERANCE_M,
  });
  const dt = take.frameTime;
  const sideEvents = (e: { initialContact: number[]; toeOff: number[] }): TruthSideEvents => ({
    initialContactFrames: e.initialContact,
    initialContactTimes: e.initialContact.map((f) => round6(f * dt)),
    toeOffFrames: e.toeOff,
    toeOffTimes: e.toeOff.map((f) => round6(f * dt)),
  });
  const left = sideEvents(ev.left), right = sideEvents(ev.right);
  const cleanSpeed = meanSpeed(take, o.upAxis, scale);

  // Sensor jitter goes on after the events are taken.
  if (o.noise.rotationDeg > 0 || o.noise.positionMm > 0) {
    const rng = new Mulberry32(streamSeed(o.seed, 97));
    const posSd = (o.noise.positionMm / 1000) * scale;
    for (let f = 0; f < F; f++)
      for (const joint of skel.joints) {
        if (joint.endSite) continue;
        joint.channels.forEach((ch, c) => {
          const idx = f * C + joint.channelStart + c;
          if (ch.endsWith('rotation')) values[idx] = values[idx]! + o.noise.rotationDeg * rng.gauss();
          else if (joint.parent < 0) values[idx] = values[idx]! + posSd * rng.gauss();
        });
      }
    roundValues(values, decimals);
  }
  const bvhText = writeBvh(take, { decimals });

  const stumbles: TruthStumble[] = [];
  for (const st of o.stumbles) {
    const s = st.side === 'left' ? 0 : 1;
    const e = s === 0 ? left : right;
    const n = m.sc.count;
    let planned = -1;
    for (let k = 0; k < n - 1; k++) if (m.sc.stumble[s * n + k]! > 0 && m.sc.ic[s * n + k + 1]! > st.time) { planned = k; break; }
    if (planned < 0) continue;
    const toT = m.sc.to[s * n + planned]!;
    const toF = nearestFrame(e.toeOffFrames, toT / dt);
    const icF = e.initialContactFrames.find((x) => x > toF) ?? -1;
    stumbles.push({
      side: st.side, severity: st.severity ?? 1, requestedTime: st.time,
      swingStartFrame: toF, swingStartTime: round6(toF * dt), swingEndFrame: icF, swingEndTime: round6(icF * dt),
      catchTime: round6((toF + 0.25 * (icF - toF)) * dt),
    });
  }
  const channelOrder: Record<string, string> = {};
  JOINT_KEYS.forEach((k, i) => { channelOrder[skel.joints[skel.jointIndex[i]!]!.name] = orders[k]; });
  const inUnits = {} as SegmentLengths;
  for (const [k, v] of Object.entries(m.seg)) (inUnits as unknown as Record<string, number>)[k] = round6(v * scale);
  const stL = stanceFractions(left), stR = stanceFractions(right);
  const mean = (xs: number[]) => (xs.length ? xs.reduce((a, b) => a + b, 0) / xs.length : NaN);
  const cvL = meanCv(strideTimes(left)), cvR = meanCv(strideTimes(right));
  const allIc = [...left.initialContactTimes, ...right.initialContactTimes].sort((a, b) => a - b);
  const cadence = allIc.length > 1 ? (60 * (allIc.length - 1)) / (allIc[allIc.length - 1]! - allIc[0]!) : NaN;
  const fwd = [0, 1, 2].map((a) => M[a * 3 + 2]!) as [number, number, number];
  const lft = [0, 1, 2].map((a) => M[a * 3]!) as [number, number, number];
  const truth: SynthTruth = {
    format: 'jointloom-synth-truth',
    version: 1,
    options: o,
    frameRate: o.frameRate,
    frameTime: dt,
    frameCount: F,
    units: { length: o.units, metresPerUnit: UNIT_METRES[o.units], angle: 'degrees', time: 'seconds' },
    upAxis: o.upAxis,
    forwardAxis: fwd,
    leftAxis: lft,
    namingStyle: o.naming,
    jointNames: jointNames(o.naming),
    channelOrder,
    positionChannels: o.positionsOnAllJoints ? 'all' : 'root',
    segmentsMetres: m.seg,
    segmentsFileUnits: inUnits,
    sides: { left: m.sides[0], right: m.sides[1] },
    contact: {
      toleranceMetres: CONTACT_TOLERANCE_M,
      heelPoint: 'heel(t) = ankle(t) + R_ankle_world(t) · (heel_rest − ankle_rest); heel_rest on the floor (toe-tip height) behind the ankle by 0.3 × the horizontal ankle-to-toe-joint distance',
      initialContactRule: 'first frame, after a swing, at which the heel point is at or below the tolerance',
      toeOffRule: 'first frame, after a contact, at which heel point, toe joint and toe tip are all above the tolerance',
      source: 'forward kinematics of the noise-free take as written (rounded values)',
    },
    events: { left, right },
    phase: { left: phaseOfFrames(F, left.initialContactFrames), right: phaseOfFrames(F, right.initialContactFrames) },
    stumbles,
    summary: {
      cadenceStepsPerMin: round6(cadence),
      stanceFraction: { left: round6(mean(stL)), right: round6(mean(stR)) },
      strideTimeMean: { left: round6(cvL.mean), right: round6(cvR.mean) },
      strideTimeCv: { left: round6(cvL.cv), right: round6(cvR.cv) },
      meanSpeed: round6(cleanSpeed),
    },
    conventions: [
      'internal frame: Y up, Z forward at heading 0, X to the subject\'s left; Z-up takes map right→+X, forward→+Y, up→+Z',
      'rest pose: standing, arms hanging, feet flat with heel point, toe joint and toe tip on the floor',
      'knee flexion is a positive rotation about the knee\'s own X axis in the internal frame (negative in Z-up files)',
      'heading: positive turns toward the subject\'s left (about the up axis)',
    ],
  };
  // The returned take is the text read back, so take and file agree exactly.
  return { take: parseBvh(bvhText, { file: 'synthesized take' }), truth, bvhText };
}

function round6(x: number): number {
  return Number.isFinite(x) ? Math.round(x * 1e6) / 1e6 : x;
}

function nearestFrame(frames: readonly number[], target: number): number {
  let best = -1, bd = Infinity;
  for (const f of frames) if (Math.abs(f - target) < bd) { bd = Math.abs(f - target); best = f; }
  return best;
}

/** Returns the mean horizontal speed (m/s) of the root over the take, from its position channels. */
function meanSpeed(take: Take, up: 'Y' | 'Z', unitsPerMetre: number): number {
  const C = take.channelCount, F = take.frameCount;
  if (F < 2) return NaN;
  const a = 0, b = up === 'Y' ? 2 : 1;
  let len = 0;
  for (let f = 1; f < F; f++) {
    const dx = take.values[f * C + a]! - take.values[(f - 1) * C + a]!;
    const dz = take.values[f * C + b]! - take.values[(f - 1) * C + b]!;
    len += Math.hypot(dx, dz);
  }
  return len / unitsPerMetre / ((F - 1) * take.frameTime);
}
