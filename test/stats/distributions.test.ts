import { describe, expect, it } from "vitest";
import seedrandom from "seedrandom";
import stdlibNormalCdf from "@stdlib/stats-base-dists-normal-cdf";
import { normalCdf, normalQuantile, normalSf, twoSidedNormalP } from "../../src/stats/normal.js";
import { chiSquareCdf, chiSquareQuantile, chiSquareSf } from "../../src/stats/chisquare.js";

// Reference values: standard normal and chi-square tables (e.g. Abramowitz & Stegun, Handbook of
// Mathematical Functions, tables 26.1 and 26.8), to the digits printed there.
describe("normal law (stdlib wrappers)", () => {
  it("matches tabulated quantiles", () => {
    expect(normalCdf(1.959963984540054)).toBeCloseTo(0.975, 14);
    expect(normalCdf(0)).toBe(0.5);
    expect(normalQuantile(0.995)).toBeCloseTo(2.5758293035489, 12);
    expect(twoSidedNormalP(1.959963984540054)).toBeCloseTo(0.05, 14);
  });
  it("keeps digits in the far upper tail (Phi(-z), not 1 - Phi(z))", () => {
    // 1 - Phi(10) = 7.61985302416e-24 (A&S 26.2.2 tail table, 12 digits).
    expect(normalSf(10) / 7.61985302416e-24).toBeCloseTo(1, 9);
  });
  it("Phi is stdlib's normal CDF at mu = 0, sigma = 1, bit for bit (it calls erfc directly)", () => {
    const rng = seedrandom("phi");
    const z = [0, -0, 1, -1, 1e-300, -1e-300, 5e-324, 0.84375, -0.84375, 1.25, -1.25, 6, -6, 27.9, -27.9, 40, -40, 1e300, -1e300, Infinity, -Infinity];
    for (let i = 0; i < 200000; i++) z.push((rng() - 0.5) * [1e-8, 2, 5, 12, 80][i % 5]);
    let differ = 0;
    for (const x of z) if (!Object.is(normalCdf(x), stdlibNormalCdf(x, 0, 1)) || !Object.is(normalSf(x), stdlibNormalCdf(-x, 0, 1))) differ++;
    expect(differ).toBe(0);
    expect(normalCdf(NaN)).toBeNaN();
  });
});

describe("chi-square law (stdlib wrapper)", () => {
  it("matches tabulated critical values", () => {
    expect(chiSquareCdf(3.841458820694124, 1)).toBeCloseTo(0.95, 12);
    expect(chiSquareSf(5.991464547107979, 2)).toBeCloseTo(0.05, 12);
    expect(chiSquareSf(11.344866730144373, 3)).toBeCloseTo(0.01, 12);
  });
  it("the quantile inverts the CDF", () => {
    expect(chiSquareQuantile(0.95, 1)).toBeCloseTo(3.841458820694124, 8);
    expect(chiSquareQuantile(0.99, 3)).toBeCloseTo(11.344866730144373, 8);
  });
  it("rejects bad degrees of freedom naming the field", () => {
    expect(() => chiSquareSf(1, 0)).toThrow(/^k:/);
  });
});
