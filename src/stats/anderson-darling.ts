// Anderson-Darling A^2 against a normal law with estimated mean and variance, with Stephens'
// modification and p-value.
//
// Statistic: A^2 = -m - (1/m) sum_{i=1..m} (2i - 1) [ln Phi(z_(i)) + ln(1 - Phi(z_(m+1-i)))],
// z = (x - xbar)/s ("A test of goodness of fit", JASA 49 (1954) 765-769). Modified statistic for
// estimated mean and variance: A* = A^2 (1 + 0.75/m + 2.25/m^2), and its p-value by the piecewise
// exponential formulas of "Goodness-of-Fit Techniques" (Marcel Dekker, 1986), ch. 4 (tests based on
// EDF statistics), table 4.9, case 3 [memory for the table number; the coefficients reproduce the
// same book's percentage points of A*, table 4.7, case 3, [memory]: 0.561 (15%), 0.631 (10%),
// 0.752 (5%), 0.873 (2.5%), 1.035 (1%), checked in test/stats/normality.test.ts].
// Beyond A* = 10 (p ~ 4e-24, far outside the range the formula was fitted on, and where its
// quadratic term would eventually turn it upward) the p-value is held at its value at A* = 10, an
// upper bound: no finer value is claimed.
// Ties enter as equal z's (the formula is unchanged), but the null law assumes continuity: with
// lattice data the p-value is too small. Logs use Phi(-z) for the upper tail (no cancellation).
// Cost O(m log m). Example: see test/stats/normality.test.ts (hand-computed A^2 on 8 values).

import { normalCdf } from "./normal.js";
import { meanSd, sortedCopy } from "./lilliefors.js";
import { runCount, type TieGroups } from "./normal-distance.js";

export interface AndersonDarlingResult {
  statistic: number;
  modified: number;
  pValue: number;
}

/** A^2, A* and the p-value for a sample of at least 8 values. */
export function andersonDarlingNormal(x: ArrayLike<number>): AndersonDarlingResult {
  return andersonDarlingNormalSorted(sortedCopy(x));
}

/**
 * andersonDarlingNormal of a sample already in ascending order (e.g. sortedCopy's result); `moments`:
 * its meanSd (and tie groups) when the caller has them. With ties (e.g. a lattice law's 10^5 values on a few dozen
 * points), ln Phi(z) and ln Phi(-z) are computed once per distinct value: the same numbers, since
 * equal values give equal z.
 */
export function andersonDarlingNormalSorted(s: ArrayLike<number>, moments?: { mean: number; sd: number; groups?: TieGroups }): AndersonDarlingResult {
  const m = s.length;
  if (m < 8) throw new Error(`sample: Anderson-Darling needs at least 8 values, got ${m}`);
  const { mean, sd } = moments ?? meanSd(s);
  if (!(sd > 0)) throw new Error("sample: zero variance");
  const ties = tieRuns(s, moments?.groups);
  const sum = ties === null ? plainSum(s, mean, sd) : tiedSum(s, mean, sd, ties.runs, ties.first);
  const a2 = -m - sum / m;
  const modified = a2 * (1 + 0.75 / m + 2.25 / (m * m));
  return { statistic: a2, modified, pValue: andersonDarlingPValue(modified) };
}

// The sums in functions of their own, with module-level helpers rather than closures made at
// each call: V8 compiles such a long loop on-stack, and a new closure at the next call sent it
// back to the interpreter ("wrong call target", --trace-deopt).

/** ln Phi(z) and ln Phi(-z) (both floored at ln 1e-300) of z = (v - mean)/sd. */
function logLower(v: number, mean: number, sd: number): number {
  return Math.log(Math.max(normalCdf((v - mean) / sd), 1e-300));
}
function logUpper(v: number, mean: number, sd: number): number {
  return Math.log(Math.max(normalCdf(-((v - mean) / sd)), 1e-300));
}

/** sum_i (2i + 1) [ln Phi(z_(i)) + ln Phi(-z_(m-1-i))], term by term. */
function plainSum(s: ArrayLike<number>, mean: number, sd: number): number {
  const m = s.length;
  let sum = 0;
  for (let i = 0; i < m; i++) sum += (2 * i + 1) * (logLower(s[i], mean, sd) + logUpper(s[m - 1 - i], mean, sd));
  return sum;
}

/** plainSum with the logs computed once per run of equal values (first: each run's first index). */
function tiedSum(s: ArrayLike<number>, mean: number, sd: number, runs: number, first: Int32Array): number {
  const m = s.length;
  const lo = new Float64Array(runs);
  const hi = new Float64Array(runs);
  for (let r = 0; r < runs; r++) {
    lo[r] = logLower(s[first[r]], mean, sd);
    hi[r] = logUpper(s[first[r]], mean, sd);
  }
  // Runs of i ascending and of j = m - 1 - i descending.
  let sum = 0;
  let ri = 0;
  let rj = runs - 1;
  for (let i = 0; i < m; i++) {
    while (ri + 1 < runs && first[ri + 1] <= i) ri++;
    while (first[rj] > m - 1 - i) rj--;
    sum += (2 * i + 1) * (lo[ri] + hi[rj]);
  }
  return sum;
}

/**
 * The first index of each run of equal values of an ascending sample (the tie groups' starts when
 * the caller has them), or null when fewer than half the values are repeats (then the plain loop
 * is as fast).
 */
function tieRuns(s: ArrayLike<number>, groups?: TieGroups): { runs: number; first: Int32Array } | null {
  const m = s.length;
  if (groups) return 2 * groups.start.length > m ? null : { runs: groups.start.length, first: groups.start };
  const runs = runCount(s);
  if (2 * runs > m) return null;
  const first = new Int32Array(runs);
  let r = 0;
  for (let i = 1; i < m; i++) if (s[i] !== s[i - 1]) first[++r] = i;
  return { runs, first };
}

/** p-value of the modified statistic A* ("Goodness-of-Fit Techniques" (1986), table 4.9, case 3). */
export function andersonDarlingPValue(aa: number): number {
  let p: number;
  if (aa < 0.2) p = 1 - Math.exp(-13.436 + 101.14 * aa - 223.73 * aa * aa);
  else if (aa < 0.34) p = 1 - Math.exp(-8.318 + 42.796 * aa - 59.938 * aa * aa);
  else if (aa < 0.6) p = Math.exp(0.9177 - 4.279 * aa - 1.38 * aa * aa);
  else {
    const a = Math.min(aa, 10);
    p = Math.exp(1.2937 - 5.709 * a + 0.0186 * a * a);
  }
  return Math.min(1, Math.max(0, p));
}
