// Run planner: how many paths (and how much wall time on this machine) a suite needs so that the
// variance at its largest n reaches a target standard error, or detects a given relative error.
//
// Variance of the variance estimator: Var(s^2) = mu4/N - (N-3) sigma^4 / (N(N-1)) (plug-in of the
// 4th central moment; e.g. Kendall & Stuart, The Advanced Theory of Statistics vol. 1, sampling
// moments of k-statistics), the same formula as src/stats/moments.ts uses for varianceSE. For a
// normal measure mu4 = 3 sigma^4 and Var(s^2) = 2 sigma^4 / (N - 1), so the target SE needs
// N = 1 + 2 sigma^4 / SE^2 paths.
// Detection: a relative error REL in sigma^2 is found at two-sided level alpha with power 1 - beta
// when (z_{1-alpha/2} + z_{1-beta}) SE_N <= REL sigma^2 (the usual normal-approximation sample
// size for a z-test; common practice). For the extrapolated LIMIT (what a claim is checked
// against) the plan uses the total error of the verdicts instead: see detectionPlan.

import { normalQuantile } from "../stats/normal.js";
import { mergeAll } from "../stats/moments.js";
import type { MomentState } from "../stats/types.js";
import { measureBlocks } from "../run/series.js";
import { simulateInProcess } from "../run/simulate.js";
import type { LoadedSuite, Measure } from "../suite/schema.js";
import { predict } from "../theory/predict.js";
import { extrapolate, plainRatios } from "../verdict/extrapolate.js";
import { estimateMeasures, scaledSeries, type MeasureEstimates } from "../verdict/estimates.js";

/** Default power of the detection plan. */
export const DEFAULT_POWER = 0.9;
/** Default paths of the pilot run. */
export const DEFAULT_PILOT_PATHS = 4000;

/** Var(s^2) for N paths of a measure with variance sigma2 and 4th central moment mu4. */
export function varianceOfVariance(mu4: number, sigma2: number, N: number): number {
  if (!(N > 1)) throw new Error(`N: need more than one path, got ${N}`);
  return mu4 / N - ((N - 3) / (N - 1)) * (sigma2 * sigma2) / N;
}

function checkMoments(mu4: number, sigma2: number): void {
  if (!(sigma2 > 0) || !Number.isFinite(sigma2)) throw new Error(`sigma2: expected a positive finite variance, got ${sigma2}`);
  if (!(mu4 >= sigma2 * sigma2 * (1 - 1e-12)) || !Number.isFinite(mu4)) {
    throw new Error(`mu4: expected a finite 4th central moment >= sigma^4 = ${sigma2 * sigma2}, got ${mu4}`);
  }
}

/**
 * Smallest N (>= 4) with sqrt(Var(s^2)) <= targetSE. Var(s^2) = (mu4 - sigma^4)/N + 2 sigma^4/(N(N-1))
 * decreases in N, so a doubling search then bisection on integers finds it.
 */
export function pathsForTargetSE(mu4: number, sigma2: number, targetSE: number): number {
  checkMoments(mu4, sigma2);
  if (!(targetSE > 0) || !Number.isFinite(targetSE)) throw new Error(`targetSE: expected a positive number, got ${targetSE}`);
  const t2 = targetSE * targetSE;
  const ok = (N: number) => varianceOfVariance(mu4, sigma2, N) <= t2;
  let lo = 3; // not ok by convention (the estimator needs N >= 4)
  let hi = 4;
  while (!ok(hi)) {
    lo = hi;
    hi *= 2;
    if (hi > 2 ** 60) throw new Error(`targetSE: ${targetSE} needs more than 2^60 paths`);
  }
  while (hi - lo > 1) {
    const mid = Math.floor((lo + hi) / 2);
    if (ok(mid)) hi = mid;
    else lo = mid;
  }
  return hi;
}

/** The SE on sigma^2 that detects a relative error `rel` at two-sided level alpha with the given power. */
export function detectionSE(sigma2: number, rel: number, alpha: number, power = DEFAULT_POWER): number {
  if (!(rel > 0) || !Number.isFinite(rel)) throw new Error(`detect: expected a positive relative error, got ${rel}`);
  if (!(alpha > 0 && alpha < 1)) throw new Error(`alpha: expected a number in (0, 1), got ${alpha}`);
  if (!(power > 0 && power < 1)) throw new Error(`power: expected a number in (0, 1), got ${power}`);
  const z = normalQuantile(1 - alpha / 2) + normalQuantile(power);
  return (rel * sigma2) / z;
}

/** Paths to detect a relative error `rel` in sigma^2 (see detectionSE). */
export function pathsToDetect(mu4: number, sigma2: number, rel: number, alpha: number, power = DEFAULT_POWER): number {
  return pathsForTargetSE(mu4, sigma2, detectionSE(sigma2, rel, alpha, power));
}

export type PlanGoal = { kind: "target-se"; se: number } | { kind: "detect"; rel: number };

export interface MeasurePlan {
  measure: Measure;
  /** The largest n of the suite: the plan is for Var(X_n)/n^p there. */
  n: number;
  /** p in Var/n^p (the prediction's varianceScaling, or 1). */
  scaling: number;
  /** Pilot estimates of sigma^2/n^p and of the kurtosis mu4/sigma^4. */
  sigma2: number;
  kurtosis: number;
  /** The target standard error on sigma^2/n^p (given, or implied by the detection goal). */
  targetSE: number;
  /** Paths for the target at the largest n, and the wall time on `workers` workers. */
  paths: number;
  seconds: number;
  /**
   * SE(extrapolated limit) / SE(ratio at the largest n) from the pilot's own extrapolation, null
   * when the pilot cannot extrapolate (then the limit's SE is not included in the plan).
   */
  inflation: number | null;
  /**
   * Paths for the same target on the extrapolated limit: paths * max(1, inflation)^2 (null without
   * an inflation). An inflation below 1 (the fit pools every grid point) never lowers the plan.
   */
  limitPaths: number | null;
  limitSeconds: number | null;
  note: string;
  /**
   * With --detect: the plan from the TOTAL error of the extrapolated limit as the verdicts compute
   * it (control-variate estimates, statistical SE scaling like 1/sqrt(paths), the model systematic
   * not shrinking), at the Holm threshold of the suite's claim family; `paths` null when the
   * systematic alone is too wide. Then limitPaths = detection.paths.
   */
  detection?: {
    paths: number | null;
    sigma2: number;
    seStatPilot: number;
    systematic: number;
    familySize: number;
    zFail: number;
    zPower: number;
    note: string;
  } | null;
}

/**
 * Paths to detect a relative error `rel` in the extrapolated sigma^2 = lim Var/n^p with power
 * `power`: the claim fails when |estimate - claim| > zFail sqrt(se^2 + syst^2), zFail =
 * z_{1 - alpha/(2m)} (Holm's first step over a family of m, the worst case), so the plan needs
 * (zFail + zPower) sqrt(se_pilot^2 N0/N + syst^2) <= rel sigma^2 (normal-approximation sample size;
 * common practice).
 */
function detectionPlan(suite: LoadedSuite, measure: Measure, p: number, estimates: Map<Measure, MeasureEstimates>, rel: number, alpha: number, power: number, familySize: number, pilotPaths: number): NonNullable<MeasurePlan["detection"]> {
  const zFail = normalQuantile(1 - alpha / (2 * familySize));
  const zPower = normalQuantile(power);
  const empty = { sigma2: NaN, seStatPilot: NaN, systematic: NaN, familySize, zFail, zPower };
  const est = estimates.get(measure);
  if (!est) return { ...empty, paths: null, note: "the pilot has no control-variate estimates: no detection plan" };
  let ex;
  try {
    ex = extrapolate({ measure, quantity: "varianceLimit", scaling: p, n: suite.n, ...scaledSeries(est, "variance", p, suite.n), blocks: est.sizes.length, expectedRate: suite.expectedRate ?? 0.5 });
  } catch (e) {
    return { ...empty, paths: null, note: `the pilot cannot extrapolate (${(e as Error).message}): no detection plan` };
  }
  const L = ex.limit;
  const st = L.statisticalCi ?? L.ci;
  if (L.method === "none" || !st || L.systematic === null || L.systematic === undefined || !ex.testable) {
    return { ...empty, paths: null, note: `the pilot's limit is not testable on this grid (${ex.undecidable ?? L.note}): no detection plan` };
  }
  const zl = normalQuantile(1 - (1 - L.level) / 2);
  const seStat = Math.max(L.estimate - st[0], st[1] - L.estimate) / zl;
  const syst = L.systematic;
  const target = (rel * Math.abs(L.estimate)) / (zFail + zPower);
  const base = { sigma2: L.estimate, seStatPilot: seStat, systematic: syst, familySize, zFail, zPower };
  if (!(target > syst)) {
    return { ...base, paths: null, note: `no number of paths detects ${rel} on this grid: the model systematic se_syst = ${syst.toPrecision(3)} (pilot) exceeds the needed total error ${target.toPrecision(3)}; a grid reaching larger n would` };
  }
  const paths = Math.max(pilotPaths, Math.ceil((pilotPaths * seStat * seStat) / (target * target - syst * syst)));
  return {
    ...base, paths,
    note: `detection plan from the pilot's extrapolated limit ${L.estimate.toPrecision(5)} (control variates): se_stat ${seStat.toPrecision(3)} at ${pilotPaths} paths, se_syst ${syst.toPrecision(3)}, ` +
      `Holm threshold z = ${zFail.toFixed(2)} over ${familySize} claim(s) + power z = ${zPower.toFixed(2)}: needs total error <= ${target.toPrecision(3)}`,
  };
}

export interface SuitePlan {
  title: string;
  goal: PlanGoal;
  alpha: number;
  power: number;
  workers: number;
  pilotPaths: number;
  /** Measured seconds per path on one core (pilot, after its first block). */
  secondsPerPath: number;
  measures: MeasurePlan[];
}

export interface PlanOptions {
  goal: PlanGoal;
  workers?: number;
  pilotPaths?: number;
  power?: number;
  /** Seconds for predict()'s quadratures (only varianceScaling is used). */
  predictBudgetSeconds?: number;
}

/** Pilot statistics of one measure at the largest n, from the per-block moments. */
function pooled(blocks: MomentState[]): { sigma2: number; mu4: number } {
  const m = mergeAll(blocks);
  return { sigma2: m.m2 / (m.count - 1), mu4: m.m4 / m.count };
}

/**
 * Plans a suite: a pilot of `pilotPaths` paths on this thread measures the cost per path (timed
 * from the end of the first block, so compilation and warm-up are left out) and the moments.
 * Wall time assumes `workers` workers scale linearly (see the bench's parallel efficiency).
 */
export function planSuite(suite: LoadedSuite, opts: PlanOptions): SuitePlan {
  const workers = opts.workers ?? 1;
  if (!Number.isInteger(workers) || workers < 1) throw new Error(`workers: expected a positive integer, got ${workers}`);
  const pilotPaths = opts.pilotPaths ?? DEFAULT_PILOT_PATHS;
  if (!Number.isInteger(pilotPaths) || pilotPaths < 200) throw new Error(`pilotPaths: expected an integer >= 200, got ${pilotPaths}`);
  const power = opts.power ?? DEFAULT_POWER;
  const alpha = suite.alpha ?? 0.01;
  if (opts.goal.kind === "target-se" && !(opts.goal.se > 0)) throw new Error(`target-se: expected a positive number, got ${opts.goal.se}`);
  if (opts.goal.kind === "detect" && !(opts.goal.rel > 0)) throw new Error(`detect: expected a positive number, got ${opts.goal.rel}`);

  const pilot: LoadedSuite = { ...suite, paths: pilotPaths };
  let tFirst = 0;
  let pathsFirst = 0;
  let pathsAll = 0;
  const sim = simulateInProcess(pilot, {
    onBlock: (done, _total, paths) => {
      if (done === 1) { tFirst = performance.now(); pathsFirst = paths; }
      pathsAll = paths;
    },
  });
  const tEnd = performance.now();
  const secondsPerPath = pathsAll > pathsFirst ? (tEnd - tFirst) / 1000 / (pathsAll - pathsFirst) : sim.wallSeconds / pathsAll;

  let scalings: Map<Measure, number>;
  try {
    // Only the variance scalings are read: the finite-n means need no accuracy here.
    const pred = predict(suite, { budgetSeconds: opts.predictBudgetSeconds ?? 5, meanTargets: { relative: 1e-2 } });
    scalings = new Map(pred.measures.map((m) => [m.measure, m.varianceScaling]));
  } catch {
    scalings = new Map();
  }
  const G = suite.n.length;
  const nMax = suite.n[G - 1];
  // The detection plan reads the pilot the way the verdicts will read the run: control-variate
  // estimates, the same extrapolation, its statistical and systematic errors.
  const estimates = opts.goal.kind === "detect" ? estimateMeasures(sim) : null;
  const familySize = Math.max(1, (suite.claims ?? []).filter((c) => c.varianceLimit !== undefined || c.meanGrowth !== undefined || c.mean !== undefined).length);
  const measures = suite.measure.map((measure): MeasurePlan => {
    const series = measureBlocks(sim, measure);
    const p = scalings.get(measure) ?? 1;
    const scale = Math.pow(nMax, p);
    const atLast = series.map((b) => b[G - 1]);
    const raw = pooled(atLast);
    const sigma2 = raw.sigma2 / scale;
    const mu4 = raw.mu4 / (scale * scale);
    const base = { measure, n: nMax, scaling: p, sigma2, kurtosis: sigma2 > 0 ? mu4 / (sigma2 * sigma2) : NaN };
    if (!(sigma2 > 0)) {
      return { ...base, targetSE: NaN, paths: NaN, seconds: NaN, inflation: null, limitPaths: null, limitSeconds: null, note: "no spread in the pilot: nothing to plan" };
    }
    const targetSE = opts.goal.kind === "target-se" ? opts.goal.se : detectionSE(sigma2, opts.goal.rel, alpha, power);
    const paths = pathsForTargetSE(mu4, sigma2, targetSE);
    const seconds = (paths * secondsPerPath) / workers;
    let inflation: number | null = null;
    let note: string;
    try {
      const ex = extrapolate({ measure, quantity: "varianceLimit", scaling: p, n: suite.n, ...plainRatios("varianceLimit", p, suite.n, series), expectedRate: suite.expectedRate ?? 0.5 });
      const last = ex.limit.ratios[ex.limit.ratios.length - 1];
      if (ex.limit.method !== "none" && last.standardError > 0 && Number.isFinite(ex.limit.standardError)) {
        inflation = ex.limit.standardError / last.standardError;
        note = `limit extrapolated by the pilot (${ex.limit.method}): its SE is ${inflation.toFixed(2)}x the SE at n = ${nMax}` +
          (inflation < 1 ? " (below 1: the fit pools all grid points; the limit plan keeps the largest-n paths)" : "");
      } else {
        note = "the pilot cannot extrapolate this grid: the limit's extra SE is not included";
      }
    } catch (e) {
      note = `pilot extrapolation failed (${(e as Error).message}): the limit's extra SE is not included`;
    }
    let limitPaths = inflation === null ? null : Math.ceil(paths * Math.max(1, inflation) ** 2);
    let detection: MeasurePlan["detection"] = null;
    if (opts.goal.kind === "detect") {
      detection = detectionPlan(suite, measure, p, estimates!, opts.goal.rel, alpha, power, familySize, pilotPaths);
      limitPaths = detection.paths;
      note = detection.note;
    }
    return {
      ...base, targetSE, paths, seconds, inflation, limitPaths,
      limitSeconds: limitPaths === null ? null : (limitPaths * secondsPerPath) / workers, note, detection,
    };
  });
  return { title: suite.title, goal: opts.goal, alpha, power, workers, pilotPaths, secondsPerPath, measures };
}

function fmtTime(s: number): string {
  if (!Number.isFinite(s)) return "-";
  if (s < 120) return `${s.toFixed(1)} s`;
  if (s < 7200) return `${(s / 60).toFixed(1)} min`;
  return `${(s / 3600).toFixed(1)} h`;
}

function g4(x: number): string {
  return Number.isFinite(x) ? x.toPrecision(4) : "-";
}

/** Plain-text rendering of a plan. */
export function renderPlan(plan: SuitePlan): string {
  const goal = plan.goal.kind === "target-se"
    ? `target SE ${plan.goal.se} on sigma^2 = Var/n^p`
    : `detect a relative error ${plan.goal.rel} in sigma^2 = Var/n^p (two-sided alpha ${plan.alpha}, power ${plan.power})`;
  const lines = [
    `${plan.title}`,
    `goal: ${goal}`,
    `pilot: ${plan.pilotPaths} paths, ${(plan.secondsPerPath * 1e3).toPrecision(3)} ms per path on one core; times below for ${plan.workers} worker(s), assuming linear scaling`,
    "",
    "| measure | n | p | sigma^2 (pilot) | mu4/sigma^4 | target SE | paths | time | limit SE inflation | paths for the limit | time |",
    "|---|---|---|---|---|---|---|---|---|---|---|",
  ];
  for (const m of plan.measures) {
    lines.push(`| ${m.measure} | ${m.n} | ${m.scaling} | ${g4(m.sigma2)} | ${g4(m.kurtosis)} | ${g4(m.targetSE)} | ${Number.isFinite(m.paths) ? m.paths : "-"} | ${fmtTime(m.seconds)} | ` +
      `${m.inflation === null ? "not included" : m.inflation.toFixed(2)} | ${m.limitPaths ?? "-"} | ${m.limitSeconds === null ? "-" : fmtTime(m.limitSeconds)} |`);
  }
  lines.push(
    "",
    "The paths and times are for sigma^2 = Var(X_n)/n^p at the LARGEST n of the suite. The extrapolated",
    "limit n -> infinity usually has a larger SE: the inflation column is SE(limit)/SE(largest n) from the",
    "pilot's own extrapolation (itself noisy at pilot size); 'paths for the limit' = paths x max(1, inflation)^2.",
  );
  if (plan.goal.kind === "detect")
    lines.push(
      "With --detect, 'paths for the limit' is the detection plan: the pilot read as the verdicts read a run",
      "(control variates, the extrapolated limit's statistical SE shrinking like 1/sqrt(paths), its model",
      "systematic not shrinking, the Holm threshold of the suite's claim family, the stated power).",
    );
  for (const m of plan.measures) lines.push(`- ${m.measure}: ${m.note}`);
  return lines.join("\n");
}
