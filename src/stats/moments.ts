// Mergeable moment accumulators (to 4th order) and co-moment accumulators.
//
// Method: P. Pebay, "Formulas for robust, one-pass parallel computation of covariances and
// arbitrary-order statistical moments", Sandia report SAND2008-6212 (2008): eqs. for the pairwise
// update of M2, M3, M4 and of the co-moment C_ab; one-value update in the form given by
// T. Terriberry, "Computing higher-order moments online" (2007). Cost: O(1) per value, O(d^2) per
// vector. Merging is not associative in floating point, so callers merge blocks in block order;
// `mergeMoments(a, b)` always evaluates the same expressions in the same order.
//
// Example: push 1, 2, 3, 4 -> count 4, mean 2.5, m2 5, m3 0, m4 10.25; variance 5/3.

import type { CoMomentState, MomentState, MomentSummary } from "./types.js";

/** A state with no values. */
export function emptyMoments(): MomentState {
  return { count: 0, mean: 0, m2: 0, m3: 0, m4: 0 };
}

/** Adds one value in place (Terriberry's one-pass form of Pebay's update). */
export function pushValue(s: MomentState, x: number): void {
  const n1 = s.count;
  const n = n1 + 1;
  const delta = x - s.mean;
  const deltaN = delta / n;
  const deltaN2 = deltaN * deltaN;
  const term1 = delta * deltaN * n1;
  s.mean += deltaN;
  s.m4 += term1 * deltaN2 * (n * n - 3 * n + 3) + 6 * deltaN2 * s.m2 - 4 * deltaN * s.m3;
  s.m3 += term1 * deltaN * (n - 2) - 3 * deltaN * s.m2;
  s.m2 += term1;
  s.count = n;
}

/** Pairwise merge (Pebay 2008, eqs. 3.1 and the M3, M4 combination rules); returns a new state. */
export function mergeMoments(a: MomentState, b: MomentState): MomentState {
  if (a.count === 0) return { ...b };
  if (b.count === 0) return { ...a };
  const na = a.count;
  const nb = b.count;
  const n = na + nb;
  const delta = b.mean - a.mean;
  const delta2 = delta * delta;
  const delta3 = delta2 * delta;
  const delta4 = delta2 * delta2;
  const mean = a.mean + (delta * nb) / n;
  const m2 = a.m2 + b.m2 + (delta2 * na * nb) / n;
  const m3 =
    a.m3 + b.m3 + (delta3 * na * nb * (na - nb)) / (n * n) + (3 * delta * (na * b.m2 - nb * a.m2)) / n;
  const m4 =
    a.m4 +
    b.m4 +
    (delta4 * na * nb * (na * na - na * nb + nb * nb)) / (n * n * n) +
    (6 * delta2 * (na * na * b.m2 + nb * nb * a.m2)) / (n * n) +
    (4 * delta * (na * b.m3 - nb * a.m3)) / n;
  return { count: n, mean, m2, m3, m4 };
}

/** Merges a list of states left to right (block order): ((s0 + s1) + s2) + ... */
export function mergeAll(states: readonly MomentState[]): MomentState {
  let acc = emptyMoments();
  for (const s of states) acc = mergeMoments(acc, s);
  return acc;
}

/**
 * Summary with standard errors.
 * - meanSE = sqrt(s^2 / n), s^2 the unbiased variance.
 * - varianceSE = sqrt((m4/n - (n-3)/(n-1) s^4) / n): the large-sample SE of s^2 from the 4th
 *   central moment (Var(s^2) = mu4/n - (n-3) sigma^4 / (n(n-1)), plug-in; e.g. Kendall & Stuart,
 *   The Advanced Theory of Statistics vol. 1, sampling moments of k-statistics). Clamped at 0.
 * - skewnessSE, excessKurtosisSE: EXACT under normality for the moment estimators g1, g2 used here
 *   ("A suggestion for using powerful and informative tests of normality", Am. Stat. 44
 *   (1990)): Var(g1) = 6(n-2)/((n+1)(n+3)),
 *   Var(g2) = 24 n (n-2)(n-3)/((n+1)^2 (n+3)(n+5)); note E(g2) = -6/(n+1) under normality.
 *   These are null-hypothesis SEs (they ignore the sample's own higher moments).
 * Quantities that need more values than `count` are NaN (variance: n >= 2; skewness: n >= 3;
 * kurtosis: n >= 4); a zero-variance sample has skewness and kurtosis NaN.
 */
export function summarize(s: MomentState): MomentSummary {
  const n = s.count;
  const variance = n >= 2 ? s.m2 / (n - 1) : NaN;
  const meanSE = n >= 2 ? Math.sqrt(variance / n) : NaN;
  let varianceSE = NaN;
  if (n >= 4) {
    const v = (s.m4 / n - ((n - 3) / (n - 1)) * variance * variance) / n;
    varianceSE = Math.sqrt(Math.max(0, v));
  }
  const biasedVar = n >= 1 ? s.m2 / n : NaN;
  const skewness = n >= 3 && biasedVar > 0 ? s.m3 / n / Math.pow(biasedVar, 1.5) : NaN;
  const excessKurtosis = n >= 4 && biasedVar > 0 ? s.m4 / n / (biasedVar * biasedVar) - 3 : NaN;
  const skewnessSE = n >= 3 ? Math.sqrt((6 * (n - 2)) / ((n + 1) * (n + 3))) : NaN;
  const excessKurtosisSE =
    n >= 4 ? Math.sqrt((24 * n * (n - 2) * (n - 3)) / ((n + 1) * (n + 1) * (n + 3) * (n + 5))) : NaN;
  return { count: n, mean: n >= 1 ? s.mean : NaN, meanSE, variance, varianceSE, skewness, skewnessSE, excessKurtosis, excessKurtosisSE };
}

/** A co-moment state of dimension `dim` with no vectors. */
export function emptyCoMoments(dim: number): CoMomentState {
  if (!Number.isInteger(dim) || dim < 1) throw new Error(`dim: must be a positive integer, got ${dim}`);
  return { count: 0, dim, mean: new Float64Array(dim), c: new Float64Array(dim * dim) };
}

/** Adds the vector x[offset .. offset+dim) in place (Pebay 2008, one-pass co-moment update). */
export function pushVector(s: CoMomentState, x: ArrayLike<number>, offset: number, scratch?: Float64Array): void {
  const d = s.dim;
  const n = s.count + 1;
  const f = (n - 1) / n;
  // `scratch` (length >= dim) spares an allocation per vector in hot loops.
  const delta = scratch ?? new Float64Array(d);
  for (let a = 0; a < d; a++) delta[a] = x[offset + a] - s.mean[a];
  for (let a = 0; a < d; a++) {
    const fa = f * delta[a];
    const row = a * d;
    for (let b = 0; b < d; b++) s.c[row + b] += fa * delta[b];
  }
  for (let a = 0; a < d; a++) s.mean[a] += delta[a] / n;
  s.count = n;
}

/** Pairwise merge of co-moments: C = Ca + Cb + delta delta' na nb / n (Pebay 2008). New object. */
export function mergeCoMoments(a: CoMomentState, b: CoMomentState): CoMomentState {
  if (a.dim !== b.dim) throw new Error(`comoments.dim: cannot merge dim ${a.dim} with dim ${b.dim}`);
  const d = a.dim;
  const out = emptyCoMoments(d);
  if (a.count === 0 || b.count === 0) {
    const src = a.count === 0 ? b : a;
    out.count = src.count;
    out.mean.set(src.mean);
    out.c.set(src.c);
    return out;
  }
  const na = a.count;
  const nb = b.count;
  const n = na + nb;
  const delta = new Float64Array(d);
  for (let i = 0; i < d; i++) delta[i] = b.mean[i] - a.mean[i];
  for (let i = 0; i < d; i++) out.mean[i] = a.mean[i] + (delta[i] * nb) / n;
  const w = (na * nb) / n;
  for (let i = 0; i < d; i++) {
    for (let j = 0; j < d; j++) {
      const k = i * d + j;
      out.c[k] = a.c[k] + b.c[k] + w * delta[i] * delta[j];
    }
  }
  out.count = n;
  return out;
}

/** Unbiased covariance matrix c / (n - 1), row-major dim x dim; NaN entries when count < 2. */
export function covarianceMatrix(s: CoMomentState): Float64Array {
  const out = new Float64Array(s.dim * s.dim);
  const denom = s.count - 1;
  for (let k = 0; k < out.length; k++) out[k] = s.count >= 2 ? s.c[k] / denom : NaN;
  return out;
}
