// Extrapolation of Var(X_n)/n^p and E X_n/n^q to n -> infinity from one simulated grid, with
// correlations between grid points (same paths) from the delete-one-block jackknife.
//
// Policy (house rules, see docs/theory.md sec. 13):
// - >= 5 grid points spanning >= 1.5 decades, geometrically spaced: fit s2 + c n^-beta with beta
//   profiled over [0.1, 2] (src/stats/gls.ts); tests invert the profile likelihood.
// - 3 or more points otherwise: beta fixed to suite.expectedRate (an assumption, default 1/2), with
//   the estimate also shown for beta in {1/4, 1/2, 1}.
// - <= 2 points: no extrapolation; the ratio at the largest n is reported, bias unknown.
// - Mean of the perimeter with q = 1: E L_n = n perimeter(P) + c log n + C + o(1) (docs/theory.md sec. 13,
//   [derived] for one walk, assumed for several), so E L_n/n = g + (a ln n + b)/n is fitted by
//   linear GLS; the same model is used for the diameter at q = 1 (a linear diameter needs a drift;
//   E D_n = n|a - b| + O(1), log terms allowed). Fitted by
//   linear GLS (>= 3 points; its misfit is testable from 4).
//
// Systematic (model) uncertainty, gated with the statistical one (common practice in numerical
// extrapolation: vary the fit window and the correction model, and carry the spread):
// - every extrapolated limit is refitted (a) on the grid minus its smallest n with the same model
//   and (b) with an alternative correction model: two terms n^-1/2 and n^-1 for the power law (the
//   leading orders of an expansion in n^-1/2, common practice for random-walk functionals), one
//   more term for a drift expansion, and (c) for drift expansions, their leading terms on the 3-4
//   largest n only (guards against slow small-n transients that a flexible fit absorbs).
//   se_syst = the largest |alternative - estimate|.
// - a value is tested by z = (estimate - value)/sqrt(se_stat^2 + se_syst^2), se_stat read off the
//   side of the statistical interval that faces the value (the profile-likelihood interval is
//   asymmetric), so the gated test inverts the reported total interval.
// - when no alternative can be fitted (too few points) the limit is not testable: inconclusive.
// Why: a single correction term is mis-specified when several terms of similar size exist, and a
// GLS fit on strongly correlated points then extrapolates with a bias its own interval ignores
// (the misfit test has little power against it); the spread of reasonable fits measures that bias.

import { blockJackknife } from "../stats/jackknife.js";
import { fitPowerLawFixed, fitPowerLawProfile, gridIdentifiesRate, linearGls, weightMatrix } from "../stats/gls.js";
import { normalQuantile, twoSidedNormalP } from "../stats/normal.js";
import type { MomentState } from "../stats/types.js";
import type { Measure } from "../suite/schema.js";
import type { LimitEstimate } from "./types.js";

export const LEVEL = 0.95;
const SENSITIVITY_RATES = [0.25, 0.5, 1];
/** Misfit p-value below which a drift expansion gives way to the free-rate power law. */
const EXPANSION_MISFIT = 0.01;

export interface ScaledSeries {
  measure: Measure;
  quantity: "varianceLimit" | "meanGrowth";
  scaling: number;
  n: number[];
  /** The ratios Q_n / n^scaling at the grid points (Q = variance or mean, control-variate estimates where they help). */
  y: number[];
  /** Their delete-one-block jackknife covariance (G x G, row-major). */
  cov: Float64Array;
  /** Number of blocks behind the covariance (the GLS weight's degrees of freedom). */
  blocks: number;
  expectedRate: number;
  /** A quantity that may be negative (a regression coefficient): no "negative variance" rule. */
  signed?: boolean;
  /** Name of the series in notes (default "Var/n^p" or "mean/n^q"). */
  name?: string;
  /**
   * Let a fit whose rate interval spans the whole range [0.1, 2] decide (its profile interval for L
   * already maximises over every admissible rate). Used for regression coefficients, whose series
   * are often flat within noise (no trend to identify a rate from); variance and mean limits keep
   * the stricter rule (calibrated with it: README "Calibration").
   */
  rateFreeDecides?: boolean;
}

/** The plain ratios of a series from per-block moment states (blocks[b][g]), with their jackknife covariance. */
export function plainRatios(quantity: ScaledSeries["quantity"], scaling: number, n: number[], blocks: MomentState[][]): { y: number[]; cov: Float64Array; blocks: number } {
  const ratioOf = (st: MomentState, g: number): number => {
    const scale = Math.pow(n[g], scaling);
    if (quantity === "varianceLimit") return st.count >= 2 ? st.m2 / (st.count - 1) / scale : NaN;
    return st.mean / scale;
  };
  const jk = blockJackknife(blocks, (merged) => merged.map((st, g) => ratioOf(st, g)));
  return { y: Array.from(jk.estimate), cov: jk.covariance, blocks: blocks.length };
}

/** A test of a value against the extrapolated limit. */
export interface LimitTest {
  statistic: number;
  /** The p-value used for gating (the least significant over the rates considered, for "fixed"). */
  pValue: number;
  /** Smallest p-value over the rates considered ("fixed"), else equal to pValue. */
  minPValue: number;
  statisticKind: "z" | "profile-LR";
}

export interface Extrapolation {
  limit: LimitEstimate;
  /** Whether a calibrated test of a value is possible (a model with a misfit test or a derived rate). */
  testable: boolean;
  test: (value: number) => LimitTest;
  /**
   * The total interval (statistical, misfit-scaled, + systematic in quadrature) at a two-sided
   * level, as the union over the admissible models (every assumed rate for "fixed").
   */
  interval: (level: number) => [number, number];
  /** Why no decision is possible whatever the paths (unidentified rate, unbounded interval), else null. */
  undecidable: string | null;
}

/** Misfit p-value below which the statistical errors are scaled by sqrt(chi2/df). */
export const MISFIT_SCALE_P = 0.05;

export function extrapolate(s: ScaledSeries): Extrapolation {
  const G = s.n.length;
  const B = s.blocks;
  const y = s.y;
  const se = Array.from({ length: G }, (_, g) => Math.sqrt(s.cov[g * G + g]));
  const ratios = s.n.map((n, g) => ({ n, value: y[g], standardError: se[g] }));
  // Grid points with no spread (e.g. a vertex count that is constant at tiny n) carry no
  // information and make the covariance singular: they are left out of the fits, and said so.
  const keep = s.n.map((_, g) => g).filter((g) => Number.isFinite(y[g]) && se[g] > 0);
  const dropped = s.n.filter((_, g) => !keep.includes(g));
  const droppedNote = dropped.length ? ` (n = ${dropped.join(", ")} left out: no spread)` : "";
  if (keep.length === 0) {
    const last = G - 1;
    const limit: LimitEstimate = { measure: s.measure, quantity: s.quantity, scaling: s.scaling, level: LEVEL, ratios, method: "none", estimate: y[last], standardError: se[last], ci: null, beta: null, betaInterval: null, misfitPValue: null, sensitivity: [], note: "no grid point has any spread: nothing to extrapolate" };
    return { limit, testable: false, test: () => ({ statistic: NaN, pValue: NaN, minPValue: NaN, statisticKind: "z" }), interval: () => [NaN, NaN], undecidable: limit.note };
  }
  return noNegativeVariance(s, fitKept(s, keep.map((g) => s.n[g]), keep.map((g) => y[g]), keep.map((g) => se[g]), subMatrix(s.cov, G, keep), B, ratios, droppedNote));
}

/**
 * A variance limit extrapolated below 0 makes no sense: it is reported as "no limit" with the
 * reason (Var/n^p most likely tends to 0: the power p is too large for this measure, e.g. a vertex
 * count whose variance grows like log n), never as an estimate, and nothing is tested against it.
 */
function noNegativeVariance(s: ScaledSeries, ex: Extrapolation): Extrapolation {
  if (s.quantity !== "varianceLimit" || s.signed || !(ex.limit.estimate < 0)) return ex;
  const why = `no limit: the fit extrapolates Var/n^${s.scaling} to ${ex.limit.estimate.toPrecision(3)} < 0, so Var/n^${s.scaling} most likely tends to 0 (the power ${s.scaling} is too large for this measure)`;
  return {
    limit: { ...ex.limit, method: "none", estimate: NaN, standardError: NaN, ci: null, statisticalCi: null, systematic: null, sensitivity: [], note: `${why}; the fit was: ${ex.limit.note}` },
    testable: false,
    test: () => ({ statistic: NaN, pValue: NaN, minPValue: NaN, statisticKind: "z" }),
    interval: () => [NaN, NaN],
    undecidable: why,
  };
}

function subMatrix(c: Float64Array, d: number, keep: number[]): Float64Array {
  const k = keep.length;
  const out = new Float64Array(k * k);
  for (let i = 0; i < k; i++) for (let j = 0; j < k; j++) out[i * k + j] = c[keep[i] * d + keep[j]];
  return out;
}

interface LinearFit {
  chi2: number;
  estimate: number;
  se: number;
  coef: Float64Array;
  df: number;
  pValue: number;
}

/** GLS of y on the basis functions of n (the first one is the limit's constant 1). */
function linearFit(n: number[], y: number[], cov: Float64Array, B: number, basis: ((n: number) => number)[]): LinearFit {
  const m = n.length;
  const k = basis.length;
  const design: number[] = [];
  for (const v of n) for (const f of basis) design.push(f(v));
  const fit = linearGls(y, design, k, weightMatrix(cov, m, B));
  return { estimate: fit.coef[0], se: Math.sqrt(fit.coefCov[0]), coef: fit.coef, df: fit.df, pValue: fit.pValue, chi2: fit.chi2 };
}

type Basis = (n: number) => number;
const ONE: Basis = () => 1;
const LOG_OVER_N: Basis = (n) => Math.log(n) / n;
const INV_N: Basis = (n) => 1 / n;
const powerOf = (e: number): Basis => (n) => Math.pow(n, -e);

interface DriftExpansion {
  basis: Basis[];
  formula: string;
  why: string;
  /** The next term, for the alternative model. */
  extra: Basis;
  extraLabel: string;
  /** The fewest terms that can describe the largest n, fitted on `minimalPoints` largest n only. */
  minimal: Basis[];
  minimalFormula: string;
  minimalPoints: number;
}

/**
 * Linear drift expansions of the mean (used instead of a single power law when a drift is implied):
 * - perimeter, q = 1: E L_n = n perimeter(P) + c log n + C + o(1) (docs/theory.md sec. 13, [derived] for one walk,
 *   assumed for several walks);
 * - diameter, q = 1 (a linear diameter needs a drift): E D_n = n|a - b| + c log n + C + d n^-1/2
 *   (assumed: docs/theory.md sec. 7 gives n|a - b| + O(1); the O(1) overshoot of the farthest pair has corrections
 *   in n^-1/2, seen in our runs; the log term is allowed, not required);
 * - area, q = 2 (drifting walks): E A_n = n^2 area(P) + c n^3/2 + a n log n + b n (docs/theory.md sec. 10
 *   and sec. 13: n^2 area(P) + O(n^3/2) + O(n log n)).
 */
function driftExpansion(s: ScaledSeries): DriftExpansion | null {
  if (s.quantity !== "meanGrowth") return null;
  if (s.scaling === 1 && s.measure === "perimeter")
    return { basis: [ONE, LOG_OVER_N, INV_N], formula: "g + (a ln n + b)/n", why: "E L_n = n perimeter(P) + c log n + C, docs/theory.md sec. 13 [derived] for one walk, assumed for several", extra: powerOf(1.5), extraLabel: "d n^-3/2", minimal: [ONE, LOG_OVER_N, INV_N], minimalFormula: "g + (a ln n + b)/n", minimalPoints: 4 };
  if (s.scaling === 1 && s.measure === "diameter")
    return { basis: [ONE, LOG_OVER_N, INV_N, powerOf(1.5)], formula: "g + (a ln n + b)/n + d n^-3/2", why: "E D_n = n|a - b| + O(1) (docs/theory.md sec. 7) with log and n^-1/2 corrections allowed: an assumption", extra: powerOf(2), extraLabel: "e n^-2", minimal: [ONE, INV_N], minimalFormula: "g + b/n", minimalPoints: 3 };
  if (s.scaling === 2 && s.measure === "area")
    return { basis: [ONE, powerOf(0.5), LOG_OVER_N, INV_N], formula: "g + c n^-1/2 + (a ln n + b)/n", why: "E A_n = n^2 area(P) + O(n^3/2) + O(n log n) for drifting walks, docs/theory.md sec. 13: an expansion assumed to continue with n", extra: powerOf(1.5), extraLabel: "d n^-3/2", minimal: [ONE, powerOf(0.5)], minimalFormula: "g + c n^-1/2", minimalPoints: 3 };
  return null;
}
const HALF_INTEGER_BASIS = [() => 1, (n: number) => Math.pow(n, -0.5), (n: number) => 1 / n];

/** The largest |alternative - estimate|, or null when no alternative could be fitted. */
function systematicOf(estimate: number, alternatives: { label: string; estimate: number }[]): number | null {
  const ok = alternatives.filter((a) => Number.isFinite(a.estimate));
  return ok.length ? Math.max(...ok.map((a) => Math.abs(a.estimate - estimate))) : null;
}

/** Tries an alternative fit; a failed fit (singular design, too few points) is simply absent. */
function tryAlt(label: string, f: () => number): { label: string; estimate: number }[] {
  try {
    const v = f();
    return Number.isFinite(v) ? [{ label, estimate: v }] : [];
  } catch {
    return [];
  }
}

/** Total interval: each side of the statistical interval widened in quadrature by z * se_syst. */
/** Each side of an interval around est multiplied by f (a misfit scale factor, or a change of level z'/z). */
function scaleAbout(est: number, ci: readonly [number, number], f: number): [number, number] {
  return [est - f * (est - ci[0]), est + f * (ci[1] - est)];
}

function totalInterval(est: number, ci: [number, number], syst: number, z: number): [number, number] {
  const lo = est - ci[0];
  const hi = ci[1] - est;
  return [est - Math.hypot(lo, z * syst), est + Math.hypot(hi, z * syst)];
}

/** z of a value against an estimate with an asymmetric statistical interval and a systematic. */
function zAgainst(est: number, ci: [number, number], syst: number, v: number, zc: number): number {
  const seSide = (v < est ? est - ci[0] : ci[1] - est) / zc;
  const d = Math.sqrt(seSide * seSide + syst * syst);
  if (!Number.isFinite(d)) return 0;
  return d > 0 ? (est - v) / d : est === v ? 0 : Math.sign(est - v) * Infinity;
}

const fmtAlt = (alts: { label: string; estimate: number }[]) => alts.map((a) => `${a.label}: ${a.estimate.toPrecision(6)}`).join("; ");

function fitKept(s: ScaledSeries, nK: number[], y: number[], se: number[], cov: Float64Array, B: number, ratios: LimitEstimate["ratios"], droppedNote: string): Extrapolation {
  const G = nK.length;
  const z = normalQuantile(1 - (1 - LEVEL) / 2);
  const base = { measure: s.measure, quantity: s.quantity, scaling: s.scaling, level: LEVEL, ratios };
  const what = (s.name ?? (s.quantity === "varianceLimit" ? `Var/n^${s.scaling}` : `mean/n^${s.scaling}`)) + droppedNote;

  const none = (note: string): Extrapolation => {
    const last = G - 1;
    return {
      limit: { ...base, method: "none", estimate: y[last], standardError: se[last], ci: [y[last] - z * se[last], y[last] + z * se[last]], beta: null, betaInterval: null, misfitPValue: null, sensitivity: [], systematic: null, alternatives: [], note },
      testable: false,
      test: (v) => {
        const zz = (y[last] - v) / se[last];
        const p = twoSidedNormalP(zz);
        return { statistic: zz, pValue: p, minPValue: p, statisticKind: "z" };
      },
      interval: (lv) => {
        const zz = normalQuantile(1 - (1 - lv) / 2);
        return [y[last] - zz * se[last], y[last] + zz * se[last]];
      },
      undecidable: note,
    };
  };
  if (G <= 2) return none(`${what} at the largest n = ${nK[G - 1]} only (${G} grid point${G > 1 ? "s" : ""}: no extrapolation; the finite-n bias is unknown)`);
  if (B < G + 3) return none(`${B} blocks cannot estimate the ${G}x${G} covariance of the grid (need >= ${G + 3}); ratio at the largest n only, bias unknown`);

  const opts = { blocks: B, level: LEVEL };
  const rest = Array.from({ length: G - 1 }, (_, i) => i + 1);
  const nR = rest.map((i) => nK[i]);
  const yR = rest.map((i) => y[i]);
  const covR = subMatrix(cov, G, rest);
  const dropLabel = `without n = ${nK[0]}`;

  /** A fitted limit with its statistical interval, alternatives and systematic. */
  const finish = (
    method: "profile" | "log",
    est: number, seStat0: number, ciStat0: [number, number], alternatives: { label: string; estimate: number }[],
    extra: Pick<LimitEstimate, "beta" | "betaInterval" | "misfitPValue">, note: string, modelTestable: boolean,
    chi2PerDf: number | null,
  ): Extrapolation => {
    // A misfitting model still decides, with its statistical errors scaled by S = sqrt(chi2/df)
    // (the scale factor of the Review of Particle Physics' averaging procedure; common practice).
    const misfit = extra.misfitPValue !== null && extra.misfitPValue < MISFIT_SCALE_P && chi2PerDf !== null && chi2PerDf > 1;
    const S = misfit ? Math.sqrt(chi2PerDf!) : 1;
    const seStat = seStat0 * S;
    const ciStat = scaleAbout(est, ciStat0, S);
    const syst = systematicOf(est, alternatives);
    const ci = syst === null ? ciStat : totalInterval(est, ciStat, syst, z);
    const systNote = syst === null
      ? "; systematic NOT estimable (no alternative fit possible on this grid)"
      : `; systematic se_syst = ${syst.toPrecision(3)} = largest shift among alternative fits (${fmtAlt(alternatives)}); interval = statistical (${LEVEL * 100}%: [${ciStat[0].toPrecision(6)}, ${ciStat[1].toPrecision(6)}]) widened in quadrature by ${z.toFixed(2)} se_syst`;
    const misfitNote = misfit ? `; the model misfits (p = ${extra.misfitPValue!.toExponential(1)} < ${MISFIT_SCALE_P}): statistical errors scaled by S = sqrt(chi2/df) = ${S.toFixed(2)}` : "";
    const unbounded = !Number.isFinite(ci[0]) || !Number.isFinite(ci[1]);
    const rateFree = extra.betaInterval !== null && extra.betaInterval !== undefined && extra.betaInterval[0] <= 0.1 + 1e-3 && extra.betaInterval[1] >= 2 - 1e-3;
    return {
      limit: { ...base, method, estimate: est, standardError: seStat, ci, statisticalCi: ciStat, systematic: syst, alternatives, sensitivity: [], ...extra, misfitScale: misfit ? S : null, note: note + misfitNote + systNote },
      testable: modelTestable && syst !== null,
      test: (v) => {
        const zz = zAgainst(est, ciStat, syst ?? 0, v, z);
        const p = twoSidedNormalP(zz);
        return { statistic: zz, pValue: p, minPValue: p, statisticKind: "z" };
      },
      interval: (lv) => {
        const zl = normalQuantile(1 - (1 - lv) / 2);
        const st = scaleAbout(est, ciStat, zl / z);
        return syst === null ? st : totalInterval(est, st, syst, zl);
      },
      undecidable: unbounded
        ? "the interval of the limit is unbounded"
        : rateFree && !s.rateFreeDecides
          ? "the rate interval spans the whole allowed range [0.1, 2]: the grid does not constrain the approach to the limit"
          : null,
    };
  };

  const expansion = driftExpansion(s);
  let fallback = "";
  if (expansion) {
    const k = expansion.basis.length;
    if (G < k) return none(`${G} grid points cannot fit the ${k}-term drift expansion ${expansion.formula}; ratio at the largest n only, bias unknown`);
    let fit: LinearFit;
    try {
      fit = linearFit(nK, y, cov, B, expansion.basis);
    } catch (e) {
      return none(`drift-expansion fit impossible (${(e as Error).message}); ratio at the largest n only, bias unknown`);
    }
    const alternatives = [
      ...(G - 1 >= k ? tryAlt(`same expansion ${dropLabel}`, () => linearFit(nR, yR, covR, B, expansion.basis).estimate) : []),
      ...(G >= k + 1 ? tryAlt(`expansion + ${expansion.extraLabel}`, () => linearFit(nK, y, cov, B, [...expansion.basis, expansion.extra]).estimate) : []),
      // Slow transients at small n (e.g. a competing farthest pair, a near-tie) can be fitted by the
      // flexible expansion and still extrapolate with a bias: the leading terms on the largest n only.
      ...(G > expansion.minimalPoints
        ? tryAlt(`${expansion.minimalFormula} on the ${expansion.minimalPoints} largest n`, () => {
            const top = Array.from({ length: expansion.minimalPoints }, (_, i) => G - expansion.minimalPoints + i);
            return linearFit(top.map((i) => nK[i]), top.map((i) => y[i]), subMatrix(cov, G, top), B, expansion.minimal).estimate;
          })
        : []),
    ];
    const g = fit.estimate;
    const gse = fit.se;
    // A misfitting expansion (e.g. a sqrt(n) term from tied or repeated vertices of P, outside the
    // expansion's hypotheses) falls back to the free-rate power law when the grid identifies a rate.
    if (fit.df > 0 && fit.pValue < EXPANSION_MISFIT && gridIdentifiesRate(nK))
      fallback = `the drift expansion ${expansion.formula} misfits the grid (chi-square p = ${fit.pValue.toExponential(1)} < ${EXPANSION_MISFIT}): fell back to the power law; `;
    else return finish(
      "log", g, gse, [g - z * gse, g + z * gse], alternatives,
      { beta: null, betaInterval: null, misfitPValue: fit.df > 0 ? fit.pValue : null },
      `GLS fit of ${what} = ${expansion.formula} (${expansion.why})${fit.df === 0 ? `; ${G} points, no misfit test` : ""}`,
      fit.df > 0, fit.df > 0 ? fit.chi2 / fit.df : null,
    );
  }

  if (gridIdentifiesRate(nK)) {
    let fit;
    try {
      fit = fitPowerLawProfile(nK, y, cov, opts);
    } catch (e) {
      return none(`rate fit impossible (${(e as Error).message}); ratio at the largest n only, bias unknown`);
    }
    const alternatives = [
      ...tryAlt(`same model ${dropLabel}`, () => fitPowerLawProfile(nR, yR, covR, { ...opts, intervals: false }).s2),
      ...tryAlt("L + c1 n^-1/2 + c2 n^-1", () => linearFit(nK, y, cov, B, HALF_INTEGER_BASIS).estimate),
    ];
    return finish(
      "profile", fit.s2, fit.s2SE, fit.s2Interval, alternatives,
      { beta: fit.beta, betaInterval: fit.betaInterval, misfitPValue: fit.pValue },
      `${fallback}GLS fit of ${what} = L + c n^-beta, beta profiled over [0.1, 2] (beta = ${fit.beta.toFixed(3)}, ${LEVEL * 100}% profile interval [${fit.betaInterval![0].toFixed(3)}, ${fit.betaInterval![1].toFixed(3)}]${fit.betaAtBound ? ", at a bound of the range" : ""}); profile-likelihood interval for L`,
      true, fit.df > 0 ? fit.chi2 / fit.df : null,
    );
  }

  const rates = Array.from(new Set([s.expectedRate, ...SENSITIVITY_RATES]));
  let fits;
  try {
    // A misfitting assumed rate keeps deciding with its interval scaled by sqrt(chi2/df), as above.
    fits = rates.map((b) => {
      const f = fitPowerLawFixed(nK, y, cov, b, opts);
      const S = f.df > 0 && f.pValue < MISFIT_SCALE_P && f.chi2 > f.df ? Math.sqrt(f.chi2 / f.df) : 1;
      return { ...f, s2SE: f.s2SE * S, s2Interval: scaleAbout(f.s2, f.s2Interval, S) };
    });
  } catch (e) {
    return none(`fixed-rate fit impossible (${(e as Error).message}); ratio at the largest n only, bias unknown`);
  }
  // Systematic of each assumed rate: the same fit without the smallest n.
  const systs = rates.map((b, i) => systematicOf(fits[i].s2, tryAlt(dropLabel, () => fitPowerLawFixed(nR, yR, covR, b, opts).s2)));
  const main = fits[0];
  const mainSyst = systs[0];
  const reason = G < 5 ? `${G} grid points cannot identify the rate` : "the grid does not identify the rate (needs >= 5 geometrically spaced n over >= 1.5 decades)";
  const widen = (f: (typeof fits)[number], sy: number | null): [number, number] => (sy === null ? f.s2Interval : totalInterval(f.s2, f.s2Interval, sy, z));
  return {
    limit: {
      ...base, method: "fixed", estimate: main.s2, standardError: main.s2SE, ci: widen(main, mainSyst), statisticalCi: main.s2Interval, systematic: mainSyst,
      alternatives: rates.map((b, i) => ({ label: `beta = ${b}${i === 0 ? " (assumed)" : ""}`, estimate: fits[i].s2 })),
      beta: s.expectedRate, betaInterval: null, misfitPValue: main.df > 0 ? main.pValue : null,
      sensitivity: SENSITIVITY_RATES.map((b) => {
        const i = rates.indexOf(b);
        return { beta: b, estimate: fits[i].s2, ci: widen(fits[i], systs[i]) };
      }),
      note: `GLS fit of ${what} = L + c n^-beta with beta = ${s.expectedRate} ASSUMED (${reason}); ` +
        `L = ${SENSITIVITY_RATES.map((b) => `${fits[rates.indexOf(b)].s2.toPrecision(6)} (beta ${b})`).join(", ")}` +
        (mainSyst === null ? "; systematic NOT estimable (too few points to refit without the smallest n)" : `; systematic per rate = |refit ${dropLabel} - fit| (assumed rate: ${mainSyst.toPrecision(3)}), added in quadrature`),
    },
    testable: systs.every((x) => x !== null),
    test: (v) => {
      const zs = fits.map((f, i) => zAgainst(f.s2, f.s2Interval, systs[i] ?? 0, v, z));
      const ps = zs.map(twoSidedNormalP);
      return { statistic: zs[0], pValue: Math.max(...ps), minPValue: Math.min(...ps), statisticKind: "z" };
    },
    // Union over the assumed rates: a value is decided only when every admissible rate agrees.
    interval: (lv) => {
      const zl = normalQuantile(1 - (1 - lv) / 2);
      const each = fits.map((f, i) => {
        const st = scaleAbout(f.s2, f.s2Interval, zl / z);
        return systs[i] === null ? st : totalInterval(f.s2, st, systs[i]!, zl);
      });
      return [Math.min(...each.map((e) => e[0])), Math.max(...each.map((e) => e[1]))];
    },
    undecidable: null,
  };
}
