// End-to-end checks of the WASM kernel against exact expectations (values from
// docs/theory.md sec. 2 and 4): |mean - exact| <= Z * SE with Z = 4, fixed seeds.

import { describe, expect, it } from "vitest";
import type { Measure, StepLaw } from "../../src/suite/schema.js";
import { recordLayout } from "../../src/engine/types.js";
import { kernels, meanSE, GAUSS_ISO } from "./engine-helpers.js";

const Z = 4;

function columns(values: Float64Array, grid: number[]): (g: number, m: Measure) => Float64Array {
  const layout = recordLayout(grid.length);
  const paths = values.length / layout.width;
  return (g, m) => Float64Array.from({ length: paths }, (_, p) => values[p * layout.width + layout.index(g, m)]);
}

function simulate(laws: StepLaw[], grid: number[], seed: number, blocks: number, perBlock: number) {
  const { wasm } = kernels(laws, grid, seed);
  const rec = recordLayout(grid.length).width;
  const all = new Float64Array(blocks * perBlock * rec);
  for (let b = 0; b < blocks; b++) all.set(wasm.runBlock(b, perBlock), b * perBlock * rec);
  return columns(all, grid);
}

function expectZ(sample: Float64Array, exact: number): void {
  const { mean, se } = meanSE(sample);
  const z = (mean - exact) / se;
  expect(Math.abs(z), `mean ${mean} +- ${se} vs ${exact} (z = ${z.toFixed(2)})`).toBeLessThanOrEqual(Z);
}

describe("one isotropic Gaussian walk, exact means", () => {
  const grid = [1, 10, 100];
  const col = simulate([GAUSS_ISO], grid, 20251202, 8, 12_500);
  // Spitzer–Widom formula E L_n = 2 sum_k E|S_k| / k, check values of docs/theory.md sec. 2.
  it("perimeter: E L_1 = 2.50662827, E L_10 = 12.58577530, E L_100 = 46.59722656 (Spitzer–Widom)", () => {
    expectZ(col(0, "perimeter"), 2.50662827);
    expectZ(col(1, "perimeter"), 12.5857753);
    expectZ(col(2, "perimeter"), 46.59722656);
  });
  it("area: E A_10 = 8.15892774148 (Barndorff-Nielsen–Baxter)", () => {
    expectZ(col(1, "area"), 8.15892774148);
  });
  it("n = 1: the hull is the segment [0, S_1]: perimeter = 2 diameter, area 0, 2 vertices", () => {
    const p = col(0, "perimeter"), d = col(0, "diameter"), a = col(0, "area"), v = col(0, "vertices");
    let bad = 0;
    for (let i = 0; i < p.length; i++) if (p[i] !== 2 * d[i] || a[i] !== 0 || v[i] !== 2 || !(d[i] > 0)) bad++;
    expect(bad).toBe(0);
  });
});

describe("one Gaussian walk with drift (1, 0), cov I", () => {
  it("perimeter: E L_10 = 23.19253541 (Spitzer–Widom, docs/theory.md sec. 2)", () => {
    const col = simulate([{ law: "gaussian", mean: [1, 0], cov: [[1, 0], [0, 1]] }], [10], 77, 4, 25_000);
    expectZ(col(0, "perimeter"), 23.19253541);
  });
});

describe("mean number of hull vertices = 2 sum_{k<=n} 1/k (continuous steps, any drift; docs/theory.md sec. 4)", () => {
  const harmonic2 = (n: number) => { let s = 0; for (let k = 1; k <= n; k++) s += 1 / k; return 2 * s; };
  const laws: [string, StepLaw][] = [
    ["gaussian, no drift", GAUSS_ISO],
    ["gaussian, drift (1, 0.5), correlated", { law: "gaussian", mean: [1, 0.5], cov: [[1, 0.4], [0.4, 2]] }],
    ["circle, drift (0.3, 0)", { law: "circle", mean: [0.3, 0], radius: 1 }],
    ["student dof 3, no drift", { law: "student", mean: [0, 0], scale: [[1, 0], [0, 1]], dof: 3 }],
  ];
  it.each(laws)("%s, n = 10 and 20", (_name, law) => {
    const col = simulate([law], [10, 20], 4242, 4, 25_000);
    expectZ(col(0, "vertices"), harmonic2(10));
    expectZ(col(1, "vertices"), harmonic2(20));
  });
});
