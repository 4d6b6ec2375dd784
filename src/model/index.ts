// Public face of the coupling model: configuration, creation, training, forecasting, the model file,
// and the forecast baselines and metrics it is scored with.
export { defaultModelConfig, resolveModelConfig, observedPoints, totalPoints, pointOfStep, pointStep, type ModelConfig } from './config.js';
export { createModel, type CouplingModel, type CreateModelOptions, type ModelParams } from './model.js';
export { windowRefs, BatchBuilder, type TrainingTake, type WindowRef } from './batch.js';
export type { Batch } from './encoder.js';
export { elboForward, elboBackward, type LossReport } from './elbo.js';
export { createWorkspace, type Workspace } from './workspace.js';
export { train, prepareTraining, trainingLoop, statsOfTakes, evaluateLoss, createStepRunner, type TrainOptions, type TrainProgress, type TrainingSummary, type StepRunner, type StepRequest, type TrainingContext } from './train.js';
export { calibrateSpread } from './calibrate.js';
export { backcastError, spreadFactor, type SpreadAdapt } from './spread.js';
export { forecast, createForecaster, type ForecastOptions, type ForecastResult, type Forecaster } from './forecast.js';
export { saveModel, loadModel, modelToJson, modelFromJson, MODEL_FORMAT, MODEL_VERSION, type ModelFileJson, type LoadedModel } from './modelfile.js';
export { BASELINE_NAMES, baselineForecast, type BaselineName } from './baselines.js';
export { HORIZONS_S, horizonStep, meanJointError, bandCoverage } from './metrics.js';
export { windowFactors, createFactorReader, type WindowFactors, type FactorReader } from './factors.js';
export { initNoiseFromData } from './noise.js';
export { trainParallel, createParallelRunner, type ParallelRunner } from './parallel.js';
