import { describe, expect, it } from "vitest";
import { evaluateChecks } from "../../src/verdict/checks.js";
import type { Prediction } from "../../src/theory/types.js";
import { driftPerimeter, synthesise } from "./synthetic.js";

// Synthetic perimeter-like law of known moments (no hulls): Var/n = S2 - 2 n^-1/2, E X_n = G n + 2 ln n + 1.
// S2 and G are the docs/theory.md sec. 6 check values 4 + 2 sqrt 2 and 2 + sqrt 2, used only as truths of the fixture.
const S2 = 4 + 2 * Math.SQRT2;
const G = 2 + Math.SQRT2;
const empty: Prediction = { measures: [] };

describe("systematic (model) uncertainty of extrapolated limits", () => {
  it("6 grid points: every limit carries alternatives and se_syst, the total interval contains the statistical one, truths pass within a 5% tolerance", () => {
    const sim = synthesise({
      seed: "syst6", grid: [10, 32, 100, 316, 1000, 3162], blocks: 64, pathsPerBlock: 1500, keep: 10, tolerance: 0.05,
      generators: { perimeter: driftPerimeter(S2, -2, G, 2, 1) },
      claims: [{ measure: "perimeter", varianceLimit: S2 }, { measure: "perimeter", meanGrowth: G }],
    });
    const r = evaluateChecks(sim, empty);
    for (const l of r.limits) {
      expect(l.systematic, `${l.measure} ${l.quantity}`).not.toBeNull();
      expect(l.alternatives!.length).toBeGreaterThanOrEqual(2);
      expect(l.ci![0]).toBeLessThanOrEqual(l.statisticalCi![0]);
      expect(l.ci![1]).toBeGreaterThanOrEqual(l.statisticalCi![1]);
      expect(l.note).toContain("se_syst");
    }
    for (const c of r.checks.filter((x) => x.kind !== "mean")) {
      expect(c.gated, c.id).toBe(true);
      expect(c.verdict, `${c.id}: ${c.detail}`).toBe("pass");
      expect(c.detail).toMatch(/sqrt\(se_stat\^2 \+ se_syst\^2\)/);
    }
  });

  it("3 grid points for the log model: no alternative fit exists, so the limit is inconclusive (not gated), and says why", () => {
    const sim = synthesise({
      seed: "syst3", grid: [100, 1000, 10000], blocks: 32, pathsPerBlock: 500, keep: 10,
      generators: { perimeter: driftPerimeter(S2, -2, G, 2, 1) },
      claims: [{ measure: "perimeter", meanGrowth: G * 1.5, label: "50% off, still not gated" }],
    });
    const r = evaluateChecks(sim, empty);
    const c = r.checks.find((x) => x.id === "perimeter.meanGrowth.claims[0]")!;
    expect(c.verdict).toBe("inconclusive");
    expect(c.gated).toBe(false);
    expect(c.detail).toContain("systematic");
    expect(r.limits.find((l) => l.quantity === "meanGrowth")!.systematic).toBeNull();
  });
});
