import { describe, expect, it } from "vitest";
import { aliasTable, choleskyPsd2, compileWalk, compileWalks } from "../../src/engine/compile.js";
import { LAW_CODE } from "../../src/engine/types.js";
import type { Mat2 } from "../../src/suite/schema.js";

function reconstruct([l11, l21, l22]: [number, number, number]): Mat2 {
  return [[l11 * l11, l11 * l21], [l11 * l21, l21 * l21 + l22 * l22]];
}

describe("choleskyPsd2", () => {
  it.each([
    ["identity", [[1, 0], [0, 1]]],
    ["correlated", [[2, 0.6], [0.6, 1]]],
    ["singular [[1,1],[1,1]]", [[1, 1], [1, 1]]],
    ["singular [[0,0],[0,1]]", [[0, 0], [0, 1]]],
    ["singular [[4,-2],[-2,1]]", [[4, -2], [-2, 1]]],
    ["zero", [[0, 0], [0, 0]]],
  ] as [string, Mat2][])("%s: L lower-triangular, L L' = C", (_n, c) => {
    const l = choleskyPsd2(c);
    expect(l.every(Number.isFinite)).toBe(true);
    expect(l[0]).toBeGreaterThanOrEqual(0);
    expect(l[2]).toBeGreaterThanOrEqual(0);
    const r = reconstruct(l);
    for (let i = 0; i < 2; i++) for (let j = 0; j < 2; j++) expect(r[i][j]).toBeCloseTo(c[i][j], 14);
  });
  it("exact factors for the singular examples", () => {
    expect(choleskyPsd2([[1, 1], [1, 1]])).toEqual([1, 1, 0]);
    expect(choleskyPsd2([[0, 0], [0, 1]])).toEqual([0, 0, 1]);
  });
});

describe("aliasTable (Vose)", () => {
  it.each([
    [[0.25, 0.25, 0.25, 0.25]],
    [[0.3, 0.2, 0.25, 0.15, 0.1]],
    [[0, 0.5, 0, 0.5]],
    [[1]],
    [[0.999, 0.001]],
  ])("column probabilities reproduce the weights %j", (weights) => {
    const { prob, alias } = aliasTable(weights);
    const m = weights.length;
    const got = new Array<number>(m).fill(0);
    for (let i = 0; i < m; i++) {
      expect(prob[i]).toBeGreaterThanOrEqual(0);
      expect(prob[i]).toBeLessThanOrEqual(1);
      got[i] += prob[i] / m;
      got[alias[i]] += (1 - prob[i]) / m;
    }
    for (let i = 0; i < m; i++) expect(got[i]).toBeCloseTo(weights[i], 14);
  });
});

describe("compileWalk layouts (src/engine/types.ts)", () => {
  it("packs each law", () => {
    const [g, d, c, s, e] = compileWalks([
      { law: "gaussian", mean: [1, 2], cov: [[4, 2], [2, 2]] },
      { law: "discrete", atoms: [[1, 0], [0, 1]], weights: [0.75, 0.25] },
      { law: "circle", mean: [0, 0.5], radius: 2 },
      { law: "student", mean: [0, 0], scale: [[1, 0], [0, 9]], dof: 4 },
      { law: "empirical", file: "x.csv", steps: [[1, 2], [3, 4]] },
    ]);
    expect([g.code, Array.from(g.params)]).toEqual([LAW_CODE.gaussian, [1, 2, 2, 1, 1]]);
    expect(d.code).toBe(LAW_CODE.discrete);
    expect(Array.from(d.params.subarray(0, 5))).toEqual([2, 1, 0, 0, 1]);
    expect([c.code, Array.from(c.params)]).toEqual([LAW_CODE.circle, [0, 0.5, 2]]);
    expect([s.code, Array.from(s.params)]).toEqual([LAW_CODE.student, [0, 0, 1, 0, 3, 4]]);
    expect([e.code, Array.from(e.params)]).toEqual([LAW_CODE.empirical, [2, 1, 2, 3, 4]]);
  });
  it("empirical law without loaded steps: error names the field", () => {
    expect(() => compileWalk({ law: "empirical", file: "a.csv" })).toThrow(/^steps: /);
    expect(() => compileWalks([{ law: "circle", mean: [0, 0], radius: 1 }, { law: "empirical", file: "a.csv" }])).toThrow(
      /^walks\[1\]\.steps: /,
    );
  });
});
