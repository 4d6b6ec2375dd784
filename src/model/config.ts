// The coupling model's configuration: sizes of every part, the ELBO weights and the on/off switches of
// the ablations (no pair messages, match pairing, restricted labeling). Every field has a default; the
// resolved configuration travels in the model file, so a model always rebuilds with its own shapes.
import { NODE_COUNT } from '../motion/roles.js';

/** Sizes, weights and switches of a coupling model. */
export interface ModelConfig {
  /** Nodes of the joint graph (17 canonical roles). */
  nodes: number;
  /** Observed steps (60: 2 s at 30 Hz) and forecast steps (30: 1 s). */
  observe: number;
  forecast: number;
  /** Encoder GRU width per node. */
  hidden: number;
  /** Width of the pair embedding between the node projections and the factor heads. */
  pairHidden: number;
  /** Static factor dimensions per ordered pair. */
  staticDims: number;
  /** Dynamic factor dimensions per ordered pair. */
  dynamicDims: number;
  /** One dynamic factor point every `dynamicStride` steps (observe must be a multiple of it). */
  dynamicStride: number;
  /** Width of a pair message (the decoder's split first layer). */
  messageHidden: number;
  /** Hidden width of the node update MLP. */
  updateHidden: number;
  /**
   * Fixed factor on the node update's learned change of state (its output layer). Adam moves every weight
   * by about the learning rate per step whatever its gradient's size, while the change of state a step
   * needs on top of the stride prior is a few hundredths of a feature's spread: at factor 1 the first
   * steps throw the rollout far off and training spends its epochs coming back.
   */
  residualScale: number;
  /** Teacher-forced one-step transitions scored at the end of the observed part (at most observe − 1). */
  reconSteps: number;
  /** Weight of the multi-step rollout term over the forecast steps. */
  rolloutWeight: number;
  /** Weight β of the KL terms. */
  beta: number;
  /** Weight of the static factors' KL term (β unless given). */
  staticBeta: number;
  /** Model rate, steps per second (the windows' rate). */
  rate: number;
  /**
   * Add the kinematic step p(t + 1) = p(t) + v(t) / rate (in normalised units) to the decoder's predicted
   * change, so that an untrained decoder forecasts constant velocity and learns the correction.
   */
  kinematic: boolean;
  /**
   * Take the rollout's fixed step from the phase-aligned stride-mean baseline instead of the kinematic
   * step: forecast step k adds the baseline's change of state prior(k + 1) − prior(k) (window frame,
   * normalised; prior(0) the last observed state), so an untrained decoder forecasts the baseline and the
   * factors and messages learn the residual. The baseline reads the window's observed part only. The
   * teacher-forced transitions t → t + 1 add the baseline's one-step change from the steps up to t (so the
   * learned change is a correction to the baseline in both terms); the kinematic switch is then unused.
   */
  stridePrior: boolean;
  /**
   * Steps of causal history before and including the last observed step the stride prior reads (at least
   * `observe`; 150 = 5 s at 30 Hz gives it three strides and the stride period's 4-s search). The encoder
   * still reads only the observed steps.
   */
  priorHistory: number;
  /**
   * Register each past stride of the prior on the current phase (baselines.ts registeredStrideForecast:
   * the lag whose poses best match the last observed steps) instead of taking it whole periods back.
   * Measured on 12 held-out walkers: 18.9 mm against 21.7 mm at 1 s for the plain stride mean.
   */
  priorRegistration: boolean;
  /** Remove the pair messages entirely: each node's update sees only its own state (the no-coupling baseline). */
  noCoupling: boolean;
  /** Windows of one take that share a group share their static factors (posteriors averaged before sampling). */
  matchPairing: boolean;
  /** Tie the first two dynamic dimensions to sin and cos of the gait phase (a supervised term on their means). */
  restrictedLabeling: boolean;
  /**
   * Least noise variance of the reconstruction and rollout likelihoods, normalised units² (default 1e-3,
   * an SD of about 3 % of a feature's spread). Without a floor, features the stride prior already forecasts
   * almost exactly get weights of 10⁴-10⁶ and the shared decoder trades the large swing errors for them.
   */
  noiseFloor: number;
  /**
   * Weight of the restricted-labeling term, which is a mean over the ordered pairs (per labelled dimension
   * and point). The default 272 (the pair count of the 17-node graph) gives each pair's labelled means the
   * weight of its own KL term: at 1 the labels did not take (the term stayed near 1 per point, the means
   * near 0; measured on the default recipe, 12.0 per window against 1.4 at 272).
   */
  labelWeight: number;
  /**
   * Weight of the take-signature term (signature.ts): squared distance, averaged over the ordered pairs, of
   * a linear read of each pair's static sample from the pair's standardised take-level signature. Off (0) by
   * default: it made the static factors take-stable but cost the walker-made asymmetry arm its AUC
   * (measured in DEVELOPERS.md); `fit --take-signature` sets TAKE_SIGNATURE_WEIGHT. A model file whose
   * configuration lacks the field was trained without it (modelfile.ts).
   */
  signatureWeight: number;
}

/** The take-signature weight `fit --take-signature` uses: the pair count of 17 nodes, so each pair's signature weighs as its own KL term (as for the labels). */
export const TAKE_SIGNATURE_WEIGHT = 272;

/** Returns the default configuration (hidden width 32, 4 static and 4 dynamic dimensions, the stride prior on). */
export function defaultModelConfig(): ModelConfig {
  return {
    nodes: NODE_COUNT,
    observe: 60,
    forecast: 30,
    hidden: 32,
    pairHidden: 32,
    staticDims: 4,
    dynamicDims: 4,
    dynamicStride: 5,
    messageHidden: 32,
    updateHidden: 64,
    residualScale: 0.01,
    reconSteps: 30,
    rolloutWeight: 1,
    beta: 1,
    staticBeta: 1,
    rate: 30,
    kinematic: true,
    stridePrior: true,
    priorHistory: 150,
    priorRegistration: true,
    noCoupling: false,
    matchPairing: true,
    restrictedLabeling: true,
    labelWeight: 272,
    signatureWeight: 0,
    noiseFloor: 1e-3,
  };
}

/** Returns the configuration with defaults filled and every field checked (throws RangeError when unusable). */
export function resolveModelConfig(partial: Partial<ModelConfig> = {}): ModelConfig {
  // A configuration that names `kinematic` but not `stridePrior` was written before the stride prior existed
  // (model files store every field): it keeps the kinematic step it was trained with.
  const legacy: Partial<ModelConfig> = partial.kinematic !== undefined && partial.stridePrior === undefined ? { stridePrior: false } : {};
  // One that names the stride prior but no history was written when the prior read the observed part only.
  if (partial.stridePrior !== undefined && partial.priorHistory === undefined) legacy.priorHistory = partial.observe ?? defaultModelConfig().observe;
  // One without a residual scale learned its change of state unscaled.
  if (partial.stridePrior !== undefined && partial.residualScale === undefined) legacy.residualScale = 1;
  // And one without priorRegistration took whole periods back.
  if (partial.stridePrior !== undefined && partial.priorRegistration === undefined) legacy.priorRegistration = false;
  // One without a static weight weighed every KL term by β.
  if (partial.staticBeta === undefined) legacy.staticBeta = partial.beta ?? defaultModelConfig().beta;
  const c: ModelConfig = { ...defaultModelConfig(), ...legacy, ...partial };
  const ints: (keyof ModelConfig)[] = ['nodes', 'observe', 'forecast', 'hidden', 'pairHidden', 'staticDims', 'dynamicDims', 'dynamicStride', 'messageHidden', 'updateHidden', 'reconSteps', 'priorHistory'];
  for (const k of ints) {
    const v = c[k];
    if (typeof v !== 'number' || !Number.isInteger(v) || v < 1) throw new RangeError(`model config ${k} must be a positive whole number (got ${String(v)})`);
  }
  if (c.nodes < 2) throw new RangeError('model config nodes must be at least 2');
  if (c.observe % c.dynamicStride !== 0) throw new RangeError(`observe (${c.observe}) must be a multiple of dynamicStride (${c.dynamicStride})`);
  if (c.priorHistory < c.observe) throw new RangeError(`priorHistory (${c.priorHistory}) must be at least observe (${c.observe})`);
  if (c.reconSteps > c.observe - 1) throw new RangeError(`reconSteps (${c.reconSteps}) must be at most observe − 1 (${c.observe - 1})`);
  if (c.restrictedLabeling && c.dynamicDims < 2) throw new RangeError('restricted labeling needs at least 2 dynamic dimensions');
  if (!(c.residualScale > 0) || !Number.isFinite(c.residualScale)) throw new RangeError('model config residualScale must be a positive number');
  for (const k of ['rolloutWeight', 'beta', 'staticBeta', 'labelWeight', 'signatureWeight', 'noiseFloor'] as const)
    if (!(c[k] >= 0) || !Number.isFinite(c[k])) throw new RangeError(`model config ${k} must be a finite number ≥ 0`);
  if (!(c.rate > 0) || !Number.isFinite(c.rate)) throw new RangeError('model config rate must be a positive number of steps per second');
  for (const k of ['kinematic', 'stridePrior', 'priorRegistration', 'noCoupling', 'matchPairing', 'restrictedLabeling'] as const)
    if (typeof c[k] !== 'boolean') throw new RangeError(`model config ${k} must be true or false`);
  return c;
}

/** Returns the window options a model's windows are made with (observed, forecast and history steps). */
export function modelWindowOptions(c: ModelConfig): { observe: number; forecast: number; history: number } {
  return { observe: c.observe, forecast: c.forecast, history: c.stridePrior ? c.priorHistory : c.observe };
}

/** Returns the number of dynamic factor points over the observed part. */
export function observedPoints(c: ModelConfig): number {
  return c.observe / c.dynamicStride;
}

/** Returns the dynamic factor point that drives the transition from step t to t + 1 (steps counted from the window start). */
export function pointOfStep(c: ModelConfig, t: number): number {
  return Math.floor(t / c.dynamicStride);
}

/** Returns the number of dynamic factor points the observed part and the forecast need together. */
export function totalPoints(c: ModelConfig): number {
  return Math.max(observedPoints(c), pointOfStep(c, c.observe + c.forecast - 2) + 1);
}

/** Returns the observed step whose encoder state gives dynamic point j (the last step of its interval). */
export function pointStep(c: ModelConfig, j: number): number {
  return j * c.dynamicStride + c.dynamicStride - 1;
}
