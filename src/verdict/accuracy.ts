// The accuracy a run asks of its finite-n mean predictions: 1/10 of the run's own standard error of
// the simulated mean each one is checked against (then the numerical error adds at most
// sqrt(1 + 0.01) - 1 = 0.5% to the check's standard deviation): the control-variate SE when the check
// uses it (estimates.ts), else the plain one. One function of the simulation result.

import { mergeAll, summarize } from "../stats/moments.js";
import type { Measure } from "../suite/schema.js";
import { measureBlocks } from "../run/series.js";
import type { MeanTargets } from "../theory/types.js";
import type { SimulationResult } from "../run/types.js";
import { estimateMeasures, type MeasureEstimates } from "./estimates.js";

/** estimateMeasures(sim), computed once per result (the prediction targets and evaluateChecks both read it). */
const memo = new WeakMap<object, Map<Measure, MeasureEstimates>>();
export function meanEstimates(sim: SimulationResult): Map<Measure, MeasureEstimates> {
  let e = memo.get(sim);
  if (!e) { e = estimateMeasures(sim); memo.set(sim, e); }
  return e;
}

/** Share of the standard error a prediction's error bound may take. */
export const TARGET_SHARE_OF_SE = 0.1;

/** The error bound the prediction of the mean of `measure` at grid index g must reach: SE / 10 (the SE its check uses). */
export function requiredMeanAccuracy(sim: SimulationResult, measure: Measure, g: number): number {
  const point = meanEstimates(sim).get(measure)?.points[g];
  const se = point ? point.meanSE : summarize(mergeAll(measureBlocks(sim, measure).map((b) => b[g]))).meanSE;
  return TARGET_SHARE_OF_SE * se;
}

/**
 * The targets of every simulated (measure, n), rounded down to a power of 2 (so that reruns with
 * slightly different standard errors share prediction cache entries, never with a looser bound).
 * A zero or non-finite SE (a single path) leaves that mean to the default relative target.
 */
export function runMeanTargets(sim: SimulationResult): MeanTargets {
  const absolute: NonNullable<MeanTargets["absolute"]> = {};
  for (const measure of sim.suite.measure) {
    const byN: Record<string, number> = {};
    sim.suite.n.forEach((n, g) => {
      const t = requiredMeanAccuracy(sim, measure, g);
      if (t > 0 && Number.isFinite(t)) byN[String(n)] = 2 ** Math.floor(Math.log2(t));
    });
    absolute[measure] = byN;
  }
  return { absolute };
}
