// Linearisation claims (src/verdict/linearisation.ts, docs/theory.md sec. 6.1) on data of known truth.
//
// Synthetic (no hulls; test/verdict/synthetic.ts simulates one Gaussian walk's centred endpoint X_n
// and integrated path Y_n exactly, step covariance I): M_n = 3 n + a X_n.x + b X_n.y + e_n with
// e_n independent of the walk. With Var e_n = c sqrt(n) the true linearisation is g = (a, b), the
// remainder is e_n and Var(R_n)/n = c n^-1/2 exactly (decay rate 1/2); with e_n = d W_n (W an independent
// random walk) the remainder does not vanish (Var(R_n)/n = d^2).
// Real hulls: two walks with drifts (1, 0), (0, 1), Sigma = I: the perimeter's gradients are
// g_1 = u_1 + e, g_2 = u_2 - e, e = (mu_1 - mu_2)/|mu_1 - mu_2| (two-walk perimeter CLT,
// "On the convex hull of two planar random walks", arXiv:2403.17705; docs/theory.md sec. 6).
// Monte Carlo checks use |estimate - truth| <= Z_MC * SE with Z_MC = 4 (stated; no tuned tolerance).

import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";
import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import Ajv2020Module from "ajv/dist/2020.js";
import { buildReport, toJson } from "../../src/report/json.js";
import { evaluateChecks } from "../../src/verdict/checks.js";
import { linearisationEvidence, decayRate } from "../../src/verdict/linearisation.js";
import { loadSuite, simulate, predict, SuiteError } from "../../src/index.js";
import { validateSuite } from "../../src/suite/load.js";
import { gaussian, linearPerimeter, synthesise, type PathGenerator } from "./synthetic.js";

const ROOT = join(dirname(fileURLToPath(import.meta.url)), "../..");
const GRID = [50, 100, 200, 400, 800, 1600];
const Z_MC = 4;
const A = 1.5, B = -0.8, C = 0.5;

const linear = linearPerimeter;

/** M_n = 3 n + a X.x + b X.y + d W_n, W an independent random walk (Var W_n = n): a remainder of the order of the linear part. */
function heavyRemainder(a: number, b: number, d: number): PathGenerator {
  return (rng, grid, out, ctl) => {
    let w = 0, prev = 0;
    grid.forEach((n, g) => {
      w += Math.sqrt(n - prev) * gaussian(rng);
      prev = n;
      out[g] = 3 * n + a * ctl![4 * g] + b * ctl![4 * g + 1] + d * w;
    });
  };
}

const lin = (g: [number, number], path?: [number, number]) => ({ endpoint: [g], ...(path ? { path: [path] } : {}) });

describe("linearisation on synthetic data of known truth", () => {
  const sim = synthesise({
    seed: "lin", grid: GRID, blocks: 64, pathsPerBlock: 1000, keep: 10, controls: true,
    generators: { perimeter: linear(A, B, C) },
    claims: [
      { measure: "perimeter", linearisation: lin([A, B]) },
      { measure: "perimeter", linearisation: lin([A * 1.05, B]) },
    ],
  });
  const r = evaluateChecks(sim, { measures: [] });
  const check = (id: string) => r.checks.find((c) => c.id === id)!;

  it("per n: coefficients within Z_MC SE of (a, b), Var(R_n)/n within Z_MC SE of c n^-1/2, correlation as computed", () => {
    const ev = linearisationEvidence(sim, "perimeter", lin([A, B]), 1, 0.01).evidence;
    expect(ev.unavailable).toBeNull();
    expect(ev.coefficients.map((c) => c.label)).toEqual(["g1.x", "g1.y"]);
    for (const [i, truth] of [A, B].entries())
      for (const p of ev.coefficients[i].perN) expect(Math.abs(p.value - truth), `${ev.coefficients[i].label} at n = ${p.n}`).toBeLessThan(Z_MC * p.standardError);
    for (const p of ev.remainder) {
      expect(Math.abs(p.value - C / Math.sqrt(p.n)), `Var(R)/n at n = ${p.n}`).toBeLessThan(Z_MC * p.standardError);
      // corr(M, g'X) = sqrt(s2 n / (s2 n + c sqrt(n))), s2 = a^2 + b^2 (its sampling error ~1e-4 here).
      const s2 = A * A + B * B;
      expect(Math.abs(p.correlation - Math.sqrt(s2 / (s2 + C / Math.sqrt(p.n))))).toBeLessThan(2e-3);
    }
    // Decay rate: exactly 1/2.
    expect(ev.rate).not.toBeNull();
    expect(Math.abs(ev.rate!.estimate - 0.5)).toBeLessThan(Z_MC * ev.rate!.standardError);
  });

  it("the right g passes (coefficients within 1% of |g|, remainder decays); g 5% off fails on that coefficient only", () => {
    for (const lab of ["g1.x", "g1.y"]) {
      const c = check(`perimeter.linearisation.${lab}.claims[0]`);
      expect(c.kind).toBe("linearisation");
      expect(c.verdict, c.detail).toBe("pass");
    }
    const rem = check("perimeter.linearisation.remainder.claims[0]");
    expect(rem.verdict, rem.detail).toBe("pass");
    expect(rem.ci![0]).toBeGreaterThan(0);
    expect(check("perimeter.linearisation.g1.x.claims[1]").verdict).toBe("fail");
    expect(check("perimeter.linearisation.g1.y.claims[1]").verdict).toBe("pass");
    // The wrong g leaves (0.05 a)^2 = 0.0056 in Var(R_n)/n: below the materiality threshold 0.01 x 2.89, so no remainder failure.
    expect(check("perimeter.linearisation.remainder.claims[1]").verdict).not.toBe("fail");
    expect(r.linearisations!.map((l) => l.id)).toEqual(["perimeter.linearisation.claims[0]", "perimeter.linearisation.claims[1]"]);
  });

  it("a remainder of the order of the fluctuations fails, even with the right coefficients", () => {
    const s = synthesise({
      seed: "lin-heavy", grid: GRID, blocks: 64, pathsPerBlock: 500, keep: 10, controls: true,
      generators: { perimeter: heavyRemainder(A, B, Math.sqrt(0.5)) },
      claims: [{ measure: "perimeter", linearisation: lin([A, B]) }],
    });
    const rr = evaluateChecks(s, { measures: [] });
    const rem = rr.checks.find((c) => c.id === "perimeter.linearisation.remainder.claims[0]")!;
    expect(rem.verdict, rem.detail).toBe("fail");
    expect(rr.linearisations![0].remainderDecision!.limit!.interval[0]).toBeGreaterThan(0.3); // truth 0.5
    expect(rr.checks.find((c) => c.id === "perimeter.linearisation.g1.x.claims[0]")!.verdict).not.toBe("fail");
  });

  it("path coefficients: M_n = n X.x + h Y.y + noise with p = 3 checks g = (1, 0) and h = (0, 0.7) (within 2% at 32,000 paths)", () => {
    const H = 0.7;
    const gen: PathGenerator = (rng, grid, out, ctl) => grid.forEach((n, g) => (out[g] = n * n + n * ctl![4 * g] + H * ctl![4 * g + 3] + n * gaussian(rng)));
    const s = synthesise({
      seed: "lin-path", grid: GRID, blocks: 64, pathsPerBlock: 500, keep: 10, controls: true,
      generators: { area: gen },
      claims: [{ measure: "area", varianceScaling: 3, tolerance: 0.02, linearisation: lin([1, 0], [0, H]) }, { measure: "area", varianceScaling: 3, linearisation: lin([1, 0], [0, H * 1.05]) }],
    });
    const rr = evaluateChecks(s, { measures: [] });
    const v = (id: string) => rr.checks.find((c) => c.id === id)!;
    for (const lab of ["g1.x", "h1.y"]) expect(v(`area.linearisation.${lab}.claims[0]`).verdict, v(`area.linearisation.${lab}.claims[0]`).detail).toBe("pass");
    expect(v("area.linearisation.remainder.claims[0]").verdict).toBe("pass");
    expect(v("area.linearisation.h1.y.claims[1]").verdict).toBe("fail");
  });

  it("the decay rate needs three usable points and reports the misfit", () => {
    expect(decayRate([10, 20], [1, 0.5], new Float64Array([1e-4, 0, 0, 1e-4]), 64, 0.01)).toBeNull();
    const n = [10, 20, 40, 80];
    const v = n.map((x) => 2 / x);
    const cov = new Float64Array(16);
    v.forEach((x, i) => (cov[i * 5] = (0.01 * x) ** 2));
    const r = decayRate(n, v, cov, 64, 0.01)!;
    expect(r.estimate).toBeCloseTo(1, 10);
    expect(r.ci[0]).toBeGreaterThan(0.9);
  });
});

describe("linearisation claims in suites", () => {
  const base = {
    title: "t", seed: 1, n: [10, 20], paths: 64, measure: ["perimeter"],
    walks: [{ law: "gaussian", mean: [1, 0], cov: [[1, 0], [0, 1]] }, { law: "gaussian", mean: [0, 1], cov: [[1, 0], [0, 1]] }],
  };
  const bad = (claim: unknown): string => {
    try {
      validateSuite({ ...base, claims: [claim] });
    } catch (e) {
      expect(e).toBeInstanceOf(SuiteError);
      return (e as Error).message;
    }
    return "accepted";
  };
  it("bad input names the field", () => {
    expect(bad({ measure: "perimeter", linearisation: { endpoint: [[1, 0]] } })).toMatch(/claims\[0\]\.linearisation\.endpoint.*2 walks/);
    expect(bad({ measure: "perimeter", linearisation: { endpoint: [[1, 0], [0, "x"]] } })).toMatch(/claims\[0\]\.linearisation\.endpoint\[1\]\[1\]/);
    expect(bad({ measure: "perimeter", linearisation: { endpoint: [[1, 0], [0, 1]], slope: 1 } })).toMatch(/claims\[0\]\.linearisation\.slope/);
    expect(bad({ measure: "perimeter", linearisation: { path: [[1, 0], [0, 1]] } })).toMatch(/claims\[0\]\.linearisation\.endpoint.*missing/);
    expect(bad({ measure: "perimeter", linearisation: { endpoint: [[1, 0], [0, 1]], path: [[1, 0]] } })).toMatch(/claims\[0\]\.linearisation\.path/);
    expect(bad({ measure: "perimeter", linearisation: { endpoint: [[1, 0], [0, 1]] } })).toBe("accepted");
  });
});

describe("linearisation of the perimeter of two walks (real hulls)", () => {
  const s2 = Math.SQRT1_2;
  const g1: [number, number] = [1 + s2, -s2], g2: [number, number] = [-s2, 1 + s2];
  it("the built-in prediction gives g_1 = u_1 + e, g_2 = u_2 - e; the right g passes at 20,000 paths, g_1 5% off fails", async () => {
    const suite = validateSuite({
      title: "two walks at a right angle (linearisation)", seed: 2024, paths: 20000, n: [50, 100, 200, 400, 800, 1600], measure: ["perimeter"],
      walks: [{ law: "gaussian", mean: [1, 0], cov: [[1, 0], [0, 1]] }, { law: "gaussian", mean: [0, 1], cov: [[1, 0], [0, 1]] }],
      claims: [
        { measure: "perimeter", linearisation: { endpoint: [g1, g2] } },
        { measure: "perimeter", linearisation: { endpoint: [[g1[0] * 1.05, g1[1] * 1.05], g2] } },
      ],
    });
    const pred = predict(suite, { budgetSeconds: 5 });
    const lp = pred.measures.find((m) => m.measure === "perimeter")!.linearisation!;
    expect(lp.endpoint[0][0]).toBeCloseTo(g1[0], 12);
    expect(lp.endpoint[0][1]).toBeCloseTo(g1[1], 12);
    expect(lp.endpoint[1][0]).toBeCloseTo(g2[0], 12);
    expect(lp.endpoint[1][1]).toBeCloseTo(g2[1], 12);
    const sim = await simulate(suite, { workers: 2 });
    const r = evaluateChecks(sim, pred);
    const v = (id: string) => r.checks.find((c) => c.id === id)!;
    for (const lab of ["g1.x", "g1.y", "g2.x", "g2.y", "remainder"]) {
      expect(v(`perimeter.linearisation.${lab}.claims[0]`).verdict, v(`perimeter.linearisation.${lab}.claims[0]`).detail).toBe("pass");
      expect(v(`perimeter.linearisation.${lab}.prediction`).verdict).toBe("pass");
    }
    expect(v("perimeter.linearisation.g1.x.claims[1]").verdict).toBe("fail");
    expect(v("perimeter.linearisation.g1.y.claims[1]").verdict).toBe("fail");
    expect(v("perimeter.linearisation.g2.x.claims[1]").verdict).toBe("pass");
    // The JSON report carries linearisations[] and validates against schema/report.schema.json (Ajv, draft 2020-12).
    const Ajv2020 = (Ajv2020Module as unknown as { default?: typeof Ajv2020Module.default }).default ?? Ajv2020Module.default;
    const ajv = new Ajv2020({ allErrors: true, strict: true, strictRequired: false, allowUnionTypes: true, formats: { "date-time": /^\d{4}-\d\d-\d\dT/ } });
    ajv.addSchema(JSON.parse(readFileSync(join(ROOT, "schema/suite.schema.json"), "utf8")));
    const schema = ajv.compile(JSON.parse(readFileSync(join(ROOT, "schema/report.schema.json"), "utf8")));
    const json = JSON.parse(toJson(buildReport(sim, new Date(Date.UTC(2026, 11, 2)), { predictions: pred, verdicts: r })));
    expect(json.linearisations.map((l: { id: string }) => l.id)).toEqual(["perimeter.linearisation.prediction", "perimeter.linearisation.claims[0]", "perimeter.linearisation.claims[1]"]);
    expect(schema(json) ? null : schema.errors).toBeNull();
    const broken = JSON.parse(JSON.stringify(json));
    broken.linearisations[0].remainderDecision.verdict = "ok";
    expect(schema(broken)).toBe(false);
  }, 120_000);

  it("where the hypotheses break (two walks with the same drift), a naive linearisation's remainder fails at 20,000 paths", async () => {
    const suite = loadSuite(join(ROOT, "validation/nonnormal-equal-drifts-linearisation.json"), { paths: 20000 });
    const sim = await simulate(suite, { workers: 2 });
    const r = evaluateChecks(sim, { measures: [] });
    const rem = r.checks.find((c) => c.id === "perimeter.linearisation.remainder.claims[0]")!;
    expect(rem.verdict, rem.detail).toBe("fail");
    // The remainder keeps a material share of Var(L_n)/n at the largest n (seen: about 31%).
    const last = r.linearisations![0].remainder.at(-1)!;
    expect(last.value / last.measureVariance).toBeGreaterThan(0.1);
  }, 120_000);

  it("a shipped suite parses with its linearisation claim", () => {
    const s = loadSuite(join(ROOT, "validation/two-walks-right-angle.json"));
    expect(s.claims!.some((c) => c.linearisation !== undefined)).toBe(true);
  });
});

describe("the report's view of a linearisation", () => {
  it("tables and the remainder plot carry one row / one point per grid n; the JSON validates", async () => {
    const { coefficientTable, remainderTable, remainderSvg } = await import("../../src/report/linearisation-view.js");
    const sim = synthesise({
      seed: "lin-view", grid: GRID, blocks: 64, pathsPerBlock: 200, keep: 10, controls: true,
      generators: { perimeter: linear(A, B, C) },
      claims: [{ measure: "perimeter", linearisation: lin([A, B]) }],
    });
    const l = evaluateChecks(sim, { measures: [] }).linearisations![0];
    expect(coefficientTable(l).rows.map((r) => r[0])).toEqual(["g1.x", "g1.y"]);
    expect(coefficientTable(l).header).toHaveLength(2 + GRID.length + 2);
    expect(remainderTable(l).rows).toHaveLength(GRID.length);
    const svg = remainderSvg(l);
    expect(svg).toContain('data-plot="remainder-decay"');
    // One <circle> per plotted point (the plotting helpers draw nothing else as a circle).
    expect((svg.match(/<circle/g) ?? []).length).toBe(l.remainder.filter((p) => p.value > 0).length);
  });
});

describe("linearisation edge cases (real hulls, small runs)", () => {
  const run = async (walks: unknown[], claim: unknown) => {
    const suite = validateSuite({ title: "edge", seed: 9, walks, measure: ["perimeter"], n: [10, 20, 40, 80], paths: 2048, claims: [claim] });
    return evaluateChecks(await simulate(suite, { workers: 1 }), { measures: [] });
  };
  it("a walk that does not move sideways (singular Sigma): the sideways component is reported unidentified, the other is checked", async () => {
    const r = await run([{ law: "gaussian", mean: [1, 0], cov: [[1, 0], [0, 0]] }], { measure: "perimeter", linearisation: { endpoint: [[2, 0.5]] } });
    const l = r.linearisations![0];
    expect(l.coefficients.map((c) => c.label)).toEqual(["g1.(1,0)"]);
    expect(l.unidentified).toEqual(["g1 along (0,1): walks[0] does not move in that direction"]);
    expect(r.checks.some((c) => c.id === "perimeter.linearisation.g1.(1,0).claims[0]")).toBe(true);
  }, 60_000);
  it("a walk that does not move at all (one atom): nothing to regress on, said so, never a pass or a fail", async () => {
    const r = await run([{ law: "discrete", atoms: [[1, 0]], weights: [1] }], { measure: "perimeter", linearisation: { endpoint: [[2, 0]] } });
    const checks = r.checks.filter((c) => c.kind === "linearisation");
    expect(checks).toHaveLength(1);
    expect(checks[0].verdict).toBe("inconclusive");
    expect(checks[0].detail).toMatch(/no walk moves/);
    expect(r.linearisations![0].unidentified.join(" ")).toMatch(/walks\[0\] does not move/);
    expect(r.undecidedClaims!.map((u) => u.id)).toContain("perimeter.linearisation.remainder.claims[0]");
  }, 60_000);
});

