// Step samplers, through the WASM kernel (the twin draws the same steps: kernel.test.ts).
// Moments: |estimate - exact| <= Z * standard error with Z = 4. Distribution tests: one-sample KS
// (asymptotic Kolmogorov p-value, see helpers.ts) and chi-square goodness of fit, passing when
// p > 1e-3 at the fixed seeds.

import { describe, expect, it } from "vitest";
import chisquareCdf from "@stdlib/stats-base-dists-chisquare-cdf";
import normalCdf from "@stdlib/stats-base-dists-normal-cdf";
import type { StepLaw } from "../../src/suite/schema.js";
import { kernels, ksTest, meanSE, SAMPLE_LAWS } from "./engine-helpers.js";

const Z = 4;
const P_MIN = 1e-3;
const N = 200_000;

interface Moments { mean: [number, number]; cov: [[number, number], [number, number]] }

function exactMoments(law: StepLaw): Moments {
  switch (law.law) {
    case "gaussian":
      return { mean: law.mean, cov: law.cov };
    case "circle": {
      const v = (law.radius * law.radius) / 2; // uniform direction: E cos^2 = 1/2, E cos sin = 0
      return { mean: law.mean, cov: [[v, 0], [0, v]] };
    }
    case "student": {
      // Bivariate t: covariance = scale * dof / (dof - 2) (Kotz, Nadarajah, "Multivariate t
      // Distributions and Their Applications", 2004).
      const f = law.dof / (law.dof - 2);
      return { mean: law.mean, cov: [[law.scale[0][0] * f, law.scale[0][1] * f], [law.scale[1][0] * f, law.scale[1][1] * f]] };
    }
    case "discrete":
    case "empirical": {
      const atoms = law.law === "discrete" ? law.atoms : law.steps!;
      const w = law.law === "discrete" ? law.weights : atoms.map(() => 1 / atoms.length);
      let mx = 0, my = 0;
      atoms.forEach((a, i) => { mx += w[i] * a[0]; my += w[i] * a[1]; });
      let cxx = 0, cxy = 0, cyy = 0;
      atoms.forEach((a, i) => {
        cxx += w[i] * (a[0] - mx) ** 2; cxy += w[i] * (a[0] - mx) * (a[1] - my); cyy += w[i] * (a[1] - my) ** 2;
      });
      return { mean: [mx, my], cov: [[cxx, cxy], [cxy, cyy]] };
    }
  }
}

function zTests(x: Float64Array, y: Float64Array, m: Moments): number[] {
  const z: number[] = [];
  for (const [v, mu] of [[x, m.mean[0]], [y, m.mean[1]]] as const) {
    const s = meanSE(v);
    z.push(s.se === 0 ? (s.mean === mu ? 0 : Infinity) : (s.mean - mu) / s.se);
  }
  // Covariance entries as plain means of products about the exact mean.
  const prods: [Float64Array, number][] = [
    [x.map((a) => (a - m.mean[0]) ** 2), m.cov[0][0]],
    [x.map((a, i) => (a - m.mean[0]) * (y[i] - m.mean[1])), m.cov[0][1]],
    [y.map((b) => (b - m.mean[1]) ** 2), m.cov[1][1]],
  ];
  for (const [v, c] of prods) {
    const s = meanSE(v);
    z.push(s.se === 0 ? (Math.abs(s.mean - c) < 1e-12 ? 0 : Infinity) : (s.mean - c) / s.se);
  }
  return z;
}

const STUDENT_9: StepLaw = { law: "student", mean: [-1, 0.5], scale: [[2, 0.5], [0.5, 1]], dof: 9 };
const momentLaws: [string, StepLaw][] = [
  ...Object.entries(SAMPLE_LAWS).filter(([, l]) => l.law !== "student"),
  ["student dof 9 (finite 4th moment)", STUDENT_9],
];

describe("step moments (z-tests, Z = 4)", () => {
  it.each(momentLaws)("%s", (_name, law) => {
    const { wasm } = kernels([law], [10], 1001);
    const { x, y } = wasm.drawSteps(7, 0, N);
    for (const z of zTests(x, y, exactMoments(law))) expect(Math.abs(z)).toBeLessThanOrEqual(Z);
  });
  it("student dof 3.5: mean (the covariance has no finite standard error)", () => {
    const law = SAMPLE_LAWS.student as Extract<StepLaw, { law: "student" }>;
    const { wasm } = kernels([law], [10], 1002);
    const { x, y } = wasm.drawSteps(7, 0, N);
    const sx = meanSE(x), sy = meanSE(y);
    expect(Math.abs(sx.mean - law.mean[0]) / sx.se).toBeLessThanOrEqual(Z);
    expect(Math.abs(sy.mean - law.mean[1]) / sy.se).toBeLessThanOrEqual(Z);
  });
});

/** q = (Mahalanobis distance)^2 / 2 and the angle of L^-1 (step - mean). */
function whitened(x: Float64Array, y: Float64Array, mean: [number, number], c: [[number, number], [number, number]]) {
  const l11 = Math.sqrt(c[0][0]), l21 = c[0][1] / l11, l22 = Math.sqrt(c[1][1] - l21 * l21);
  const q = new Float64Array(x.length), angle = new Float64Array(x.length);
  for (let i = 0; i < x.length; i++) {
    const u = (x[i] - mean[0]) / l11;
    const v = (y[i] - mean[1] - l21 * u) / l22;
    q[i] = (u * u + v * v) / 2;
    angle[i] = Math.atan2(v, u);
  }
  return { q, angle };
}
const uniformAngleCdf = (a: number) => (a + Math.PI) / (2 * Math.PI);

describe("distribution tests (KS, chi-square; p > 1e-3)", () => {
  it("gaussian: q ~ Exp(1) (chi-square with 2 dof, halved) and uniform angle", () => {
    const law = SAMPLE_LAWS.gaussian as Extract<StepLaw, { law: "gaussian" }>;
    const { wasm } = kernels([law], [10], 2001);
    const { x, y } = wasm.drawSteps(1, 0, N);
    const { q, angle } = whitened(x, y, law.mean, law.cov);
    expect(ksTest(q, (t) => 1 - Math.exp(-t)).p).toBeGreaterThan(P_MIN);
    expect(ksTest(angle, uniformAngleCdf).p).toBeGreaterThan(P_MIN);
  });
  it.each([3.5, 1.2, 0.7])("student dof %s: q has CDF 1 - (1 + 2q/dof)^(-dof/2) and uniform angle", (dof) => {
    // d^2 / 2 ~ F(2, dof) for the bivariate t (Kotz, Nadarajah 2004); dof < 1 exercises the
    // gamma sampler's shape < 1 branch.
    const law: Extract<StepLaw, { law: "student" }> = { ...(SAMPLE_LAWS.student as Extract<StepLaw, { law: "student" }>), dof };
    const { wasm } = kernels([law], [10], 2002);
    const { x, y } = wasm.drawSteps(1, 0, N);
    const { q, angle } = whitened(x, y, law.mean, law.scale);
    expect(ksTest(q, (t) => 1 - (1 + (2 * t) / dof) ** (-dof / 2)).p).toBeGreaterThan(P_MIN);
    expect(ksTest(angle, uniformAngleCdf).p).toBeGreaterThan(P_MIN);
  });
  it("circle: steps at distance r from the mean, uniform angle", () => {
    const law = SAMPLE_LAWS.circle as Extract<StepLaw, { law: "circle" }>;
    const { wasm } = kernels([law], [10], 2003);
    const { x, y } = wasm.drawSteps(1, 0, N);
    const angle = new Float64Array(N);
    for (let i = 0; i < N; i++) {
      const dx = x[i] - law.mean[0], dy = y[i] - law.mean[1];
      expect(Math.abs(Math.hypot(dx, dy) - law.radius)).toBeLessThan(1e-14);
      angle[i] = Math.atan2(dy, dx);
    }
    expect(ksTest(angle, uniformAngleCdf).p).toBeGreaterThan(P_MIN);
  });
  it.each([
    ["discrete", SAMPLE_LAWS.discrete],
    ["discrete, 37 atoms with a zero weight", {
      law: "discrete",
      atoms: Array.from({ length: 37 }, (_, i) => [i % 6, Math.floor(i / 6)]),
      weights: Array.from({ length: 37 }, (_, i) => (i === 5 ? 0 : (i + 1) / (703 - 6))),
    } as StepLaw],
    ["empirical", SAMPLE_LAWS.empirical],
  ])("%s: chi-square goodness of fit", (_name, law) => {
    const { wasm } = kernels([law], [10], 2004);
    const { x, y } = wasm.drawSteps(1, 0, N);
    const atoms = law.law === "discrete" ? law.atoms : law.law === "empirical" ? law.steps! : [];
    const w = law.law === "discrete" ? law.weights : atoms.map(() => 1 / atoms.length);
    const counts = new Array<number>(atoms.length).fill(0);
    const index = new Map(atoms.map((a, i) => [`${a[0]},${a[1]}`, i]));
    for (let i = 0; i < N; i++) {
      const k = index.get(`${x[i]},${y[i]}`);
      expect(k).toBeDefined();
      counts[k!]++;
    }
    let stat = 0, df = -1;
    counts.forEach((c, i) => {
      if (w[i] === 0) { expect(c).toBe(0); return; }
      const e = N * w[i];
      stat += (c - e) ** 2 / e;
      df++;
    });
    expect(1 - chisquareCdf(stat, df)).toBeGreaterThan(P_MIN);
  });
});

describe("normal samplers", () => {
  const { wasm } = kernels([SAMPLE_LAWS.gaussian], [10], 3001);
  it.each(["ziggurat", "polar"] as const)("%s: KS against N(0,1), mean and variance z-tests", (method) => {
    const z = wasm.normals(2, 1_000_000, method);
    expect(ksTest(z, (t) => normalCdf(t, 0, 1)).p).toBeGreaterThan(P_MIN);
    const m = meanSE(z);
    expect(Math.abs(m.mean) / m.se).toBeLessThanOrEqual(Z);
    const sq = meanSE(z.map((t) => t * t));
    expect(Math.abs(sq.mean - 1) / sq.se).toBeLessThanOrEqual(Z);
  });
  it("ziggurat tail beyond R = 3.6541528853610088: frequency 2(1 - Phi(R)) (z-test, Z = 4)", () => {
    const z = wasm.normals(3, 2_000_000, "ziggurat");
    const R = 3.6541528853610088;
    const p = 2 * (1 - normalCdf(R, 0, 1));
    let c = 0;
    for (const t of z) if (Math.abs(t) > R) c++;
    const se = Math.sqrt(z.length * p * (1 - p));
    expect(Math.abs(c - z.length * p) / se).toBeLessThanOrEqual(Z);
    expect(c).toBeGreaterThan(0);
  });
});
