// Diagonal-Gaussian pieces of the evidence lower bound: the reparameterised sample, KL divergences (against
// the standard normal and between two diagonal Gaussians), and the Gaussian negative log-likelihood, all
// parameterised by log-variance, each with its backward pass. Losses return float64 sums; per-dimension
// totals are available for monitoring factors that carry nothing.
import type { Buf } from './types.js';

const LOG_2PI = Math.log(2 * Math.PI);

/** Returns z after z = mu + exp(logvar / 2) · eps over n entries (Kingma and Welling 2014). */
export function gaussianReparam(mu: Buf, logvar: Buf, eps: Buf, z: Buf, n: number): Buf {
  for (let i = 0; i < n; i++) z[i] = mu[i]! + Math.exp(0.5 * logvar[i]!) * eps[i]!;
  return z;
}

/** Returns dMu after the backward pass of gaussianReparam: dMu += dz, dLogvar += dz · eps · exp(logvar / 2) / 2. */
export function gaussianReparamBackward(logvar: Buf, eps: Buf, dz: Buf, dMu: Buf, dLogvar: Buf, n: number): Buf {
  for (let i = 0; i < n; i++) {
    const g = dz[i]!;
    dMu[i] = dMu[i]! + g;
    dLogvar[i] = dLogvar[i]! + g * eps[i]! * 0.5 * Math.exp(0.5 * logvar[i]!);
  }
  return dMu;
}

/**
 * Returns Σ KL(N(mu, e^logvar) ‖ N(0, 1)) over rows × dims entries, each 0.5·(mu² + e^logvar − 1 − logvar)
 * (Kingma and Welling 2014, appendix B). perDim (length dims, may be null) += the per-dimension sums.
 */
export function klStdNormal(mu: Buf, logvar: Buf, rows: number, dims: number, perDim: Float64Array | null): number {
  let total = 0;
  for (let i = 0; i < rows; i++)
    for (let d = 0; d < dims; d++) {
      const k = i * dims + d, m = mu[k]!, lv = logvar[k]!;
      const kl = 0.5 * (m * m + Math.exp(lv) - 1 - lv);
      total += kl;
      if (perDim) perDim[d] = perDim[d]! + kl;
    }
  return total;
}

/** Returns dMu after the backward pass of klStdNormal scaled by `scale`: dMu += scale·mu, dLogvar += scale·(e^logvar − 1)/2. */
export function klStdNormalBackward(mu: Buf, logvar: Buf, n: number, scale: number, dMu: Buf, dLogvar: Buf): Buf {
  for (let i = 0; i < n; i++) {
    dMu[i] = dMu[i]! + scale * mu[i]!;
    dLogvar[i] = dLogvar[i]! + scale * 0.5 * (Math.exp(logvar[i]!) - 1);
  }
  return dMu;
}

/**
 * Returns Σ KL(q ‖ p) for diagonal Gaussians q = N(muQ, e^lvQ), p = N(muP, e^lvP) over rows × dims entries,
 * each 0.5·(lvP − lvQ + (e^lvQ + (muQ − muP)²) / e^lvP − 1). perDim (may be null) += per-dimension sums.
 */
export function klGaussians(muQ: Buf, lvQ: Buf, muP: Buf, lvP: Buf, rows: number, dims: number, perDim: Float64Array | null): number {
  let total = 0;
  for (let i = 0; i < rows; i++)
    for (let d = 0; d < dims; d++) {
      const k = i * dims + d, diff = muQ[k]! - muP[k]!, lq = lvQ[k]!, lp = lvP[k]!;
      const kl = 0.5 * (lp - lq + (Math.exp(lq) + diff * diff) * Math.exp(-lp) - 1);
      total += kl;
      if (perDim) perDim[d] = perDim[d]! + kl;
    }
  return total;
}

/** Returns dMuQ after the backward pass of klGaussians scaled by `scale` into the four gradients (dMuP, dLvP may be null for a fixed prior). */
export function klGaussiansBackward(
  muQ: Buf, lvQ: Buf, muP: Buf, lvP: Buf, n: number, scale: number, dMuQ: Buf, dLvQ: Buf, dMuP: Buf | null, dLvP: Buf | null,
): Buf {
  for (let i = 0; i < n; i++) {
    const diff = muQ[i]! - muP[i]!, invP = Math.exp(-lvP[i]!), vq = Math.exp(lvQ[i]!);
    const gm = scale * diff * invP;
    dMuQ[i] = dMuQ[i]! + gm;
    dLvQ[i] = dLvQ[i]! + scale * 0.5 * (vq * invP - 1);
    if (dMuP) dMuP[i] = dMuP[i]! - gm;
    if (dLvP) dLvP[i] = dLvP[i]! + scale * 0.5 * (1 - (vq + diff * diff) * invP);
  }
  return dMuQ;
}

/**
 * Returns Σ −log N(x; mu, e^logvar) over rows × dims entries, each 0.5·(log 2π + logvar + (x − mu)² / e^logvar).
 * With sharedLogvar the logvar buffer holds one value per dimension (a learned, input-independent noise level).
 * perDim (may be null) += per-dimension sums.
 */
export function gaussianNll(
  x: Buf, mu: Buf, logvar: Buf, rows: number, dims: number, sharedLogvar: boolean, perDim: Float64Array | null,
): number {
  let total = 0;
  for (let i = 0; i < rows; i++)
    for (let d = 0; d < dims; d++) {
      const k = i * dims + d, lv = logvar[sharedLogvar ? d : k]!, e = x[k]! - mu[k]!;
      const v = 0.5 * (LOG_2PI + lv + e * e * Math.exp(-lv));
      total += v;
      if (perDim) perDim[d] = perDim[d]! + v;
    }
  return total;
}

/**
 * Returns dMu after the backward pass of gaussianNll scaled by `scale`: dMu += scale·(mu − x)/e^lv and
 * dLogvar += scale·(1 − (x − mu)²/e^lv)/2 (summed per dimension when shared; dLogvar may be null, dX too).
 */
export function gaussianNllBackward(
  x: Buf, mu: Buf, logvar: Buf, rows: number, dims: number, sharedLogvar: boolean, scale: number,
  dMu: Buf, dLogvar: Buf | null, dX: Buf | null,
): Buf {
  for (let i = 0; i < rows; i++)
    for (let d = 0; d < dims; d++) {
      const k = i * dims + d, li = sharedLogvar ? d : k, inv = Math.exp(-logvar[li]!), e = x[k]! - mu[k]!;
      const gm = -scale * e * inv;
      dMu[k] = dMu[k]! + gm;
      if (dX) dX[k] = dX[k]! - gm;
      if (dLogvar) dLogvar[li] = dLogvar[li]! + scale * 0.5 * (1 - e * e * inv);
    }
  return dMu;
}
