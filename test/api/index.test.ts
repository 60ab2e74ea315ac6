// The library API (src/index.ts): a small, fixed set of names, and the pipeline its header shows.
import { describe, expect, it } from "vitest";
import * as api from "../../src/index.js";

describe("public API", () => {
  it("exports one name per pipeline step and nothing else", () => {
    expect(Object.keys(api).sort()).toEqual(["MEASURES", "SuiteError", "buildReport", "evaluateChecks", "loadSuite", "predict", "simulate", "toJson", "validateSuite"]);
  });

  it("runs the pipeline of its header: suite -> simulate -> predict -> evaluateChecks -> report", async () => {
    const suite = api.validateSuite({ title: "api", seed: 4, walks: [{ law: "gaussian", mean: [1, 0], cov: [[1, 0], [0, 1]] }], measure: ["perimeter"], n: [20, 80], paths: 640 });
    const sim = await api.simulate(suite, { workers: 1 });
    const predictions = api.predict(suite);
    const verdicts = api.evaluateChecks(sim, predictions);
    const report = JSON.parse(api.toJson(api.buildReport(sim, new Date(Date.UTC(2026, 11, 2)), { predictions, verdicts }))) as api.Report;
    expect(report.results.map((r) => r.n)).toEqual([20, 80]);
    expect(report.checks?.length).toBe(verdicts.checks.length);
  }, 60_000);
});
