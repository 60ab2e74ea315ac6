// The data behind the plots: QQ pairs, histogram densities, the KS-distance rate fit and the
// fitted variance curve, on inputs whose answer is known.

import { describe, expect, it } from "vitest";
import { histogramData, hullSvg, ksSeries, qqData, tieCdfData, tieCdfSvg, varianceSeries } from "../../src/report/plots.js";
import { linearTicks, logTicks } from "../../src/report/svg.js";
import { normalCdf, normalQuantile } from "../../src/stats/normal.js";
import type { LimitEstimate } from "../../src/verdict/types.js";

/** Deterministic "sample": the quantiles of a law at (i - 1/2)/m, no sampling noise. */
const quantileSample = (m: number, q: (p: number) => number) => Float64Array.from({ length: m }, (_, i) => q((i + 0.5) / m));

describe("plot data", () => {
  it("QQ pairs of a normal quantile sample lie on the diagonal; K = min(m, 400)", () => {
    const x = quantileSample(4000, (p) => 3 + 2 * normalQuantile(p));
    const d = qqData(x);
    expect(d.theoretical).toHaveLength(400);
    // The sample SD of these quantiles is slightly below 1 (their tails are truncated at the
    // 1/(2m) quantile), so the standardised values differ from z by at most about 0.2%.
    for (let i = 0; i < 400; i++) expect(Math.abs(d.observed[i] - d.theoretical[i])).toBeLessThan(0.02 * (1 + Math.abs(d.theoretical[i])));
    expect(qqData([1, 2, 3]).theoretical).toHaveLength(3);
  });

  it("histogram densities integrate to 1; integer data with few values get unit bins", () => {
    const x = quantileSample(5000, (p) => normalQuantile(p));
    const h = histogramData(x);
    const total = h.density.reduce((s, d, i) => s + d * (h.edges[i + 1] - h.edges[i]), 0);
    expect(total).toBeCloseTo(1, 12);
    expect(h.discrete).toBe(false);
    const ints = Float64Array.from({ length: 994 }, (_, i) => 10 + (i % 7));
    const hi = histogramData(ints);
    expect(hi.discrete).toBe(true);
    expect(hi.density).toHaveLength(7);
    expect(hi.density.every((d) => Math.abs(d - hi.density[0]) < 1e-9)).toBe(true);
  });

  it("KS rate: lognormal samples with sigma = n^-1/2 give a log-log slope near -1/2", () => {
    // For small s the law of exp(s Z) is at a KS distance proportional to its skewness (3s + O(s^3))
    // from the normal family (first Edgeworth term), so with s = n^-1/2 the distance decays like
    // n^-1/2 up to O(s^2) relative terms: with s <= 0.32 the slope is within 0.05 of 1/2 [derived].
    const n = [10, 40, 160, 640];
    const cols = n.map((k) => quantileSample(200000, (p) => Math.exp(normalQuantile(p) / Math.sqrt(k))));
    const ks = ksSeries(n, cols);
    expect(ks.floor).toBeCloseTo(0.87 / Math.sqrt(200000), 12);
    expect(ks.fit).not.toBeNull();
    expect(ks.fit!.used).toEqual(n);
    expect(Math.abs(ks.fit!.rate - 0.5)).toBeLessThan(0.05);
    // Normal samples: every distance is below 3x the floor, so no rate is fitted.
    const flat = ksSeries(n, n.map(() => quantileSample(20000, normalQuantile)));
    expect(flat.fit).toBeNull();
  });

  it("the fitted variance curve recovers c when the ratios follow s2 + c n^-beta exactly", () => {
    const [s2, c, beta] = [6.8, -3.2, 0.5];
    const ns = [100, 200, 400, 800, 1600];
    const limit: LimitEstimate = {
      measure: "perimeter", quantity: "varianceLimit", scaling: 1, method: "profile", estimate: s2, standardError: 0.01, ci: [6.78, 6.82], level: 0.95, beta, betaInterval: [0.3, 0.8], misfitPValue: 0.5, sensitivity: [],
      ratios: ns.map((n, i) => ({ n, value: s2 + c * Math.pow(n, -beta), standardError: 0.01 * (1 + i) })), note: "",
    };
    const v = varianceSeries("perimeter", [], undefined, [limit])!;
    expect(v.fitted!.c).toBeCloseTo(c, 10);
    expect(v.points).toHaveLength(5);
    expect(varianceSeries("perimeter", [], undefined, [])).toBeNull();
  });

  it("ticks are round and cover the domain", () => {
    expect(linearTicks(0.03, 0.97, 5)).toEqual([0.2, 0.4, 0.6, 0.8]);
    expect(logTicks(8, 2000)).toEqual([10, 100, 1000]);
    expect(logTicks(30, 90)).toEqual([40, 60, 80]);
    expect(logTicks(0.0025, 0.0072)).toEqual([0.004, 0.006]);
  });

  it("the hull plot has one circle per hull vertex and one path per walk", () => {
    const pts = Float64Array.from([0, 0, 1, 0, 2, 1, 1, 2]);
    const svg = hullSvg({ points: [pts, Float64Array.from([0, 0, -1, 1])], hull: Float64Array.from([0, 0, 1, 0, 2, 1, 1, 2, -1, 1]) });
    expect(svg.match(/<circle /g)).toHaveLength(5);
    expect(svg.match(/class="walk walk\d" data-walk/g)).toHaveLength(2);
    expect(svg).toMatch(/data-points="5"/);
  });
});

describe("tie CDF plot (gaussian-maximum law, docs/theory.md sec. 7.1)", () => {
  // Two independent forms of variance 1: F(x) = Phi(x)^2. The "sample" at each n is n d + sqrt(n) times the
  // quantiles of that law (no noise), so the empirical CDF sits on the predicted one.
  const law = { centre: 2, forms: [], covariance: [[1, 0], [0, 1]], mean: 1 / Math.sqrt(Math.PI), meanError: 0, variance: 1 - 1 / Math.PI, varianceError: 0, method: "test" };
  const grid = [16, 256];
  const columns = grid.map((n) => quantileSample(2000, (p) => n * 2 + Math.sqrt(n) * normalQuantile(Math.sqrt(p))));
  const d = tieCdfData(grid, columns, law);
  it("the predicted curve is Phi(x)^2 and the empirical CDFs (smallest and largest n) follow it", () => {
    d.predicted.x.forEach((x, i) => expect(Math.abs(d.predicted.F[i] - normalCdf(x) ** 2)).toBeLessThan(1e-6));
    expect(d.empirical.map((e) => e.n)).toEqual([16, 256]);
    for (const e of d.empirical) {
      expect(e.x).toHaveLength(400);
      e.x.forEach((x, i) => expect(Math.abs(e.F[i] - normalCdf(x) ** 2)).toBeLessThan(1.5 / 2000 + 1e-6));
    }
  });
  it("renders one SVG with the predicted and two empirical curves", () => {
    const svg = tieCdfSvg("diameter", d);
    expect(svg).toContain('data-plot="tie-cdf"');
    expect(svg.match(/<path class="(predicted|fit|floor)" d="M/g)).toHaveLength(3);
  });
});
