// The verdict stage: simulated moments + predictions + user claims -> calibrated checks.
//
// Every user claim and every built-in prediction whose constant is a `theorem` or `derived` is
// checked; `estimate` constants are shown, never gated. Gated checks form one family, controlled
// by Holm's step-down procedure at suite.alpha (default 0.01): a gated check fails only when Holm
// rejects it. Checks that cannot produce a calibrated p-value (unknown finite-n bias, model misfit,
// uncalibrated variances, too small a kept sample) are reported `inconclusive` and not gated.
// Methods: src/verdict/extrapolate.ts (limits), src/verdict/normality.ts (laws), src/stats/*.

import { LILLIEFORS_P_FLOOR } from "../stats/lilliefors.js";
import { holm } from "../stats/holm.js";
import { mergeAll, summarize } from "../stats/moments.js";
import { normalQuantile, twoSidedNormalP } from "../stats/normal.js";
import type { MomentState } from "../stats/types.js";
import type { SimulationResult } from "../run/types.js";
import { measureBlocks, measureSample, seriesWidth } from "../run/series.js";
import type { MeasurePrediction, Prediction } from "../theory/types.js";
import type { Measure } from "../suite/schema.js";
import { extrapolate, LEVEL, type Extrapolation } from "./extrapolate.js";
import { normalityEvidence, type NormalityEvidence } from "./normality.js";
import type { Check, CheckKind, LimitEstimate, Verdict, VerdictReport } from "./types.js";

export type { Check, CheckKind, LimitEstimate, Verdict, VerdictReport } from "./types.js";
export { renderChecks } from "./render.js";

/** phi(0) = 1/sqrt(2 pi): the first Edgeworth term moves the CDF by at most |skewness| phi(0) / 6. */
const PHI0 = 1 / Math.sqrt(2 * Math.PI);

interface Pending {
  check: Check;
  /** Verdict when Holm does not reject (pass or inconclusive). */
  otherwise: Verdict;
}

const fmt = (x: number | null | undefined, digits = 6): string =>
  x === null || x === undefined || Number.isNaN(x) ? "-" : Number.isFinite(x) ? Number(x.toPrecision(digits)).toString() : x > 0 ? "inf" : "-inf";
const fmtP = (p: number): string => (p < 1e-4 ? p.toExponential(1) : p.toFixed(4));

function predictionSource(p: MeasurePrediction): string {
  return `prediction: ${p.sources.length ? p.sources.join("; ") : "no citation given"}`;
}

export function evaluateChecks(sim: SimulationResult, prediction: Prediction): VerdictReport {
  const suite = sim.suite;
  const alpha = suite.alpha ?? 0.01;
  const tol = suite.normalityTolerance ?? 0.01;
  const expectedRate = suite.expectedRate ?? 0.5;
  if (!(alpha > 0 && alpha < 1)) throw new Error(`alpha: must be in (0, 1), got ${alpha}`);
  if (!(tol > 0 && tol < 1)) throw new Error(`normalityTolerance: must be in (0, 1), got ${tol}`);
  if (!(expectedRate > 0)) throw new Error(`expectedRate: must be positive, got ${expectedRate}`);
  const grid = suite.n;
  const G = grid.length;
  if (G < 1) throw new Error("n: the grid is empty");
  if (sim.blocks.length < 1) throw new Error("blocks: no block statistics to check");
  sim.blocks.forEach((b, i) => {
    const width = seriesWidth(sim);
    if (b.moments.length !== width) throw new Error(`blocks[${i}].moments: length ${b.moments.length}, expected ${width} (grid x record)`);
  });

  const blocksFor = (measure: Measure): MomentState[][] => measureBlocks(sim, measure);
  const predFor = (measure: Measure) => prediction.measures.find((m) => m.measure === measure);

  const extrapolations = new Map<string, Extrapolation>();
  const limitsOrder: string[] = [];
  const getExtrapolation = (measure: Measure, quantity: "varianceLimit" | "meanGrowth", scaling: number): Extrapolation => {
    const key = `${measure}|${quantity}|${scaling}`;
    let ex = extrapolations.get(key);
    if (!ex) {
      ex = extrapolate({ measure, quantity, scaling, n: grid, blocks: blocksFor(measure), expectedRate });
      extrapolations.set(key, ex);
      limitsOrder.push(key);
    }
    return ex;
  };

  const pending: Pending[] = [];
  const add = (check: Omit<Check, "adjustedPValue">, otherwise: Verdict) => pending.push({ check: { ...check, adjustedPValue: null }, otherwise });

  // --- finite-n means -------------------------------------------------------------------------
  const meanCheck = (measure: Measure, g: number, expected: number, err: number, id: string, source: string, target?: number) => {
    const s = summarize(mergeAll(blocksFor(measure).map((b) => b[g])));
    const z = (s.mean - expected) / Math.sqrt(s.meanSE * s.meanSE + err * err);
    const zc = normalQuantile(1 - (1 - LEVEL) / 2);
    if (target !== undefined && !(err <= target)) {
      // The prediction did not reach the accuracy its check needs (its target): shown, not gated.
      add(
        {
          id, measure, n: grid[g], kind: "mean", source, estimate: s.mean, expected, statistic: z, pValue: null,
          ci: [s.mean - zc * s.meanSE, s.mean + zc * s.meanSE], verdict: "inconclusive", gated: false,
          detail: `Not gated: the predicted mean's numerical error bound ${fmt(err, 3)} did not reach its target ${fmt(target, 3)} (1/10 of the SE it is checked against); z = ${fmt(z, 3)} shown with SE = ${fmt(s.meanSE, 4)} over ${s.count} paths.`,
        },
        "inconclusive",
      );
      return;
    }
    add(
      {
        id, measure, n: grid[g], kind: "mean", source, estimate: s.mean, expected, statistic: z, pValue: twoSidedNormalP(z),
        ci: [s.mean - zc * s.meanSE, s.mean + zc * s.meanSE], verdict: "pass", gated: true,
        detail: `z = (mean - expected)/sqrt(SE^2 + err^2) with SE = ${fmt(s.meanSE, 4)} over ${s.count} paths and numerical error bound err = ${fmt(err, 3)}; ${LEVEL * 100}% CI of the mean.`,
      },
      "pass",
    );
  };

  // --- limits (variance, mean growth) ----------------------------------------------------------
  const limitCheck = (
    measure: Measure, quantity: "varianceLimit" | "meanGrowth", scaling: number, value: number, id: string, source: string,
    constantKind: string | null, uncalibrated: boolean,
  ) => {
    const ex = getExtrapolation(measure, quantity, scaling);
    const L = ex.limit;
    const t = ex.test(value);
    const power = quantity === "varianceLimit" ? `Var/n^${scaling}` : `mean/n^${scaling}`;
    const base = { id, measure, n: null, kind: quantity as CheckKind, source, estimate: L.estimate, expected: value, statistic: t.statistic, ci: L.ci };
    const method = `${L.note}; ${L.level * 100}% interval.`;
    let why: string | null = null;
    if (constantKind !== "theorem" && constantKind !== "derived" && constantKind !== "claim")
      why = `the predicted constant is an ${constantKind ?? "unclassified"} value: shown, never gated`;
    else if (uncalibrated && quantity === "varianceLimit")
      why = "the prediction marks variance checks uncalibrated (e.g. steps without a finite 4th moment: the SE of the variance is unreliable)";
    else if (!ex.testable)
      why = L.method === "none"
        ? `no extrapolation possible, finite-n bias unknown (${power} = ${fmt(L.estimate)} at n = ${grid[G - 1]}, z = ${fmt(t.statistic, 3)} against the value, not a calibrated test)`
        : L.systematic === null || L.systematic === undefined
          ? "the systematic (model) uncertainty of the extrapolation is not estimable on this grid (too few points to refit it another way)"
          : "the rate model has no degree of freedom left to test its fit";
    else if (L.misfitPValue !== null && L.misfitPValue < alpha)
      why = `the extrapolation model misfits the grid (chi-square p = ${fmtP(L.misfitPValue)} < ${alpha}): the limit is not trusted`;
    if (why !== null) {
      add({ ...base, pValue: null, verdict: "inconclusive", gated: false, detail: `Not gated: ${why}. ${method}` }, "inconclusive");
      return;
    }
    const rateDependent = L.method === "fixed" && t.minPValue <= alpha;
    add(
      {
        ...base, pValue: t.pValue, verdict: "pass", gated: true,
        detail:
          `z = (estimate - expected)/sqrt(se_stat^2 + se_syst^2) = ${fmt(t.statistic, 3)}, se_stat from the side of the statistical interval facing the value, se_syst = ${fmt(L.systematic ?? NaN, 3)} (model uncertainty). ` +
          (L.method === "fixed" ? "z test under each assumed rate; the gated p-value is the least significant one. " : "") +
          method + (rateDependent ? " The value is rejected under some assumed rates and not others: inconclusive unless rejected under all." : ""),
      },
      rateDependent ? "inconclusive" : "pass",
    );
  };

  // --- limit laws ------------------------------------------------------------------------------
  const evidenceCache = new Map<Measure, NormalityEvidence | string>();
  const evidenceFor = (measure: Measure): NormalityEvidence | string => {
    let ev = evidenceCache.get(measure);
    if (ev === undefined) {
      const samples = measureSample(sim, measure);
      try {
        ev = normalityEvidence(grid, samples, blocksFor(measure), tol, alpha);
      } catch (e) {
        ev = `the kept sample at n = ${grid[G - 1]} is unusable (${(e as Error).message})`;
      }
      evidenceCache.set(measure, ev);
    }
    return ev;
  };
  const evidenceText = (ev: NormalityEvidence): string => {
    const d = ev.distance;
    return (
      `KS distance to the normal family at n = ${ev.n} (m = ${d.size} kept paths, ${d.metric === "midpoints" ? `continuity-corrected: ${(100 * d.tiedFraction).toFixed(0)}% tied values` : "exact"}): ` +
      `${fmt(d.minimum, 3)}, ${(100 * (1 - alpha)).toFixed(0)}% DKW upper bound ${fmt(d.upperBound, 3)} vs tolerance ${tol}; ` +
      `Lilliefors D = ${fmt(ev.lillieforsD, 3)} (p ${ev.lillieforsP >= LILLIEFORS_P_FLOOR ? `>= ${LILLIEFORS_P_FLOOR}` : `= ${fmtP(ev.lillieforsP)}`}), Anderson-Darling A* = ${fmt(ev.anderson.modified, 3)} (p = ${Number.isNaN(ev.anderson.pValue) ? "-" : fmtP(ev.anderson.pValue)})${d.tiedFraction > 0 ? " (ties: p-values too small)" : ""}; ` +
      `skewness ${fmt(ev.skewness, 3)} (z = ${fmt(ev.skewnessZ, 3)}), excess-kurtosis z = ${fmt(ev.kurtosisZ, 3)}; ` +
      (ev.skewGrowth ? `growth of |skewness| from n = ${grid[0]}: z = ${fmt(ev.skewGrowth.z, 3)}; ` : "skewness trend not assessable with one n; ") +
      (ev.skewPersistence ? `|skewness| above the n^-1/2 decay of a normal limit: z = ${fmt(ev.skewPersistence.z, 3)}; ` : "") +
      `${ev.ksTrend}.`
    );
  };
  /** Whether growing skewness is both significant and large enough to matter at the tolerance. */
  const materialSkew = (ev: NormalityEvidence) => Math.abs(ev.skewness) * PHI0 / 6 > tol;
  const lawCheck = (measure: Measure, law: string, id: string, source: string, predictionReasons: string[]) => {
    const ev = evidenceFor(measure);
    const base = { id, measure, n: grid[G - 1], kind: "limitLaw" as CheckKind, source, expected: law };
    if (typeof ev === "string") {
      add({ ...base, estimate: null, statistic: null, pValue: null, ci: null, verdict: "inconclusive", gated: false, detail: `Not gated: ${ev}.` }, "inconclusive");
      return;
    }
    const d = ev.distance;
    const ci: [number, number] = [Math.max(0, d.minimum - d.margin), d.upperBound];
    const pSkew = ev.skewGrowth && materialSkew(ev) ? ev.skewGrowth.pValue : 1;
    const skewGrows = pSkew <= alpha;
    const numbers = { estimate: d.minimum, statistic: d.minimum, ci };
    if (law === "normal") {
      const p = Math.min(1, 2 * Math.min(d.pValue, pSkew));
      let otherwise: Verdict = "pass";
      let why = "";
      if (d.upperBound >= tol) {
        otherwise = "inconclusive";
        why = d.toleranceReachable
          ? ` The upper bound does not reach below the tolerance yet.`
          : ` The kept sample (m = ${d.size}) is too small for the tolerance ${tol} to be reachable (DKW margin ${fmt(d.margin, 3)} + resolution ${fmt(d.resolutionFloor, 3)}): keep more paths.`;
      } else if (skewGrows) {
        otherwise = "inconclusive";
        why = " |skewness| grows with n.";
      }
      add(
        {
          ...base, ...numbers, pValue: p, verdict: otherwise, gated: true,
          detail: `Passes when the DKW bound < tolerance and |skewness| does not grow materially (|g1| phi(0)/6 > tolerance) and significantly; fails only on Holm rejection of "distance <= tolerance" (DKW p = ${fmtP(d.pValue)}) or of "no skewness growth". ${evidenceText(ev)}${why}`,
        },
        otherwise,
      );
    } else if (law === "non-normal") {
      const persists = ev.skewPersistence !== null && ev.skewPersistence.pValue <= alpha;
      const visible = d.pValue <= alpha || skewGrows || persists;
      // Only read skewPersistence when it decided the verdict: it is null with one n on the grid.
      const how = d.pValue <= alpha || skewGrows || !persists
        ? "normality is rejected at the effect-size level (distance above tolerance, or growing skewness)"
        : `|skewness| does not decay at the n^-1/2 rate of a normal limit (first Edgeworth term, common practice): one-sided z = ${fmt(ev.skewPersistence!.z, 3)} against |g1(n_min)| sqrt(n_min/n_max), p <= ${alpha}; the finite-n distance is still below the tolerance`;
      add(
        {
          ...base, ...numbers, pValue: null, verdict: visible ? "confirmed" : "not-yet-visible", gated: false,
          detail: `Never a failure: ${visible ? how : "the departure from normality is not (yet) visible at this n and sample size"}. ${evidenceText(ev)}`,
        },
        visible ? "confirmed" : "not-yet-visible",
      );
    } else {
      add(
        {
          ...base, ...numbers, pValue: null, verdict: "inconclusive", gated: false,
          detail: `Limit law ${law}${predictionReasons.length ? ` (${predictionReasons.join("; ")})` : ""}: evidence shown, not gated. ${evidenceText(ev)}`,
        },
        "inconclusive",
      );
    }
  };

  // --- predictions ----------------------------------------------------------------------------
  for (const measure of suite.measure) {
    const pred = predFor(measure);
    if (!pred) continue;
    const src = predictionSource(pred);
    for (let g = 0; g < G; g++) {
      const key = String(grid[g]);
      const exact = pred.exactMeans[key];
      if (exact !== undefined && Number.isFinite(exact)) meanCheck(measure, g, exact, pred.exactMeansError[key] ?? 0, `${measure}.mean.n${grid[g]}.prediction`, src, pred.exactMeansTarget?.[key]);
    }
    if (pred.varianceLimit !== null)
      limitCheck(measure, "varianceLimit", pred.varianceScaling, pred.varianceLimit, `${measure}.varianceLimit.prediction`, src, pred.varianceLimitKind, pred.varianceUncalibrated === true);
    if (pred.meanGrowth !== null)
      limitCheck(measure, "meanGrowth", pred.meanScaling, pred.meanGrowth, `${measure}.meanGrowth.prediction`, src, pred.meanGrowthKind, false);
    if (pred.limitLaw !== "degenerate") lawCheck(measure, pred.limitLaw, `${measure}.limitLaw.prediction`, src, pred.reasons);
  }

  // --- user claims ----------------------------------------------------------------------------
  (suite.claims ?? []).forEach((claim, i) => {
    const field = `claims[${i}]`;
    if (!suite.measure.includes(claim.measure)) throw new Error(`${field}.measure: "${claim.measure}" is not simulated by this suite`);
    const pred = predFor(claim.measure);
    const src = `claim${claim.label ? `: ${claim.label}` : ""}`;
    const uncalibrated = pred?.varianceUncalibrated === true;
    if ((claim.n === undefined) !== (claim.mean === undefined)) throw new Error(`${field}.${claim.n === undefined ? "n" : "mean"}: a finite-n mean claim needs both n and mean`);
    if (claim.n !== undefined && claim.mean !== undefined) {
      const g = grid.indexOf(claim.n);
      if (g < 0) throw new Error(`${field}.n: ${claim.n} is not on the suite's grid [${grid.join(", ")}]`);
      meanCheck(claim.measure, g, claim.mean, 0, `${claim.measure}.mean.n${claim.n}.${field}`, src);
    }
    if (claim.varianceLimit !== undefined) {
      const p = claim.varianceScaling ?? pred?.varianceScaling ?? 1;
      limitCheck(claim.measure, "varianceLimit", p, claim.varianceLimit, `${claim.measure}.varianceLimit.${field}`, src, "claim", uncalibrated);
    }
    if (claim.meanGrowth !== undefined) {
      // q = claim.meanScaling, else the prediction's meanScaling (as for varianceScaling), else 1.
      limitCheck(claim.measure, "meanGrowth", claim.meanScaling ?? pred?.meanScaling ?? 1, claim.meanGrowth, `${claim.measure}.meanGrowth.${field}`, src, "claim", false);
    }
    if (claim.limitLaw !== undefined) lawCheck(claim.measure, claim.limitLaw, `${claim.measure}.limitLaw.${field}`, src, []);
  });

  // --- limits shown whatever was claimed -------------------------------------------------------
  for (const measure of suite.measure) {
    const pred = predFor(measure);
    getExtrapolation(measure, "varianceLimit", pred?.varianceScaling ?? 1);
    // A power 0 would extrapolate E X_n itself: no measure has a finite mean limit (the vertex
    // count grows like log n), so no such "limit" is shown unless a claim asks for it.
    const q = pred?.meanScaling ?? 1;
    if (q > 0) getExtrapolation(measure, "meanGrowth", q);
  }
  const limits: LimitEstimate[] = limitsOrder.map((k) => extrapolations.get(k)!.limit);

  // --- Holm over the gated family --------------------------------------------------------------
  const gatedIdx = pending.map((p, i) => (p.check.gated && p.check.pValue !== null && !Number.isNaN(p.check.pValue) ? i : -1)).filter((i) => i >= 0);
  const h = holm(gatedIdx.map((i) => pending[i].check.pValue!), alpha);
  gatedIdx.forEach((i, r) => {
    pending[i].check.adjustedPValue = h.adjusted[r];
    pending[i].check.verdict = h.rejected[r] ? "fail" : pending[i].otherwise;
  });
  const checks = pending.map((p) => p.check);
  return { checks, limits, alpha, failed: checks.filter((c) => c.verdict === "fail").length };
}
