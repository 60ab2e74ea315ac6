// The law of the maximum of jointly Gaussian forms (src/theory/gaussian-maximum.ts, docs/theory.md sec. 7.1):
// exact special cases, a Monte Carlo sample of the maximum itself, and the tabulated CDF.
import { describe, expect, it } from "vitest";
import seedrandom from "seedrandom";
import { mean as ssMean, sampleVariance } from "simple-statistics";
import { adaptiveIntegral, bivariateNormalCdf, gaussianMaximum, ksDistanceToCdf, tabulatedCdf } from "../../src/theory/gaussian-maximum.js";
import { normalCdf } from "../../src/stats/normal.js";
import { predict } from "../../src/theory/predict.js";
import type { Mat2, Vec2 } from "../../src/suite/schema.js";

const PHI0 = 1 / Math.sqrt(2 * Math.PI);
/** E max and E max^2 of three independent standard normals: 3/(2 sqrt(pi)) and 1 + sqrt(3)/(2 pi) (common practice [memory]). */
const EMAX3 = 3 / (2 * Math.sqrt(Math.PI));
const VMAX3 = 1 + Math.sqrt(3) / (2 * Math.PI) - EMAX3 * EMAX3;

describe("bivariate normal CDF", () => {
  it("Sheppard's orthant formula Phi_2(0, 0; rho) = 1/4 + asin(rho)/(2 pi) (common practice)", () => {
    for (const rho of [-0.99, -0.5, 0, 0.3, 0.9, 0.999]) {
      const r = bivariateNormalCdf(0, 0, rho);
      expect(Math.abs(r.value - (0.25 + Math.asin(rho) / (2 * Math.PI)))).toBeLessThan(1e-14);
      expect(r.error).toBeLessThan(1e-12);
    }
  });
  it("independence, perfect correlation and anti-correlation", () => {
    expect(bivariateNormalCdf(0.7, -0.4, 0).value).toBeCloseTo(normalCdf(0.7) * normalCdf(-0.4), 15);
    expect(bivariateNormalCdf(0.7, -0.4, 1).value).toBe(normalCdf(-0.4));
    expect(bivariateNormalCdf(0.7, -0.4, -1).value).toBeCloseTo(normalCdf(0.7) - normalCdf(0.4), 15);
    // Continuity at rho -> 1: the integral formula approaches the limit.
    expect(bivariateNormalCdf(0.7, -0.4, 1 - 1e-10).value).toBeCloseTo(normalCdf(-0.4), 4);
  });
});

describe("exact special cases", () => {
  it("m = 1: M = W, F = Phi(x/s)", () => {
    const law = gaussianMaximum([[4]]);
    expect(law.mean).toBe(0);
    expect(law.variance).toBe(4);
    for (const x of [-3, -0.5, 0, 1.2, 5]) expect(law.cdf(x).value).toBeCloseTo(normalCdf(x / 2), 15);
  });
  it("two independent forms of equal variance: E M = s/sqrt(pi), Var M = s^2 (1 - 1/pi)", () => {
    const s2 = 2.5;
    const law = gaussianMaximum([[s2, 0], [0, s2]]);
    expect(law.mean).toBeCloseTo(Math.sqrt(s2 / Math.PI), 14);
    expect(law.variance).toBeCloseTo(s2 * (1 - 1 / Math.PI), 14);
    for (const x of [-2, 0, 0.8]) expect(law.cdf(x).value).toBeCloseTo(normalCdf(x / Math.sqrt(s2)) ** 2, 14);
  });
  it("perfectly correlated forms: equal forms merge; W_2 = 2 W_1 gives E M = phi(0)", () => {
    const same = gaussianMaximum([[1, 1], [1, 1]]);
    expect(same.distinctForms).toBe(1);
    expect([same.mean, same.variance]).toEqual([0, 1]);
    // M = 2W on W > 0, W on W < 0: E M = 2 phi(0) - phi(0), E M^2 = (4 + 1)/2.
    const scaled = gaussianMaximum([[1, 2], [2, 4]]);
    expect(scaled.mean).toBeCloseTo(PHI0, 15);
    expect(scaled.variance).toBeCloseTo(2.5 - PHI0 * PHI0, 14);
    for (const x of [-1, 0.5, 2]) expect(scaled.cdf(x).value).toBeCloseTo(x < 0 ? normalCdf(x) : normalCdf(x / 2), 14);
  });
  it("a zero form: M = max(W, 0), F jumps at 0", () => {
    const law = gaussianMaximum([[1, 0], [0, 0]]);
    expect(law.hasZeroForm).toBe(true);
    expect(law.mean).toBeCloseTo(PHI0, 15);
    expect(law.variance).toBeCloseTo(0.5 - PHI0 * PHI0, 15);
    expect(law.cdf(-1e-9).value).toBe(0);
    expect(law.cdf(0).value).toBeCloseTo(0.5, 15);
  });
  it("three independent forms (nested quadrature): the known moments of the maximum of three standard normals, CDF Phi^3", () => {
    const law = gaussianMaximum([[1, 0, 0], [0, 1, 0], [0, 0, 1]]);
    expect(law.method).toMatch(/quadrature/);
    expect(law.meanError).toBeLessThan(1e-9);
    expect(law.varianceError).toBeLessThan(1e-9);
    expect(Math.abs(law.mean - EMAX3)).toBeLessThan(1e-9);
    expect(Math.abs(law.variance - VMAX3)).toBeLessThan(1e-9);
    for (const x of [-2.5, -0.3, 0, 0.9, 3]) expect(Math.abs(law.cdf(x).value - normalCdf(x) ** 3)).toBeLessThan(1e-12);
  });
  it("equicorrelated forms: W_i = s (sqrt(r) Z_0 + sqrt(1 - r) Z_i) gives E M = s sqrt(1 - r) E max_3, Var M = s^2 (r + (1 - r) Var max_3)", () => {
    const v = 2, r = 0.25;
    const C = [0, 1, 2].map((i) => [0, 1, 2].map((j) => (i === j ? v : r * v)));
    const law = gaussianMaximum(C);
    expect(Math.abs(law.mean - Math.sqrt(v * (1 - r)) * EMAX3)).toBeLessThan(1e-9);
    expect(Math.abs(law.variance - v * (r + (1 - r) * VMAX3))).toBeLessThan(1e-9);
  });
  it("bad input names the field", () => {
    expect(() => gaussianMaximum([[1, 0.5], [0.4, 1]])).toThrow(/covariance\[0\]\[1\]: not symmetric/);
    expect(() => gaussianMaximum([[1, 2], [2, 1]])).toThrow(/not a covariance/);
    expect(() => gaussianMaximum([[1, 0], [0]])).toThrow(/covariance\[1\]: expected 2 entries/);
    const I13 = Array.from({ length: 13 }, (_, i) => Array.from({ length: 13 }, (_, j) => (i === j ? 1 : 0)));
    expect(() => gaussianMaximum(I13)).toThrow(/13 distinct forms/);
  });
});

describe("four or more forms (randomised quasi-Monte Carlo, probabilistic bounds of 5 SE over 8 shifts)", () => {
  // Equicorrelated: W_i = sqrt(r) Z_0 + sqrt(1 - r) Z_i, so F(x) = int phi(z) Phi((x - sqrt(r) z)/sqrt(1 - r))^4 dz,
  // E M = sqrt(1 - r) E max_4, Var M = r + (1 - r) Var max_4, with E max_4, E max_4^2 of independent standard
  // normals by 1-D quadrature of Phi^4 (adaptive Gauss-Legendre to 1e-13).
  const d = 4, r = 0.3;
  const C = Array.from({ length: d }, (_, i) => Array.from({ length: d }, (_, j) => (i === j ? 1 : r)));
  const law = gaussianMaximum(C);
  const q = (f: (x: number) => number) => adaptiveIntegral(f, 0, 12, 1e-13).value;
  const e1 = q((x) => 1 - normalCdf(x) ** d) - q((x) => normalCdf(-x) ** d);
  const e2 = q((x) => 2 * x * (1 - normalCdf(x) ** d)) + q((x) => 2 * x * normalCdf(-x) ** d);
  it("mean and variance within their stated bounds (bounds below 2e-3)", () => {
    expect(law.method).toMatch(/quasi-Monte Carlo/);
    expect(law.meanError).toBeLessThan(2e-3);
    expect(law.varianceError).toBeLessThan(2e-3);
    expect(Math.abs(law.mean - Math.sqrt(1 - r) * e1)).toBeLessThanOrEqual(law.meanError);
    expect(Math.abs(law.variance - (r + (1 - r) * (e2 - e1 * e1)))).toBeLessThanOrEqual(law.varianceError);
  });
  it("CDF within its stated bound at several x; the table's bound covers the interpolation", () => {
    for (const x of [-1.5, -0.4, 0, 0.6, 1.3, 2.5]) {
      const exact = adaptiveIntegral((z) => Math.exp(-z * z / 2) / Math.sqrt(2 * Math.PI) * normalCdf((x - Math.sqrt(r) * z) / Math.sqrt(1 - r)) ** d, -12, 12, 1e-14).value;
      const got = law.cdf(x);
      expect(got.error).toBeLessThan(2e-3);
      expect(Math.abs(got.value - exact)).toBeLessThanOrEqual(got.error + 1e-12);
    }
    expect(tabulatedCdf(law, C).error).toBeLessThan(3e-3);
  });
});

describe("against a direct Monte Carlo sample of the maximum", () => {
  // Forms W = G Z of independent standard normals Z (singular C: 3 forms of a 4-dimensional Z, one
  // of them the constant 0 in the second case; 2 forms of 8 normals in the third). z = 4 on means and
  // variances (6 comparisons; a false alarm has probability < 4e-4); the KS distance against the DKW
  // band at level 1e-4.
  const N = 200_000;
  const Z = 4;
  // A two-pair tie: four walks with drifts at the corners of a square (0 inside), the diagonals tie; the
  // prediction's forms g_j'X_j with X_j = chol(Sigma_j) z_j give the rows of G (8 standard normals).
  const covs: Mat2[] = [[[2, 0.5], [0.5, 1]], [[1, 0], [0, 1]], [[1, -0.3], [-0.3, 0.6]], [[0.5, 0], [0, 1.5]]];
  const square = predict({ title: "square", seed: 1, n: [10], paths: 1, measure: ["diameter"], walks: ([[1, 1], [-1, 1], [-1, -1], [1, -1]] as Vec2[]).map((mean, j) => ({ law: "gaussian", mean, cov: covs[j] })) }, { budgetSeconds: 2 }).measures[0];
  const chol = (c: Mat2) => { const a = Math.sqrt(c[0][0]), b = c[1][0] / a; return [[a, 0], [b, Math.sqrt(c[1][1] - b * b)]]; };
  const squareG = square.gaussianMaximum!.forms.map((f) => f.gradients.flatMap((g, j) => { const L = chol(covs[j]); return [g[0] * L[0][0] + g[1] * L[1][0], g[1] * L[1][1]]; }));
  const cases: { name: string; G: number[][] }[] = [
    { name: "three correlated forms (rank 3)", G: [[1, 0, 0, 0], [0.5, -0.8, 0.3, 0], [-0.5, -0.8, 0, 0.6]] },
    { name: "two forms and the constant 0", G: [[1.2, 0.4, 0, 0], [0, 0.9, -0.5, 0], [0, 0, 0, 0]] },
    { name: "a two-pair tie (drifts at the corners of a square): the prediction's law", G: squareG },
  ];
  it("the square's diagonals tie: two forms, the prediction's covariance is G G'", () => {
    expect(square.limitLaw).toBe("gaussian-maximum");
    expect(square.gaussianMaximum!.forms.length).toBe(2);
    const C = squareG.map((a) => squareG.map((b) => a.reduce((s, x, k) => s + x * b[k], 0)));
    C.forEach((row, i) => row.forEach((v, j) => expect(v).toBeCloseTo(square.gaussianMaximum!.covariance[i][j], 12)));
    expect(square.gaussianMaximum!.mean).toBe(gaussianMaximum(C).mean);
  });
  for (const { name, G } of cases) {
    it(name, () => {
      const C = G.map((a) => G.map((b) => a.reduce((s, x, k) => s + x * b[k], 0)));
      const law = gaussianMaximum(C);
      const rng = seedrandom(`gaussian-maximum ${name}`);
      const gauss = () => Math.sqrt(-2 * Math.log(1 - rng())) * Math.cos(2 * Math.PI * rng());
      const sample = new Float64Array(N);
      for (let i = 0; i < N; i++) {
        const z = G[0].map(gauss);
        sample[i] = Math.max(...G.map((g) => g.reduce((s, x, k) => s + x * z[k], 0)));
      }
      const xs = Array.from(sample);
      const m = ssMean(xs), v = sampleVariance(xs);
      const m4 = xs.reduce((s, x) => s + (x - m) ** 4, 0) / N;
      expect(Math.abs(m - law.mean)).toBeLessThanOrEqual(Z * Math.sqrt(v / N));
      expect(Math.abs(v - law.variance)).toBeLessThanOrEqual(Z * Math.sqrt((m4 - v * v) / N));
      const tab = tabulatedCdf(law, C);
      expect(tab.error).toBeLessThan(1e-6);
      const ks = ksDistanceToCdf(sample.sort(), tab.cdf, tab.cdfLeft);
      expect(ks).toBeLessThanOrEqual(Math.sqrt(Math.log(2 / 1e-4) / (2 * N)) + tab.error);
    });
  }
});
