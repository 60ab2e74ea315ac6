// The rules of decisive verdicts on synthetic data of known truth (no hulls):
// control variates, a pass only within the tolerance, misfit scaled not ungated, two Holm families.
import { describe, expect, it } from "vitest";
import { evaluateChecks } from "../../src/verdict/checks.js";
import { estimateMeasures } from "../../src/verdict/estimates.js";
import { driftPerimeter, gaussian, linearPerimeter, synthesise, type PathGenerator } from "./synthetic.js";

const GRID = [50, 100, 200, 400, 800, 1600];

// Perimeter-like measure driven by the walk (test/verdict/synthetic.ts linearPerimeter):
// Var M_n / n = a^2 + b^2 + c n^-1/2 -> a^2 + b^2 exactly, E M_n = 3 n.
const linearised = linearPerimeter;
const A = 1.5, B = -0.8, C = 0.5;
const SIGMA2 = A * A + B * B; // 2.89

describe("control variates", () => {
  const sim = synthesise({
    seed: "cv", grid: GRID, blocks: 64, pathsPerBlock: 500, keep: 10, controls: true,
    generators: { perimeter: linearised(A, B, C) },
  });
  const est = estimateMeasures(sim).get("perimeter")!;

  it("the control-variate estimates are within 4 SE of the truth and their SEs are much smaller than the plain ones", () => {
    for (const p of est.points) {
      expect(p.controls).toBe(4); // X and Y, two directions each
      expect(Math.abs(p.mean - 3 * p.n) / p.meanSE, `mean at n = ${p.n}`).toBeLessThan(4);
      const trueVar = SIGMA2 * p.n + C * Math.sqrt(p.n);
      expect(Math.abs(p.variance - trueVar) / p.varianceSE, `variance at n = ${p.n}`).toBeLessThan(4);
      expect(p.meanUsesControls && p.varianceUsesControls).toBe(true);
      // The unexplained part is c sqrt(n) of a variance ~ 2.89 n: reductions grow with n.
      expect(p.varianceReduction).toBeGreaterThan(5);
    }
    const first = est.points[0], last = est.points[GRID.length - 1];
    expect(last.meanReduction).toBeGreaterThan(first.meanReduction);
    // Fitted coefficients on (X.x, X.y) recover (a, b): the labels say which control is which.
    const ix = last.controlLabels.findIndex((l) => l.startsWith("X1.(1,0)"));
    const iy = last.controlLabels.findIndex((l) => l.startsWith("X1.(0,1)"));
    expect(ix).toBeGreaterThanOrEqual(0);
    expect(Math.abs(last.coefficients[ix] - A)).toBeLessThan(0.05);
    expect(Math.abs(last.coefficients[iy] - B)).toBeLessThan(0.05);
  });

  it("never a loss: where the controls explain nothing, the plain estimate is kept", () => {
    const noise: PathGenerator = (rng, grid, out) => grid.forEach((n, g) => (out[g] = Math.sqrt(n) * gaussian(rng)));
    const s2 = synthesise({ seed: "cv-none", grid: GRID, blocks: 64, pathsPerBlock: 300, keep: 10, controls: true, generators: { perimeter: noise } });
    for (const p of estimateMeasures(s2).get("perimeter")!.points) {
      expect(p.meanSE).toBeLessThanOrEqual(p.meanPlainSE);
      expect(p.varianceSE).toBeLessThanOrEqual(p.variancePlainSE);
      if (!p.varianceUsesControls) expect(p.variance).toBe(p.variancePlain);
    }
  });

  it("the extrapolated sigma^2 passes within 2% at 64,000 paths and claims 2% off fail", () => {
    const s = synthesise({
      seed: "cv-claims", grid: GRID, blocks: 64, pathsPerBlock: 1000, keep: 10, controls: true,
      generators: { perimeter: linearised(A, B, C) },
      claims: [{ measure: "perimeter", varianceLimit: SIGMA2, tolerance: 0.02 }, { measure: "perimeter", varianceLimit: SIGMA2 * 1.02 }, { measure: "perimeter", varianceLimit: SIGMA2 * 0.98 }],
    });
    const r = evaluateChecks(s, { measures: [] });
    const v = (i: number) => r.checks.find((c) => c.id === `perimeter.varianceLimit.claims[${i}]`)!;
    expect(v(0).verdict, v(0).detail).toBe("pass");
    // The plain SE of the variance at the largest n is several times the control-variate one.
    const plain = estimateMeasures(s).get("perimeter")!.points.at(-1)!;
    expect(plain.variancePlainSE / plain.varianceSE).toBeGreaterThan(3);
    expect(v(1).verdict, v(1).detail).toBe("fail");
    expect(v(2).verdict, v(2).detail).toBe("fail");
  });
});

describe("a pass means a stated precision", () => {
  // Var X_n / n = SIGMA2 - 2 n^-1/2 (a rate the grid identifies), no controls: plain estimates.
  const sim = synthesise({
    seed: "precise", grid: GRID, blocks: 64, pathsPerBlock: 200, keep: 10,
    generators: { perimeter: driftPerimeter(SIGMA2, -2, 3, 0, 0) },
    claims: [
      { measure: "perimeter", varianceLimit: SIGMA2, label: "right, default tolerance 1%" },
      { measure: "perimeter", varianceLimit: SIGMA2, tolerance: 0.3, label: "right, tolerance 30%" },
    ],
  });
  const r = evaluateChecks(sim, { measures: [] });
  const c0 = r.checks.find((c) => c.id === "perimeter.varianceLimit.claims[0]")!;
  const c1 = r.checks.find((c) => c.id === "perimeter.varianceLimit.claims[1]")!;

  it("a right value with an interval wider than the band is inconclusive, naming what would decide", () => {
    expect(c0.verdict, c0.detail).toBe("inconclusive");
    expect(c0.detail).toMatch(/INCONCLUSIVE: .* not within value x \(1 \+- 0\.01\)/);
    expect(c0.detail).toMatch(/paths would decide|more paths cannot decide/);
    expect(c0.pathsToDecide == null || c0.pathsToDecide > 12800).toBe(true);
    expect(r.undecidedClaims!.map((u) => u.id)).toContain(c0.id);
  });

  it("the same value passes when the claim's own tolerance holds the whole interval", () => {
    expect(c1.verdict, c1.detail).toBe("pass");
    expect(c1.tolerance).toBe(0.3);
    const [lo, hi] = c1.decisionInterval!;
    expect(lo).toBeGreaterThanOrEqual(SIGMA2 * 0.7);
    expect(hi).toBeLessThanOrEqual(SIGMA2 * 1.3);
  });

  it("a rate interval spanning the whole allowed range is inconclusive, never a pass", () => {
    // Exactly SIGMA2 n at every n: no correction, so no rate can be identified.
    const flat = synthesise({ seed: "flat", grid: GRID, blocks: 64, pathsPerBlock: 200, keep: 10, generators: { perimeter: driftPerimeter(SIGMA2, 0, 3, 0, 0) }, claims: [{ measure: "perimeter", varianceLimit: SIGMA2, tolerance: 0.5 }] });
    const c = evaluateChecks(flat, { measures: [] }).checks.find((x) => x.id === "perimeter.varianceLimit.claims[0]")!;
    const lim = evaluateChecks(flat, { measures: [] }).limits.find((l) => l.quantity === "varianceLimit")!;
    if (lim.betaInterval && lim.betaInterval[0] <= 0.1001 && lim.betaInterval[1] >= 1.999) {
      expect(c.verdict).toBe("inconclusive");
      expect(c.pValue).toBeNull();
      expect(c.detail).toMatch(/spans the whole allowed range/);
    } else {
      expect(c.verdict).not.toBe("fail");
    }
  });
});

describe("misfit is not a free pass", () => {
  // Var X_n / n = 2 (1 - 0.5 n^-1/2 + 0.02 sin(3 ln n)): the power law misfits (p << 0.05 at this
  // size); a claim 20% above every ratio of the grid fails although the model misfits.
  const wobble: PathGenerator = (rng, grid, out) => {
    let x = 0, prevV = 0;
    grid.forEach((n, g) => {
      const v = 2 * n * (1 - 0.5 / Math.sqrt(n) + 0.02 * Math.sin(3 * Math.log(n)));
      x += Math.sqrt(Math.max(0, v - prevV)) * gaussian(rng);
      prevV = Math.max(prevV, v);
      out[g] = x;
    });
  };
  const sim = synthesise({ seed: "misfit", grid: GRID, blocks: 64, pathsPerBlock: 2000, keep: 10, generators: { perimeter: wobble }, claims: [{ measure: "perimeter", varianceLimit: 2.4 }] });
  const r = evaluateChecks(sim, { measures: [] });
  it("the limit is still gated (errors scaled by sqrt(chi2/df)) and the far claim fails", () => {
    const lim = r.limits.find((l) => l.quantity === "varianceLimit")!;
    expect(lim.misfitPValue!, lim.note).toBeLessThan(0.05);
    expect(lim.misfitScale!).toBeGreaterThan(1);
    const c = r.checks.find((x) => x.id === "perimeter.varianceLimit.claims[0]")!;
    expect(c.gated, c.detail).toBe(true);
    expect(c.verdict, c.detail).toBe("fail");
  });
});

describe("two Holm families", () => {
  const gen: PathGenerator = (rng, grid, out) => { let x = 0, prev = 0; grid.forEach((n, g) => { x += Math.sqrt(SIGMA2 * (n - prev)) * gaussian(rng); prev = n; out[g] = 3 * n + x; }); };
  const base = { seed: "holm", grid: GRID, blocks: 64, pathsPerBlock: 200, keep: 10, generators: { perimeter: gen } };
  const claim = { measure: "perimeter" as const, n: 800, mean: 3 * 800 + 0.9 };
  it("padding the predictions with many true checks does not change a claim's adjusted p-value", () => {
    const sim = synthesise({ ...base, claims: [claim] });
    const lone = evaluateChecks(sim, { measures: [] }).checks.find((c) => c.source.startsWith("claim"))!;
    const exactMeans = Object.fromEntries(GRID.map((n) => [String(n), 3 * n]));
    const padded = evaluateChecks(sim, {
      measures: [{ measure: "perimeter", limitLaw: "unknown", varianceLimit: SIGMA2, varianceScaling: 1, meanGrowth: 3, meanScaling: 1, exactMeans, exactMeansError: {}, varianceLimitKind: "theorem", meanGrowthKind: "theorem", reasons: [], sources: ["synthetic truth"] }],
    }).checks.find((c) => c.source.startsWith("claim"))!;
    expect(padded.adjustedPValue).toBe(lone.adjustedPValue);
    expect(padded.family).toBe("claims");
  });
});
