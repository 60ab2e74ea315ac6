// walkhull diff: statistical mode (two-sample z-tests, Holm), exact-bits mode, mismatched rows and
// bad input. Budgets: a 1% change in a variance is significant when 0.01 V / (sqrt 2 SE) exceeds the
// Holm threshold; with near-normal values SE(V)/V ~ sqrt(2/N), so about 10^6 paths give z ~ 5.

import { describe, expect, it } from "vitest";
import { DiffInputError, diffCases, diffReports, readDiffInput, renderDiff, twoSampleZ } from "../../src/report/diff.js";
import { normalQuantile } from "../../src/stats/normal.js";
import { buildOneWalk } from "./fixtures.js";
import { validateJunit } from "./junit-structure.js";
import { renderJunit } from "../../src/report/junit.js";

const clone = <T>(x: T): T => JSON.parse(JSON.stringify(x));

function synthetic(rows: { measure: string; n: number; mean: number; meanSE: number; variance: number; varianceSE: number }[], over: object = {}) {
  return {
    format: "walkhull-report/1",
    seed: 1,
    version: "0.1.0",
    suite: { title: "synthetic", hash: "a".repeat(64) },
    provenance: { seed: 1, suiteHash: "a".repeat(64), version: "0.1.0", wasmSha256: null },
    results: rows.map((r) => ({ paths: 1000, ...r })),
    ...over,
  };
}

describe("walkhull diff, statistical mode", () => {
  it("z of a difference uses both standard errors", () => {
    const t = twoSampleZ(100, 3, 108, 4);
    expect(t.z).toBeCloseTo(8 / 5, 12);
    expect(t.pValue).toBeCloseTo(2 * (1 - 0.945200708300442), 9); // Phi(1.6) = 0.9452007083 (standard normal table)
    expect(twoSampleZ(1, 0, 1, 0)).toEqual({ z: 0, pValue: 1 });
    expect(Number.isNaN(twoSampleZ(1, NaN, 1, 1).pValue)).toBe(true);
  });

  it("synthetic reports with stated SEs: a planted 1% variance change at z = 7 moves, a 0.1% one does not", () => {
    // Variance 400 with SE 0.404 in both: a 1% change is 4 = 7.0 SE of the difference.
    const se = 4 / (7 * Math.SQRT2);
    const rows = [10, 20, 40, 80].flatMap((n) => ["perimeter", "area"].map((measure) => ({ measure, n, mean: 10 * n, meanSE: 0.5, variance: 400, varianceSE: se })));
    const base = synthetic(rows, { seed: 1 });
    const cur = synthetic(clone(rows), { seed: 2, provenance: { seed: 2, suiteHash: "a".repeat(64), version: "0.1.0", wasmSha256: null } });
    cur.results[5].variance = 404; // area at n = 40, +1%
    cur.results[2].variance = 400.4; // perimeter at n = 20, +0.1%: z = 0.7
    const r = diffReports(readDiffInput(base, "baseline"), readDiffInput(cur, "current"), { alpha: 0.01 });
    expect(r.mode).toBe("statistical");
    expect(r.tests).toHaveLength(16);
    const moved = r.tests.filter((t) => t.moved);
    expect(moved.map((t) => `${t.quantity} ${t.measure}@${t.n}`)).toEqual(["variance area@40"]);
    expect(moved[0].z).toBeCloseTo(7, 10);
    expect(r.exitCode).toBe(1);
    const text = renderDiff(r);
    expect(text).toMatch(/MOVED/);
    expect(text).toMatch(/variance of area at n = 40 \(\+1\.00%, z = 7\.00\)/);
    const info = validateJunit(renderJunit("walkhull diff", [{ name: "d", cases: diffCases(r) }]));
    expect(info).toMatchObject({ tests: 16, failures: 1, skipped: 0 });
  });

  it("a real report: a 1% variance change is invisible at 40 000 paths and flagged at the budget where it is significant", () => {
    // Standard errors scale as 1/sqrt(N): the budget N* at which a 1% change of the perimeter's
    // variance at n = 40 has z = 6 is N* = N (6 sqrt2 SE / (0.01 V))^2. The report's SEs are
    // rescaled to N* (a synthetic report with stated SEs, derived from a real run).
    const { json } = buildOneWalk({ paths: 40000, n: [10, 20, 40], measure: ["perimeter", "diameter"] }, false);
    const row = json.results.findIndex((r) => r.measure === "perimeter" && r.n === 40);
    const b = json.results[row];
    const N = b.paths;
    const plant = (rep: typeof json) => {
      const cur = clone(rep);
      cur.version = "0.1.0-changed"; // not exactly comparable: statistical mode on the same paths
      cur.results[row].variance *= 1.01;
      return cur;
    };
    const atN = diffReports(readDiffInput(json, "baseline"), readDiffInput(plant(json), "current"), { alpha: 0.01 });
    const zN = (0.01 * b.variance) / (Math.SQRT2 * b.varianceSE);
    expect(zN).toBeLessThan(normalQuantile(1 - 0.01 / 24)); // Holm's first threshold for 12 rows x 2 tests
    expect(atN.changed).toBe(0);

    const Nstar = N * Math.pow((6 * Math.SQRT2 * b.varianceSE) / (0.01 * b.variance), 2);
    expect(Nstar).toBeGreaterThan(N);
    const scaled = clone(json);
    for (const r of scaled.results) {
      r.meanSE *= Math.sqrt(N / Nstar);
      r.varianceSE *= Math.sqrt(N / Nstar);
    }
    const r = diffReports(readDiffInput(scaled, "baseline"), readDiffInput(plant(scaled), "current"), { alpha: 0.01 });
    const moved = r.tests.filter((t) => t.moved);
    expect(moved).toHaveLength(1);
    expect(moved[0]).toMatchObject({ measure: "perimeter", n: 40, quantity: "variance" });
    expect(moved[0].z).toBeCloseTo(6, 8);
    expect(r.exitCode).toBe(1);
  });

  it("a real re-run with another seed shows no significant change at alpha 0.01", () => {
    // Under the null, Holm keeps the family-wise false-alarm rate <= alpha: at most 1% of such
    // re-runs would be flagged (asymptotically in the number of paths).
    const a = buildOneWalk({ paths: 20000, seed: 11 }, false).json;
    const b = buildOneWalk({ paths: 20000, seed: 12 }, false).json;
    const r = diffReports(readDiffInput(a, "baseline"), readDiffInput(b, "current"), { alpha: 0.01 });
    expect(r.mode).toBe("statistical");
    expect(r.tests).toHaveLength(2 * 4 * 5);
    expect(r.tests.every((t) => Number.isFinite(t.z))).toBe(true);
    expect(r.changed).toBe(0);
    expect(r.exitCode).toBe(0);
    // The seeds really differ: the means are not equal.
    expect(r.tests.some((t) => t.baseline !== t.current)).toBe(true);
  });
});

describe("walkhull diff, exact mode and bad input", () => {
  it("same seed, suite hash and version: identical re-run passes; a one-ulp change fails", () => {
    const a = buildOneWalk({ paths: 640, n: [10, 20] }, false).json;
    const b = buildOneWalk({ paths: 640, n: [10, 20] }, false).json;
    const ok = diffReports(readDiffInput(a, "baseline"), readDiffInput(b, "current"));
    expect(ok.mode).toBe("exact");
    expect(ok.mismatches).toEqual([]);
    expect(ok.exitCode).toBe(0);
    const c = clone(b);
    const x = c.results[1].mean;
    c.results[1].mean = x + Math.abs(x) * Number.EPSILON;
    expect(c.results[1].mean).not.toBe(x);
    const bad = diffReports(readDiffInput(a, "baseline"), readDiffInput(c, "current"));
    expect(bad.mode).toBe("exact");
    expect(bad.mismatches).toEqual([{ measure: c.results[1].measure, n: c.results[1].n, field: "mean", baseline: x, current: c.results[1].mean }]);
    expect(bad.exitCode).toBe(1);
    expect(renderDiff(bad)).toMatch(/1 row\(s\) differ/);
    // The same tiny change is far below statistical significance: --statistical would not see it.
    expect(diffReports(readDiffInput(a, "baseline"), readDiffInput(c, "current"), { statistical: true }).exitCode).toBe(0);
  });

  it("different measures or n are reported, not crashed on, with exit code 2", () => {
    const rows = [10, 20].map((n) => ({ measure: "perimeter", n, mean: 1, meanSE: 0.1, variance: 1, varianceSE: 0.1 }));
    const base = synthetic(rows);
    const cur = synthetic([rows[0], { ...rows[1], n: 30 }, { ...rows[0], measure: "area" }], { seed: 5 });
    const r = diffReports(readDiffInput(base, "baseline"), readDiffInput(cur, "current"));
    expect(r.onlyInBaseline).toEqual(["perimeter@20"]);
    expect(r.onlyInCurrent).toEqual(["perimeter@30", "area@10"]);
    expect(r.tests).toHaveLength(2);
    expect(r.exitCode).toBe(2);
    expect(renderDiff(r)).toMatch(/Only in the baseline \(not compared\): perimeter@20/);
  });

  it("unreadable reports: errors name the field", () => {
    expect(() => readDiffInput({}, "baseline")).toThrow(/^baseline\.format: /);
    expect(() => readDiffInput([], "baseline")).toThrow(/^baseline: must be a JSON object/);
    const s = synthetic([{ measure: "perimeter", n: 10, mean: 1, meanSE: 0.1, variance: 1, varianceSE: 0.1 }]);
    (s.results[0] as Record<string, unknown>).meanSE = "0.1";
    expect(() => readDiffInput(s, "current")).toThrow(/^current\.results\[0\]\.meanSE: must be a number/);
    expect(() => readDiffInput({ ...s, results: "x" }, "current")).toThrow(DiffInputError);
    expect(() => diffReports(readDiffInput(synthetic([]), "a"), readDiffInput(synthetic([]), "b"), { alpha: 2 })).toThrow(/^alpha: /);
  });
});
