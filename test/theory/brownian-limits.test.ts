import { describe, expect, it } from "vitest";
import { ALPHA, brownianPerimeterConstant } from "../../src/theory/brownian-limits.js";
import { gaussianAreaMeans } from "../../src/theory/area-mean.js";
import { predict } from "../../src/theory/predict.js";
import type { Mat2, Suite, Vec2 } from "../../src/suite/schema.js";
import { hullOf, meanSE, normalSource } from "./theory-helpers.js";

const I: Mat2 = [[1, 0], [0, 1]];
const suiteOf = (walks: Suite["walks"], measure: Suite["measure"], n = [10]): Suite => ({ title: "t", seed: 1, walks, measure, n, paths: 10 });

describe("zero-drift Brownian limits vs 'Convex hull of N planar Brownian motions', PRL 103, 140602 (2009), arXiv:0907.0921 (docs/theory.md sec. 8)", () => {
  it("alpha_1..alpha_3 to 1e-9 by the Cauchy + reflection integral", () => {
    expect(Math.abs(ALPHA[0] - 5.013256549262)).toBeLessThan(1e-11);
    expect(Math.abs(ALPHA[1] - 7.089815403622)).toBeLessThan(1e-11);
    expect(Math.abs(ALPHA[2] - 8.333933772404)).toBeLessThan(1e-11);
    for (let k = 1; k <= 3; k++) {
      const v = brownianPerimeterConstant(Array.from({ length: k }, () => I)).value;
      expect(Math.abs(v - ALPHA[k - 1])).toBeLessThan(1e-9);
    }
  });
  it("predict() reports alpha_k s and beta_1 = pi/2 (det Sigma)^{1/2}", () => {
    const s2 = 2.25;
    const p = predict(suiteOf([{ law: "gaussian", mean: [0, 0], cov: [[s2, 0], [0, s2]] }], ["perimeter", "area"]));
    expect(Math.abs(p.measures[0].meanGrowth! - ALPHA[0] * Math.sqrt(s2))).toBeLessThan(1e-9);
    expect(p.measures[0].meanScaling).toBe(0.5);
    expect(Math.abs(p.measures[1].meanGrowth! - (Math.PI / 2) * s2)).toBeLessThan(1e-12);
    const p2 = predict(suiteOf([{ law: "gaussian", mean: [0, 0], cov: I }, { law: "gaussian", mean: [0, 0], cov: I }], ["perimeter"]), { budgetSeconds: 5 });
    expect(Math.abs(p2.measures[0].meanGrowth! - ALPHA[1])).toBeLessThan(1e-9);
  });
  it("beta_1: the exact zero-drift mean area divided by n tends to pi/2 (Barndorff-Nielsen–Baxter sum)", () => {
    // f(n) = E A_n / n = pi/2 - c / sqrt(n) + O(1/n) (Euler–Maclaurin for the lattice sum; common
    // practice), so the two-point extrapolation 2 f(4n) - f(n) removes the 1/sqrt(n) term.
    const r = gaussianAreaMeans([0, 0], I, [100000, 400000], 5);
    const f = (n: number) => r.means[String(n)] / n;
    expect(Math.abs(f(100000) - Math.PI / 2)).toBeGreaterThan(1e-3); // the raw ratio is still biased
    expect(Math.abs(2 * f(400000) - f(100000) - Math.PI / 2)).toBeLessThan(1e-4);
  });
});

describe("exact mean area of one Gaussian walk (Barndorff-Nielsen-Baxter formula, 'Combinatorial lemmas in higher dimensions', Trans. AMS 108 (1963))", () => {
  it("zero drift: E A_10 = 8.15892774148, E A_1000 = 1480.27059801 [derived, docs/theory.md sec. 3]", () => {
    const r = gaussianAreaMeans([0, 0], I, [10, 1000], 5);
    expect(Math.abs(r.means["10"] - 8.15892774148)).toBeLessThan(1e-9);
    expect(Math.abs(r.means["1000"] - 1480.27059801)).toBeLessThan(1e-7);
  });
  it("the drift formula [derived] is continuous at zero drift", () => {
    const a = gaussianAreaMeans([1e-9, 0], [[1, 0.3], [0.3, 0.5]], [30], 5);
    const b = gaussianAreaMeans([0, 0], [[1, 0.3], [0.3, 0.5]], [30], 5);
    expect(Math.abs(a.means["30"] - b.means["30"])).toBeLessThan(1e-9);
  });
  it("the drift formula [derived] agrees with a Monte Carlo estimate (|z| <= 4, seeded simulation in this test)", () => {
    const mean: Vec2 = [0.5, 0.2], cov: Mat2 = [[1, 0.3], [0.3, 0.6]];
    const n = 25;
    const exact = gaussianAreaMeans(mean, cov, [n], 5).means[String(n)];
    const normal = normalSource("area-drift");
    const a = Math.sqrt(cov[0][0]), b = cov[0][1] / a, d = Math.sqrt(cov[1][1] - b * b);
    const xs = new Array(n + 1).fill(0), ys = new Array(n + 1).fill(0), sample: number[] = [];
    for (let p = 0; p < 40000; p++) {
      for (let i = 0; i < n; i++) {
        const z1 = normal(), z2 = normal();
        xs[i + 1] = xs[i] + mean[0] + a * z1;
        ys[i + 1] = ys[i] + mean[1] + b * z1 + d * z2;
      }
      sample.push(hullOf(xs, ys).area);
    }
    const { mean: m, se } = meanSE(sample);
    expect(Math.abs(m - exact)).toBeLessThanOrEqual(4 * se);
  });
});
