import { describe, expect, it } from "vitest";
import { holm } from "../../src/stats/holm.js";
import { wilsonInterval } from "../../src/stats/binomial.js";
import { excessKurtosisZ, skewnessZ } from "../../src/stats/shape.js";
import { emptyMoments, pushValue, summarize } from "../../src/stats/moments.js";

describe("Holm step-down", () => {
  it("hand-worked example", () => {
    // Sorted: 0.005 (x4 = 0.02), 0.01 (x3 = 0.03), 0.03 (x2 = 0.06), 0.04 (x1 = 0.04 -> 0.06 running max).
    const r = holm([0.01, 0.04, 0.03, 0.005], 0.05);
    expect(r.adjusted.map((x) => Number(x.toFixed(12)))).toEqual([0.03, 0.06, 0.06, 0.02]);
    expect(r.rejected).toEqual([true, false, false, true]);
  });
  it("stops at the first non-rejection even if a later raw p is small enough for its own threshold", () => {
    // k = 3, alpha = 0.05: 0.02 > 0.05/3 -> nothing rejected although 0.024 < 0.05/2.
    expect(holm([0.02, 0.024, 0.5], 0.05).rejected).toEqual([false, false, false]);
  });
  it("ignores NaN and names bad alpha", () => {
    const r = holm([NaN, 0.001], 0.01);
    expect(r.rejected).toEqual([false, true]);
    expect(Number.isNaN(r.adjusted[0])).toBe(true);
    expect(() => holm([0.1], 0)).toThrow(/^alpha:/);
  });
});

describe("Wilson interval", () => {
  it("matches the closed form computed by hand", () => {
    // z = 1.959963985, z^2 = 3.841458821: centre (5 + 1.920729410)/103.841458821 = 0.066647074,
    // half-width 1.959963985 sqrt(4.75 + 0.960364705)/103.841458821 = 0.045103395 (worked by hand,
    // re-checked with python3 float arithmetic).
    const [lo, hi] = wilsonInterval(5, 100, 0.95);
    expect(lo).toBeCloseTo(0.021543679, 8);
    expect(hi).toBeCloseTo(0.111750469, 8);
    expect(wilsonInterval(0, 100, 0.95)[0]).toBe(0);
    expect(() => wilsonInterval(101, 100)).toThrow(/^successes:/);
  });
});

describe("shape z-scores", () => {
  it("standardise g1 and g2 by their exact normal-theory moments", () => {
    const s = emptyMoments();
    for (const x of [0, 0, 1, 0, 3, 1, 0, 2, 0, 5]) pushValue(s, x);
    const sm = summarize(s);
    expect(skewnessZ(sm)).toBeCloseTo(sm.skewness / Math.sqrt((6 * 8) / (11 * 13)), 12);
    expect(excessKurtosisZ(sm)).toBeCloseTo((sm.excessKurtosis + 6 / 11) / Math.sqrt((24 * 10 * 8 * 7) / (121 * 13 * 15)), 12);
  });
});
