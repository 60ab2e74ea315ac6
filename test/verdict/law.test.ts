import { describe, expect, it } from "vitest";
import { evaluateChecks } from "../../src/verdict/checks.js";
import type { MeasurePrediction, Prediction } from "../../src/theory/types.js";
import { gaussian, synthesise, type PathGenerator } from "./synthetic.js";

// Limit laws are judged on the trend of the skewness and kurtosis over the grid (their n -> infinity
// limits are 0 under a normal limit, first Edgeworth orders; common practice), even when the
// finite-n KS distance is below the tolerance. Synthetic laws of known skewness (no hulls):
// - persistent: X_n = sqrt(n) (Z + 0.4 (E - 1)), E ~ Exp(1): skewness 2 0.4^3 / 1.16^1.5 = 0.102 at every n;
// - decaying:   X_n = sqrt(n) Z + n^(1/3) (E - 1): skewness ~ 2 n^(3/3) / n^(3/2) = 2 n^-1/2 (normal limit).
const persistent: PathGenerator = (rng, grid, out) => {
  const z = gaussian(rng);
  const e = -Math.log(1 - rng());
  grid.forEach((n, i) => (out[i] = Math.sqrt(n) * (z + 0.4 * (e - 1))));
};
const decaying: PathGenerator = (rng, grid, out) => {
  const e = -Math.log(1 - rng());
  grid.forEach((n, i) => (out[i] = Math.sqrt(n) * gaussian(rng) + Math.cbrt(n) * (e - 1)));
};

function pred(measure: MeasurePrediction["measure"]): MeasurePrediction {
  return {
    measure, limitLaw: "non-normal", varianceLimit: null, varianceScaling: 1, meanGrowth: null, meanScaling: 1, exactMeans: {}, exactMeansError: {},
    varianceLimitKind: null, meanGrowthKind: null, reasons: [], sources: ["synthetic law of known skewness (test fixture)"],
  };
}

describe("limit laws judged on the trend over the grid", () => {
  const sim = synthesise({
    seed: "skew-persist", grid: [32, 64, 128, 256, 512, 1024], blocks: 64, pathsPerBlock: 1250, keep: 80000,
    generators: { diameter: persistent, area: decaying, perimeter: (rng, grid, out) => grid.forEach((n, i) => (out[i] = Math.sqrt(n) * gaussian(rng))) },
    claims: [
      { measure: "diameter", limitLaw: "normal" },
      { measure: "diameter", limitLaw: "non-normal" },
      { measure: "area", limitLaw: "normal" },
      { measure: "area", limitLaw: "non-normal" },
    ],
  });
  const prediction: Prediction = { measures: [pred("diameter"), pred("area"), pred("perimeter")] };
  const r = evaluateChecks(sim, prediction);
  const byId = (id: string) => r.checks.find((x) => x.id === id)!;

  it("a skewness of 0.1 at every n confirms a non-normal limit although the distance is below tolerance", () => {
    const c = byId("diameter.limitLaw.prediction");
    expect(c.estimate!).toBeLessThan(0.01);
    expect(c.verdict, c.detail).toBe("confirmed");
    expect(c.detail).toContain("non-normal limit confirmed: the skewness tends to");
    expect(c.gated).toBe(false);
    // The same state decides the claims: "normal" fails, "non-normal" passes.
    expect(byId("diameter.limitLaw.claims[0]").verdict).toBe("fail");
    expect(byId("diameter.limitLaw.claims[1]").verdict).toBe("pass");
  });

  it("a skewness decaying to 0 more slowly than n^-1/2 (and kurtosis more slowly than n^-1) is not taken for a non-normal limit", () => {
    // X_n = sqrt(n) Z + n^(1/3) (E - 1): skewness ~ 2 n^-1/2 (1 - 1.5 n^-1/3), excess kurtosis ~ 6 n^-2/3 -> 0.
    const c = byId("area.limitLaw.prediction");
    expect(c.verdict, c.detail).toBe("inconclusive");
    expect(byId("area.limitLaw.claims[2]").verdict).toBe("inconclusive");
    expect(byId("area.limitLaw.claims[3]").verdict).toBe("inconclusive");
  });

  it("an exactly normal law: a non-normal prediction is never confirmed", () => {
    const c = byId("perimeter.limitLaw.prediction");
    expect(["inconclusive", "fail"], c.detail).toContain(c.verdict);
  });

  it("no data set gives contradictory verdicts: for every measure, normal and non-normal never both pass or both fail", () => {
    for (const m of ["diameter", "area"]) {
      const v = r.checks.filter((c) => c.measure === m && c.kind === "limitLaw" && c.source.startsWith("claim")).map((c) => c.verdict);
      expect(v.filter((x) => x === "pass").length).toBeLessThanOrEqual(1);
      expect(v.filter((x) => x === "fail").length).toBeLessThanOrEqual(1);
    }
  });
});

describe("normal convergence shown (and a non-normal claim failing) with enough paths", () => {
  // Exactly normal at every n: X_n = sqrt(n) (Z + 0.5 Z_n). 640,000 paths: the skewness and kurtosis
  // limits are pinned to about +-0.01, immaterial at the tolerance 0.01.
  const sim = synthesise({
    seed: "normal-shown", grid: [32, 64, 128, 256, 512, 1024], blocks: 64, pathsPerBlock: 10000, keep: 131072,
    generators: { diameter: (rng, grid, out) => { const z = gaussian(rng); grid.forEach((n, i) => (out[i] = Math.sqrt(n) * (z + 0.5 * gaussian(rng)))); } },
    claims: [{ measure: "diameter", limitLaw: "normal" }, { measure: "diameter", limitLaw: "non-normal" }],
  });
  const r = evaluateChecks(sim, { measures: [] });
  it("normal passes, non-normal fails (distance below resolution at every n)", () => {
    const normal = r.checks.find((c) => c.id === "diameter.limitLaw.claims[0]")!;
    const non = r.checks.find((c) => c.id === "diameter.limitLaw.claims[1]")!;
    expect(normal.verdict, normal.detail).toBe("pass");
    expect(non.verdict, non.detail).toBe("fail");
  });
});
