import { describe, expect, it } from "vitest";
import seedrandom from "seedrandom";
import { driftPolygon } from "../../src/theory/geometry.js";
import { areaGradients, diameterVariance, linearisedVariance, perimeterGradients, walksAt } from "../../src/theory/linearised-variance.js";
import { stepMoments } from "../../src/theory/predict.js";
import type { Mat2, StepLaw, Vec2 } from "../../src/suite/schema.js";

/** The perimeter's linearised variance as src/theory/diagnose.ts composes it. */
function perimeterVariance(drifts: Vec2[], covs: Mat2[], tol = 1e-9) {
  const P = driftPolygon(drifts, tol);
  return { ...linearisedVariance(P, perimeterGradients(P), covs, tol), meanGrowth: P.perimeter };
}
/** Perimeter and area of conv{0, x_1..x_k}, for the finite differences of the gradients. */
const hullPerimeter = (drifts: Vec2[]): number => driftPolygon(drifts, 1e-14).perimeter;
const hullArea = (drifts: Vec2[]): number => driftPolygon(drifts, 1e-14).area;

/** E[((Z - mu).mu_hat)^2] computed directly from the law (the test's own computation). */
function alongDriftVariance(law: StepLaw): number {
  if (law.law === "gaussian") {
    const m = Math.hypot(...law.mean), u = [law.mean[0] / m, law.mean[1] / m];
    return u[0] * u[0] * law.cov[0][0] + 2 * u[0] * u[1] * law.cov[0][1] + u[1] * u[1] * law.cov[1][1];
  }
  if (law.law === "circle") return (law.radius * law.radius) / 2; // E cos^2 U = 1/2
  if (law.law === "discrete") {
    const mx = law.atoms.reduce((s, a, i) => s + law.weights[i] * a[0], 0);
    const my = law.atoms.reduce((s, a, i) => s + law.weights[i] * a[1], 0);
    const m = Math.hypot(mx, my);
    return law.atoms.reduce((s, a, i) => s + law.weights[i] * (((a[0] - mx) * mx + (a[1] - my) * my) / m) ** 2, 0);
  }
  throw new Error("unused");
}

describe("one-walk drift variance limit sigma^2 = 4 E[((Z-mu).mu_hat)^2] ('Convex hulls of planar random walks with drift', arXiv:1301.4059; docs/theory.md sec. 6)", () => {
  const laws: StepLaw[] = [
    { law: "gaussian", mean: [1, 0.5], cov: [[1, 0.3], [0.3, 0.4]] },
    { law: "circle", mean: [0.2, -0.7], radius: 1.3 },
    { law: "discrete", atoms: [[1, 0], [0, 1], [-1, 0], [2, 2]], weights: [0.4, 0.3, 0.2, 0.1] },
  ];
  for (const law of laws) {
    it(`${law.law} steps (perimeter 4x, diameter 1x; arXiv:1803.08293 for the diameter [memory])`, () => {
      const m = stepMoments(law);
      const v = perimeterVariance([m.mean], [m.cov]);
      expect(Math.abs(v.sigma2 - 4 * alongDriftVariance(law))).toBeLessThan(1e-12);
      const d = diameterVariance([m.mean], [m.cov])!;
      expect(Math.abs(d.sigma2 - alongDriftVariance(law))).toBeLessThan(1e-12);
    });
  }
});

describe("two walks with a right angle (docs/theory.md sec. 6 check value [derived, confirmed by Monte Carlo])", () => {
  it("sigma^2 = 4 + 2 sqrt 2 and E L_n/n -> 2 + sqrt 2", () => {
    const I: Mat2 = [[1, 0], [0, 1]];
    const v = perimeterVariance([[1, 0], [0, 1]], [I, I]);
    expect(Math.abs(v.sigma2 - (4 + 2 * Math.SQRT2))).toBeLessThan(1e-12);
    expect(Math.abs(v.meanGrowth - (2 + Math.SQRT2))).toBeLessThan(1e-12);
  });
  it("matches the two-walk formula of arXiv:2403.17705 for a random non-isotropic pair", () => {
    const mu1: Vec2 = [1.2, 0.3], mu2: Vec2 = [-0.4, 0.9];
    const S1: Mat2 = [[0.7, 0.2], [0.2, 1.1]], S2: Mat2 = [[1.5, -0.4], [-0.4, 0.5]];
    const unit = (v: Vec2): Vec2 => [v[0] / Math.hypot(...v), v[1] / Math.hypot(...v)];
    const u1 = unit(mu1), u2 = unit(mu2), e = unit([mu1[0] - mu2[0], mu1[1] - mu2[1]]);
    const q = (S: Mat2, g: Vec2) => g[0] * g[0] * S[0][0] + 2 * g[0] * g[1] * S[0][1] + g[1] * g[1] * S[1][1];
    const expected = q(S1, [u1[0] + e[0], u1[1] + e[1]]) + q(S2, [u2[0] - e[0], u2[1] - e[1]]);
    expect(Math.abs(perimeterVariance([mu1, mu2], [S1, S2]).sigma2 - expected)).toBeLessThan(1e-12);
  });
});

describe("g_j and the area gradients agree with finite differences of perimeter(P) and area(P) (common practice)", () => {
  it("random drift configurations, tolerance 1e-8", () => {
    const rng = seedrandom("gradients");
    let checked = 0;
    for (let trial = 0; trial < 40; trial++) {
      const k = 1 + Math.floor(rng() * 4);
      const drifts: Vec2[] = Array.from({ length: k }, () => [4 * rng() - 2, 4 * rng() - 2] as Vec2);
      const P = driftPolygon(drifts, 1e-12);
      const gp = perimeterGradients(P), ga = areaGradients(P);
      for (const [p, g] of gp) {
        if (p === 0) continue;
        const j = walksAt(P, p, 1e-12)[0];
        const h = 1e-6;
        const fd = (f: (d: Vec2[]) => number, axis: 0 | 1) => {
          const plus = drifts.map((d) => [...d] as Vec2), minus = drifts.map((d) => [...d] as Vec2);
          plus[j][axis] += h; minus[j][axis] -= h;
          return (f(plus) - f(minus)) / (2 * h);
        };
        expect(Math.abs(fd(hullPerimeter, 0) - g[0])).toBeLessThan(1e-8);
        expect(Math.abs(fd(hullPerimeter, 1) - g[1])).toBeLessThan(1e-8);
        const a = ga.get(p);
        if (a) {
          expect(Math.abs(fd(hullArea, 0) - a[0])).toBeLessThan(1e-8);
          expect(Math.abs(fd(hullArea, 1) - a[1])).toBeLessThan(1e-8);
        }
        checked++;
      }
    }
    expect(checked).toBeGreaterThan(40);
  });
});
