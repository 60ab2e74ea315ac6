// Standard normal CDF, upper tail, quantile and two-sided p-value.
//
// Method: thin wrappers over stdlib. Phi(z) = 0.5 erfc(-z / sqrt 2) with stdlib's FreeBSD-derived
// erfc (@stdlib/math-base-special-erfc, relative accuracy ~1e-15), the expression
// @stdlib/stats-base-dists-normal-cdf evaluates at mu = 0, sigma = 1, so the same number (checked
// in test/stats/distributions.test.ts), without that package's argument checks on every call (the
// distance searches make ~10^5-10^6 calls per measure). The quantile is
// @stdlib/stats-base-dists-normal-quantile, -sqrt 2 erfcinv(2p). Upper tails are computed as
// Phi(-z), never 1 - Phi(z), so small p-values keep their digits. Cost O(1).
// Example: normalCdf(1.959963984540054) = 0.975; twoSidedNormalP(1.96) = 0.04999579...

import erfc from "@stdlib/math-base-special-erfc";
import quantile from "@stdlib/stats-base-dists-normal-quantile";

/** Phi(z) for the standard normal law. */
export function normalCdf(z: number): number {
  return 0.5 * erfc(-z / Math.SQRT2);
}

/** 1 - Phi(z), computed as Phi(-z). */
export function normalSf(z: number): number {
  return normalCdf(-z);
}

/** Phi^{-1}(p), p in [0, 1] (NaN outside). */
export function normalQuantile(p: number): number {
  return quantile(p, 0, 1);
}

/** Two-sided p-value 2 (1 - Phi(|z|)); NaN for NaN input. */
export function twoSidedNormalP(z: number): number {
  if (Number.isNaN(z)) return NaN;
  return Math.min(1, 2 * normalCdf(-Math.abs(z)));
}
