import { describe, expect, it } from "vitest";
import seedrandom from "seedrandom";
import { ksDistanceSorted, ksNormalDistance, meanSd, meanSdAll, sortedCopy } from "../../src/stats/lilliefors.js";
import { KsDistanceSearch, normalDistance, normalDistanceSorted, sortedStats, sortedStatsAll, tieGroups } from "../../src/stats/normal-distance.js";
import { andersonDarlingNormal, andersonDarlingNormalSorted } from "../../src/stats/anderson-darling.js";
import { normalCdf } from "../../src/stats/normal.js";

function gaussian(rng: () => number): number {
  const u = 1 - rng();
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * rng());
}

// Fixed-seed samples: normal, skewed, values rounded to a grid (ties, fewer than half tied),
// a lattice (almost all tied), heavy tails, and tiny samples.
function samples(): { name: string; x: number[] }[] {
  const rng = seedrandom("pruned-ks");
  const draw = (m: number, f: () => number) => Array.from({ length: m }, f);
  return [
    { name: "normal 50000", x: draw(50000, () => 10 + 3 * gaussian(rng)) },
    { name: "chi-square-like 20000", x: draw(20000, () => gaussian(rng) ** 2 + 0.5 * gaussian(rng)) },
    { name: "rounded to 0.01 (some ties)", x: draw(30000, () => Math.round(100 * gaussian(rng)) / 100) },
    { name: "lattice (all tied)", x: draw(20000, () => Math.round(3 * gaussian(rng))) },
    { name: "heavy tails", x: draw(10000, () => gaussian(rng) / Math.max(0.05, Math.abs(gaussian(rng)))) },
    { name: "m = 5", x: draw(5, () => gaussian(rng)) },
    { name: "m = 37", x: draw(37, () => gaussian(rng)) },
  ];
}

describe("pruned KS distance (KsDistanceSearch) = the plain loop, bit for bit", () => {
  it("at random (mu, sigma) near and far from the moment fit, in sequence on one sample", () => {
    const rng = seedrandom("probes");
    for (const { x } of samples()) {
      const s = sortedCopy(x);
      const { mean, sd } = meanSd(s);
      const search = new KsDistanceSearch(s);
      for (let k = 0; k < 150; k++) {
        const spread = k < 50 ? 1 : k < 100 ? 0.05 : 1e-4;
        const mu = mean + spread * sd * gaussian(rng);
        const sigma = sd * Math.exp(spread * gaussian(rng));
        expect(search.distance(mu, sigma)).toBe(ksDistanceSorted(s, mu, sigma));
      }
    }
  });

  it("with a cap: the exact distance when it is below the cap, a value >= the cap otherwise", () => {
    const rng = seedrandom("caps");
    let capped = 0;
    for (const { x } of samples()) {
      const s = sortedCopy(x);
      const { mean, sd } = meanSd(s);
      const search = new KsDistanceSearch(s);
      for (let k = 0; k < 100; k++) {
        const spread = k < 50 ? 0.05 : 1e-3;
        const mu = mean + spread * sd * gaussian(rng);
        const sigma = sd * Math.exp(spread * gaussian(rng));
        const exact = ksDistanceSorted(s, mu, sigma);
        // Caps around the distance, as the minimiser's thresholds are (the values of its simplex).
        const cap = exact * (1 + 0.02 * gaussian(rng));
        const d = search.distance(mu, sigma, cap);
        if (exact < cap) expect(d).toBe(exact);
        else {
          expect(d).toBeGreaterThanOrEqual(cap);
          if (d !== exact) capped++;
        }
      }
    }
    // The early stop happened (else the test would not test it).
    expect(capped).toBeGreaterThan(10);
  });

  it("means and SDs of several samples at once (three chains in one loop) equal meanSd's, bit for bit", () => {
    const rng = seedrandom("means");
    // Lengths: a run of equal ones (taken three at a time), then unequal ones and leftovers.
    for (const lengths of [[5000, 5000, 5000, 5000, 5000, 5000], [5000, 5000, 5000, 5000], [300, 300, 301, 300, 300, 300, 7], [9], []]) {
      const xs = lengths.map((m, k) => sortedCopy(Array.from({ length: m }, () => 1e3 * k + (k + 1) * gaussian(rng))));
      const all = meanSdAll(xs);
      expect(all.length).toBe(xs.length);
      xs.forEach((x, k) => {
        expect(Object.is(all[k].mean, meanSd(x).mean) && Object.is(all[k].sd, meanSd(x).sd), `lengths ${lengths}, sample ${k}`).toBe(true);
        expect(sortedStatsAll(xs)[k]).toEqual(sortedStats(x));
      });
    }
  });

  it("tie groups without ties (shared arrays) equal the general construction", () => {
    const rng = seedrandom("groups");
    for (const m of [1, 2, 7, 1000, 3000]) {
      const s = sortedCopy(Array.from({ length: m }, () => gaussian(rng)));
      const fast = tieGroups(s);
      // A plain array takes the general path (it allocates the three arrays).
      const general = tieGroups(Array.from(s));
      expect(general.value).not.toBe(s);
      expect(Array.from(fast.start)).toEqual(Array.from(general.start));
      expect(Array.from(fast.end)).toEqual(Array.from(general.end));
      expect(Array.from(fast.value)).toEqual(Array.from(general.value));
    }
    // With ties, the general construction.
    const g = tieGroups(Float64Array.of(1, 1, 2, 3, 3, 3));
    expect([Array.from(g.start), Array.from(g.end), Array.from(g.value)]).toEqual([[0, 2, 3], [1, 2, 5], [1, 2, 3]]);
  });

  it("saves Phi evaluations on a large sample near the minimum (the reason it exists)", () => {
    const rng = seedrandom("savings");
    const s = sortedCopy(Array.from({ length: 100000 }, () => gaussian(rng)));
    const { mean, sd } = meanSd(s);
    const search = new KsDistanceSearch(s);
    for (let k = 0; k < 100; k++) search.distance(mean + 0.01 * sd * gaussian(rng), sd * Math.exp(0.01 * gaussian(rng)));
    // The plain loop makes 100 x 100,000 evaluations.
    expect(search.evaluations).toBeLessThan(0.2 * 100 * 100000);
  });

  it("normalDistance (minimiser on the pruned search) equals the same minimiser on the plain loop, every field", () => {
    for (const { name, x } of samples()) {
      const s = sortedCopy(x);
      const fast = normalDistanceSorted(s, 0.01, 0.01);
      const plain = normalDistanceSorted(s, 0.01, 0.01, true);
      expect(fast, name).toEqual(plain);
      expect(normalDistanceSorted(s, 0.01, 0.01, false, sortedStats(s)), name).toEqual(plain);
      expect(normalDistance(x, 0.01, 0.01), name).toEqual(fast);
      expect(fast.momentFit, name).toBe(ksNormalDistance(x));
    }
  });

  it("Anderson-Darling with ties (once per distinct value) equals the per-value loop, bit for bit", () => {
    const rng = seedrandom("ad-ties");
    const cases = [...samples().filter((c) => c.x.length >= 8), { name: "two values", x: Array.from({ length: 1001 }, () => (rng() < 0.3 ? -0 : 1)) }, { name: "zeros of both signs", x: Array.from({ length: 500 }, () => [-0, 0, 1, 2][Math.floor(4 * rng())]) }];
    let tied = 0;
    for (const { name, x } of cases) {
      const s = sortedCopy(x);
      const m = s.length;
      const { mean, sd } = meanSd(s);
      // The formula term by term (the code before the per-value evaluation).
      let sum = 0;
      for (let i = 0; i < m; i++) sum += (2 * i + 1) * (Math.log(Math.max(normalCdf((s[i] - mean) / sd), 1e-300)) + Math.log(Math.max(normalCdf(-((s[m - 1 - i] - mean) / sd)), 1e-300)));
      expect(andersonDarlingNormalSorted(s).statistic, name).toBe(-m - sum / m);
      expect(andersonDarlingNormalSorted(s, sortedStats(s)).statistic, name).toBe(-m - sum / m);
      if (new Set(s).size * 2 <= m) tied++;
    }
    // The per-value path ran (lattice, two values, zeros).
    expect(tied).toBeGreaterThanOrEqual(3);
  });

  it("the sorted-input entry points equal the unsorted ones", () => {
    for (const { x } of samples().filter((c) => c.x.length >= 8)) expect(andersonDarlingNormalSorted(sortedCopy(x))).toEqual(andersonDarlingNormal(x));
  });
});
