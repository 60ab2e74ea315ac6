// The control values (centred endpoint X_n and centred integrated path Y_n of every walk) that the
// kernel writes beside the measures: same bits in WASM and the twin, equal to the values recomputed
// from the path's own points, and means/covariances matching the closed forms
// Cov X = n Sigma, Cov Y = n(n+1)(2n+1)/6 Sigma, Cov(X, Y) = n(n+1)/2 Sigma (sums of i.i.d. steps;
// common practice) at a stated z.
import { describe, expect, it } from "vitest";
import { CONTROLS_PER_WALK } from "../../src/engine/types.js";
import type { StepLaw } from "../../src/suite/schema.js";
import { kernels, SAMPLE_LAWS, GAUSS_ISO } from "./engine-helpers.js";

describe("control values", () => {
  it("WASM == twin bit for bit (1 and 3 walks, chunked runs)", () => {
    for (const laws of [[SAMPLE_LAWS.discrete], [SAMPLE_LAWS.gaussian, SAMPLE_LAWS.empirical, GAUSS_ISO]]) {
      const grid = [1, 7, 300];
      const { twin, wasm } = kernels(laws, grid, 31);
      const paths = 300;
      const len = paths * grid.length * laws.length * CONTROLS_PER_WALK;
      const a = new Float64Array(len), b = new Float64Array(len);
      const va = twin.runBlock(2, paths, a), vb = wasm.runBlock(2, paths, b);
      expect(Array.from(vb)).toEqual(Array.from(va));
      expect(Array.from(b)).toEqual(Array.from(a));
      // With or without the controls buffer, the measures are the same.
      expect(Array.from(wasm.runBlock(2, paths))).toEqual(Array.from(vb));
    }
  });

  it("equal the values recomputed from the sample path's points", () => {
    const laws: StepLaw[] = [SAMPLE_LAWS.gaussian, SAMPLE_LAWS.discrete];
    const grid = [3, 40, 90];
    const { wasm } = kernels(laws, grid, 5);
    const ctl = new Float64Array(grid.length * laws.length * CONTROLS_PER_WALK);
    wasm.runBlock(4, 1, ctl);
    const { points } = wasm.samplePath(4);
    const means = laws.map((l) => (l.law === "gaussian" ? l.mean : null));
    // discrete law mean from its atoms
    const d = SAMPLE_LAWS.discrete as Extract<StepLaw, { law: "discrete" }>;
    means[1] = [d.atoms.reduce((s, a, i) => s + d.weights[i] * a[0], 0), d.atoms.reduce((s, a, i) => s + d.weights[i] * a[1], 0)];
    grid.forEach((n, g) => {
      laws.forEach((_, j) => {
        const [mx, my] = means[j]!;
        let yx = 0, yy = 0;
        for (let i = 1; i <= n; i++) { yx += points[j][2 * i]; yy += points[j][2 * i + 1]; }
        const r = CONTROLS_PER_WALK * (g * laws.length + j);
        const scale = Math.max(1, n * Math.hypot(mx, my));
        expect(Math.abs(ctl[r] - (points[j][2 * n] - n * mx))).toBeLessThan(1e-12 * scale);
        expect(Math.abs(ctl[r + 1] - (points[j][2 * n + 1] - n * my))).toBeLessThan(1e-12 * scale);
        expect(Math.abs(ctl[r + 2] - (yx - (n * (n + 1) / 2) * mx))).toBeLessThan(1e-10 * scale * n);
        expect(Math.abs(ctl[r + 3] - (yy - (n * (n + 1) / 2) * my))).toBeLessThan(1e-10 * scale * n);
      });
    });
  });

  it("mean 0 and the closed-form covariances, |z| <= 4.5 over every entry", () => {
    // Gaussian steps with a drift and a correlated covariance.
    const law: StepLaw = { law: "gaussian", mean: [0.8, -0.3], cov: [[1.5, 0.4], [0.4, 0.7]] };
    const S = [1.5, 0.4, 0.4, 0.7];
    const n = 25;
    const { wasm } = kernels([law], [n], 99);
    const paths = 40000;
    const ctl = new Float64Array(paths * CONTROLS_PER_WALK);
    wasm.runBlock(0, paths, ctl);
    const cxx = n, cyy = (n * (n + 1) * (2 * n + 1)) / 6, cxy = (n * (n + 1)) / 2;
    // Known covariance of (Xx, Xy, Yx, Yy): kron([[cxx, cxy], [cxy, cyy]], Sigma).
    const K = (a: number, b: number) => [[cxx, cxy], [cxy, cyy]][a >> 1][b >> 1] * S[(a & 1) * 2 + (b & 1)];
    for (let a = 0; a < 4; a++) {
      let s = 0;
      for (let p = 0; p < paths; p++) s += ctl[4 * p + a];
      const z = s / paths / Math.sqrt(K(a, a) / paths);
      expect(Math.abs(z)).toBeLessThan(4.5);
      for (let b = a; b < 4; b++) {
        let sab = 0, s4 = 0;
        for (let p = 0; p < paths; p++) { const v = ctl[4 * p + a] * ctl[4 * p + b]; sab += v; s4 += v * v; }
        const m = sab / paths;
        const se = Math.sqrt((s4 / paths - m * m) / paths);
        expect(Math.abs(m - K(a, b)) / se).toBeLessThan(4.5);
      }
    }
  });
});
