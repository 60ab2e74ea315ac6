// Chi-square CDF and upper-tail p-value.
//
// Method: wrapper over @stdlib/stats-base-dists-chisquare-cdf (regularised lower incomplete
// gamma P(k/2, x/2)). The upper tail is 1 - CDF, adequate for the misfit p-values used here
// (digits are lost only below ~1e-15). Cost O(1).
// Example: chiSquareCdf(3.841458820694124, 1) = 0.95; chiSquareSf(5.991464547107979, 2) = 0.05.

import cdf from "@stdlib/stats-base-dists-chisquare-cdf";

/** P(X <= x) for X ~ chi-square with k degrees of freedom. */
export function chiSquareCdf(x: number, k: number): number {
  return cdf(x, k);
}

/** P(X > x) for X ~ chi-square with k > 0 degrees of freedom. */
export function chiSquareSf(x: number, k: number): number {
  if (!(k > 0)) throw new Error(`k: degrees of freedom must be positive, got ${k}`);
  return Math.max(0, 1 - cdf(x, k));
}

/** Upper quantile: the x with P(X <= x) = p, by bisection on the CDF (|error| < 1e-10 x). */
export function chiSquareQuantile(p: number, k: number): number {
  if (!(p > 0 && p < 1)) throw new Error(`p: must be in (0, 1), got ${p}`);
  let lo = 0;
  let hi = Math.max(1, k);
  while (cdf(hi, k) < p) hi *= 2;
  for (let i = 0; i < 200 && hi - lo > 1e-12 * hi; i++) {
    const mid = 0.5 * (lo + hi);
    if (cdf(mid, k) < p) lo = mid;
    else hi = mid;
  }
  return 0.5 * (lo + hi);
}
