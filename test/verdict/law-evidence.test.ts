import { describe, expect, it } from "vitest";
import { validateSuite } from "../../src/suite/load.js";
import { simulateInProcess } from "../../src/run/simulate.js";
import { LawEvidenceThreads, lawEvidenceInput, lawEvidenceOf, unorderedSource } from "../../src/verdict/law-evidence.js";
import { runSuite } from "../../src/run/run.js";
import { endParkedWorkers } from "../../src/run/pool.js";
import type { BlockCollector } from "../../src/run/simulate.js";
import type { SimulationResult } from "../../src/run/types.js";
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

describe("law evidence from the kept values before they are put in path order", () => {
  // The evidence sorts each sample, so any order of the same values gives the same numbers; the
  // helpers start on the unordered values (runSuite's onSimulated) while the main thread orders them.
  it("any order of the kept values gives the same evidence, every measure (a reversed and a rotated order)", () => {
    for (const m of suite.measure) {
      const input = lawEvidenceInput(sim, m);
      const reversed = { ...input, samples: input.samples.map((x) => x.slice().reverse()) };
      const rotated = { ...input, samples: input.samples.map((x) => Float64Array.from(x, (_, i) => x[(i + 1234) % x.length])) };
      const expected = lawEvidenceOf(input);
      expect(lawEvidenceOf(reversed), m).toEqual(expected);
      expect(lawEvidenceOf(rotated), m).toEqual(expected);
    }
  });

  it("dispatched from runSuite's onSimulated (2 workers), the helpers return the evidence of the ordered sample", async () => {
    const threads = new LawEvidenceThreads();
    let early: ReturnType<typeof unorderedSource> | null = null;
    const out = await runSuite(suite, {
      workers: 2, checkpoint: null, log: () => {},
      onSimulated: (collector: BlockCollector) => {
        early = unorderedSource(collector);
        threads.dispatchEarly(collector);
      },
    });
    await endParkedWorkers();
    expect(out.status).toBe("done");
    const run = (out as { sim: SimulationResult }).sim;
    // The unordered columns hold the same values as the kept sample (sorted copies equal).
    const sortedOf = (x: Float64Array) => Float64Array.from(x).sort();
    for (const m of suite.measure) {
      const a = lawEvidenceInput(early!, m).samples, b = lawEvidenceInput(run, m).samples;
      a.forEach((x, g) => expect(sortedOf(x)).toEqual(sortedOf(b[g])));
    }
    threads.dispatch(run);
    const got = await threads.collect();
    for (const m of suite.measure) expect(got.get(m), m).toEqual(lawEvidenceOf(lawEvidenceInput(run, m)));
  });

  it("an error answer to an early dispatch is computed again from the ordered sample (a NaN's position)", async () => {
    // The same values with a NaN at index 7 of the perimeter's largest-n column in path order, and
    // the unordered source holding them reversed (the NaN elsewhere): the message must name index 7.
    const G = suite.n.length;
    const input = lawEvidenceInput(sim, "perimeter");
    const ordered = input.samples[G - 1].slice();
    ordered[7] = NaN;
    const values = [...sim.sample.values];
    const at = values.indexOf(input.samples[G - 1]);
    expect(at).toBeGreaterThanOrEqual(0);
    values[at] = ordered;
    const withNaN: SimulationResult = { ...sim, sample: { ...sim.sample, values } };
    const reversedValues = values.map((x) => x.slice().reverse());
    const fakeCollector = { suite, blocks: new Map(sim.blocks.map((b) => [b.block, b])), keptColumns: (cols: number[]) => cols.map((j) => reversedValues[j]) } as unknown as BlockCollector;
    const threads = new LawEvidenceThreads();
    threads.dispatchEarly(fakeCollector);
    threads.dispatch(withNaN);
    const got = await threads.collect();
    const expected = lawEvidenceOf(lawEvidenceInput(withNaN, "perimeter"));
    expect(typeof expected).toBe("string");
    expect(expected).toMatch(/sample\[7\]: NaN/);
    expect(got.get("perimeter")).toBe(expected);
    for (const m of suite.measure) if (m !== "perimeter") expect(got.get(m), m).toEqual(lawEvidenceOf(lawEvidenceInput(withNaN, m)));
  });
});
