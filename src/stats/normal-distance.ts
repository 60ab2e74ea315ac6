// An effect-size test of normality: the Kolmogorov distance from the sampled law F to the normal
// FAMILY, d(F) = inf_{mu, sigma} sup_x |F(x) - Phi((x - mu)/sigma)|, with a confidence bound.
//
// Method: the Dvoretzky-Kiefer-Wolfowitz inequality with Massart's constant ("The tight constant in the
// Dvoretzky-Kiefer-Wolfowitz inequality", Ann. Probab. 18 (1990) 1269 [memory for the title]): P(sup |F_m - F| > e) <= 2 exp(-2 m e^2), valid for every F, discrete or not.
// With D_min = min over (mu, sigma) of sup |F_m - Phi_{mu,sigma}| (Nelder-Mead from the moment fit,
// "A simplex method for function minimization", Comput. J. 7 (1965) 308), the triangle inequality gives, with probability >= 1-a,
//   d(F) <= D_min + sqrt(ln(2/a) / (2m))                 (upper confidence bound, "DKW band")
// and, under H0: d(F) <= tol, P(D_min - tol >= t) <= 2 exp(-2 m t^2), so
//   p = min(1, 2 exp(-2 m (D_min - tol)^2)) for D_min > tol, else 1       (conservative p-value).
// The minimiser is a local search: a larger D_min than the true minimum makes the bound wider
// (safe) and the p-value smaller (not safe); the search starts at the moment fit and its result
// never exceeds the moment-fit distance.
// Ties (lattice laws): a law on a lattice of spacing h is at KS distance about (atom mass)/2 from
// every continuous law, so the plain distance cannot certify "normal" for, e.g., vertex counts.
// When more than half the sample values are tied, the sup is taken over the mid-points between
// consecutive distinct values (the classical continuity correction: compare F at the atom v_k with
// Phi at (v_k + v_{k+1})/2). The DKW bound holds at every point, so it also bounds this
// restricted distance; the result says which distance was used.
// Resolution floor: under exact normality E D_hat ~ 0.87/sqrt(m) is the scale below which
// distances are not resolved (asymptotic Lilliefors quantiles are 0.886/sqrt(m) at 5%, Lilliefors
// 1967; "0.87" is common practice for this project).
// Cost O(m log m + 200 m). Example: 10^5 normal draws give D_min ~ 0.002, bound ~ 0.0073 at a = 0.01.

import { normalCdf } from "./normal.js";
import { ksDistanceSorted, meanSd, meanSdAll, sortedCopy } from "./lilliefors.js";

export interface NormalDistance {
  /** Sample size m. */
  size: number;
  /** D with the moment fit (the Lilliefors statistic, exact with ties). */
  momentFit: number;
  /** Minimum-distance D over (mu, sigma), in the metric below. */
  minimum: number;
  /** "jumps": sup over all x; "midpoints": continuity-corrected (lattice data). */
  metric: "jumps" | "midpoints";
  /** Fraction of values equal to another value. */
  tiedFraction: number;
  /** DKW margin sqrt(ln(2/a)/(2m)). */
  margin: number;
  /** Upper (1 - a) confidence bound of d(F). */
  upperBound: number;
  /** p-value of H0: d(F) <= tol. */
  pValue: number;
  /** 0.87/sqrt(m). */
  resolutionFloor: number;
  /** Whether a perfectly normal law could pass: margin + resolution floor < tol. */
  toleranceReachable: boolean;
}

/** The distinct values of an ascending sample and the empirical CDF after each (computed once per sample). */
export interface TieGroups {
  /** First index of each run of equal values. */
  start: Int32Array;
  /** Last index of each run. */
  end: Int32Array;
  /** The run's value. */
  value: Float64Array;
}

/** 0, 1, 2, ... shared by the tie groups of every sample without ties (read-only). */
let identity = new Int32Array(0);

/**
 * The tie groups of an ascending sample. Without ties (every continuous sample) no array is
 * allocated: start and end are one shared identity array and value is the sample itself (when it
 * is a Float64Array), so callers must not write into them.
 */
export function tieGroups(sorted: ArrayLike<number>): TieGroups {
  const m = sorted.length;
  const count = runCount(sorted);
  return count === m && sorted instanceof Float64Array ? untiedGroups(sorted) : groupsOf(sorted, count);
}

// The parts of tieGroups are separate functions so that each long loop is compiled (on-stack, in
// the first call) with its own feedback: one function holding them all was compiled in its first
// loop and thrown back to the interpreter at the next, on every call (V8's --trace-deopt).

/** The number of runs of equal values of an ascending sample. */
export function runCount(sorted: ArrayLike<number>): number {
  const m = sorted.length;
  let count = m > 0 ? 1 : 0;
  for (let i = 1; i < m; i++) if (sorted[i] !== sorted[i - 1]) count++;
  return count;
}

function untiedGroups(sorted: Float64Array): TieGroups {
  const m = sorted.length;
  if (identity.length < m) {
    identity = new Int32Array(Math.max(m, 2 * identity.length));
    for (let i = 0; i < identity.length; i++) identity[i] = i;
  }
  const ids = identity.subarray(0, m);
  return { start: ids, end: ids, value: sorted };
}

function groupsOf(sorted: ArrayLike<number>, count: number): TieGroups {
  const start = new Int32Array(count);
  const end = new Int32Array(count);
  const value = new Float64Array(count);
  for (let g = 0, i = 0; g < count; g++) {
    const j = runEnd(sorted, i);
    start[g] = i;
    end[g] = j;
    value[g] = sorted[i];
    i = j + 1;
  }
  return { start, end, value };
}

/** The last index of the run of values equal to sorted[i] (one short loop per run, never compiled on-stack). */
function runEnd(sorted: ArrayLike<number>, i: number): number {
  let j = i;
  while (j + 1 < sorted.length && sorted[j + 1] === sorted[i]) j++;
  return j;
}

function midpointDistance(groups: TieGroups, m: number, mu: number, sigma: number): number {
  const values = groups.value;
  const u = values.length;
  if (u < 2) return 1;
  let d = 0;
  for (let k = 0; k < u - 1; k++) {
    const mid = 0.5 * (values[k] + values[k + 1]);
    d = Math.max(d, Math.abs((groups.end[k] + 1) / m - normalCdf((mid - mu) / sigma)));
  }
  const lowEdge = values[0] - 0.5 * (values[1] - values[0]);
  const highEdge = values[u - 1] + 0.5 * (values[u - 1] - values[u - 2]);
  d = Math.max(d, normalCdf((lowEdge - mu) / sigma), 1 - normalCdf((highEdge - mu) / sigma));
  return d;
}

/**
 * Slack of the pruning test below: it covers a non-monotone last bit of the computed Phi (an erfc
 * accurate to ~1e-15 relative moves a value by far less), so pruning never drops the maximum.
 */
const PRUNE_SLACK = 1e-12;
/** How many recent maximisers seed a search (the maximum often alternates between a few places, e.g. the largest F_m - Phi and the largest Phi - F_m). */
const SEEDS = 4;

/**
 * Phi at the tie groups, memoised for one distance evaluation: an entry is valid when its stamp is
 * the evaluation's number. One pair of arrays serves every search (numbers are never reused
 * between evaluations, so an entry another search wrote is never taken for one of this one's).
 */
let phiMemo = new Float64Array(0);
let stampMemo = new Int32Array(0);
let stampNow = 0;
/** Depth-first stack of the search (ranges lo..hi and their bounds); depth <= log2(groups) + 1. */
const stackLo = new Int32Array(64);
const stackHi = new Int32Array(64);
const stackBound = new Float64Array(64);

/**
 * ksDistanceSorted(sorted, mu, sigma) with the same result, bit for bit, at a fraction of its cost
 * when called many times on one sample (the minimiser's ~100-200 evaluations). Branch and bound over
 * the tie groups: for groups lo..hi (ascending values, so ascending Phi and F_m), every term of
 * the distance is at most max(F_m(after hi) - Phi(x_lo), Phi(x_hi) - F_m(before lo)) (for one
 * group, this bound IS its term); a range whose bound cannot beat the best term found so far
 * (minus PRUNE_SLACK) is skipped, others are split. The search starts from the groups that gave the
 * maximum at the last SEEDS calls (the minimiser moves little between calls). The maximum is a
 * maximum of the same floating-point terms as the plain loop computes, so it is the same number.
 */
export class KsDistanceSearch {
  private readonly groups: TieGroups;
  private readonly m: number;
  /** The groups that gave the maximum at the last calls (most recent first, distinct): the seeds. */
  private readonly recent: number[] = [0];
  /** Phi evaluations made (for tests and profiling). */
  evaluations = 0;

  constructor(readonly sorted: ArrayLike<number>, groups?: TieGroups) {
    this.groups = groups ?? tieGroups(sorted);
    this.m = sorted.length;
  }

  /**
   * sup_x |F_m(x) - Phi((x - mu)/sigma)|, equal to ksDistanceSorted(sorted, mu, sigma). With a
   * `cap`, the search may stop at the first term >= cap and return it: the result is then the
   * exact distance when that is below cap, and some value >= cap (not the distance) otherwise.
   */
  distance(mu: number, sigma: number, cap = Infinity): number {
    // Guard: a NaN anywhere (it cannot arise from finite inputs) would make the pruning meaningless.
    if (!Number.isFinite(mu) || !Number.isFinite(sigma)) return ksDistanceSorted(this.sorted, mu, sigma);
    const { start, end, value } = this.groups;
    const m = this.m;
    const count = value.length;
    if (stampMemo.length < count) {
      phiMemo = new Float64Array(count);
      stampMemo = new Int32Array(count);
    }
    if (stampNow >= 0x7fffffff) {
      stampMemo.fill(0);
      stampNow = 0;
    }
    const call = ++stampNow;
    const phi = phiMemo;
    const stamp = stampMemo;
    let evaluations = 0;
    // Phi at groups g0 and g1 into the memo. The one place Phi is called: a search compiled with
    // several inlined copies of it took V8 ~0.1 s of compiler time (--trace-opt), once per thread.
    const fill = (g0: number, g1: number): void => {
      for (let g = g0; g <= g1; g += g1 - g0 || 1) {
        if (stamp[g] === call) continue;
        evaluations++;
        phi[g] = normalCdf((value[g] - mu) / sigma);
        stamp[g] = call;
      }
    };
    // The larger of the two terms' bounds over groups lo..hi (Phi at both in the memo); for lo = hi, the group's term exactly as ksDistanceSorted computes it.
    const bound = (lo: number, hi: number): number => Math.max((end[hi] + 1) / m - phi[lo], phi[hi] - start[lo] / m);
    const recent = this.recent;
    let arg = 0;
    let best = 0;
    for (const g of recent) {
      fill(g, g);
      const seed = bound(g, g);
      if (seed > best) {
        best = seed;
        arg = g;
      }
    }
    let sp = 0;
    if (count > 1 && !(best >= cap)) {
      fill(0, count - 1);
      stackLo[0] = 0;
      stackHi[0] = count - 1;
      stackBound[0] = bound(0, count - 1);
      sp = 1;
    }
    while (sp > 0) {
      sp--;
      const lo = stackLo[sp];
      const hi = stackHi[sp];
      if (stackBound[sp] + PRUNE_SLACK <= best) continue;
      const mid = (lo + hi) >> 1;
      fill(mid, mid + 1);
      const left = bound(lo, mid);
      const right = bound(mid + 1, hi);
      if (lo === mid && left > best) {
        best = left;
        arg = lo;
      }
      if (mid + 1 === hi && right > best) {
        best = right;
        arg = hi;
      }
      if (best >= cap) break;
      // The half with the larger bound is searched first: it more likely holds the maximum, which prunes the other.
      if (right > left) {
        if (lo < mid) sp = push(sp, lo, mid, left);
        if (mid + 1 < hi) sp = push(sp, mid + 1, hi, right);
      } else {
        if (mid + 1 < hi) sp = push(sp, mid + 1, hi, right);
        if (lo < mid) sp = push(sp, lo, mid, left);
      }
    }
    this.evaluations += evaluations;
    remember(recent, arg);
    return Number.isNaN(best) ? ksDistanceSorted(this.sorted, mu, sigma) : best;
  }
}

/** Puts g first in the list of recent maximisers (at most SEEDS, distinct). */
function remember(recent: number[], g: number): void {
  const at = recent.indexOf(g);
  if (at === 0) return;
  if (at > 0) recent.splice(at, 1);
  else if (recent.length >= SEEDS) recent.pop();
  recent.unshift(g);
}

function push(sp: number, lo: number, hi: number, bound: number): number {
  stackLo[sp] = lo;
  stackHi[sp] = hi;
  stackBound[sp] = bound;
  return sp + 1;
}

/**
 * Nelder-Mead minimum of f over the plane. f(p, cap) may return any value >= cap instead of f(p)
 * when f(p) >= cap: every trial point whose value is only compared with a threshold (a rejected
 * reflection, expansion or contraction) is given that threshold as cap, and a value >= cap takes
 * the same branch as f(p) itself, so the search follows the same steps and returns the same number
 * as with exact values.
 */
function nelderMead2(f: (p: [number, number], cap: number) => number, start: [number, number], scale: [number, number], iters = 200): number {
  let simplex: [number, number][] = [start, [start[0] + scale[0], start[1]], [start[0], start[1] + scale[1]]];
  let values = simplex.map((p) => f(p, Infinity));
  for (let it = 0; it < iters; it++) {
    const spread = Math.max(...values) - Math.min(...values);
    const size = Math.max(Math.abs(simplex[1][0] - simplex[0][0]), Math.abs(simplex[2][0] - simplex[0][0]), Math.abs(simplex[1][1] - simplex[0][1]), Math.abs(simplex[2][1] - simplex[0][1]));
    if (spread < 1e-7 && size < 1e-5) break;
    const order = [0, 1, 2].sort((a, b) => values[a] - values[b]);
    simplex = order.map((k) => simplex[k]);
    values = order.map((k) => values[k]);
    const c: [number, number] = [(simplex[0][0] + simplex[1][0]) / 2, (simplex[0][1] + simplex[1][1]) / 2];
    const w = simplex[2];
    const refl: [number, number] = [2 * c[0] - w[0], 2 * c[1] - w[1]];
    // Read only if below values[1].
    const fr = f(refl, values[1]);
    if (fr < values[0]) {
      const exp: [number, number] = [3 * c[0] - 2 * w[0], 3 * c[1] - 2 * w[1]];
      // Read only if below fr.
      const fe = f(exp, fr);
      if (fe < fr) {
        simplex[2] = exp;
        values[2] = fe;
      } else {
        simplex[2] = refl;
        values[2] = fr;
      }
    } else if (fr < values[1]) {
      simplex[2] = refl;
      values[2] = fr;
    } else {
      const con: [number, number] = [(c[0] + w[0]) / 2, (c[1] + w[1]) / 2];
      // Read only if below values[2].
      const fc = f(con, values[2]);
      if (fc < values[2]) {
        simplex[2] = con;
        values[2] = fc;
      } else {
        for (const k of [1, 2]) {
          simplex[k] = [(simplex[0][0] + simplex[k][0]) / 2, (simplex[0][1] + simplex[k][1]) / 2];
          values[k] = f(simplex[k], Infinity);
        }
      }
    }
  }
  return Math.min(...values);
}

/**
 * Distance to the normal family with a (1 - a) upper bound and the p-value of H0: d(F) <= tol.
 * `a` defaults to 0.01. Needs at least 5 values and a non-zero variance.
 */
export function normalDistance(x: ArrayLike<number>, tol: number, a = 0.01): NormalDistance {
  return normalDistanceSorted(sortedCopy(x), tol, a);
}

/** What the distance and Anderson-Darling read of one ascending sample, computed once and shared. */
export interface SortedStats {
  mean: number;
  sd: number;
  groups: TieGroups;
}

/** meanSd and tieGroups of an ascending sample. */
export function sortedStats(s: Float64Array): SortedStats {
  return { ...meanSd(s), groups: tieGroups(s) };
}

/** sortedStats of each sample (the means and SDs by meanSdAll: the same numbers, less CPU). */
export function sortedStatsAll(samples: readonly Float64Array[]): SortedStats[] {
  return meanSdAll(samples).map((moments, g) => ({ ...moments, groups: tieGroups(samples[g]) }));
}

/**
 * normalDistance of a sample already in ascending order (e.g. sortedCopy's result). `plain`: every
 * distance by the plain loop ksDistanceSorted, exact at every trial point (the reference the
 * pruned search is tested against). `stats`: sortedStats(s) when the caller has it.
 */
export function normalDistanceSorted(s: Float64Array, tol: number, a = 0.01, plain = false, stats: SortedStats = sortedStats(s)): NormalDistance {
  if (!(tol > 0 && tol < 1)) throw new Error(`normalityTolerance: must be in (0, 1), got ${tol}`);
  if (!(a > 0 && a < 1)) throw new Error(`alpha: must be in (0, 1), got ${a}`);
  const m = s.length;
  if (m < 5) throw new Error(`sample: needs at least 5 values, got ${m}`);
  const { mean, sd, groups } = stats;
  if (!(sd > 0)) throw new Error("sample: zero variance");
  // Values equal to another value: the members of the groups of two or more.
  const distinct = groups.value.length;
  let tied = 0;
  if (distinct < m) for (let g = 0; g < distinct; g++) if (groups.end[g] > groups.start[g]) tied += groups.end[g] - groups.start[g] + 1;
  const tiedFraction = tied / m;
  const metric: "jumps" | "midpoints" = tiedFraction > 0.5 && distinct >= 2 ? "midpoints" : "jumps";
  const search = new KsDistanceSearch(s, groups);
  const dist = (mu: number, sigma: number, cap: number) => (metric === "jumps" ? (plain ? ksDistanceSorted(s, mu, sigma) : search.distance(mu, sigma, cap)) : midpointDistance(groups, m, mu, sigma));
  const start = dist(mean, sd, Infinity);
  // With the "jumps" metric the first distance IS the moment fit's (same sample, same mu and sigma).
  const momentFit = metric === "jumps" ? start : ksDistanceSorted(s, mean, sd);
  const found = nelderMead2((p, cap) => dist(mean + p[0] * sd, sd * Math.exp(p[1]), cap), [0, 0], [0.05, 0.05]);
  const minimum = Math.min(start, found);
  const margin = Math.sqrt(Math.log(2 / a) / (2 * m));
  const resolutionFloor = 0.87 / Math.sqrt(m);
  const excess = minimum - tol;
  return {
    size: m,
    momentFit,
    minimum,
    metric,
    tiedFraction,
    margin,
    upperBound: minimum + margin,
    pValue: excess > 0 ? Math.min(1, 2 * Math.exp(-2 * m * excess * excess)) : 1,
    resolutionFloor,
    toleranceReachable: margin + resolutionFloor < tol,
  };
}
