import { describe, expect, it } from "vitest";
import seedrandom from "seedrandom";
import { fitPowerLawFixed, fitPowerLawProfile, gridIdentifiesRate, linearGls, weightMatrix } from "../../src/stats/gls.js";
import { choleskyInverse, cholesky } from "../../src/stats/linalg.js";
import { wilsonInterval } from "../../src/stats/binomial.js";

const diag = (v: number[]) => {
  const m = v.length;
  const c = new Float64Array(m * m);
  v.forEach((x, i) => (c[i * m + i] = x));
  return c;
};

function gaussian(rng: () => number): number {
  const u = 1 - rng();
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * rng());
}

describe("linear algebra", () => {
  it("doc example: inverse of [[4,2],[2,3]]", () => {
    const inv = choleskyInverse([4, 2, 2, 3], 2);
    expect(Array.from(inv).map((x) => Number(x.toFixed(12)))).toEqual([0.375, -0.25, -0.25, 0.5]);
  });
  it("names the field when not positive definite", () => {
    expect(() => cholesky([1, 2, 2, 1], 2, "covariance")).toThrow(/^covariance: not positive definite/);
  });
});

describe("GLS", () => {
  it("with W = I equals ordinary least squares by the normal equations (naive 2x2 solve)", () => {
    const x = [1, 2, 3, 4, 5];
    const y = [1.1, 1.9, 3.2, 3.9, 5.3];
    const design = x.flatMap((v) => [1, v]);
    const g = linearGls(y, design, 2, diag([1, 1, 1, 1, 1]));
    const n = 5;
    const sx = x.reduce((a, b) => a + b), sy = y.reduce((a, b) => a + b);
    const sxx = x.reduce((a, b) => a + b * b, 0), sxy = x.reduce((a, v, i) => a + v * y[i], 0);
    const slope = (n * sxy - sx * sy) / (n * sxx - sx * sx);
    const icpt = (sy - slope * sx) / n;
    expect(g.coef[0]).toBeCloseTo(icpt, 12);
    expect(g.coef[1]).toBeCloseTo(slope, 12);
    const rss = y.reduce((a, v, i) => a + (v - icpt - slope * x[i]) ** 2, 0);
    expect(g.chi2).toBeCloseTo(rss, 12);
    expect(g.df).toBe(3);
  });

  it("the Hartlap factor scales the weights by (g - m - 2)/(g - 1)", () => {
    const w = weightMatrix(diag([2, 2, 2]), 3, 64);
    expect(w[0]).toBeCloseTo(0.5 * (59 / 63), 14);
    expect(() => weightMatrix(diag([1, 1, 1]), 3, 5)).toThrow(/^blocks:/);
  });
});

describe("power-law extrapolation y = s2 + c n^-beta", () => {
  const grid = [10, 32, 100, 316, 1000, 3162, 10000];
  it("recovers s2 and beta from exact data", () => {
    const y = grid.map((n) => 2 + 3 * Math.pow(n, -0.5));
    const f = fitPowerLawProfile(grid, y, diag(grid.map(() => 1e-8)));
    expect(f.s2).toBeCloseTo(2, 6);
    expect(f.beta).toBeCloseTo(0.5, 5);
    expect(f.chi2).toBeLessThan(1e-6);
    const fx = fitPowerLawFixed(grid, y, diag(grid.map(() => 1e-8)), 0.5);
    expect(fx.s2).toBeCloseTo(2, 10);
    expect(fx.c).toBeCloseTo(3, 10);
  });

  it("recovers s2 and beta from noisy correlated synthetic data (z = 3 on the replicate mean), and the profile interval covers at its level", () => {
    // Truth: s2 = 6.8284, c = -4, beta = 0.75. Noise: random-walk-correlated errors, cov_ij =
    // tau^2 min(i, j) + small diagonal, known to the fit. 60 replications, fixed seed.
    const rng = seedrandom("gls-synthetic");
    const m = grid.length;
    const cov = new Float64Array(m * m);
    const tau = 0.004;
    for (let i = 0; i < m; i++) for (let j = 0; j < m; j++) cov[i * m + j] = tau * tau * (Math.min(m - i, m - j)) + (i === j ? 1e-6 : 0);
    const L = cholesky(cov, m);
    const reps = 60;
    const s2s: number[] = [];
    const betas: number[] = [];
    let covered = 0;
    for (let r = 0; r < reps; r++) {
      const e = Array.from({ length: m }, () => gaussian(rng));
      const y = grid.map((n, i) => {
        let noise = 0;
        for (let k = 0; k <= i; k++) noise += L[i * m + k] * e[k];
        return 6.8284 - 4 * Math.pow(n, -0.75) + noise;
      });
      const f = fitPowerLawProfile(grid, y, cov);
      s2s.push(f.s2);
      betas.push(f.beta);
      if (f.s2Interval[0] <= 6.8284 && 6.8284 <= f.s2Interval[1]) covered++;
    }
    const mean = (v: number[]) => v.reduce((a, b) => a + b, 0) / v.length;
    const sd = (v: number[]) => Math.sqrt(v.reduce((a, b) => a + (b - mean(v)) ** 2, 0) / (v.length - 1));
    expect(Math.abs(mean(s2s) - 6.8284)).toBeLessThanOrEqual(3 * sd(s2s) / Math.sqrt(reps));
    expect(Math.abs(mean(betas) - 0.75)).toBeLessThanOrEqual(3 * sd(betas) / Math.sqrt(reps) + 0.005);
    // Coverage: the 99.9% Wilson interval of the observed rate contains the nominal 0.95.
    const [lo, hi] = wilsonInterval(covered, reps, 0.999);
    expect(lo).toBeLessThanOrEqual(0.95);
    expect(hi).toBeGreaterThanOrEqual(0.95);
  });

  it("refuses to estimate beta from a 3-point grid, and the grid rule says which grids identify it", () => {
    const n3 = [100, 1000, 10000];
    const y = n3.map((n) => 2 + Math.pow(n, -0.5));
    expect(() => fitPowerLawProfile(n3, y, diag([1e-4, 1e-4, 1e-4]))).toThrow(/^n: estimating beta needs at least 4/);
    expect(gridIdentifiesRate(n3)).toBe(false);
    expect(gridIdentifiesRate([100, 200, 400, 800, 1600])).toBe(false); // 1.2 decades
    expect(gridIdentifiesRate([10, 32, 100, 316, 1000])).toBe(true); // 2 decades, even
    expect(gridIdentifiesRate([10, 11, 12, 13, 1000])).toBe(false); // one gap holds the whole span
    expect(fitPowerLawFixed(n3, y, diag([1e-4, 1e-4, 1e-4]), 0.5).mode).toBe("fixed");
  });
});

describe("profile fit: fewer evaluations, the same numbers", () => {
  // Six fixed-seed data sets on a 6-point grid with correlated errors. The expected intervals were
  // printed by the implementation before the speed-up (commit fdd42e7: chi2 recomputed from scratch
  // at every beta, 80 / 50 bisection steps). beta's interval must come out bit for bit; s2's is now
  // computed in closed form over beta (the union of the per-beta intervals) instead of by bisection
  // on s2, so its ends must agree with the bisection's to rounding level (see below).
  const grid = [32, 64, 128, 256, 512, 1024];
  const before: [[number, number], [number, number]][] = [
    [[6.787085963091506, 6.962919084575212], [0.2347130912759942, 0.7296486951833547]],
    [[6.774280821375957, 6.832079431783367], [0.5666274340259201, 1.28270219253065]],
    [[6.769555011719152, 6.84930401061415], [0.31826624946763327, 1.673168458166522]],
    [[6.777183406864607, 6.877384973738026], [0.22104597674666915, 2]],
    [[6.778918846379531, 6.825742776450946], [0.5385285376114692, 2]],
    [[6.752586671108071, 6.952018449566603], [0.1, 2]],
  ];
  const rng = seedrandom("gls-profile-oracle");
  const cases = before.map((_, c) => {
    const m = grid.length;
    const cov = new Float64Array(m * m);
    for (let i = 0; i < m; i++) for (let j = 0; j < m; j++) cov[i * m + j] = 1e-4 * Math.pow(0.6, Math.abs(i - j)) * (1 + 0.1 * c);
    const y = grid.map((n) => 6.8 - 2.5 * Math.pow(n, -0.7 - 0.1 * c) + 0.01 * gaussian(rng));
    return { cov, y };
  });
  it("beta's profile interval equals the pre-speed-up values exactly; s2's agrees with the bisection's", () => {
    // Both methods find the ends of the same set; the bisection stopped at adjacent floating-point
    // numbers of its test, whose inner minimum over beta had the golden section's resolution, so
    // the two differ by rounding (~1e-13 of the width here). 1e-9 of the width is far below the 6
    // digits any report prints; a wrong closed form (a factor, a sign) would miss by O(width).
    cases.forEach(({ cov, y }, c) => {
      const f = fitPowerLawProfile(grid, y, cov, { blocks: 64 });
      const width = before[c][0][1] - before[c][0][0];
      for (const e of [0, 1]) expect(Math.abs(f.s2Interval[e] - before[c][0][e])).toBeLessThanOrEqual(1e-9 * width);
      expect(f.betaInterval).toEqual(before[c][1]);
    });
  });
  it("s2's interval ends are where the profile chi2 crosses chi2_min + chi2_{1,0.95} (brute force over beta)", () => {
    // Independent of gls.ts's search: chi2(s2, beta) with c fitted by weighted least squares, its
    // minimum over a 1e-4 grid of beta on [0.1, 2] (the grid only over-estimates the minimum, by
    // ~1e-7 at this spacing). Just outside an end the profile must exceed the threshold; just
    // inside it must be below (1e-6 of the width either side moves the profile by ~1e-5).
    const m = grid.length;
    const q = 3.841458820694124; // chi2_{1, 0.95} (common tables; chiSquareQuantile(0.95, 1))
    cases.forEach(({ cov, y }) => {
      const f = fitPowerLawProfile(grid, y, cov, { blocks: 64 });
      const w = weightMatrix(cov, m, 64);
      const quad = (a: number[], b: number[]) => {
        let t = 0;
        for (let i = 0; i < m; i++) for (let j = 0; j < m; j++) t += a[i] * w[i * m + j] * b[j];
        return t;
      };
      const profile = (s2: number) => {
        const r0 = y.map((v) => v - s2);
        let best = Infinity;
        for (let k = 0; k <= 19000; k++) {
          const x = grid.map((n) => Math.pow(n, -(0.1 + k * 1e-4)));
          const cc = quad(x, r0) / quad(x, x);
          const r = r0.map((v, i) => v - cc * x[i]);
          best = Math.min(best, quad(r, r));
        }
        return best;
      };
      const threshold = f.chi2 + q;
      const d = 1e-6 * (f.s2Interval[1] - f.s2Interval[0]);
      expect(profile(f.s2Interval[0] - d)).toBeGreaterThan(threshold);
      expect(profile(f.s2Interval[0] + d)).toBeLessThan(threshold);
      expect(profile(f.s2Interval[1] + d)).toBeGreaterThan(threshold);
      expect(profile(f.s2Interval[1] - d)).toBeLessThan(threshold);
    });
  });
  it("intervals: false skips only the intervals (estimate, rate and misfit unchanged)", () => {
    for (const { cov, y } of cases) {
      const full = fitPowerLawProfile(grid, y, cov, { blocks: 64 });
      const lean = fitPowerLawProfile(grid, y, cov, { blocks: 64, intervals: false });
      expect([lean.s2, lean.s2SE, lean.c, lean.beta, lean.chi2, lean.pValue]).toEqual([full.s2, full.s2SE, full.c, full.beta, full.chi2, full.pValue]);
      expect(lean.betaInterval).toBeNull();
      expect(lean.s2Interval.every(Number.isNaN)).toBe(true);
    }
  });
});

describe("power-law fits: fast path vs the plain computations", () => {
  // The fast path (W 1 and W y computed once, the powers of the grid kept, linearGls written out
  // for the design [1, x]) must return the plain path's numbers bit for bit, -0 and NaN included.
  const bits = (v: unknown) => JSON.stringify(v, (_, x) => (typeof x === "number" ? (Object.is(x, -0) ? "-0" : String(x)) : x));
  const rng = seedrandom("gls-fast-vs-reference");
  const grids = [[31, 62, 125, 250, 500, 1000], [10, 20, 40, 80, 160, 320, 640], [62, 125, 250, 500, 1000], [8, 16, 32, 64, 128, 256, 512, 1024, 2048]];
  const cases = Array.from({ length: 24 }, (_, c) => {
    const grid = grids[c % grids.length];
    const m = grid.length;
    // Strong correlations and a large level over small errors (cancellation) in some cases.
    const rho = c % 5 === 4 ? 0.98 : 0.3 + 0.6 * rng();
    const level = c % 4 === 3 ? 1e3 : 0;
    const scale = Math.pow(10, -6 + 4 * rng());
    const cov = new Float64Array(m * m);
    for (let i = 0; i < m; i++) for (let j = 0; j < m; j++) cov[i * m + j] = scale * Math.pow(rho, Math.abs(i - j)) * (1 + 0.3 * Math.min(i, j) / m);
    const beta = 0.2 + 1.6 * rng();
    const y = grid.map((n) => level + 3 * rng() - 1 + (4 * rng() - 2) * Math.pow(n, -beta) + Math.sqrt(scale) * gaussian(rng));
    return { grid, cov, y, blocks: c % 3 === 0 ? undefined : 40 + c };
  });
  it("fitPowerLawProfile: estimate, rate, misfit and both profile intervals identical", () => {
    for (const { grid, cov, y, blocks } of cases) {
      for (const intervals of [true, false]) {
        const fast = fitPowerLawProfile(grid, y, cov, { blocks, intervals });
        const plain = fitPowerLawProfile(grid, y, cov, { blocks, intervals, reference: true });
        expect(bits(fast)).toBe(bits(plain));
      }
    }
  });
  it("fitPowerLawFixed: identical at several rates", () => {
    for (const { grid, cov, y, blocks } of cases)
      for (const beta of [0.25, 0.5, 1, 1.37]) expect(bits(fitPowerLawFixed(grid, y, cov, beta, { blocks }))).toBe(bits(fitPowerLawFixed(grid, y, cov, beta, { blocks, reference: true })));
  });
  it("a degenerate design fails with the same message both ways", () => {
    // Two equal n: 1 and n^-beta are collinear when every n is the same.
    const grid = [100, 100, 100, 100];
    const cov = diag([1e-4, 1e-4, 1e-4, 1e-4]);
    const y = [1, 1.01, 0.99, 1];
    const message = (reference: boolean) => {
      try {
        fitPowerLawFixed(grid, y, cov, 0.5, { reference });
        return "no error";
      } catch (e) {
        return (e as Error).message;
      }
    };
    expect(message(false)).toMatch(/^design: not positive definite \(pivot 1 = /);
    expect(message(false)).toBe(message(true));
  });
});
