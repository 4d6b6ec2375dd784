// The coupling stage of scoring: left/right coupling asymmetry of the take's static pair factors against
// the normative cohort stored in the model file (src/analysis/coupling-asymmetry.ts). A take is flagged
// when its score lies above the controls' 90th percentile and the take lies in the model's straight-walking
// domain (src/model/domain.ts; outside it the score is kept with a warning). Skipped without a model or figures.
import { coupleNames, couplingAsymmetry, storedCouplingNorms } from '../analysis/coupling-asymmetry.js';
import { storedJointProfiles } from '../analysis/joint-profiles.js';
import { takeFactors } from '../analysis/factors.js';
import { domainWarning } from '../model/domain.js';
import { cachedModel, modelTrack, takeDomain } from './model-cache.js';
import type { ScoreStage, StageResult } from './stages.js';

const METRICS = ['asymmetry_score', 'asymmetry_ci_low', 'asymmetry_ci_high', 'side_right', 'control_p90'] as const;
const empty = (): Record<string, number | null> => Object.fromEntries(METRICS.map((m) => [m, null]));

/** The coupling stage: take score with its interval, the side (1 = right, 0 = left) and the controls' 90th percentile. */
export const COUPLING_STAGE: ScoreStage = {
  name: 'coupling',
  // 2: with a joint discriminant the asymmetry score is its evidence (a log-likelihood ratio), not the pair distance.
  // 3: a take most like a side-only class (a shorter stance or step) is flagged as such, not only at a joint.
  version: 3,
  metrics: METRICS,
  run(ctx): StageResult {
    if (!ctx.modelFile) return { metrics: empty(), detail: { model: null } };
    const loaded = cachedModel(ctx.modelFile), model = loaded.model, c = model.config;
    const norms = storedCouplingNorms(loaded.extras, c.nodes * (c.nodes - 1), c.staticDims);
    if (!norms) return { metrics: empty(), detail: { model: ctx.modelFile }, warnings: [`${ctx.modelFile} holds no normative coupling figures; no coupling asymmetry was scored`] };
    const track = modelTrack(ctx, c.rate);
    if (track.steps <= c.observe) return { metrics: empty(), usedModel: true, detail: { model: ctx.modelFile }, warnings: [`the take is too short for coupling factors (it needs more than ${(c.observe / c.rate).toFixed(1)} s)`] };
    const a = couplingAsymmetry(takeFactors(model, track), norms, { profiles: storedJointProfiles(loaded.extras, coupleNames(), c.staticDims) });
    // Outside straight walking the factors are read on motion the model never saw: the score is kept, not flagged.
    const domain = takeDomain(ctx, c);
    const flagged = a.score > a.controlP90 && domain.inside;
    return {
      metrics: { asymmetry_score: a.score, asymmetry_ci_low: a.ciLow, asymmetry_ci_high: a.ciHigh, side_right: a.side === 'right' ? 1 : 0, control_p90: a.controlP90 },
      flags: flagged ? [{ stage: 'coupling', measure: 'asymmetry', value: a.score, text: `coupling asymmetry ${a.score.toFixed(2)} (${a.scoreKind}) above the controls' 90th percentile (${a.controlP90.toFixed(2)}): ${a.side} side, ${a.pattern ? `like ${a.pattern} (nearest joint class: ${a.joint})` : `around the ${a.joint}`}` }] : [],
      detail: { model: ctx.modelFile, side: a.side, joint: a.joint, pattern: a.pattern, summary: a.summary, top: a.ranked.slice(0, 5).map((r) => ({ pair: r.pair, mirror: r.mirror, score: r.score, ci_low: r.ciLow, ci_high: r.ciHigh, side: r.side })), domain },
      ...(domain.inside ? {} : { warnings: [`${domainWarning(domain, `its coupling asymmetry (${a.score.toFixed(2)}, ${a.side} side) is not flagged and`)}`] }),
      usedModel: true,
    };
  },
};
