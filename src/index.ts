// The library API: the pipeline the CLI runs, one name per step (the same names as inside).
//
//   import { loadSuite, simulate, predict, evaluateChecks, buildReport, toJson } from "walkhull";
//   const suite = loadSuite("validation/two-walks-right-angle.json", { paths: 20000 });
//   const sim = await simulate(suite, { workers: 2 });
//   const predictions = predict(suite);
//   const verdicts = evaluateChecks(sim, predictions);
//   const json = toJson(buildReport(sim, new Date(), { predictions, verdicts }));
//
// Everything else under src/ is internal and may change without notice.

import type { LoadedSuite } from "./suite/schema.js";
import type { SimulationResult } from "./run/types.js";
import { runSuite, type RunOptions } from "./run/run.js";

/** Read and validate a suite file (errors name the field: SuiteError); validateSuite for a suite built in code. */
export { loadSuite, validateSuite, SuiteError } from "./suite/load.js";
/** The measures a suite may ask for, in the kernel's slot order. */
export { MEASURES } from "./suite/schema.js";
/** The predictions of the theory for a suite: limit laws, constants, exact finite-n means, sources. */
export { predict } from "./theory/predict.js";
/** Simulated moments + predictions + the suite's claims -> checks with calibrated verdicts (Holm). */
export { evaluateChecks } from "./verdict/checks.js";
/** The JSON report (its field names are a contract) and its canonical serialisation. */
export { buildReport, toJson } from "./report/json.js";

export type { Suite, LoadedSuite, StepLaw, Measure, Claim } from "./suite/schema.js";
export type { SimulationResult, ResultRecord } from "./run/types.js";
export type { RunOptions } from "./run/run.js";
export type { Prediction, MeasurePrediction } from "./theory/types.js";
export type { Check, VerdictReport } from "./verdict/types.js";
export type { Report } from "./report/json.js";

/**
 * Simulate a loaded suite (all blocks, `workers` threads, no checkpoint unless asked); the results
 * are bitwise the same for any worker count.
 */
export async function simulate(suite: LoadedSuite, opts: RunOptions = {}): Promise<SimulationResult> {
  const outcome = await runSuite(suite, { checkpoint: null, ...opts });
  if (outcome.status !== "done") throw new Error(`simulation stopped (${outcome.reason})`);
  return outcome.sim;
}
