import { describe, expect, it } from "vitest";
import { validateSuite } from "../../src/suite/load.js";
import { simulateInProcess } from "../../src/run/simulate.js";
import { LawEvidenceThreads, lawEvidenceInput, lawEvidenceOf } from "../../src/verdict/law-evidence.js";
import { evaluateChecks } from "../../src/verdict/checks.js";
import type { Prediction } from "../../src/theory/types.js";

// The helper threads run the compiled dist/ code (npm test builds first), this file the sources:
// the evidence must come back identical, bit for bit (structured clones keep every number).
const suite = validateSuite({
  title: "law evidence on helper threads",
  seed: 77,
  walks: [{ law: "gaussian", mean: [1, 0], cov: [[1, 0], [0, 1]] }, { law: "discrete", atoms: [[1, 0], [0, 1], [-1, 0], [0, -1]], weights: [0.4, 0.3, 0.2, 0.1] }],
  measure: ["perimeter", "diameter", "area", "vertices"],
  n: [16, 32, 64, 128],
  paths: 4000,
});
const sim = simulateInProcess(suite);

describe("law evidence on helper threads", () => {
  it("equals the evidence computed on this thread, every measure", async () => {
    const threads = new LawEvidenceThreads();
    threads.start(suite.measure.length);
    threads.dispatch(sim);
    const got = await threads.collect();
    expect([...got.keys()].sort()).toEqual([...suite.measure].sort());
    for (const m of suite.measure) expect(got.get(m), m).toEqual(lawEvidenceOf(lawEvidenceInput(sim, m)));
  });

  it("evaluateChecks gives the same report with the precomputed evidence as without", async () => {
    const prediction: Prediction = {
      suiteHash: suite.hash,
      measures: suite.measure.map((measure) => ({
        measure, limitLaw: measure === "perimeter" ? "normal" : "unknown", varianceLimit: null, varianceScaling: 1, meanGrowth: null, meanScaling: 1,
        exactMeans: {}, exactMeansError: {}, varianceLimitKind: null, meanGrowthKind: null, reasons: [], sources: [],
      })),
    } as unknown as Prediction;
    const threads = new LawEvidenceThreads();
    threads.dispatch(sim);
    const evidence = await threads.collect();
    expect(evaluateChecks(sim, prediction, { evidence })).toEqual(evaluateChecks(sim, prediction));
  });

  it("a helper that dies leaves its measure to this thread", async () => {
    const threads = new LawEvidenceThreads();
    threads.start(suite.measure.length);
    threads.dispatch(sim);
    // End every helper at once: their measures go back to the queue.
    for (const h of (threads as unknown as { helpers: { worker: { terminate(): Promise<number> } }[] }).helpers) await h.worker.terminate();
    const got = await threads.collect();
    for (const m of suite.measure) expect(got.get(m), m).toEqual(lawEvidenceOf(lawEvidenceInput(sim, m)));
  });
});
