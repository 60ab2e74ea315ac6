import { describe, expect, it } from "vitest";
import { cauchyMeanPerimeter } from "../../src/theory/cauchy-quadrature.js";
import { predict } from "../../src/theory/predict.js";
import { requiredMeanAccuracy, runMeanTargets } from "../../src/verdict/accuracy.js";
import { atLeastAsAccurate, earlyTargets, leadInBlocks, predictionTargets } from "../../src/verdict/early-prediction.js";
import { evaluateChecks } from "../../src/verdict/checks.js";
import { validateSuite } from "../../src/suite/load.js";
import type { Mat2, Vec2 } from "../../src/suite/schema.js";
import type { MeasurePrediction } from "../../src/theory/types.js";
import { driftPerimeter, synthesise } from "../verdict/synthetic.js";
import { mergeAll, summarize } from "../../src/stats/moments.js";
import { measureBlocks } from "../../src/run/series.js";
import { estimateMeasures } from "../../src/verdict/estimates.js";

const walks: { mean: Vec2; cov: Mat2 }[] = [
  { mean: [1, 0], cov: [[1, 0], [0, 1]] },
  { mean: [0.2, 0.7], cov: [[1, 0.3], [0.3, 0.6]] },
];

describe("accuracy-targeted Cauchy quadrature", () => {
  it("reaches the requested bound, and a tighter run agrees within the sum of both bounds", () => {
    const loose = cauchyMeanPerimeter(walks, [10, 60], { tolerance: () => 1e-3 });
    const tight = cauchyMeanPerimeter(walks, [10, 60], { tolerance: (_n, e) => 1e-9 * e });
    expect(loose.missed).toEqual([]);
    expect(tight.missed).toEqual([]);
    for (const n of ["10", "60"]) {
      expect(loose.targets[n]).toBe(1e-3);
      expect(loose.errors[n]).toBeLessThanOrEqual(1e-3);
      expect(tight.errors[n]).toBeLessThanOrEqual(tight.targets[n]);
      expect(Math.abs(loose.means[n] - tight.means[n])).toBeLessThanOrEqual(loose.errors[n] + tight.errors[n]);
    }
    // A looser target costs fewer angles.
    expect(loose.angles).toBeLessThan(tight.angles);
  });

  it("says so when a bound cannot be reached within the time cap", () => {
    const r = cauchyMeanPerimeter(walks, [10, 200], { tolerance: () => 1e-13, budgetSeconds: 0.5 });
    const shown = Object.keys(r.means).map(Number);
    expect(shown.length).toBeGreaterThan(0);
    expect(r.missed.length).toBeGreaterThan(0);
    for (const n of r.missed) {
      expect(r.errors[String(n)]).toBeGreaterThan(r.targets[String(n)]);
      expect(r.reasons.join(" ")).toContain(`n = ${n}: error bound`);
    }
  });
});

describe("targets from the run's own standard error", () => {
  const grid = [10, 100, 1000];
  const sim = synthesise({
    seed: "mean-targets", grid, blocks: 32, pathsPerBlock: 200, keep: 1000,
    generators: { perimeter: driftPerimeter(6.8, -2, 3.4, 2, 1) },
  });

  // The mean and SE the check reads: moments of all blocks at grid index g.
  const rowAt = (g: number) => summarize(mergeAll(measureBlocks(sim, "perimeter").map((b) => b[g])));

  it("requiredMeanAccuracy is SE / 10 of the mean the check reads (the check's own SE); runMeanTargets rounds it down to a power of 2", () => {
    const targets = runMeanTargets(sim);
    grid.forEach((n, g) => {
      // The SE the mean check reads (control-variate when it uses one, verdict/estimates.ts).
      const checked = estimateMeasures(sim).get("perimeter")!.points[g].meanSE;
      const want = requiredMeanAccuracy(sim, "perimeter", g);
      expect(want).toBeCloseTo(checked / 10, 12);
      const t = targets.absolute!.perimeter![String(n)];
      expect(t).toBeLessThanOrEqual(want);
      expect(t).toBeGreaterThan(want / 2);
      expect(Math.log2(t)).toBe(Math.round(Math.log2(t)));
    });
  });

  it("predictions computed during the run: early targets from blocks 0..K-1, used only when at least as accurate as the final ones", () => {
    expect(leadInBlocks(32)).toBe(8);
    expect(leadInBlocks(256)).toBe(32);
    expect(leadInBlocks(4)).toBe(4);
    const early = earlyTargets(sim.suite, sim.blocks.filter((b) => b.block < leadInBlocks(32)));
    const final = runMeanTargets(sim);
    const chosen = predictionTargets(sim);
    // Whichever is chosen, no target is looser than the final SE / 10 (rounded down).
    expect(atLeastAsAccurate(chosen, final)).toBe(true);
    expect(chosen).toEqual(atLeastAsAccurate(early, final) ? early : final);
    // Here the lead-in's SE extrapolates well: the early targets (a power of 2 below) are chosen.
    expect(chosen).toEqual(early);
    expect(atLeastAsAccurate({ absolute: { perimeter: { "10": 1 } } }, { absolute: { perimeter: { "10": 0.5 } } })).toBe(false);
    expect(atLeastAsAccurate({ absolute: {} }, { absolute: { perimeter: { "10": 0.5 } } })).toBe(false);
  });

  it("a predicted mean whose bound missed its target is shown, not gated", () => {
    const row = rowAt(1);
    const base: MeasurePrediction = {
      measure: "perimeter", limitLaw: "unknown", varianceLimit: null, varianceScaling: 1, meanGrowth: null, meanScaling: 1,
      varianceLimitKind: null, meanGrowthKind: null, reasons: [], sources: ["synthetic law (test fixture)"],
      exactMeans: { "100": row.mean }, exactMeansError: { "100": row.meanSE }, exactMeansTarget: { "100": row.meanSE / 10 },
    };
    const report = evaluateChecks(sim, { measures: [base] });
    const c = report.checks.find((x) => x.id === "perimeter.mean.n100.prediction")!;
    expect(c.gated).toBe(false);
    expect(c.verdict).toBe("inconclusive");
    expect(c.detail).toContain("did not reach its target");
    const reached = evaluateChecks(sim, { measures: [{ ...base, exactMeansError: { "100": row.meanSE / 20 } }] });
    expect(reached.checks.find((x) => x.id === "perimeter.mean.n100.prediction")!.gated).toBe(true);
  });

  it("predict() records the target beside every exact mean (one walk: Spitzer–Widom; vertices)", () => {
    const suite = validateSuite({
      title: "targets", seed: 1, paths: 100, measure: ["perimeter", "vertices"], n: [10, 100],
      walks: [{ law: "gaussian", mean: [0.5, 0], cov: [[1, 0], [0, 1]] }],
    });
    const p = predict(suite, { meanTargets: { absolute: { perimeter: { "10": 1e-3 } }, relative: 1e-8 } });
    const per = p.measures.find((m) => m.measure === "perimeter")!;
    expect(per.exactMeansTarget!["10"]).toBe(1e-3);
    expect(per.exactMeansTarget!["100"]).toBeCloseTo(1e-8 * per.exactMeans["100"], 15);
    for (const m of p.measures) for (const k of Object.keys(m.exactMeans)) expect(m.exactMeansError[k]).toBeLessThanOrEqual(m.exactMeansTarget![k]);
    expect(() => predict(suite, { meanTargets: { relative: -1 } })).toThrow(/meanTargets.relative/);
  });
});
