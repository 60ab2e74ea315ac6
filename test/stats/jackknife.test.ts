import { describe, expect, it } from "vitest";
import seedrandom from "seedrandom";
import { blockJackknife } from "../../src/stats/jackknife.js";
import { emptyMoments, pushValue } from "../../src/stats/moments.js";
import type { MomentState } from "../../src/stats/types.js";

function blocksOf(values: number[][][]): MomentState[][] {
  return values.map((block) =>
    block.map((series) => {
      const s = emptyMoments();
      for (const x of series) pushValue(s, x);
      return s;
    }),
  );
}

// Naive statistic: (mean of series 0, unbiased variance of series 1) from raw values.
function naiveStat(blocks: number[][][], skip: number): number[] {
  const a: number[] = [];
  const b: number[] = [];
  blocks.forEach((blk, j) => {
    if (j === skip) return;
    a.push(...blk[0]);
    b.push(...blk[1]);
  });
  const mean = (v: number[]) => v.reduce((x, y) => x + y, 0) / v.length;
  const mb = mean(b);
  return [mean(a), b.reduce((s, x) => s + (x - mb) ** 2, 0) / (b.length - 1)];
}

function synth(seed: string, sizes: number[]): number[][][] {
  const rng = seedrandom(seed);
  return sizes.map((m) => {
    const a: number[] = [];
    const b: number[] = [];
    for (let i = 0; i < m; i++) {
      const u = rng();
      a.push(u);
      b.push(u * u + rng());
    }
    return [a, b];
  });
}

const stat = (m: MomentState[]) => [m[0].mean, m[1].m2 / (m[1].count - 1)];

describe("delete-one-block jackknife", () => {
  it("equal blocks: matches the textbook (g-1)/g sum of squared deviations, computed naively", () => {
    const raw = synth("eq", [10, 10, 10, 10, 10]);
    const jk = blockJackknife(blocksOf(raw), stat);
    const g = raw.length;
    const loo = raw.map((_, j) => naiveStat(raw, j));
    const bar = [0, 1].map((a) => loo.reduce((s, t) => s + t[a], 0) / g);
    for (let a = 0; a < 2; a++)
      for (let b = 0; b < 2; b++) {
        const ref = ((g - 1) / g) * loo.reduce((s, t) => s + (t[a] - bar[a]) * (t[b] - bar[b]), 0);
        expect(jk.covariance[a * 2 + b]).toBeCloseTo(ref, 12);
      }
    const full = naiveStat(raw, -1);
    expect(jk.estimate[0]).toBeCloseTo(full[0], 13);
    expect(jk.estimate[1]).toBeCloseTo(full[1], 13);
    // The mean's jackknife: theta_J equals the mean and Var = sum (block mean - mean)^2 / (g(g-1)).
    expect(jk.biasCorrected[0]).toBeCloseTo(full[0], 12);
  });

  it("unequal blocks: matches the unequal-group jackknife ('Delete-m jackknife for unequal m', 1999) computed naively", () => {
    const sizes = [5, 9, 14, 7];
    const raw = synth("uneq", sizes);
    const jk = blockJackknife(blocksOf(raw), stat);
    const N = sizes.reduce((a, b) => a + b, 0);
    const g = sizes.length;
    const full = naiveStat(raw, -1);
    const loo = raw.map((_, j) => naiveStat(raw, j));
    for (let a = 0; a < 2; a++) {
      const thetaJ = g * full[a] - loo.reduce((s, t, j) => s + (1 - sizes[j] / N) * t[a], 0);
      expect(jk.biasCorrected[a]).toBeCloseTo(thetaJ, 11);
      let v = 0;
      loo.forEach((t, j) => {
        const h = N / sizes[j];
        v += (h * full[a] - (h - 1) * t[a] - thetaJ) ** 2 / (h - 1);
      });
      expect(jk.covariance[a * 2 + a]).toBeCloseTo(v / g, 11);
    }
  });

  it("the variance of a mean is about s^2/N (|ratio - 1| within 3 SE of the variance-of-variance)", () => {
    // 64 blocks x 50 values of U(0,1): s^2/N = (1/12)/3200; the jackknife variance estimate has
    // relative SE about sqrt(2/(g-1)) = 0.178 (chi-square with g-1 df); z = 3.
    const raw = synth("mean", new Array(64).fill(50));
    const jk = blockJackknife(blocksOf(raw), stat);
    const ratio = jk.covariance[0] / (1 / 12 / 3200);
    expect(Math.abs(ratio - 1)).toBeLessThanOrEqual(3 * Math.sqrt(2 / 63));
  });

  it("rejects bad input naming the field", () => {
    expect(() => blockJackknife(blocksOf(synth("x", [3])), stat)).toThrow(/^blocks:/);
  });
});
