// Standard normal CDF, upper tail, quantile and two-sided p-value.
//
// Method: thin wrappers over stdlib (@stdlib/stats-base-dists-normal-cdf, which evaluates
// 0.5 erfc(-z / sqrt 2) with the FreeBSD-derived erfc, relative accuracy ~1e-15; and
// @stdlib/stats-base-dists-normal-quantile, -sqrt 2 erfcinv(2p)). Upper tails are computed as
// Phi(-z), never 1 - Phi(z), so small p-values keep their digits. Cost O(1).
// Example: normalCdf(1.959963984540054) = 0.975; twoSidedNormalP(1.96) = 0.04999579...

import cdf from "@stdlib/stats-base-dists-normal-cdf";
import quantile from "@stdlib/stats-base-dists-normal-quantile";

/** Phi(z) for the standard normal law. */
export function normalCdf(z: number): number {
  return cdf(z, 0, 1);
}

/** 1 - Phi(z), computed as Phi(-z). */
export function normalSf(z: number): number {
  return cdf(-z, 0, 1);
}

/** Phi^{-1}(p), p in [0, 1] (NaN outside). */
export function normalQuantile(p: number): number {
  return quantile(p, 0, 1);
}

/** Two-sided p-value 2 (1 - Phi(|z|)); NaN for NaN input. */
export function twoSidedNormalP(z: number): number {
  if (Number.isNaN(z)) return NaN;
  return Math.min(1, 2 * cdf(-Math.abs(z), 0, 1));
}
