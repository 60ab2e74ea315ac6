// Each case of docs/theory.md sec. 12, "When the normal limit fails", gets the right label (plus the normal cases).
import { describe, expect, it } from "vitest";
import { predict, renderPredictionTable, stepMoments } from "../../src/theory/predict.js";
import type { Mat2, Measure, StepLaw, Suite, Vec2 } from "../../src/suite/schema.js";

const I: Mat2 = [[1, 0], [0, 1]];
const g = (mean: Vec2, cov: Mat2 = I): StepLaw => ({ law: "gaussian", mean, cov });
const suiteOf = (walks: StepLaw[], measure: Measure[] = ["perimeter", "diameter", "area", "vertices"], n = [10, 20]): Suite =>
  ({ title: "diagnosis", seed: 1, walks, measure, n, paths: 100 });
// Small budget: the diagnosis is what is tested here, not the quadrature.
const run = (walks: StepLaw[], measure?: Measure[]) => predict(suiteOf(walks, measure), { budgetSeconds: 2 });
const of = (p: ReturnType<typeof predict>, m: Measure) => p.measures.find((x) => x.measure === m)!;

describe("normal cases (docs/theory.md sec. 6, 7, 10)", () => {
  it("two walks with independent drifts: perimeter and diameter normal, area non-normal (0 is a vertex of P)", () => {
    const p = run([g([1, 0]), g([0, 1])]);
    expect(p.measures.map((m) => m.measure)).toEqual(["perimeter", "diameter", "area", "vertices"]);
    expect(of(p, "perimeter").limitLaw).toBe("normal");
    expect(of(p, "perimeter").varianceLimit).toBeCloseTo(4 + 2 * Math.SQRT2, 12);
    expect(of(p, "diameter").limitLaw).toBe("normal");
    expect(of(p, "area").limitLaw).toBe("non-normal");
    expect(of(p, "area").reasons.join(" ")).toMatch(/boundary of P/);
    expect(of(p, "vertices").limitLaw).toBe("unknown");
    expect(of(p, "vertices").varianceLimit).toBeNull();
  });
  it("0 interior to P: zero-drift walks do not matter; area normal with a derived variance", () => {
    const p = run([g([1, 0]), g([-1, 1]), g([-1, -1.2]), g([0, 0])]);
    expect(of(p, "perimeter").limitLaw).toBe("normal");
    expect(of(p, "area").limitLaw).toBe("normal");
    expect(of(p, "area").varianceLimitKind).toBe("derived");
    expect(of(p, "area").varianceScaling).toBe(3);
  });
});

describe("When the normal limit fails (docs/theory.md sec. 12)", () => {
  it("a zero-drift walk whose origin is a vertex of P -> non-normal", () => {
    const p = run([g([0, 0]), g([1, 0])], ["perimeter", "diameter"]);
    expect(of(p, "perimeter").limitLaw).toBe("non-normal");
    expect(of(p, "perimeter").reasons.join(" ")).toMatch(/without drift sit at the vertex 0/);
    expect(of(p, "diameter").limitLaw).toBe("non-normal");
  });
  it("two walks with the same non-zero drift (repeated vertex) -> non-normal perimeter, diameter a Gaussian maximum", () => {
    const p = run([g([1, 0]), g([1, 0], [[2, 0], [0, 1]])], ["perimeter", "diameter"]);
    expect(of(p, "perimeter").limitLaw).toBe("non-normal");
    expect(of(p, "perimeter").reasons.join(" ")).toMatch(/repeated vertex/);
    // D_n = max(|S^1_n|, |S^2_n|) + O(1): M = max(X_1x, X_2x), independent with variances 1 and 2 (sec. 7.1).
    const d = of(p, "diameter");
    expect(d.limitLaw).toBe("gaussian-maximum");
    expect(d.reasons.join(" ")).toMatch(/repeated vertex/);
    expect(d.gaussianMaximum!.covariance).toEqual([[1, 0], [0, 2]]);
    // Two forms: E M = sqrt(Var(W1 - W2)/(2 pi)), Var M = (s1^2 + s2^2)/2 - Var(W1 - W2)/(2 pi) (docs/theory.md sec. 7.1).
    expect(d.gaussianMaximum!.mean).toBeCloseTo(Math.sqrt(3 / (2 * Math.PI)), 14);
    expect(d.varianceLimit).toBeCloseTo(1.5 - 3 / (2 * Math.PI), 14);
  });
  it("collinear drifts (P a segment) -> unknown for the perimeter", () => {
    for (const drifts of [[[1, 0], [2, 0]], [[1, 0], [-1, 0]]] as Vec2[][]) {
      const p = run(drifts.map((d) => g(d)), ["perimeter"]);
      expect(of(p, "perimeter").limitLaw).toBe("unknown");
      expect(of(p, "perimeter").reasons.join(" ")).toMatch(/collinear/);
    }
  });
  it("area of drifting walks with 0 on the boundary of P (always for one walk) -> non-normal", () => {
    const one = run([g([1, 0.5])], ["area"]);
    expect(of(one, "area").limitLaw).toBe("non-normal");
    expect(of(one, "area").meanScaling).toBe(1.5);
    expect(of(one, "area").meanGrowthKind).toBe("derived");
    // sqrt(2 pi)/3 |mu| sigma_perp [derived, docs/theory.md sec. 9]
    expect(of(one, "area").meanGrowth).toBeCloseTo((Math.sqrt(2 * Math.PI) / 3) * Math.hypot(1, 0.5), 12);
    const edge = run([g([1, 1]), g([-1, 1]), g([0, -1]), g([0.5, -1])], ["area"]);
    expect(of(edge, "area").limitLaw).toBe("normal"); // 0 strictly inside
    const onEdge = run([g([1, 0]), g([-1, 0]), g([0, 1])], ["area"]);
    expect(of(onEdge, "area").limitLaw).toBe("non-normal");
  });
  it("ties for the farthest pair (equilateral drifts) -> gaussian-maximum; a near-tie is a risk", () => {
    const tri = [0, 1, 2].map((i) => g([Math.cos((2 * Math.PI * i) / 3), Math.sin((2 * Math.PI * i) / 3)]));
    const p = run(tri, ["diameter", "perimeter"]);
    expect(of(p, "diameter").limitLaw).toBe("gaussian-maximum");
    expect(of(p, "diameter").reasons.join(" ")).toMatch(/tie for the farthest pair/);
    // Three forms e_ab'(X_a - X_b), Sigma = I: variances 2, covariances 1/2 (the pairs' directions meet at 60 degrees).
    const C = of(p, "diameter").gaussianMaximum!.covariance;
    C.forEach((row, i) => row.forEach((v, j) => expect(v).toBeCloseTo(i === j ? 2 : 0.5, 12)));
    expect(of(p, "perimeter").limitLaw).toBe("normal");
    const near = [0, 1, 2].map((i) => g([1.003 * Math.cos((2 * Math.PI * i) / 3 + 0.002 * i), Math.sin((2 * Math.PI * i) / 3)]));
    const q = run(near, ["diameter"]);
    expect(of(q, "diameter").limitLaw).toBe("normal");
    expect(of(q, "diameter").reasons.join(" ")).toMatch(/near-tie .*slow-convergence risk/);
  });
  it("a tie with the origin as a vertex (|mu_1| = |mu_2| = |mu_1 - mu_2|): the origin contributes no X", () => {
    const p = run([g([1, 0]), g([0.5, Math.sqrt(3) / 2])], ["diameter"]);
    const d = of(p, "diameter");
    expect(d.limitLaw).toBe("gaussian-maximum");
    expect(d.meanGrowth).toBeCloseTo(1, 12);
    const forms = d.gaussianMaximum!.forms;
    expect(forms.length).toBe(3);
    expect(forms.filter((f) => f.walks.includes(null)).length).toBe(2);
    // Forms u_1'X_1, u_2'X_2 (from the origin; independent walks) and e_12'(X_1 - X_2): variances 1, 1, 2;
    // covariance 0 between the first two, 1/2 with the third (unit vectors at 60 degrees).
    const C = d.gaussianMaximum!.covariance;
    const expected = [[1, 0, 0.5], [0, 1, 0.5], [0.5, 0.5, 2]];
    C.forEach((row, i) => row.forEach((v, j) => expect(v).toBeCloseTo(expected[i][j], 12)));
    // E max depends only on the distances E(W_i - W_j)^2 = 2 (all pairs), as for three independent standard
    // normals: E M = 3/(2 sqrt(pi)) (E max of three standard normals, common practice).
    expect(d.gaussianMaximum!.mean).toBeCloseTo(3 / (2 * Math.sqrt(Math.PI)), 9);
  });
  it("a tie with a repeated vertex: one form per walk at each end (5 forms, quasi-Monte Carlo law)", () => {
    const tri = [0, 1, 2].map((i) => g([Math.cos((2 * Math.PI * i) / 3), Math.sin((2 * Math.PI * i) / 3)]));
    const p = run([...tri, tri[0]], ["diameter"]);
    const d = of(p, "diameter");
    expect(d.limitLaw).toBe("gaussian-maximum");
    expect(d.gaussianMaximum!.forms.length).toBe(5);
    expect(d.gaussianMaximum!.method).toMatch(/quasi-Monte Carlo/);
    // Adding forms can only raise the maximum: E M above the three-form value 1.036482 (sec. 7.1).
    expect(d.gaussianMaximum!.mean - d.gaussianMaximum!.meanError).toBeGreaterThan(1.036482);
  });
  it("a tie whose origin vertex holds a zero-drift walk stays non-normal, law not computed", () => {
    const p = run([g([1, 0]), g([0.5, Math.sqrt(3) / 2]), g([0, 0])], ["diameter"]);
    expect(of(p, "diameter").limitLaw).toBe("non-normal");
    expect(of(p, "diameter").reasons.join(" ")).toMatch(/law not computed/);
  });
  it("sigma^2 = 0 (steps constant along the relevant direction) -> degenerate", () => {
    const p = run([g([1, 0], [[0, 0], [0, 1]])], ["perimeter", "diameter"]);
    expect(of(p, "perimeter").limitLaw).toBe("degenerate");
    expect(of(p, "diameter").limitLaw).toBe("degenerate");
    const d = run([{ law: "discrete", atoms: [[1, 1], [1, -1]], weights: [0.5, 0.5] }], ["perimeter"]);
    expect(of(d, "perimeter").limitLaw).toBe("degenerate");
  });
  it("infinite-variance steps -> unknown; student dof <= 4 -> variance checks uncalibrated", () => {
    const inf = run([{ law: "student", mean: [1, 0], scale: I, dof: 2 }], ["perimeter", "diameter", "area"]);
    for (const m of inf.measures) {
      expect(m.limitLaw).toBe("unknown");
      expect(m.reasons.join(" ")).toMatch(/infinite variance/);
    }
    const t3 = run([{ law: "student", mean: [1, 0], scale: I, dof: 3 }], ["perimeter"]);
    expect(of(t3, "perimeter").limitLaw).toBe("normal");
    expect(of(t3, "perimeter").varianceUncalibrated).toBe(true);
    // covariance = scale * dof/(dof-2) = 3 I, so sigma^2 = 4 * 3
    expect(of(t3, "perimeter").varianceLimit).toBeCloseTo(12, 12);
    const t5 = run([{ law: "student", mean: [1, 0], scale: I, dof: 5 }], ["perimeter"]);
    expect(of(t5, "perimeter").varianceUncalibrated).toBeUndefined();
  });
  it("zero drift -> non-normal with Brownian constants; variance constants are estimates", () => {
    const p = run([g([0, 0])], ["perimeter", "area", "diameter"]);
    expect(of(p, "perimeter").limitLaw).toBe("non-normal");
    expect(of(p, "perimeter").varianceLimitKind).toBe("estimate");
    expect(of(p, "area").varianceLimitKind).toBe("estimate");
    expect(of(p, "diameter").limitLaw).toBe("non-normal");
  });
});

describe("vertices (Baxter's formula; docs/theory.md sec. 4)", () => {
  it("2 sum 1/k for one continuous walk, none for lattice laws or k >= 2", () => {
    const p = run([g([0.5, 0])], ["vertices"]);
    expect(of(p, "vertices").exactMeans["10"]).toBeCloseTo(2 * 2.9289682539682538, 12);
    const lat = run([{ law: "discrete", atoms: [[1, 0], [0, 1]], weights: [0.5, 0.5] }], ["vertices"]);
    expect(Object.keys(of(lat, "vertices").exactMeans)).toHaveLength(0);
    const two = run([g([1, 0]), g([0, 1])], ["vertices"]);
    expect(Object.keys(of(two, "vertices").exactMeans)).toHaveLength(0);
    expect(of(two, "vertices").reasons.join(" ")).toMatch(/one walk only/);
  });
});

describe("predict() contract", () => {
  it("exact means keyed by n as decimal strings, with errors; errors name the field", () => {
    const p = predict(suiteOf([g([1, 0])], ["perimeter", "area"], [10, 100]));
    expect(Object.keys(of(p, "perimeter").exactMeans)).toEqual(["10", "100"]);
    expect(of(p, "perimeter").exactMeans["10"]).toBeCloseTo(23.19253541, 7);
    expect(Object.keys(of(p, "perimeter").exactMeansError)).toEqual(["10", "100"]);
    expect(() => predict(suiteOf([g([1, 0], [[1, 2], [2, 1]])]))).toThrow(/^walks\[0\]\.cov: not positive semi-definite/);
    expect(() => predict(suiteOf([{ law: "empirical", file: "a.csv" }]))).toThrow(/^walks\[0\]\.steps/);
    expect(() => predict({ ...suiteOf([g([1, 0])]), n: [10, 5] })).toThrow(/^n\[1\]/);
  });
  it("stepMoments: student covariance = scale dof/(dof-2); empirical = equal weights", () => {
    const s = stepMoments({ law: "student", mean: [0, 0], scale: [[2, 0], [0, 1]], dof: 6 });
    expect(s.cov[0][0]).toBeCloseTo(3, 14);
    expect(s.fourthMomentFinite).toBe(true);
    const e = stepMoments({ law: "empirical", file: "x", steps: [[1, 0], [3, 0]] });
    expect(e.mean).toEqual([2, 0]);
    expect(e.cov[0][0]).toBeCloseTo(1, 14);
  });
  it("renderPredictionTable shows every measure, the header and the sources", () => {
    const p = run([g([1, 0]), g([0, 1])]);
    const t = renderPredictionTable(p);
    for (const w of ["measure", "quantity", "value", "verdict", "source", "perimeter", "diameter", "area", "vertices", "Sources:"]) {
      expect(t).toContain(w);
    }
  });
});
