// Work buffers of one forward and backward pass of the coupling model over a batch of windows, allocated
// once for a largest batch size so that training steps allocate nothing. Layouts (row-major):
//   state         (observe + forecast) × B × N × 6   normalised window state, time-major
//   node rows     b·N + n                            pair rows (point·B + b)·P + k
//   dynamic point j covers transitions j·stride … j·stride + stride − 1; points ≥ K are rolled forward
import { STATE_SIZE } from '../motion/reflect.js';
import { createGruCache, type GruCache } from '../nn/gru.js';
import { allOrderedPairs, tilePairs, type PairList, type PairProjectionScratch } from '../nn/pairs.js';
import type { Buf } from '../nn/types.js';
import { observedPoints, totalPoints } from './config.js';
import { encoderInputDim, type CouplingModel } from './model.js';

/** One decoder pass over `blocks` × B windows' nodes: its input view and what backward needs. */
export interface DecoderCache {
  blocks: number;
  /** Dynamic point of each block. */
  points: Int32Array;
  /** Input state (blocks × B × N × 6); a view set before each pass. */
  x: Buf;
  a: Buf;
  b: Buf;
  u: Buf;
  agg: Buf;
  h1: Buf;
  /** Predicted next state, blocks × B × N × 6. */
  out: Buf;
  /** Fixed change of state added per row instead of the kinematic step (the stride prior); null: kinematic step as configured. */
  step: Buf | null;
  /** Keep the per-pair activations for a backward pass (false: forecasting only). */
  keep: boolean;
}

/** Every buffer of a training or forecasting pass for up to `batch` windows. */
export interface Workspace {
  batch: number;
  pairs: PairList;
  /** Pairs over B stacked graphs and over K·B stacked graphs. */
  pairsB: PairList;
  pairsKB: PairList;
  encIn: Buf;
  gru: GruCache;
  dHs: Buf;
  hbar: Buf; dhbar: Buf;
  scratchS: PairProjectionScratch;
  preS: Buf; dPreS: Buf;
  muS: Buf; lvS: Buf; muSg: Buf; lvSg: Buf; epsS: Buf; sS: Buf;
  dmuS: Buf; dlvS: Buf; dmuSg: Buf; dlvSg: Buf; dsS: Buf;
  /** Gradient of the signature term on the static samples (B·P × S). */
  dsSig: Buf;
  hd: Buf; dhd: Buf;
  scratchD: PairProjectionScratch;
  preD: Buf; dPreD: Buf;
  muD: Buf; lvD: Buf; epsD: Buf; dmuD: Buf; dlvD: Buf;
  /** Dynamic factor samples of every point (Kt × B·P × D) and their gradients. */
  d: Buf; dd: Buf;
  /** Prior noise of the rolled-forward points (forecasting only). */
  epsPrior: Buf;
  muP: Buf; lvP: Buf; dmuP: Buf; dlvP: Buf;
  zin: Buf; dzin: Buf; zp: Buf; dzp: Buf; gate: Buf; dgate: Buf;
  teacher: DecoderCache;
  rollout: DecoderCache[];
  /** Rolled-out states, (forecast + 1) × B × N × 6 (block 0 is the last observed state). */
  roll: Buf;
  /** Backward scratch of the decoder, sized for the teacher-forced pass. */
  dOut: Buf; dX: Buf; dA: Buf; dB: Buf; dAgg: Buf; dH1: Buf;
  perDimStatic: Float64Array;
  perDimDynamic: Float64Array;
}

function pairScratch(alloc: (n: number) => Buf, n: number): PairProjectionScratch {
  return { a: alloc(n), b: alloc(n), da: alloc(n), db: alloc(n) };
}

function decoderCache(alloc: (n: number) => Buf, blocks: number, rows: number, pairRows: number, M: number, U: number, coupled: boolean): DecoderCache {
  const m = coupled ? M : 0;
  return {
    blocks, points: new Int32Array(blocks), x: alloc(0),
    a: alloc(rows * m), b: alloc(rows * m), u: alloc(pairRows * m), agg: alloc(rows * m),
    h1: alloc(rows * U), out: alloc(rows * STATE_SIZE), step: null, keep: true,
  };
}

/** Returns a workspace for batches of up to `batch` windows of the model. */
export function createWorkspace(model: CouplingModel, batch: number): Workspace {
  const c = model.config, alloc = (n: number) => model.store.alloc(n);
  const N = c.nodes, B = batch, BN = B * N, T = c.observe, F = c.forecast;
  const H = c.hidden, E = c.pairHidden, S = c.staticDims, D = c.dynamicDims, M = c.messageHidden, U = c.updateHidden;
  const K = observedPoints(c), Kt = totalPoints(c), R = c.reconSteps, Z = S + D;
  const pairs = allOrderedPairs(N), P = pairs.count, BP = B * P;
  const coupled = !c.noCoupling;
  const rollout: DecoderCache[] = [];
  for (let f = 0; f < F; f++) rollout.push(decoderCache(alloc, 1, BN, BP, M, U, coupled));
  return {
    batch, pairs, pairsB: tilePairs(pairs, B), pairsKB: tilePairs(pairs, K * B),
    encIn: alloc(T * BN * encoderInputDim(c)),
    gru: createGruCache(model.store, model.params.gru, BN, T),
    dHs: alloc(T * BN * H),
    hbar: alloc(BN * H), dhbar: alloc(BN * H),
    scratchS: pairScratch(alloc, BN * E),
    preS: alloc(BP * E), dPreS: alloc(BP * E),
    muS: alloc(BP * S), lvS: alloc(BP * S), muSg: alloc(BP * S), lvSg: alloc(BP * S), epsS: alloc(BP * S), sS: alloc(BP * S),
    dmuS: alloc(BP * S), dlvS: alloc(BP * S), dmuSg: alloc(BP * S), dlvSg: alloc(BP * S), dsS: alloc(BP * S),
    dsSig: alloc(c.signatureWeight > 0 && !c.noCoupling ? BP * S : 0),
    hd: alloc(K * BN * H), dhd: alloc(K * BN * H),
    scratchD: pairScratch(alloc, K * BN * E),
    preD: alloc(K * BP * E), dPreD: alloc(K * BP * E),
    muD: alloc(K * BP * D), lvD: alloc(K * BP * D), epsD: alloc(K * BP * D), dmuD: alloc(K * BP * D), dlvD: alloc(K * BP * D),
    d: alloc(Kt * BP * D), dd: alloc(Kt * BP * D), epsPrior: alloc(Kt * BP * D),
    muP: alloc(K * BP * D), lvP: alloc(K * BP * D), dmuP: alloc(K * BP * D), dlvP: alloc(K * BP * D),
    zin: alloc(Kt * BP * Z), dzin: alloc(Kt * BP * Z), zp: alloc(coupled ? Kt * BP * M : 0), dzp: alloc(coupled ? Kt * BP * M : 0),
    gate: alloc(Kt * BP), dgate: alloc(Kt * BP),
    teacher: decoderCache(alloc, R, R * BN, R * BP, M, U, coupled),
    rollout,
    roll: alloc((F + 1) * BN * STATE_SIZE),
    dOut: alloc(R * BN * STATE_SIZE), dX: alloc(BN * STATE_SIZE),
    dA: alloc(R * BN * M), dB: alloc(R * BN * M), dAgg: alloc(R * BN * M), dH1: alloc(R * BN * U),
    perDimStatic: new Float64Array(S), perDimDynamic: new Float64Array(D),
  };
}
