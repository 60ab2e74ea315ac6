// Control variates with KNOWN control covariance: mean and variance of a response M from the joint
// co-moments of (M, Z), where Z has mean 0 and a known covariance K.
//
// Method (common practice in Monte Carlo; e.g. "Monte Carlo Methods in Financial Engineering",
// Springer 2003, sec. 4.1, and "Simulation", 5th ed., Academic Press 2013, ch. 9 "control variates"):
//   b     = S_ZZ^-1 S_ZM                     (least squares of M on Z with an intercept)
//   mean  = mean(M) - b' mean(Z)             (E Z = 0)
//   var   = s_R^2 + b' K b                   (Var M = Var(M - b'Z) + b' K b when Cov(M - b'Z, Z) = 0)
//   s_R^2 = (S_MM - S_MZ S_ZZ^-1 S_ZM) / (N - 1 - p)   (residual variance, p controls)
// The variance identity holds for the population coefficient; b is its least-squares estimate,
// so both estimates are consistent and their standard errors come from the delete-one-block
// jackknife with b refitted in every replicate (jackknifeFromReplicates below).
// Controls are standardised by their known standard deviations before the solve (X_n ~ sqrt(n) and
// the integrated path ~ n^3/2 differ by a factor n in scale).
// Cost: O(p^3) per (response, replicate). Example: M = 2 Z + e, Var Z = 1 known, Var e = 0.01:
// the control-variate variance of M is 4.01 with a standard error set by e alone.

import { cholesky, choleskySolve } from "./linalg.js";
import { emptyCoMoments, mergeCoMoments } from "./moments.js";
import type { CoMomentState } from "./types.js";

/** The controls used: rows of `transform` map the raw control vector to them; `known` is their covariance. */
export interface ControlBasis {
  /** Number of used controls p. */
  p: number;
  /** Number of raw controls c. */
  c: number;
  /** p x c, row-major. */
  transform: Float64Array;
  /** p x p known covariance of the used controls (positive definite). */
  known: Float64Array;
}

/** Co-moments of [responses (the first q entries), used controls] from those of [responses, raw controls]. */
export function projectControls(s: CoMomentState, q: number, basis: ControlBasis): CoMomentState {
  const { p, c, transform: T } = basis;
  if (s.dim !== q + c) throw new Error(`controls: co-moments of dim ${s.dim}, expected ${q + c}`);
  const d = q + p;
  const out = emptyCoMoments(d);
  out.count = s.count;
  // A = the (q + p) x (q + c) map: identity on the responses, T on the controls. Its non-zero
  // entries per row, in column order (the sums below skip the zeros and keep that order).
  const D = s.dim;
  const cols: number[][] = [];
  const vals: number[][] = [];
  for (let i = 0; i < d; i++) {
    const ks: number[] = [];
    const as: number[] = [];
    for (let k = 0; k < D; k++) {
      const a = i < q ? (k === i ? 1 : 0) : k < q ? 0 : T[(i - q) * c + (k - q)];
      if (a !== 0) {
        ks.push(k);
        as.push(a);
      }
    }
    cols.push(ks);
    vals.push(as);
  }
  for (let i = 0; i < d; i++) {
    let m = 0;
    for (let e = 0; e < cols[i].length; e++) m += vals[i][e] * s.mean[cols[i][e]]; // unused raw controls may be NaN (a law without a mean)
    out.mean[i] = m;
  }
  // C' = A C A'
  const AC = new Float64Array(d * D);
  for (let i = 0; i < d; i++)
    for (let e = 0; e < cols[i].length; e++) {
      const a = vals[i][e];
      const k = cols[i][e];
      for (let l = 0; l < D; l++) AC[i * D + l] += a * s.c[k * D + l];
    }
  for (let i = 0; i < d; i++)
    for (let j = 0; j < d; j++) {
      let t = 0;
      for (let e = 0; e < cols[j].length; e++) t += AC[i * D + cols[j][e]] * vals[j][e];
      out.c[i * d + j] = t;
    }
  return out;
}

export interface ControlVariatePoint {
  meanPlain: number;
  variancePlain: number;
  mean: number;
  variance: number;
  /** Regression coefficients on the used controls (in their own units). */
  coef: Float64Array;
  /** Residual variance Var(M - b'Z) (the part the controls do not explain). */
  residualVariance: number;
}

/**
 * Control-variate estimates of response r (0 <= r < q) from projected co-moments of
 * [q responses, p controls] with known control covariance `known` (p x p).
 */
/** The controls' block of a state standardised by their known SDs, and its Cholesky factor (null: no spread). The same for every response. */
export interface ControlFactor {
  sd: Float64Array;
  l: Float64Array | null;
}

/** The control factor of projected co-moments of [q responses, p controls] (pass it to controlVariatePoint for each response). */
export function controlFactor(s: CoMomentState, q: number, known: Float64Array): ControlFactor {
  const p = s.dim - q;
  const d = s.dim;
  // Standardise the controls by their known standard deviations.
  const sd = new Float64Array(p);
  for (let a = 0; a < p; a++) sd[a] = Math.sqrt(known[a * p + a]);
  const Szz = new Float64Array(p * p);
  for (let a = 0; a < p; a++) for (let b = 0; b < p; b++) Szz[a * p + b] = s.c[(q + a) * d + (q + b)] / (sd[a] * sd[b]);
  try {
    return { sd, l: cholesky(Szz, p, "controls") };
  } catch {
    return { sd, l: null };
  }
}

export function controlVariatePoint(s: CoMomentState, q: number, r: number, known: Float64Array, factor?: ControlFactor): ControlVariatePoint {
  const N = s.count;
  const p = s.dim - q;
  const d = s.dim;
  const meanPlain = s.mean[r];
  const variancePlain = N >= 2 ? s.c[r * d + r] / (N - 1) : NaN;
  if (p === 0 || N < p + 3) {
    return { meanPlain, variancePlain, mean: meanPlain, variance: variancePlain, coef: new Float64Array(p), residualVariance: variancePlain };
  }
  const { sd, l } = factor ?? controlFactor(s, q, known);
  // Controls without spread in this sample (e.g. a lattice walk at n = 1): no regression.
  if (l === null) return { meanPlain, variancePlain, mean: meanPlain, variance: variancePlain, coef: new Float64Array(p), residualVariance: variancePlain };
  const Szm = new Float64Array(p);
  for (let a = 0; a < p; a++) Szm[a] = s.c[(q + a) * d + r] / sd[a];
  const Smm = s.c[r * d + r];
  const beta = choleskySolve(l, p, Szm);
  let explained = 0;
  let shift = 0;
  for (let a = 0; a < p; a++) {
    explained += beta[a] * Szm[a];
    shift += (beta[a] * s.mean[q + a]) / sd[a];
  }
  const residualVariance = Math.max(0, Smm - explained) / (N - 1 - p);
  let bKb = 0;
  for (let a = 0; a < p; a++)
    for (let b = 0; b < p; b++) bKb += (beta[a] * beta[b] * known[a * p + b]) / (sd[a] * sd[b]);
  const coef = beta.map((x, a) => x / sd[a]);
  return { meanPlain, variancePlain, mean: meanPlain - shift, variance: residualVariance + bKb, coef, residualVariance };
}

/**
 * States of all blocks merged except block j, for every j, in a fixed order (prefix and suffix
 * merges in block order): deterministic bits for any split of the run. Also returns the full merge.
 */
export function leaveOneOutStates(blocks: readonly CoMomentState[]): { full: CoMomentState; leaveOut: CoMomentState[] } {
  const B = blocks.length;
  if (B < 2) throw new Error(`blocks: the jackknife needs at least 2 blocks, got ${B}`);
  const d = blocks[0].dim;
  const prefix: CoMomentState[] = [];
  const suffix: CoMomentState[] = new Array(B);
  let acc = emptyCoMoments(d);
  for (let j = 0; j < B; j++) prefix.push((acc = mergeCoMoments(acc, blocks[j])));
  acc = emptyCoMoments(d);
  for (let j = B - 1; j >= 0; j--) suffix[j] = acc = mergeCoMoments(blocks[j], acc);
  const leaveOut = blocks.map((_, j) => {
    if (j === 0) return suffix[1];
    if (j === B - 1) return prefix[B - 2];
    return mergeCoMoments(prefix[j - 1], suffix[j + 1]);
  });
  return { full: prefix[B - 1], leaveOut };
}
