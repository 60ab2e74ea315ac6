// The verdict stage: simulated moments + predictions + user claims -> calibrated checks.
//
// Every user claim and every built-in prediction whose constant is a `theorem` or `derived` is
// checked; `estimate` constants are shown, never gated. Gated checks of constants form two
// families, each controlled by Holm's step-down procedure at suite.alpha (default 0.01): the
// user's claims, and the built-in predictions (so padding one family never rescues the other).
// A constant (a limit or a finite-n mean) FAILS when Holm rejects its value; it PASSES only when
// its whole (1 - alpha) interval (statistical + systematic) lies within value x (1 +- tolerance)
// (src/verdict/decide.ts); otherwise it is INCONCLUSIVE, with the paths that would decide or the
// reason no number of paths can. Limit laws read one evidence state per measure
// (src/verdict/normality.ts lawDecision) at level alpha, outside the Holm families, so that a claim
// and a prediction about the same law never disagree.
// Estimates use control variates where they lower the jackknife SE (src/verdict/estimates.ts).
// Methods: src/verdict/extrapolate.ts (limits), src/verdict/normality.ts (laws), src/stats/*.

import { LILLIEFORS_P_FLOOR } from "../stats/lilliefors.js";
import { holm } from "../stats/holm.js";
import { normalQuantile, twoSidedNormalP } from "../stats/normal.js";
import type { MomentState } from "../stats/types.js";
import type { SimulationResult } from "../run/types.js";
import { measureBlocks, measureSample, seriesWidth } from "../run/series.js";
import type { MeasurePrediction, Prediction } from "../theory/types.js";
import type { Measure } from "../suite/schema.js";
import { extrapolate, LEVEL, plainRatios, type Extrapolation } from "./extrapolate.js";
import type { NormalityEvidence } from "./normality.js";
import { lawEvidenceInput, lawEvidenceOf, type LawEvidence } from "./law-evidence.js";
import { scaledSeries, type MeasureEstimates, type PointEstimate } from "./estimates.js";
import { meanEstimates } from "./accuracy.js";
import { insideBand, pathsToDecide, toleranceBand } from "./decide.js";
import { coefficientPower, coefficientSeriesName, extrapolateCoefficient, extrapolateRemainder, linearisationEvidence, remainderDecision } from "./linearisation.js";
import { sqrtMeanConstant, tieLawCheck } from "./tie-law.js";
import type { Check, CheckKind, LimitEstimate, LinearisationReport, Verdict, VerdictReport } from "./types.js";
import type { Linearisation } from "../suite/schema.js";

export type { Check, CheckKind, LimitEstimate, Verdict, VerdictReport } from "./types.js";
export { renderChecks } from "./render.js";

type Family = "claims" | "predictions";

interface Pending {
  check: Check;
  /** Verdict when Holm does not reject (pass or inconclusive). */
  otherwise: Verdict;
  family: Family;
  /** For constants: the value, tolerance, decision interval and what decides it (set when gated). */
  constant?: { value: number; tolerance: number; interval: [number, number]; seStat: number; seStatWide?: number; seSyst: number; paths: number; estimate: number; scale?: number };
}

const fmt = (x: number | null | undefined, digits = 6): string =>
  x === null || x === undefined || Number.isNaN(x) ? "-" : Number.isFinite(x) ? Number(x.toPrecision(digits)).toString() : x > 0 ? "inf" : "-inf";
const fmtP = (p: number): string => (p < 1e-4 ? p.toExponential(1) : p.toFixed(4));

function predictionSource(p: MeasurePrediction): string {
  return `prediction: ${p.sources.length ? p.sources.join("; ") : "no citation given"}`;
}

/**
 * What evaluateChecks computes from the simulation alone (not from claims or predictions): callers
 * that judge many claim sets on ONE simulation (the calibration) pass the same object each time.
 */
export interface VerdictCache {
  estimates?: Map<Measure, MeasureEstimates>;
  extrapolations?: Map<string, Extrapolation>;
  /** Limit-law evidence per measure (e.g. computed on helper threads, src/verdict/law-evidence.ts). */
  evidence?: Map<Measure, LawEvidence>;
  /** Linearisation fits and their extrapolations, by measure, linearisation, scaling, alpha and expected rate. */
  linearFits?: Map<string, LinearFit>;
  /**
   * Set by prepareVerdictCache only: the law checks do not compute missing evidence (their checks
   * in that pass are thrown away), so that everything else is computed while the evidence is
   * computed elsewhere.
   */
  lawsPending?: boolean;
}

/** A linearisation's per-n fit with its coefficients' and remainder's extrapolations. */
interface LinearFit {
  fit: ReturnType<typeof linearisationEvidence>;
  coef: Extrapolation[];
  rem: Extrapolation | null;
}

/**
 * Fill `cache` with everything the checks of (sim, prediction) compute from the simulation alone
 * (control-variate estimates, extrapolations, linearisation fits), without the limit-law evidence:
 * `walkhull run` calls it while helper threads compute that evidence, and evaluateChecks then
 * reads the cache (the same numbers: each entry is what evaluateChecks would compute itself).
 */
export function prepareVerdictCache(sim: SimulationResult, prediction: Prediction, cache: VerdictCache): void {
  cache.estimates ??= meanEstimates(sim);
  cache.extrapolations ??= new Map();
  cache.linearFits ??= new Map();
  evaluateChecks(sim, prediction, { estimates: cache.estimates, extrapolations: cache.extrapolations, linearFits: cache.linearFits, evidence: cache.evidence, lawsPending: true });
}

export function evaluateChecks(sim: SimulationResult, prediction: Prediction, cache: VerdictCache = {}): VerdictReport {
  const suite = sim.suite;
  const alpha = suite.alpha ?? 0.01;
  const tol = suite.normalityTolerance ?? 0.01;
  const tolerance = suite.tolerance ?? 0.01;
  if (!(tolerance > 0 && tolerance < 1)) throw new Error(`tolerance: must be in (0, 1), got ${tolerance}`);
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
  const estimates = (cache.estimates ??= meanEstimates(sim));
  const shared = (cache.extrapolations ??= new Map<string, Extrapolation>());
  const totalPaths = sim.blocks.reduce((a, b) => a + b.paths, 0);

  const extrapolations = new Map<string, Extrapolation>();
  const limitsOrder: string[] = [];
  const getExtrapolation = (measure: Measure, quantity: "varianceLimit" | "meanGrowth", scaling: number): Extrapolation => {
    const key = `${measure}|${quantity}|${scaling}`;
    let ex = extrapolations.get(key);
    if (!ex) {
      ex = shared.get(key);
      if (!ex) {
        const est = estimates.get(measure);
        const series = est
          ? { ...scaledSeries(est, quantity === "varianceLimit" ? "variance" : "mean", scaling, grid), blocks: sim.blocks.length }
          : plainRatios(quantity, scaling, grid, blocksFor(measure));
        ex = extrapolate({ measure, quantity, scaling, n: grid, y: series.y, cov: series.cov, blocks: series.blocks, expectedRate });
        shared.set(key, ex);
      }
      extrapolations.set(key, ex);
      limitsOrder.push(key);
    }
    return ex;
  };

  const pending: Pending[] = [];
  const add = (check: Omit<Check, "adjustedPValue" | "family" | "tolerance" | "decisionInterval" | "pathsToDecide">, otherwise: Verdict, family: Family, constant?: Pending["constant"]) =>
    pending.push({ check: { ...check, adjustedPValue: null, family: check.gated ? family : null, tolerance: constant?.tolerance ?? null, decisionInterval: constant?.interval ?? null, pathsToDecide: null }, otherwise, family, constant });
  const zPass = normalQuantile(1 - alpha / 2);

  // --- finite-n means -------------------------------------------------------------------------
  const meanCheck = (measure: Measure, g: number, expected: number, err: number, id: string, source: string, family: Family, tol: number, target?: number) => {
    const pt = estimates.get(measure)?.points[g];
    const plain = blocksFor(measure).map((b) => b[g]);
    const mean = pt ? pt.mean : plain.reduce((a, b) => a + b.mean * b.count, 0) / plain.reduce((a, b) => a + b.count, 0);
    const se = pt ? pt.meanSE : NaN;
    const total = Math.sqrt(se * se + err * err);
    const z = (mean - expected) / total;
    const zc = normalQuantile(1 - (1 - LEVEL) / 2);
    const how = pt && pt.meanUsesControls ? `control-variate mean (SE ${fmt(pt.meanSE, 4)}, plain ${fmt(pt.meanPlainSE, 4)}: variance reduction ${fmt(pt.meanReduction, 3)}x)` : "plain mean";
    if (target !== undefined && !(err <= target)) {
      // The prediction did not reach the accuracy its check needs (its target): shown, not gated.
      add(
        {
          id, measure, n: grid[g], kind: "mean", source, estimate: mean, expected, statistic: z, pValue: null,
          ci: [mean - zc * se, mean + zc * se], verdict: "inconclusive", gated: false,
          detail: `Not gated: the predicted mean's numerical error bound ${fmt(err, 3)} did not reach its target ${fmt(target, 3)} (1/10 of the SE it is checked against); z = ${fmt(z, 3)} shown with the ${how}, SE = ${fmt(se, 4)}.`,
        },
        "inconclusive", family,
      );
      return;
    }
    add(
      {
        id, measure, n: grid[g], kind: "mean", source, estimate: mean, expected, statistic: z, pValue: twoSidedNormalP(z),
        ci: [mean - zc * se, mean + zc * se], verdict: "pass", gated: Number.isFinite(z),
        detail: `z = (mean - expected)/sqrt(SE^2 + err^2) with the ${how}, jackknife SE over ${sim.blocks.length} blocks, ${totalPaths} paths, numerical error bound err = ${fmt(err, 3)}; ${LEVEL * 100}% CI of the mean.`,
      },
      "pass", family,
      { value: expected, tolerance: tol, interval: [mean - zPass * total, mean + zPass * total], seStat: se, seSyst: err, paths: totalPaths, estimate: mean },
    );
  };

  // --- limits (variance, mean growth) ----------------------------------------------------------
  // `other`: a constant that is not a variance or mean limit (a linearisation coefficient), with its
  // own extrapolation, check kind, series name and tolerance scale (the norm of its vector).
  const limitCheck = (
    measure: Measure, quantity: "varianceLimit" | "meanGrowth", scaling: number, value: number, id: string, source: string,
    constantKind: string | null, uncalibrated: boolean, family: Family, tol: number,
    other?: { ex: Extrapolation; kind: CheckKind; name: string; scale?: number },
  ) => {
    const ex = other?.ex ?? getExtrapolation(measure, quantity, scaling);
    const L = ex.limit;
    const t = ex.test(value);
    const power = other?.name ?? (quantity === "varianceLimit" ? `Var/n^${scaling}` : `mean/n^${scaling}`);
    const base = { id, measure, n: null, kind: other?.kind ?? (quantity as CheckKind), source, estimate: L.estimate, expected: value, statistic: t.statistic, ci: L.ci };
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
    else if (ex.undecidable !== null) why = ex.undecidable;
    else if (!Number.isFinite(t.pValue)) why = "the test statistic is not finite";
    if (why !== null) {
      add({ ...base, pValue: null, verdict: "inconclusive", gated: false, detail: `Not gated: ${why}. ${method}` }, "inconclusive", family);
      return;
    }
    const interval = ex.interval(1 - alpha);
    // se_stat on the side facing the value (the profile interval may be asymmetric).
    const st = L.statisticalCi ?? L.ci ?? [L.estimate, L.estimate];
    const zL = normalQuantile(1 - (1 - LEVEL) / 2);
    const seStat = (value < L.estimate ? L.estimate - st[0] : st[1] - L.estimate) / zL;
    const seStatWide = Math.max(L.estimate - st[0], st[1] - L.estimate) / zL;
    add(
      {
        ...base, pValue: t.pValue, verdict: "pass", gated: true,
        detail:
          `z = (estimate - expected)/sqrt(se_stat^2 + se_syst^2) = ${fmt(t.statistic, 3)}, se_stat from the side of the statistical interval facing the value, se_syst = ${fmt(L.systematic ?? NaN, 3)} (model uncertainty). ` +
          (L.method === "fixed" ? "z test under each assumed rate; the gated p-value is the least significant one and the decision interval is the union over the rates. " : "") +
          method,
      },
      "pass", family,
      { value, tolerance: tol, interval, seStat, seStatWide, seSyst: L.systematic ?? 0, paths: totalPaths, estimate: L.estimate, scale: other?.scale },
    );
  };

  // --- limit laws ------------------------------------------------------------------------------
  const evidenceCache = new Map<Measure, LawEvidence>(cache.evidence ?? []);
  const evidenceFor = (measure: Measure): LawEvidence => {
    let ev = evidenceCache.get(measure);
    if (ev === undefined && cache.lawsPending) return "pending";
    if (ev === undefined) {
      ev = lawEvidenceOf(lawEvidenceInput(sim, measure));
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
      `skewness ${fmt(ev.skewness, 3)} (jackknife SE ${fmt(ev.skewnessJackknifeSE, 2)}), excess kurtosis ${fmt(ev.excessKurtosis, 3)} (SE ${fmt(ev.kurtosisJackknifeSE, 2)}); ` +
      (ev.skewGrowth ? `growth of |skewness| from n = ${grid[0]}: z = ${fmt(ev.skewGrowth.z, 3)}; ` : "skewness trend not assessable with one n; ") +
      (ev.skewPersistence ? `|skewness| above the n^-1/2 decay of a normal limit: z = ${fmt(ev.skewPersistence.z, 3)}; ` : "") +
      (ev.kurtosisPersistence ? `|excess kurtosis| above the n^-1 decay: z = ${fmt(ev.kurtosisPersistence.z, 3)}; ` : "") +
      `${ev.ksTrend}.`
    );
  };
  const lawCheck = (measure: Measure, law: string, id: string, source: string, predictionReasons: string[], family: Family) => {
    const got = evidenceFor(measure);
    const base = { id, measure, n: grid[G - 1], kind: "limitLaw" as CheckKind, source, expected: law };
    if (typeof got === "string") {
      add({ ...base, estimate: null, statistic: null, pValue: null, ci: null, verdict: "inconclusive", gated: false, detail: `Not decided: ${got}.` }, "inconclusive", family);
      return;
    }
    const { ev, decision } = got;
    const d = ev.distance;
    const numbers = { estimate: d.minimum, statistic: d.minimum, ci: [Math.max(0, d.minimum - d.margin), d.upperBound] as [number, number] };
    const rule = `One evidence state per measure at level alpha = ${alpha} (not in a Holm family; claims and predictions read the same state): ${decision.why}.`;
    if (law === "normal" || law === "non-normal") {
      // normal: pass when normal convergence is shown, fail when non-normality is confirmed;
      // non-normal: pass ("confirmed" for a prediction) when confirmed, fail only when normal
      // convergence is shown strictly (distance below resolution at every n as well).
      let verdict: Verdict = "inconclusive";
      if (law === "normal") verdict = decision.state === "normal" ? "pass" : decision.state === "non-normal" ? "fail" : "inconclusive";
      else if (decision.state === "non-normal") verdict = family === "predictions" ? "confirmed" : "pass";
      else if (decision.state === "normal" && decision.strict) verdict = "fail";
      add({ ...base, ...numbers, pValue: null, verdict, gated: false, detail: `${rule} ${evidenceText(ev)}` }, verdict, family);
    } else {
      add(
        {
          ...base, ...numbers, pValue: null, verdict: "inconclusive", gated: false,
          detail: `Limit law ${law}${predictionReasons.length ? ` (${predictionReasons.join("; ")})` : ""}: evidence shown, not decided. ${decision.why}. ${evidenceText(ev)}`,
        },
        "inconclusive", family,
      );
    }
  };

  // --- linearisations (src/verdict/linearisation.ts) -------------------------------------------
  // Coefficients: constants like any limit (gated in their family, tolerance relative to the norm
  // of the walk's claimed vector); remainder: decided at level alpha outside the Holm families.
  const linearisations: LinearisationReport[] = [];
  // A claim identical to a built-in linearisation (or to another claim) reuses its fits.
  const linearFits = (cache.linearFits ??= new Map<string, LinearFit>());
  const linearFit = (measure: Measure, spec: Linearisation, scaling: number) => {
    const key = JSON.stringify([measure, spec.endpoint, spec.path ?? null, scaling, alpha, expectedRate]);
    let got = linearFits.get(key);
    if (!got) {
      const fit = linearisationEvidence(sim, measure, spec, scaling, alpha);
      const coef = fit.evidence.coefficients.map((_, i) => extrapolateCoefficient(fit, i, grid, sim.blocks.length, expectedRate));
      got = { fit, coef, rem: fit.evidence.unavailable === null ? extrapolateRemainder(fit, grid, sim.blocks.length, expectedRate) : null };
      linearFits.set(key, got);
    }
    return got;
  };
  const linearisationCheck = (measure: Measure, spec: Linearisation, scaling: number, idBase: string, idTail: string, source: string, constantKind: string | null, uncalibrated: boolean, family: Family, tol: number) => {
    const { fit, coef, rem: exR } = linearFit(measure, spec, scaling);
    const ev = fit.evidence;
    const rep: LinearisationReport = { id: `${idBase}${idTail}`, source, family, tolerance: tol, claimed: spec, ...ev, coefficientLimits: [], remainderDecision: null };
    linearisations.push(rep);
    const idOf = (part: string) => `${idBase}.${part}${idTail}`;
    if (ev.unavailable !== null) {
      add({ id: idOf("remainder"), measure, n: null, kind: "linearisation", source, estimate: null, expected: "decay rate > 0", statistic: null, pValue: null, ci: null, verdict: "inconclusive", gated: false, detail: `Not decided: ${ev.unavailable}.` }, "inconclusive", family);
      return;
    }
    const norm = (vs: [number, number][] | undefined) => Math.sqrt((vs ?? []).reduce((a, v) => a + v[0] * v[0] + v[1] * v[1], 0));
    ev.coefficients.forEach((c, i) => {
      const ex = coef[i];
      const vecs = c.kind === "endpoint" ? spec.endpoint : spec.path;
      const own = Math.hypot(vecs![c.walk][0], vecs![c.walk][1]);
      const scale = own > 0 ? own : norm(vecs);
      const power = coefficientPower(c.kind, scaling);
      rep.coefficientLimits.push({ label: c.label, estimate: ex.limit.estimate, ci: ex.limit.ci, note: ex.limit.note });
      limitCheck(measure, "varianceLimit", scaling, c.claimed, idOf(c.label), source, constantKind, uncalibrated, family, tol, { ex, kind: "linearisation", name: coefficientSeriesName(c, scaling), scale });
      const ck = pending[pending.length - 1].check;
      ck.detail = `Coefficient of M_n on ${c.kind === "endpoint" ? "X" : "Y"}_n^${c.walk + 1} along (${c.direction.map((x) => +x.toFixed(4)).join(", ")}), least squares per n (jackknife over blocks, refitted per replicate), divided by n^${power}, extrapolated; claimed ${fmt(c.claimed)}. ${ck.detail}`;
    });
    const d = remainderDecision(ev, exR, alpha, tol, totalPaths);
    rep.remainderDecision = d;
    const rate = ev.rate;
    add(
      {
        id: idOf("remainder"), measure, n: null, kind: "linearisation", source, estimate: rate?.estimate ?? null, expected: "decay rate > 0",
        statistic: rate && rate.standardError > 0 ? rate.estimate / rate.standardError : null, pValue: null, ci: rate?.ci ?? null, verdict: d.verdict, gated: false,
        detail: `Remainder R_n = M_n - E M_n - (claimed functional); Var(R_n)/n^${scaling} per n from the block co-moments (jackknife SE), decay rate by GLS of its log on log n, limit extrapolated; decided at level alpha = ${alpha} outside the Holm families. ${d.why}.` +
          (ev.unidentified.length ? ` Not identifiable: ${ev.unidentified.join("; ")}.` : ""),
      },
      d.verdict, family,
    );
    pending[pending.length - 1].check.pathsToDecide = d.pathsToDecide;
  };

  // --- predictions ----------------------------------------------------------------------------
  const tieLaws: NonNullable<VerdictReport["tieLaws"]> = [];
  for (const measure of suite.measure) {
    const pred = predFor(measure);
    if (!pred) continue;
    const src = predictionSource(pred);
    for (let g = 0; g < G; g++) {
      const key = String(grid[g]);
      const exact = pred.exactMeans[key];
      if (exact !== undefined && Number.isFinite(exact)) meanCheck(measure, g, exact, pred.exactMeansError[key] ?? 0, `${measure}.mean.n${grid[g]}.prediction`, src, "predictions", tolerance, pred.exactMeansTarget?.[key]);
    }
    if (pred.varianceLimit !== null)
      limitCheck(measure, "varianceLimit", pred.varianceScaling, pred.varianceLimit, `${measure}.varianceLimit.prediction`, src, pred.varianceLimitKind, pred.varianceUncalibrated === true, "predictions", tolerance);
    if (pred.meanGrowth !== null)
      limitCheck(measure, "meanGrowth", pred.meanScaling, pred.meanGrowth, `${measure}.meanGrowth.prediction`, src, pred.meanGrowthKind, false, "predictions", tolerance);
    const gm = pred.limitLaw === "gaussian-maximum" ? pred.gaussianMaximum : undefined;
    if (gm) {
      // The law of a maximum of Gaussian forms and the mean's sqrt(n) constant (src/verdict/tie-law.ts).
      const law = tieLawCheck(grid, measureSample(sim, measure), gm, tol, alpha);
      tieLaws.push({ measure, state: law.state, points: law.evidence.points, cdfError: law.evidence.cdfError });
      add({ id: `${measure}.limitLaw.prediction`, measure, n: grid[G - 1], kind: "limitLaw", source: src, expected: "gaussian-maximum", pValue: null, gated: false, ...law.fields }, law.fields.verdict, "predictions");
      const est = estimates.get(measure);
      if (est) limitCheck(measure, "meanGrowth", 0.5, gm.mean, `${measure}.meanSqrtConstant.prediction`, src, "derived", false, "predictions", tolerance, { ex: sqrtMeanConstant(measure, est, gm.centre, grid, sim.blocks.length, expectedRate), kind: "meanGrowth", name: "(mean - n d)/n^0.5" });
    } else if (pred.limitLaw !== "degenerate") lawCheck(measure, pred.limitLaw, `${measure}.limitLaw.prediction`, src, pred.reasons, "predictions");
    if (pred.linearisation)
      linearisationCheck(measure, pred.linearisation, pred.varianceScaling, `${measure}.linearisation`, ".prediction", src, pred.varianceLimitKind, pred.varianceUncalibrated === true, "predictions", tolerance);
  }

  // --- user claims ----------------------------------------------------------------------------
  (suite.claims ?? []).forEach((claim, i) => {
    const field = `claims[${i}]`;
    if (!suite.measure.includes(claim.measure)) throw new Error(`${field}.measure: "${claim.measure}" is not simulated by this suite`);
    const pred = predFor(claim.measure);
    const src = `claim${claim.label ? `: ${claim.label}` : ""}`;
    const uncalibrated = pred?.varianceUncalibrated === true;
    const claimTol = claim.tolerance ?? tolerance;
    if (!(claimTol > 0 && claimTol < 1)) throw new Error(`${field}.tolerance: must be in (0, 1), got ${claimTol}`);
    if ((claim.n === undefined) !== (claim.mean === undefined)) throw new Error(`${field}.${claim.n === undefined ? "n" : "mean"}: a finite-n mean claim needs both n and mean`);
    if (claim.n !== undefined && claim.mean !== undefined) {
      const g = grid.indexOf(claim.n);
      if (g < 0) throw new Error(`${field}.n: ${claim.n} is not on the suite's grid [${grid.join(", ")}]`);
      meanCheck(claim.measure, g, claim.mean, 0, `${claim.measure}.mean.n${claim.n}.${field}`, src, "claims", claimTol);
    }
    if (claim.varianceLimit !== undefined) {
      const p = claim.varianceScaling ?? pred?.varianceScaling ?? 1;
      limitCheck(claim.measure, "varianceLimit", p, claim.varianceLimit, `${claim.measure}.varianceLimit.${field}`, src, "claim", uncalibrated, "claims", claimTol);
    }
    if (claim.meanGrowth !== undefined) {
      // q = claim.meanScaling, else the prediction's meanScaling (as for varianceScaling), else 1.
      limitCheck(claim.measure, "meanGrowth", claim.meanScaling ?? pred?.meanScaling ?? 1, claim.meanGrowth, `${claim.measure}.meanGrowth.${field}`, src, "claim", false, "claims", claimTol);
    }
    if (claim.limitLaw !== undefined) lawCheck(claim.measure, claim.limitLaw, `${claim.measure}.limitLaw.${field}`, src, [], "claims");
    if (claim.linearisation !== undefined) {
      if (claim.linearisation.endpoint.length !== suite.walks.length) throw new Error(`${field}.linearisation.endpoint: ${claim.linearisation.endpoint.length} gradients for ${suite.walks.length} walks`);
      linearisationCheck(claim.measure, claim.linearisation, claim.varianceScaling ?? pred?.varianceScaling ?? 1, `${claim.measure}.linearisation`, `.${field}`, src, "claim", uncalibrated, "claims", claimTol);
    }
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

  // --- Holm within each family, then the decision of each constant ----------------------------
  const familySize: Record<Family, number> = { claims: 0, predictions: 0 };
  for (const family of ["claims", "predictions"] as Family[]) {
    const idx = pending.map((p, i) => (p.family === family && p.check.gated && p.check.pValue !== null && !Number.isNaN(p.check.pValue) ? i : -1)).filter((i) => i >= 0);
    familySize[family] = idx.length;
    const h = holm(idx.map((i) => pending[i].check.pValue!), alpha);
    const zFail = normalQuantile(1 - alpha / (2 * Math.max(1, idx.length)));
    idx.forEach((i, r) => {
      const p = pending[i];
      p.check.adjustedPValue = h.adjusted[r];
      if (h.rejected[r]) {
        p.check.verdict = "fail";
        p.check.detail += ` FAIL: the value is rejected (Holm-adjusted p = ${fmtP(h.adjusted[r])} <= ${alpha} within the ${family} family of ${idx.length}).`;
        return;
      }
      const c = p.constant;
      if (!c) {
        p.check.verdict = p.otherwise;
        return;
      }
      const band = toleranceBand(c.value, c.tolerance, c.scale);
      const bandText = c.scale === undefined ? `value x (1 +- ${c.tolerance})` : `value +- ${c.tolerance} x ${fmt(c.scale, 4)} (the norm of its vector)`;
      const containsValue = c.interval[0] <= c.value && c.value <= c.interval[1];
      if (containsValue && insideBand(c.interval, band)) {
        p.check.verdict = "pass";
        p.check.detail += ` PASS: the ${(100 * (1 - alpha)).toFixed(0)}% decision interval [${fmt(c.interval[0])}, ${fmt(c.interval[1])}] lies within ${bandText} = [${fmt(band[0])}, ${fmt(band[1])}].`;
        return;
      }
      p.check.verdict = "inconclusive";
      const decide = pathsToDecide({ ...c, zPass, zFail });
      p.check.pathsToDecide = decide.paths;
      const state = !containsValue
        ? `the value lies outside the ${(100 * (1 - alpha)).toFixed(0)}% decision interval [${fmt(c.interval[0])}, ${fmt(c.interval[1])}] but is not rejected after Holm (adjusted p = ${fmtP(h.adjusted[r])})`
        : `the ${(100 * (1 - alpha)).toFixed(0)}% decision interval [${fmt(c.interval[0])}, ${fmt(c.interval[1])}] is not within ${bandText} = [${fmt(band[0])}, ${fmt(band[1])}]`;
      p.check.detail += ` INCONCLUSIVE: ${state}; ${decide.why}.`;
    });
  }
  const checks = pending.map((p) => p.check);
  const undecided = checks.filter((c) => c.source.startsWith("claim") && c.verdict === "inconclusive");
  const pointEstimates: PointEstimate[] = [...estimates.values()].flatMap((e) => e.points);
  return {
    checks, limits, alpha, tolerance,
    failed: checks.filter((c) => c.verdict === "fail").length,
    undecidedClaims: undecided.map((c) => ({ id: c.id, pathsToDecide: c.pathsToDecide })),
    familySizes: familySize,
    estimates: pointEstimates,
    ...(linearisations.length ? { linearisations } : {}),
    ...(tieLaws.length ? { tieLaws } : {}),
  };
}
