// Evidence about the limit law of one measure, from the kept per-path sample and the block sums.
//
// Gate (house rule): finite-n laws are never exactly normal, so "normal" is judged by an effect
// size: the (1 - alpha) DKW upper bound of the Kolmogorov distance to the normal family at the
// largest n must be below the tolerance, and |skewness| must not grow significantly with n
// (one-sided z of |g1(n_max)| - |g1(n_min)|, jackknife SE over blocks, correlation included).
// Lilliefors and Anderson-Darling p-values, skewness and kurtosis z-scores are reported only.
// KS distance vs n: a log-log slope is given only over grid points where the distance exceeds
// 3x its resolution floor 0.87/sqrt(m); otherwise "below resolution".

import { andersonDarlingNormalSorted, type AndersonDarlingResult } from "../stats/anderson-darling.js";
import { blockJackknife, jackknifeFromReplicates } from "../stats/jackknife.js";
import { lillieforsPValue, sortedCopy } from "../stats/lilliefors.js";
import { mergeAll, summarize } from "../stats/moments.js";
import { KsDistanceSearch, normalDistanceSorted, sortedStatsAll, type NormalDistance } from "../stats/normal-distance.js";
import { normalQuantile, normalSf, twoSidedNormalP } from "../stats/normal.js";
import { glsFit } from "../stats/gls-fit.js";
import { excessKurtosisZ, skewnessZ } from "../stats/shape.js";
import type { MomentState } from "../stats/types.js";

export interface NormalityEvidence {
  n: number;
  distance: NormalDistance;
  lillieforsD: number;
  lillieforsP: number;
  anderson: AndersonDarlingResult;
  skewness: number;
  skewnessZ: number;
  kurtosisZ: number;
  /** One-sided test that |skewness| grows from the smallest to the largest n (null with one n). */
  skewGrowth: { z: number; pValue: number } | null;
  /**
   * One-sided test that |skewness| at the largest n exceeds |g1(n_min)| sqrt(n_min/n_max), the
   * n^-1/2 decay a normal limit implies (first Edgeworth term; common practice): a skewness that
   * persists is evidence of a non-normal LIMIT even when the finite-n distance is below tolerance.
   */
  skewPersistence: { z: number; pValue: number } | null;
  /**
   * One-sided test that |excess kurtosis| at the largest n exceeds |g2(n_min)| n_min/n_max, the
   * n^-1 decay a normal limit implies (second Edgeworth term; common practice); null with one n.
   */
  kurtosisPersistence: { z: number; pValue: number } | null;
  /** Excess kurtosis at the largest n and its jackknife SE. */
  excessKurtosis: number;
  /** Jackknife SEs of the skewness and excess kurtosis at the largest n (NaN with one block). */
  skewnessJackknifeSE: number;
  kurtosisJackknifeSE: number;
  /** Limit of the skewness over the grid, g1(n) = g1_inf + a n^-1/2 (+ b n^-1; or a n^-1/4), null when G < 3. */
  skewnessLimit: ShapeLimit | null;
  /** Limit of the excess kurtosis over the grid, g2(n) = g2_inf + a n^-1 (+ b n^-3/2; or a n^-1/2), null when G < 3. */
  kurtosisLimit: ShapeLimit | null;
  /** KS distance vs n, or the reason it is not given. */
  ksTrend: string;
  /** Whether the KS distance to the normal family is below 3 x 0.87/sqrt(m) at every n. */
  belowResolutionEverywhere: boolean;
}

/**
 * The n -> infinity limit of a shape statistic (skewness or excess kurtosis) from its values on the
 * grid, by GLS with the block-jackknife covariance across n: under a normal limit it is 0 and the
 * statistic decays like its first Edgeworth order (n^-1/2 for g1, n^-1 for g2; common practice).
 */
export interface ShapeLimit {
  estimate: number;
  /** Jackknife SE of the fitted limit (base model). */
  se: number;
  /** p-value of "limit = 0": the LEAST significant over the models fitted (base, + next order with G >= 4, slower rate). */
  pZero: number;
  /** Union over the models of the (1 - alpha) intervals. */
  interval: [number, number];
  models: { label: string; estimate: number; se: number; misfitP: number | null }[];
}

/** The one state the data support about the limit law of a measure; every law check reads it. */
export interface LawDecision {
  state: "normal" | "non-normal" | "undecided";
  /** With state "normal": whether the KS distance is also below resolution at every n. */
  strict?: boolean;
  why: string;
}

/** phi(0) = 1/sqrt(2 pi): the first Edgeworth term (He2 phi g1/6) moves the CDF by at most |g1| phi(0)/6. */
const PHI0 = 1 / Math.sqrt(2 * Math.PI);
const skewEffect = (g1: number) => (Math.abs(g1) * PHI0) / 6;
/** max_x |He3(x) phi(x)| / 24 = 0.5503 / 24 (He3 = x^3 - 3x, maximum at x = 0.742; computed). */
const kurtEffect = (g2: number) => (Math.abs(g2) * 0.5503) / 24;

/**
 * One decision per measure, judged on the trend over the grid (not only at the largest n):
 * - non-normal limit confirmed when the limit of the skewness or of the excess kurtosis over the
 *   grid (ShapeLimit) is excluded from 0 under every model fitted (level alpha/2 each) AND by a
 *   material amount (the end of its interval nearest 0 has an Edgeworth effect above tolerance/4):
 *   the shape does not decay as a normal limit implies, by an amount that matters; a significant
 *   but immaterial limit (or an unmodelled slow transient) stays undecided;
 * - normal convergence shown when it is not, the grid has >= 3 points, the worst case over both
 *   limits' (1 - alpha) intervals of their Edgeworth effect on the CDF (|g1| phi(0)/6 + |g2|
 *   max|He3 phi|/24; common practice) is below tolerance/4, and the (1 - alpha) DKW upper bound
 *   of the distance to the normal family at the largest n is below the tolerance with a kept
 *   sample that can resolve it; "strict" when, moreover, the KS distance is below its resolution
 *   (3 x 0.87/sqrt(m)) at every n of the grid (what a "non-normal" claim needs to fail);
 * - otherwise undecided, with what is missing.
 * Claims and predictions of "normal" and "non-normal" all read this one state, so one data set
 * can never give contradictory verdicts.
 */
export function lawDecision(ev: NormalityEvidence, grid: number[], tol: number, alpha: number): LawDecision {
  const d = ev.distance;
  const shapes: [string, ShapeLimit | null, (x: number) => number][] = [
    ["skewness", ev.skewnessLimit, skewEffect],
    ["excess kurtosis", ev.kurtosisLimit, kurtEffect],
  ];
  // The interval's end nearest 0 (0 when it contains 0): what the limit is at least, in magnitude.
  const atLeast = (L: ShapeLimit) => (L.interval[0] > 0 ? L.interval[0] : L.interval[1] < 0 ? -L.interval[1] : 0);
  const confirmed = shapes
    .filter(([, L, eff]) => L !== null && L.pZero <= alpha / 2 && eff(atLeast(L)) > tol / 4)
    .map(([name, L]) => `the ${name} tends to ${L!.estimate.toPrecision(3)} (SE ${L!.se.toPrecision(2)}), not 0, under every trend model (p <= ${L!.pZero.toExponential(1)}), by a material amount (at least ${atLeast(L!).toPrecision(2)})`);
  if (confirmed.length) return { state: "non-normal", why: `non-normal limit confirmed: ${confirmed.join("; ")}` };
  const missing: string[] = [];
  for (const [name, L, eff] of shapes) {
    if (L !== null && L.pZero <= alpha / 2 && !(eff(atLeast(L)) > tol / 4))
      missing.push(`the ${name} tends to ${L.estimate.toPrecision(3)}, not 0 (p <= ${L.pZero.toExponential(1)}), but by an amount immaterial at the tolerance (a non-normal limit is not confirmed below the tolerance; a smaller normalityTolerance would decide)`);
  }
  if (grid.length < 3) missing.push(`${grid.length} grid point(s) show no trend (need >= 3 n)`);
  let effect = 0;
  for (const [name, L, eff] of shapes) {
    if (L === null) {
      if (grid.length >= 3) missing.push(`the ${name} trend could not be fitted`);
      effect = NaN;
      continue;
    }
    effect += eff(Math.max(Math.abs(L.interval[0]), Math.abs(L.interval[1])));
  }
  if (ev.skewnessLimit && ev.kurtosisLimit && !(effect < tol / 4))
    missing.push(
      `the limits of skewness [${ev.skewnessLimit.interval.map((x) => x.toPrecision(2)).join(", ")}] and excess kurtosis [${ev.kurtosisLimit.interval.map((x) => x.toPrecision(2)).join(", ")}] ` +
        `are consistent with 0 but still allow a departure of ${effect.toPrecision(2)} in the CDF (>= tolerance/4 = ${tol / 4}; more paths narrow them)`,
    );
  if (!(d.upperBound < tol)) missing.push(d.toleranceReachable ? `the distance bound ${d.upperBound.toFixed(4)} at n = ${ev.n} is not below the tolerance ${tol}` : `the kept sample (m = ${d.size}) cannot resolve the tolerance ${tol}: keep more paths`);
  if (missing.length) return { state: "undecided", why: `neither shown: ${missing.join("; ")}` };
  return {
    state: "normal",
    strict: ev.belowResolutionEverywhere,
    why: `normal convergence shown${ev.belowResolutionEverywhere ? " (and the KS distance is below resolution at every n)" : ""}: skewness and excess kurtosis tend to 0 within immaterial intervals (skewness [${ev.skewnessLimit!.interval.map((x) => x.toPrecision(2)).join(", ")}], kurtosis [${ev.kurtosisLimit!.interval.map((x) => x.toPrecision(2)).join(", ")}]) and the distance bound ${d.upperBound.toFixed(4)} < ${tol} at n = ${ev.n}`,
  };
}

/**
 * Least-squares fits of t(s) = t_inf + sum_k c_k s^-powers[k] (s = n, or log n), one per model
 * (a model needs G >= its terms + 2 points). The SE of t_inf is the delete-one-block jackknife of
 * the fitted t_inf itself (robust when the values at different n are almost perfectly correlated,
 * where a GLS weight matrix would be singular).
 */
function shapeLimit(s: number[], full: number[], leaveOut: number[][], sizes: number[], modelPowers: number[][], alpha: number): ShapeLimit | null {
  const G = s.length;
  if (!full.every(Number.isFinite) || !leaveOut.every((r) => r.every(Number.isFinite))) return null;
  const z = normalQuantile(1 - alpha / 2);
  const models: ShapeLimit["models"] = [];
  const identity = new Float64Array(G * G);
  for (let i = 0; i < G; i++) identity[i * G + i] = 1;
  for (const powers of modelPowers) {
    const k = powers.length;
    if (G < k + 2) continue;
    const design: number[] = [];
    for (const v of s) design.push(1, ...powers.map((p) => Math.pow(v, -p)));
    const fit = (y: number[]) => leastSquaresIntercept(y, design, k + 1, identity);
    const est = fit(full);
    if (!Number.isFinite(est)) continue;
    const cov = jackknifeFromReplicates([est], leaveOut.map((r) => [fit(r)]), sizes).covariance;
    models.push({ label: `t_inf${powers.map((p) => ` + c s^-${p}`).join("")}`, estimate: est, se: Math.sqrt(cov[0]), misfitP: null });
  }
  if (models.length === 0) return null;
  const base = models[0];
  const pZero = Math.max(...models.map((m) => (m.se > 0 ? twoSidedNormalP(m.estimate / m.se) : m.estimate === 0 ? 1 : 0)));
  const interval: [number, number] = [Math.min(...models.map((m) => m.estimate - z * m.se)), Math.max(...models.map((m) => m.estimate + z * m.se))];
  return { estimate: base.estimate, se: base.se, pZero, interval, models };
}

/** First coefficient of the ordinary least-squares fit of y on the m x k design (GLS with weight I); NaN when singular. */
function leastSquaresIntercept(y: number[], x: number[], k: number, identity: Float64Array): number {
  try {
    return glsFit(y, x, k, identity).coef[0];
  } catch {
    return NaN;
  }
}

/**
 * `logTrend`: the shape statistics decay in powers of log n instead of n (the vertex count, whose
 * natural scale is log n).
 */
export function normalityEvidence(n: number[], samples: ArrayLike<number>[], blocks: MomentState[][], tol: number, alpha: number, logTrend = false): NormalityEvidence {
  const G = n.length;
  // Each sample sorted once (the distances and Anderson-Darling read the same ascending copy).
  // Their mean, SD and tie groups computed once too (the same numbers each reader would compute).
  const sorted = samples.map((x) => sortedCopy(x));
  const stats = sortedStatsAll(sorted);
  const last = sorted[G - 1];
  const distance = normalDistanceSorted(last, tol, alpha, false, stats[G - 1]);
  const lillieforsD = distance.momentFit;
  const lillieforsP = lillieforsPValue(lillieforsD, distance.size);
  const anderson = distance.size >= 8 ? andersonDarlingNormalSorted(last, stats[G - 1]) : { statistic: NaN, modified: NaN, pValue: NaN };
  const merged = summarize(mergeAll(blocks.map((b) => b[G - 1])));
  let skewGrowth: NormalityEvidence["skewGrowth"] = null;
  let skewPersistence: NormalityEvidence["skewPersistence"] = null;
  let kurtosisPersistence: NormalityEvidence["kurtosisPersistence"] = null;
  let skewnessJackknifeSE = NaN;
  let kurtosisJackknifeSE = NaN;
  if (blocks.length >= 2) {
    // Jackknife over blocks of [g1(n_min), g1(n_max), g2(n_min), g2(n_max)] (correlations kept).
    const jk = blockJackknife(blocks.map((b) => [b[0], b[G - 1]]), (m) => { const [a, b] = m.map(summarize); return [a.skewness, b.skewness, a.excessKurtosis, b.excessKurtosis]; });
    const c = jk.covariance;
    const at = (i: number, j: number) => c[i * 4 + j];
    skewnessJackknifeSE = Math.sqrt(at(1, 1));
    kurtosisJackknifeSE = Math.sqrt(at(3, 3));
    /** One-sided z of |t(n_max)| - r |t(n_min)| (indices i0, i1 of the jackknifed vector). */
    const excess = (i0: number, i1: number, r: number) => {
      const t0 = jk.estimate[i0], t1 = jk.estimate[i1];
      const s0 = Math.sign(t0) || 1, s1 = Math.sign(t1) || 1;
      const v = at(i1, i1) + r * r * at(i0, i0) - 2 * r * s1 * s0 * at(i0, i1);
      const z = v > 0 ? (Math.abs(t1) - r * Math.abs(t0)) / Math.sqrt(v) : 0;
      return { z, pValue: normalSf(z) };
    };
    if (G >= 2) {
      skewGrowth = excess(0, 1, 1);
      skewPersistence = excess(0, 1, Math.sqrt(n[0] / n[G - 1]));
      kurtosisPersistence = excess(2, 3, n[0] / n[G - 1]);
    }
  }
  let skewnessLimit: ShapeLimit | null = null;
  let kurtosisLimit: ShapeLimit | null = null;
  if (G >= 3 && blocks.length >= 2) {
    const jk = blockJackknife(blocks, (m) => { const sm = m.map(summarize); return [...sm.map((x) => x.skewness), ...sm.map((x) => x.excessKurtosis)]; });
    const part = (v: ArrayLike<number>, off: number) => Array.from(v).slice(off, off + G);
    const scale = logTrend ? n.map(Math.log) : n;
    // Models: the first Edgeworth order, + the next order, and a SLOWER rate (half the power):
    // non-normality is confirmed only when every one excludes a zero limit, so a shape statistic
    // that decays to 0 more slowly than Edgeworth's orders is not taken for a non-normal limit.
    skewnessLimit = shapeLimit(scale, part(jk.estimate, 0), jk.leaveOut.map((r) => part(r, 0)), jk.sizes, [[0.5], [0.5, 1], [0.25]], alpha);
    kurtosisLimit = shapeLimit(scale, part(jk.estimate, G), jk.leaveOut.map((r) => part(r, G)), jk.sizes, [[1], [1, 1.5], [0.5]], alpha);
  }
  const points: { n: number; d: number }[] = [];
  const below: number[] = [];
  for (let g = 0; g < G; g++) {
    const m = samples[g].length;
    if (m < 5) continue;
    // The Lilliefors statistic (lilliefors.ts ksNormalDistance, the same number): at the largest n
    // it is the distance's moment fit; elsewhere one pruned evaluation (normal-distance.ts).
    const { mean, sd, groups } = stats[g];
    if (!(sd > 0)) continue;
    const d = g === G - 1 ? distance.momentFit : new KsDistanceSearch(sorted[g], groups).distance(mean, sd);
    if (d > 3 * (0.87 / Math.sqrt(m))) points.push({ n: n[g], d });
    else below.push(n[g]);
  }
  let ksTrend: string;
  if (points.length >= 2) {
    const xs = points.map((p) => Math.log(p.n));
    const ys = points.map((p) => Math.log(p.d));
    const mx = xs.reduce((a, b) => a + b, 0) / xs.length;
    const my = ys.reduce((a, b) => a + b, 0) / ys.length;
    let sxy = 0;
    let sxx = 0;
    for (let i = 0; i < xs.length; i++) {
      sxy += (xs[i] - mx) * (ys[i] - my);
      sxx += (xs[i] - mx) ** 2;
    }
    ksTrend = `KS distance ~ n^${(sxy / sxx).toFixed(2)} over n = ${points.map((p) => p.n).join(", ")} (least squares on log-log)` + (below.length ? `; below resolution at n = ${below.join(", ")}` : "");
  } else {
    ksTrend = "KS distance vs n: below resolution (3 x 0.87/sqrt(m)) at " + (points.length === 1 ? `all n but ${points[0].n}` : "every n");
  }
  return {
    n: n[G - 1],
    distance,
    lillieforsD,
    lillieforsP,
    anderson,
    skewness: merged.skewness,
    skewnessZ: skewnessZ(merged),
    kurtosisZ: excessKurtosisZ(merged),
    skewGrowth,
    skewPersistence,
    kurtosisPersistence,
    excessKurtosis: merged.excessKurtosis,
    skewnessJackknifeSE,
    kurtosisJackknifeSE,
    skewnessLimit,
    kurtosisLimit,
    ksTrend,
    belowResolutionEverywhere: points.length === 0 && below.length === G,
  };
}
