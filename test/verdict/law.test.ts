import { describe, expect, it } from "vitest";
import { evaluateChecks } from "../../src/verdict/checks.js";
import type { MeasurePrediction, Prediction } from "../../src/theory/types.js";
import { gaussian, synthesise, type PathGenerator } from "./synthetic.js";

// Non-normal predictions: "confirmed" also when |skewness| persists instead of decaying like n^-1/2
// (first Edgeworth term of a normal limit, common practice), even if the finite-n KS distance is
// below the tolerance. Synthetic laws of known skewness (no hulls):
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

describe("non-normal limit laws: persistence of skewness", () => {
  const sim = synthesise({
    seed: "skew-persist", grid: [32, 64, 128, 256, 512, 1024], blocks: 64, pathsPerBlock: 1250, keep: 80000,
    generators: { diameter: persistent, area: decaying },
  });
  const prediction: Prediction = { measures: [pred("diameter"), pred("area")] };
  const r = evaluateChecks(sim, prediction);

  it("a skewness of 0.1 at every n confirms the non-normal prediction although the distance is below tolerance", () => {
    const c = r.checks.find((x) => x.id === "diameter.limitLaw.prediction")!;
    expect(c.estimate!).toBeLessThan(0.01);
    expect(c.verdict, c.detail).toBe("confirmed");
    expect(c.detail).toContain("does not decay at the n^-1/2 rate");
    expect(c.gated).toBe(false);
  });

  it("a skewness decaying like n^-1/2 (a normal limit) does not confirm it", () => {
    const c = r.checks.find((x) => x.id === "area.limitLaw.prediction")!;
    expect(c.verdict, c.detail).toBe("not-yet-visible");
    expect(c.gated).toBe(false);
  });
});
