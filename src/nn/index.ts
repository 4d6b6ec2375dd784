// Public surface of src/nn: tensor kernels with explicit backward passes, the parameter store, Adam with
// clipping, and the seeded generator. Nothing here knows of skeletons, gait or models.
export * from './types.js';
export * from './prng.js';
export * from './matmul.js';
export * from './linear.js';
export * from './activations.js';
export * from './elementwise.js';
export * from './params.js';
export * from './mlp.js';
export * from './gru.js';
export * from './pairs.js';
export * from './gaussian.js';
export * from './pool.js';
export * from './adam.js';
export * from './causal-conv.js';
