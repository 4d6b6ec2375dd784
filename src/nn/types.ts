// The buffer type every kernel in src/nn works on. Training runs on Float32Array; the kernels also accept
// Float64Array so that gradient checks can run the very same code in double precision. (Mixing the two in
// one hot process makes V8's element access polymorphic; keep training on Float32Array alone.)

/** A dense row-major buffer of floats: Float32Array in training, Float64Array in gradient checks. */
export type Buf = Float32Array | Float64Array;
