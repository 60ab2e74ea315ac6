import { describe, expect, it } from "vitest";
import { cauchyMeanPerimeter, mirrorLine } from "../../src/theory/cauchy-quadrature.js";
import { lindleyModule, normalCdfFast, runningMaxLaw, spitzerMaxMean, spitzerMaxMeans } from "../../src/theory/running-max.js";
import { normalCdf } from "../../src/stats/normal.js";
import { spitzerWidomMeans } from "../../src/theory/spitzer-widom.js";
import type { Mat2, Vec2 } from "../../src/suite/schema.js";
import { hullOf, meanSE, normalSource } from "./theory-helpers.js";

describe("running maximum by the Lindley recursion vs Spitzer's E M_n = sum E[S_k^+]/k (Spitzer, Trans. AMS 82 (1956))", () => {
  it("matches for drifts -0.3, 0, 0.05, 1 at n = 10, 200, and -1.2 at n = 10, 1000 (stationary to the last bit from n ~ 100)", () => {
    for (const [r, nBig] of [[-0.3, 200], [0, 200], [0.05, 200], [1, 200], [-1.2, 1000]]) {
      const law = runningMaxLaw(r, [10, nBig], { h: 0.75 });
      for (const [idx, n] of [[0, 10], [1, nBig]]) {
        const [, hi] = law.support(idx);
        // Simpson rule for int_0^hi (1 - F).
        const m = 2 * Math.ceil(hi / 0.02 / 2), H = hi / m;
        let s = 0;
        for (let i = 0; i <= m; i++) s += (i === 0 || i === m ? 1 : i % 2 ? 4 : 2) * (1 - law.cdf(idx, i * H));
        const exact = spitzerMaxMean(r, n);
        expect(Math.abs((s * H) / 3 - exact)).toBeLessThan(1e-8 * Math.max(1, exact));
      }
    }
  });
});

describe("the recursion in build/lindley.wasm (SIMD) against its TypeScript twin", () => {
  it("is built, and gives the same windows and the same cdf values, bit for bit (the twin sums in the module's order)", () => {
    expect(lindleyModule()).not.toBeNull();
    const ns = [7, 150, 400];
    // Drifts on both sides of 0 (stationary law reached or not, Toeplitz rows used or not), among
    // them -0.2 and 0.7, where the windows once ended one node apart.
    for (const r of [-1.2, -0.7, -0.3, -0.2, -0.05, 0, 0.1, 0.3, 0.7, 0.9, 1.5]) {
      const js = runningMaxLaw(r, ns, { h: 0.75, engine: "js" });
      const wasm = runningMaxLaw(r, ns, { h: 0.75, engine: "wasm" });
      for (let idx = 0; idx < 3; idx++) {
        expect(wasm.support(idx), `r = ${r}, n = ${ns[idx]}`).toEqual(js.support(idx));
        const [lo, hi] = js.support(idx);
        for (let k = 0; k <= 100; k++) {
          const y = lo + ((hi - lo) * k) / 100;
          expect(wasm.cdf(idx, y), `r = ${r}, n = ${ns[idx]}, y = ${y}`).toBe(js.cdf(idx, y));
        }
      }
    }
  });

  it("spitzerMaxMeans gives spitzerMaxMean at every n in one pass (same bits: the skipped normal cdf calls are exactly 0 or 1)", () => {
    const ns = [1, 2, 9, 100, 1000];
    for (const r of [-1.5, -0.3, 0, 0.3, 2]) spitzerMaxMeans(r, ns).forEach((v, i) => expect(v).toBe(spitzerMaxMean(r, ns[i])));
  });

  it("normalCdfFast is normalCdf bit for bit (exactly 1 from 8.3 up, exactly 0 from -38.5 down)", () => {
    for (let z = -80; z <= 80; z += 0.0037) expect(normalCdfFast(z)).toBe(normalCdf(z));
    for (const z of [8.3, 8.29, -38.5, -38.49, Infinity, -Infinity]) expect(normalCdfFast(z)).toBe(normalCdf(z));
    expect(normalCdfFast(NaN)).toBeNaN();
  });
});

describe("k-walk Cauchy quadrature (item 3)", () => {
  it("agrees with Spitzer–Widom (item 1) for k = 1 to 1e-6 relative", () => {
    const walks: { mean: Vec2; cov: Mat2 }[] = [
      { mean: [1, 0], cov: [[1, 0], [0, 1]] },
      { mean: [0.3, 0.1], cov: [[1, 0.3], [0.3, 0.5]] },
      { mean: [0, 0], cov: [[2, -0.5], [-0.5, 1]] },
    ];
    for (const w of walks) {
      const c = cauchyMeanPerimeter([w], [10, 300], { budgetSeconds: 120 });
      const sw = spitzerWidomMeans({ law: "gaussian", ...w }, [10, 300], 20);
      for (const n of ["10", "300"]) {
        expect(Math.abs(c.means[n] - sw.means[n]) / sw.means[n]).toBeLessThan(1e-6);
        expect(Math.abs(c.means[n] - sw.means[n])).toBeLessThanOrEqual(c.errors[n] + 1e-9 * sw.means[n]);
      }
    }
  });

  it("agrees with a Monte Carlo estimate for k = 2 (|z| <= 4, seeded simulation in this test)", () => {
    const walks: { mean: Vec2; cov: Mat2 }[] = [
      { mean: [0.3, 0], cov: [[1, 0], [0, 1]] },
      { mean: [0, 0.2], cov: [[1, 0.3], [0.3, 0.6]] },
    ];
    const n = 40;
    const c = cauchyMeanPerimeter(walks, [n], { budgetSeconds: 120 });
    const normal = normalSource("cauchy-k2");
    const chol = walks.map((w) => {
      const a = Math.sqrt(w.cov[0][0]), b = w.cov[0][1] / a, d = Math.sqrt(w.cov[1][1] - b * b);
      return [a, b, d];
    });
    const xs = new Array(2 * n + 1), ys = new Array(2 * n + 1), sample: number[] = [];
    for (let p = 0; p < 20000; p++) {
      xs[0] = 0; ys[0] = 0;
      let q = 1;
      walks.forEach((w, j) => {
        let x = 0, y = 0;
        const [a, b, d] = chol[j];
        for (let i = 0; i < n; i++) {
          const z1 = normal(), z2 = normal();
          x += w.mean[0] + a * z1;
          y += w.mean[1] + b * z1 + d * z2;
          xs[q] = x; ys[q] = y; q++;
        }
      });
      sample.push(hullOf(xs, ys).perimeter);
    }
    const { mean, se } = meanSE(sample);
    expect(Math.abs(mean - c.means[String(n)])).toBeLessThanOrEqual(4 * se);
  });

  it("finds a mirror line of the walks (a reflection that permutes them), and none when there is none", () => {
    const I: Mat2 = [[1, 0], [0, 1]];
    expect(mirrorLine([{ mean: [1, 0], cov: I }, { mean: [0, 1], cov: I }])?.alpha).toBeCloseTo(Math.PI / 4, 14);
    // Across the x-axis: the covariances must map too (c01 -> -c01).
    const sheared: { mean: Vec2; cov: Mat2 }[] = [
      { mean: [1, 0.5], cov: [[1, 0.3], [0.3, 2]] },
      { mean: [1, -0.5], cov: [[1, -0.3], [-0.3, 2]] },
    ];
    const m = mirrorLine(sheared)!;
    expect(Math.abs(Math.sin(m.alpha))).toBeLessThan(1e-15);
    expect(m.slack(1000)).toBeLessThan(1e-9);
    expect(mirrorLine([sheared[0], { mean: [1, -0.5], cov: [[1, 0.3], [0.3, 2]] }])).toBeNull();
    expect(mirrorLine([{ mean: [1, 0], cov: I }, { mean: [0, 1.01], cov: I }])).toBeNull();
    expect(mirrorLine([{ mean: [0, 0], cov: I }])).toBeNull();
  });

  it("integrates half the circle on a mirror line: same means as the whole circle within both bounds, on fewer angles", () => {
    const cases: { mean: Vec2; cov: Mat2 }[][] = [
      [{ mean: [1, 0], cov: [[1, 0], [0, 1]] }, { mean: [0, 1], cov: [[1, 0], [0, 1]] }],
      [{ mean: [1, 0.5], cov: [[1, 0.3], [0.3, 2]] }, { mean: [1, -0.5], cov: [[1, -0.3], [-0.3, 2]] }],
    ];
    for (const walks of cases) {
      const half = cauchyMeanPerimeter(walks, [10, 120], { tolerance: () => 1e-5 });
      const whole = cauchyMeanPerimeter(walks, [10, 120], { tolerance: () => 1e-5, mirror: false });
      expect(half.angles).toBeLessThan(0.7 * whole.angles);
      for (const n of ["10", "120"]) {
        expect(half.errors[n]).toBeLessThanOrEqual(1e-5);
        expect(Math.abs(half.means[n] - whole.means[n])).toBeLessThanOrEqual(half.errors[n] + whole.errors[n]);
      }
    }
  });

  it("drops the largest n and says so when the budget is tiny", () => {
    const walks: { mean: Vec2; cov: Mat2 }[] = [
      { mean: [1, 0], cov: [[1, 0], [0, 1]] },
      { mean: [0, 1], cov: [[1, 0], [0, 1]] },
    ];
    const c = cauchyMeanPerimeter(walks, [5, 3000], { budgetSeconds: 0.5 });
    expect(c.means["3000"]).toBeUndefined();
    expect(c.reasons.join(" ")).toMatch(/n = 3000: Cauchy quadrature (skipped|stopped)/);
  });
});
