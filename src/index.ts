// The library API: the same engine the CLI uses, for scripts.
//
//   import { loadSuite, simulate, predict, check, buildReport } from "walkhull";
//   const suite = loadSuite("validation/two-walks-right-angle.json", { paths: 20000 });
//   const sim = await simulate(suite, { workers: 2 });
//   const checks = check(sim, predict(suite));

export { loadSuite, validateSuite, SuiteError, blockCount, blockRange } from "./suite/load.js";
export type { Suite, LoadedSuite, StepLaw, Measure, Claim } from "./suite/schema.js";
export { MEASURES } from "./suite/schema.js";
export type { SimulationResult, ResultRecord, BlockStats, KeptSample } from "./run/types.js";
export { simulateInProcess, createKernel, resultRecords } from "./run/simulate.js";
export { predict, renderPredictionTable } from "./theory/predict.js";
export type { Prediction, MeasurePrediction } from "./theory/types.js";
export { evaluateChecks as check, renderChecks } from "./verdict/checks.js";
export { buildReport, toJson } from "./report/json.js";
export type { Report } from "./report/json.js";

export { runSuite, partBlocks } from "./run/run.js";
export type { RunOptions, RunOutcome } from "./run/run.js";
export { combinePartFiles } from "./run/parts.js";

import type { LoadedSuite } from "./suite/schema.js";
import type { SimulationResult } from "./run/types.js";
import { runSuite, type RunOptions } from "./run/run.js";

/** Simulate a loaded suite (all blocks); results are bitwise the same for any worker count. */
export async function simulate(suite: LoadedSuite, opts: RunOptions = {}): Promise<SimulationResult> {
  const outcome = await runSuite(suite, { checkpoint: null, ...opts });
  if (outcome.status !== "done") throw new Error(`simulation stopped (${outcome.reason})`);
  return outcome.sim;
}
