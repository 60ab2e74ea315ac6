import { describe, expect, it } from "vitest";
import { evaluateChecks, renderChecks } from "../../src/verdict/checks.js";
import type { MeasurePrediction, Prediction } from "../../src/theory/types.js";
import { driftPerimeter, exponentialArea, normalDiameter, synthesise } from "./synthetic.js";

// Synthetic "perimeter": Var(X_n)/n = S2 - 2 n^-1/2, E X_n = G n + 2 ln n + 1, Gaussian. S2 and G are
// the docs/theory.md sec. 6 check values 4 + 2 sqrt 2 and 2 + sqrt 2 (used here only as known truths of the
// synthetic law, no hull is simulated).
const S2 = 4 + 2 * Math.SQRT2;
const G = 2 + Math.SQRT2;
const exactMean = (n: number) => G * n + 2 * Math.log(n) + 1;
const GRID6 = [10, 32, 100, 316, 1000, 3162];

function pred(p: Partial<MeasurePrediction> & Pick<MeasurePrediction, "measure">): MeasurePrediction {
  return {
    limitLaw: "unknown", varianceLimit: null, varianceScaling: 1, meanGrowth: null, meanScaling: 1, exactMeans: {}, exactMeansError: {},
    varianceLimitKind: null, meanGrowthKind: null, reasons: [], sources: ["synthetic law of known moments (test fixture)"], ...p,
  };
}

describe("evaluateChecks on a 6-point grid over 2.5 decades (160,000 paths, 64 blocks)", () => {
  // Budget: the extrapolated limit has SE ~ 0.03 here, so a claim 3% off (0.205) is ~7 SE away.
  const sim = synthesise({
    seed: "verdict-main", grid: GRID6, blocks: 64, pathsPerBlock: 2500, keep: 80000, tolerance: 0.05,
    generators: { perimeter: driftPerimeter(S2, -2, G, 2, 1), area: exponentialArea, diameter: normalDiameter },
    claims: [
      { measure: "perimeter", varianceLimit: 6.8284 },
      { measure: "perimeter", varianceLimit: 6.8284 * 1.03, label: "3% too high" },
      { measure: "perimeter", meanGrowth: 3.4142 },
      { measure: "perimeter", limitLaw: "normal" },
      { measure: "perimeter", n: 100, mean: exactMean(100) },
      { measure: "perimeter", n: 1000, mean: exactMean(1000) * 1.001, label: "0.1% too high" },
    ],
  });
  const prediction: Prediction = {
    measures: [
      pred({ measure: "perimeter", limitLaw: "normal", varianceLimit: S2, varianceLimitKind: "derived", meanGrowth: G, meanGrowthKind: "derived",
        exactMeans: { "10": exactMean(10), "3162": exactMean(3162) }, exactMeansError: { "10": 1e-9, "3162": 1e-9 } }),
      pred({ measure: "area", limitLaw: "non-normal", varianceScaling: 2 }),
      pred({ measure: "diameter", limitLaw: "non-normal", varianceLimit: 1.3, varianceLimitKind: "estimate", meanScaling: 0.5 }),
    ],
  };
  const report = evaluateChecks(sim, prediction);
  const byId = (id: string) => {
    const c = report.checks.find((x) => x.id === id);
    if (!c) throw new Error(`missing check ${id}: have ${report.checks.map((x) => x.id).join(", ")}`);
    return c;
  };

  it("passes the correct claims and predictions (decided within the suite's tolerance of 5%)", () => {
    for (const id of ["perimeter.varianceLimit.claims[0]", "perimeter.varianceLimit.prediction", "perimeter.meanGrowth.claims[2]", "perimeter.meanGrowth.prediction",
      "perimeter.mean.n100.claims[4]", "perimeter.mean.n10.prediction", "perimeter.mean.n3162.prediction"]) {
      const c = byId(id);
      expect(c.gated, id).toBe(true);
      expect(c.verdict, `${id}: ${c.detail}`).toBe("pass");
      expect(c.tolerance).toBe(0.05);
      const [lo, hi] = c.decisionInterval!;
      const v = c.expected as number;
      expect(lo >= v * 0.95 && hi <= v * 1.05 && lo <= v && v <= hi, id).toBe(true);
    }
    // An exactly normal law: the normal claim and prediction are never failed (pass or, at this size, inconclusive).
    for (const id of ["perimeter.limitLaw.claims[3]", "perimeter.limitLaw.prediction"]) expect(["pass", "inconclusive"]).toContain(byId(id).verdict);
    const v = byId("perimeter.varianceLimit.claims[0]");
    expect(v.ci![0]).toBeLessThanOrEqual(6.8284);
    expect(v.ci![1]).toBeGreaterThanOrEqual(6.8284);
    expect(v.source).toContain("claim");
    expect(byId("perimeter.varianceLimit.prediction").source).toMatch(/^prediction: /);
  });

  it("fails a variance-limit claim 3% off and a mean claim 0.1% off (Holm-adjusted p <= alpha)", () => {
    const c = byId("perimeter.varianceLimit.claims[1]");
    expect(c.verdict, c.detail).toBe("fail");
    expect(c.adjustedPValue!).toBeLessThanOrEqual(report.alpha);
    expect(c.source).toBe("claim: 3% too high");
    expect(byId("perimeter.mean.n1000.claims[5]").verdict).toBe("fail");
    // The third failure: a non-normal prediction for the exactly normal synthetic diameter.
    expect(report.failed).toBe(3);
    expect(report.undecidedClaims!.map((c) => c.id)).toEqual(report.checks.filter((c) => c.source.startsWith("claim") && c.verdict === "inconclusive").map((c) => c.id));
  });

  it("non-normal predictions: confirmed when the trend shows it, fail when normal convergence is shown", () => {
    const area = byId("area.limitLaw.prediction");
    expect(area.verdict, area.detail).toBe("confirmed");
    expect(area.gated).toBe(false);
    const diam = byId("diameter.limitLaw.prediction");
    expect(diam.verdict, diam.detail).toBe("fail");
    expect(diam.detail).toMatch(/normal convergence shown \(and the KS distance is below resolution at every n\)/);
  });

  it("the two Holm families are separate: claims are adjusted among claims only", () => {
    expect(report.familySizes).toEqual({ claims: 5, predictions: 4 });
    const c = byId("perimeter.varianceLimit.claims[1]");
    expect(c.family).toBe("claims");
    expect(byId("perimeter.mean.n10.prediction").family).toBe("predictions");
  });

  it("shows estimate constants without gating them, and reports limits where nothing is claimed", () => {
    const d = byId("diameter.varianceLimit.prediction");
    expect(d.gated).toBe(false);
    expect(d.verdict).toBe("inconclusive");
    expect(d.detail).toMatch(/never gated/);
    const area = report.limits.find((l) => l.measure === "area" && l.quantity === "varianceLimit")!;
    expect(area.scaling).toBe(2);
    expect(area.method).toBe("profile");
    expect(area.ci).not.toBeNull();
    // The synthetic area has Var/n^2 = 1.09 exactly at every n.
    expect(area.ci![0]).toBeLessThanOrEqual(1.09);
    expect(area.ci![1]).toBeGreaterThanOrEqual(1.09);
  });

  it("renders a plain-text table with every check id", () => {
    const text = renderChecks(report);
    for (const c of report.checks) expect(text).toContain(c.id);
    expect(text).toContain("Estimated limits");
  });
});

describe("evaluateChecks on coarse grids", () => {
  const base = { blocks: 64, pathsPerBlock: 1000, keep: 1000, generators: { perimeter: driftPerimeter(S2, -2, G, 2, 1) } };
  const prediction: Prediction = { measures: [pred({ measure: "perimeter", limitLaw: "normal", varianceLimit: S2, varianceLimitKind: "derived" })] };

  it("3 grid points: beta is assumed (labelled), with the sensitivity to 1/4, 1/2, 1 shown", () => {
    const sim = synthesise({ ...base, seed: "grid3", grid: [100, 1000, 10000], claims: [{ measure: "perimeter", varianceLimit: 6.8284 }] });
    const r = evaluateChecks(sim, prediction);
    const lim = r.limits.find((l) => l.measure === "perimeter" && l.quantity === "varianceLimit")!;
    expect(lim.method).toBe("fixed");
    expect(lim.beta).toBe(0.5);
    expect(lim.note).toMatch(/ASSUMED/);
    expect(lim.sensitivity.map((s) => s.beta)).toEqual([0.25, 0.5, 1]);
    const c = r.checks.find((x) => x.id === "perimeter.varianceLimit.claims[0]")!;
    expect(["pass", "inconclusive"]).toContain(c.verdict);
    // With 1000 kept paths the normality tolerance 0.01 is out of reach: inconclusive, with the reason.
    const law = r.checks.find((x) => x.id === "perimeter.limitLaw.prediction")!;
    expect(law.verdict).toBe("inconclusive");
    expect(law.detail).toMatch(/cannot resolve the tolerance/);
  });

  it("2 grid points: no extrapolation, never pass on unknown bias", () => {
    const sim = synthesise({ ...base, seed: "grid2", grid: [100, 1000], claims: [{ measure: "perimeter", varianceLimit: 6.8284 }] });
    const r = evaluateChecks(sim, prediction);
    for (const c of r.checks.filter((x) => x.kind === "varianceLimit")) {
      expect(c.verdict).toBe("inconclusive");
      expect(c.gated).toBe(false);
      expect(c.detail).toMatch(/bias unknown/);
    }
    expect(r.limits.find((l) => l.quantity === "varianceLimit")!.method).toBe("none");
  });

  it("uncalibrated variances are not gated, and say why", () => {
    const sim = synthesise({ ...base, seed: "uncal", grid: GRID6, claims: [{ measure: "perimeter", varianceLimit: 100 }] });
    const p: Prediction = { measures: [{ ...prediction.measures[0], varianceUncalibrated: true }] };
    const r = evaluateChecks(sim, p);
    for (const c of r.checks.filter((x) => x.kind === "varianceLimit")) {
      expect(c.gated).toBe(false);
      expect(c.verdict).toBe("inconclusive");
      expect(c.detail).toMatch(/uncalibrated/);
    }
  });

  it("grid points with no spread are left out of the fit, and the note says so", () => {
    const grid = [1, 10, 32, 100, 316, 1000];
    const vertices = (rng: () => number, g: number[], out: Float64Array) => {
      driftPerimeter(1, 0, 0, 0, 0)(rng, g, out);
      out[0] = 2; // like the vertex count of a one-step walk: always 2
    };
    const sim = synthesise({ ...base, seed: "spread", grid, generators: { vertices } });
    const r = evaluateChecks(sim, { measures: [] });
    const lim = r.limits.find((l) => l.measure === "vertices" && l.quantity === "varianceLimit")!;
    expect(lim.note).toMatch(/n = 1 left out: no spread/);
    expect(lim.method).toBe("profile");
    expect(lim.ratios).toHaveLength(6);
  });

  it("bad claims get errors naming the field", () => {
    const sim = synthesise({ ...base, seed: "bad", grid: [100, 1000], claims: [{ measure: "perimeter", n: 500, mean: 1 }] });
    expect(() => evaluateChecks(sim, prediction)).toThrow(/^claims\[0\]\.n: 500 is not on the suite's grid/);
    const sim2 = synthesise({ ...base, seed: "bad2", grid: [100, 1000], claims: [{ measure: "area", varianceLimit: 1 }] });
    expect(() => evaluateChecks(sim2, prediction)).toThrow(/^claims\[0\]\.measure:/);
  });
});
