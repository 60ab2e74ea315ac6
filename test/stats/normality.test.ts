import { describe, expect, it } from "vitest";
import seedrandom from "seedrandom";
import { ksDistanceSorted, ksNormalDistance, LILLIEFORS_P_FLOOR, lillieforsPValue, meanSd } from "../../src/stats/lilliefors.js";
import { andersonDarlingNormal, andersonDarlingPValue } from "../../src/stats/anderson-darling.js";
import { normalDistance } from "../../src/stats/normal-distance.js";
import { normalCdf } from "../../src/stats/normal.js";

function gaussian(rng: () => number): number {
  const u = 1 - rng();
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * rng());
}

// Naive KS: evaluate |F_m(x) - Phi| and |F_m(x-) - Phi| at every sample point by counting.
function naiveKs(x: number[], mu: number, sd: number): number {
  let d = 0;
  for (const v of x) {
    const le = x.filter((y) => y <= v).length / x.length;
    const lt = x.filter((y) => y < v).length / x.length;
    const p = normalCdf((v - mu) / sd);
    d = Math.max(d, Math.abs(le - p), Math.abs(lt - p));
  }
  return d;
}

describe("Kolmogorov-Smirnov distance with estimated parameters (Lilliefors)", () => {
  it("equals the naive counting formula, with and without ties", () => {
    const rng = seedrandom("ks");
    const cont = Array.from({ length: 40 }, () => gaussian(rng));
    const tied = Array.from({ length: 40 }, () => Math.round(2 * gaussian(rng)));
    for (const x of [cont, tied]) {
      const { mean, sd } = meanSd(x);
      const sorted = Float64Array.from(x).sort();
      expect(ksDistanceSorted(sorted, mean, sd)).toBeCloseTo(naiveKs(x, mean, sd), 14);
    }
    expect(ksNormalDistance([-1, 0, 1, 5, 2])).toBeCloseTo(naiveKs([-1, 0, 1, 5, 2], ...Object.values(meanSd([-1, 0, 1, 5, 2])) as [number, number]), 14);
  });

  it("p-value at the published percentage points of the modified D* = D (sqrt m - 0.01 + 0.85/sqrt m)", () => {
    // Upper percentage points of D* for the normal law with estimated mean and variance: 0.775 (15%),
    // 0.819 (10%), 0.895 (5%), 0.955 (2.5%), 1.035 (1%) ("EDF statistics for goodness of fit and some
    // comparisons", JASA 69 (1974) 730, table 1A; "Goodness-of-Fit Techniques" (1986), table 4.7,
    // case 3) [memory]. For m <= 100 and p <= 0.1 the p-value is the analytic approximation of "An
    // analytic approximation to the distribution of Lilliefors's test statistic for normality"
    // (1986): two published approximations of one law, which agree within 15% of the level here
    // (their largest gap, 12% at the 1% point for m = 100). For m > 100 the p-value is read off the
    // table itself, so it must reproduce the table to rounding.
    for (const m of [10, 20, 50, 100, 400, 5000, 131072]) {
      const f = Math.sqrt(m) - 0.01 + 0.85 / Math.sqrt(m);
      for (const [dstar, level] of [[0.895, 0.05], [0.955, 0.025], [1.035, 0.01]]) {
        const p = lillieforsPValue(dstar / f, m);
        expect(Math.abs(p - level), `m = ${m}, level ${level}: p = ${p}`).toBeLessThanOrEqual((m <= 100 ? 0.15 : 1e-9) * level);
      }
      // 10% and 15% points: the interpolation between them reproduces them; below 15%: the floor.
      expect(lillieforsPValue(0.819 / f, m)).toBeCloseTo(0.1, 2);
      expect(lillieforsPValue(0.775 / f, m)).toBeCloseTo(0.15, 2);
      expect(lillieforsPValue(0.5 / f, m)).toBe(LILLIEFORS_P_FLOOR);
    }
    // Monotone in D.
    const ps = Array.from({ length: 60 }, (_, i) => lillieforsPValue(0.02 + 0.004 * i, 100));
    for (let i = 1; i < ps.length; i++) expect(ps[i]).toBeLessThanOrEqual(ps[i - 1]);
  });

  it("p-value at the large-sample critical values of the original table (1967)", () => {
    // "On the Kolmogorov-Smirnov test for normality with mean and variance unknown", JASA 62 (1967)
    // 399, table 1, m > 30: 0.886/sqrt(m) (5%), 1.031/sqrt(m) (1%) [memory]. That table came from
    // 1000 simulated samples per size, so it carries Monte Carlo error of its own: within 20% of
    // the level.
    for (const m of [50, 100, 1000, 10000]) {
      expect(Math.abs(lillieforsPValue(0.886 / Math.sqrt(m), m) - 0.05)).toBeLessThanOrEqual(0.2 * 0.05);
      expect(Math.abs(lillieforsPValue(1.031 / Math.sqrt(m), m) - 0.01)).toBeLessThanOrEqual(0.2 * 0.01);
    }
  });
});

describe("Anderson-Darling A^2 with estimated parameters", () => {
  it("equals the naive formula with 1 - Phi on 8 values", () => {
    const x = [2.1, -0.3, 0.8, 1.7, -1.2, 0.1, 3.3, 0.5];
    const { mean, sd } = meanSd(x);
    const z = [...x].sort((a, b) => a - b).map((v) => (v - mean) / sd);
    const m = x.length;
    let s = 0;
    for (let i = 1; i <= m; i++) s += (2 * i - 1) * (Math.log(normalCdf(z[i - 1])) + Math.log(1 - normalCdf(z[m - i])));
    const a2 = -m - s / m;
    const r = andersonDarlingNormal(x);
    expect(r.statistic).toBeCloseTo(a2, 12);
    expect(r.modified).toBeCloseTo(a2 * (1 + 0.75 / 8 + 2.25 / 64), 12);
  });

  it("p-value at the published percentage points of A* = A^2 (1 + 0.75/m + 2.25/m^2)", () => {
    // "Goodness-of-Fit Techniques" (1986), ch. 4, table 4.7, case 3 [memory]: 0.561 (15%),
    // 0.631 (10%), 0.752 (5%), 0.873 (2.5%), 1.035 (1%); the p-value formulas of the same chapter
    // reproduce them within 5% of the level.
    for (const [a, level] of [[0.561, 0.15], [0.631, 0.1], [0.752, 0.05], [0.873, 0.025], [1.035, 0.01]]) {
      expect(Math.abs(andersonDarlingPValue(a) - level), `A* = ${a}`).toBeLessThanOrEqual(0.05 * level);
    }
    // Monotone, continuous at the pieces' joins, held (an upper bound) beyond A* = 10.
    const grid = Array.from({ length: 400 }, (_, i) => 0.05 + 0.03 * i);
    for (let i = 1; i < grid.length; i++) expect(andersonDarlingPValue(grid[i])).toBeLessThanOrEqual(andersonDarlingPValue(grid[i - 1]));
    for (const join of [0.2, 0.34, 0.6]) expect(Math.abs(andersonDarlingPValue(join - 1e-9) - andersonDarlingPValue(join))).toBeLessThan(0.01);
    expect(andersonDarlingPValue(200)).toBe(andersonDarlingPValue(10));
  });
});

describe("distance to the normal family with a DKW bound", () => {
  it("normal data: the bound covers 0 distance and the tolerance is reachable; margin is Massart's", () => {
    const rng = seedrandom("dkw-normal");
    const x = Array.from({ length: 80000 }, () => 3 + 2 * gaussian(rng));
    const d = normalDistance(x, 0.01, 0.01);
    expect(d.margin).toBeCloseTo(Math.sqrt(Math.log(200) / 160000), 14);
    expect(d.metric).toBe("jumps");
    expect(d.toleranceReachable).toBe(true);
    expect(d.minimum).toBeLessThanOrEqual(d.momentFit);
    expect(d.upperBound).toBeLessThan(0.01);
    expect(d.pValue).toBe(1);
  });

  it("exponential data: far from normal, tiny p-value for 'distance <= 0.01'", () => {
    const rng = seedrandom("dkw-exp");
    const x = Array.from({ length: 20000 }, () => -Math.log(1 - rng()));
    const d = normalDistance(x, 0.01, 0.01);
    // Skewness 2: the first Edgeworth term alone moves the CDF by |g1| phi(0)/6 = 0.13 near the
    // mean, so the distance to every normal law is of order 0.1 (a rough guide, not an exact value).
    expect(d.minimum).toBeGreaterThan(0.05);
    expect(d.pValue).toBeLessThan(1e-10);
  });

  it("lattice data: uses mid-points (continuity correction), so a binomial(400, 1/2) passes at 0.01 while the plain distance cannot", () => {
    const rng = seedrandom("dkw-lattice");
    const x = Array.from({ length: 100000 }, () => {
      let k = 0;
      for (let i = 0; i < 400; i++) if (rng() < 0.5) k++;
      return k;
    });
    const d = normalDistance(x, 0.01, 0.01);
    expect(d.metric).toBe("midpoints");
    expect(d.tiedFraction).toBeGreaterThan(0.99);
    // Plain KS distance is about half an atom: P(K = 200) / 2 = 0.0199 (local CLT, phi(0)/(2 sd), sd = 10).
    expect(d.momentFit).toBeGreaterThan(0.015);
    expect(d.upperBound).toBeLessThan(0.01);
  });

  it("too small a sample cannot reach the tolerance", () => {
    const rng = seedrandom("small");
    const d = normalDistance(Array.from({ length: 2000 }, () => gaussian(rng)), 0.01, 0.01);
    expect(d.toleranceReachable).toBe(false);
    expect(() => normalDistance([1, 2, 3], 0.01)).toThrow(/^sample:/);
    expect(() => normalDistance([1, 2, 3, 4, 5], 2)).toThrow(/^normalityTolerance:/);
  });
});
