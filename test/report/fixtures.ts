// Reports built from the library (real simulations, fixed seeds) for the report tests.
// The prediction is written here rather than computed by src/theory, so these tests exercise the
// report stage on its own. Check values: one Gaussian walk with drift mu = (1, 0), Sigma = I:
// Var(L_n)/n -> 4 E[((Z - mu).mu_hat)^2] = 4 ("Convex hulls of planar random walks with drift",
// Proc. AMS 143 (2015), arXiv:1301.4059; constant as summarised in docs/theory.md sec. 6), E L_n / n -> 2|mu| = 2;
// Var(D_n)/n -> E[((Z - mu).mu_hat)^2] = 1 (arXiv:1803.08293, docs/theory.md sec. 7).

import { validateSuite } from "../../src/suite/load.js";
import type { LoadedSuite } from "../../src/suite/schema.js";
import { createKernel, simulateInProcess } from "../../src/run/simulate.js";
import type { SimulationResult } from "../../src/run/types.js";
import type { MeasurePrediction, Prediction } from "../../src/theory/types.js";
import { evaluateChecks } from "../../src/verdict/checks.js";
import { buildReport, toJson, type Report } from "../../src/report/json.js";

export const ONE_WALK = {
  title: "report test: one drifting Gaussian walk",
  seed: 20261202,
  walks: [{ law: "gaussian", mean: [1, 0], cov: [[1, 0], [0, 1]] }],
  measure: ["perimeter", "diameter", "area", "vertices"],
  n: [16, 32, 64, 128, 256],
  paths: 6400,
};

function pred(p: Partial<MeasurePrediction> & Pick<MeasurePrediction, "measure">): MeasurePrediction {
  return {
    limitLaw: "unknown",
    varianceLimit: null,
    varianceScaling: 1,
    meanGrowth: null,
    meanScaling: 1,
    exactMeans: {},
    exactMeansError: {},
    varianceLimitKind: null,
    meanGrowthKind: null,
    reasons: [],
    sources: [],
    ...p,
  };
}

export const ONE_WALK_PREDICTION: Prediction = {
  measures: [
    pred({
      measure: "perimeter",
      limitLaw: "normal",
      varianceLimit: 4,
      varianceLimitKind: "theorem",
      meanGrowth: 2,
      meanGrowthKind: "theorem",
      reasons: ["one walk with non-zero drift: normal limit"],
      sources: ["Convex hulls of planar random walks with drift, Proc. AMS 143 (2015), arXiv:1301.4059"],
    }),
    pred({
      measure: "diameter",
      limitLaw: "normal",
      varianceLimit: 1,
      varianceLimitKind: "theorem",
      meanGrowth: 1,
      meanGrowthKind: "theorem",
      sources: ["The convex hull of a planar random walk: perimeter, diameter, and shape, arXiv:1803.08293"],
    }),
    pred({ measure: "area", limitLaw: "non-normal", varianceScaling: 3, meanScaling: 1.5, reasons: ["area of one drifting walk: non-normal limit"], sources: ["docs/theory.md sec. 9 [derived]"] }),
    pred({ measure: "vertices", limitLaw: "unknown", varianceScaling: 1, meanScaling: 0 }),
  ],
};

export interface Built {
  suite: LoadedSuite;
  sim: SimulationResult;
  report: Report;
  /** The report as written to disk and read back (typed arrays as arrays, non-finite as null). */
  json: Report;
}

export function buildOneWalk(over: Partial<typeof ONE_WALK> = {}, withChecks = true): Built {
  const suite = validateSuite({ ...ONE_WALK, ...over });
  const sim = simulateInProcess(suite);
  const verdicts = withChecks ? evaluateChecks(sim, ONE_WALK_PREDICTION) : undefined;
  const report = buildReport(sim, new Date(Date.UTC(2026, 11, 2)), withChecks ? { predictions: ONE_WALK_PREDICTION, verdicts: verdicts! } : {});
  report.exitCode = verdicts && verdicts.failed > 0 ? 1 : 0;
  return { suite, sim, report, json: JSON.parse(toJson(report)) as Report };
}

export function geometryOf(suite: LoadedSuite) {
  return createKernel(suite).samplePath(0);
}
