// src/stats against an independent implementation: simple-statistics (a declared dependency),
// on seeded samples of several shapes and sizes. Mean, variance, sample skewness and kurtosis,
// quantiles (the QQ plot's), and least squares (src/stats/gls.ts with identity weights).

import { describe, expect, it } from "vitest";
import seedrandom from "seedrandom";
import * as ss from "simple-statistics";
import { emptyMoments, mergeAll, pushValue, summarize } from "../../src/stats/moments.js";
import { meanSd } from "../../src/stats/lilliefors.js";
import { linearGls } from "../../src/stats/gls.js";
import { histogramData, qqData } from "../../src/report/plots.js";
import { normalQuantile } from "../../src/stats/normal.js";

const close = (a: number, b: number, rel: number) => expect(Math.abs(a - b), `${a} vs ${b}`).toBeLessThanOrEqual(rel * Math.max(1, Math.abs(b)));

function samples(): { name: string; x: number[] }[] {
  const rng = seedrandom("simple-statistics reference");
  const n = (k: number, f: () => number) => Array.from({ length: k }, f);
  const gauss = () => Math.sqrt(-2 * Math.log(1 - rng())) * Math.cos(2 * Math.PI * rng());
  return [
    { name: "uniform, 7 values", x: n(7, () => rng()) },
    { name: "exponential, 500 values", x: n(500, () => -Math.log(1 - rng())) },
    { name: "shifted normal, 10000 values", x: n(10000, () => 1e4 + 3 * gauss()) },
    { name: "integers, 2001 values", x: n(2001, () => Math.floor(6 * rng())) },
  ];
}

describe("moments vs simple-statistics", () => {
  for (const { name, x } of samples()) {
    it(name, () => {
      // In three blocks merged in order, as the engine does.
      const parts = [x.slice(0, 2), x.slice(2, Math.floor(x.length / 2)), x.slice(Math.floor(x.length / 2))].map((p) => {
        const s = emptyMoments();
        for (const v of p) pushValue(s, v);
        return s;
      });
      const s = summarize(mergeAll(parts));
      const m = x.length;
      close(s.mean, ss.mean(x), 1e-13);
      close(s.variance, ss.sampleVariance(x), 1e-10);
      close(meanSd(x).sd, ss.sampleStandardDeviation(x), 1e-10);
      // src/stats reports the moment estimators g1 = m3/m2^1.5 and g2 = m4/m2^2 - 3 (moments over n).
      close(s.skewness, ss.sampleSkewness(x, true), 1e-9);
      // simple-statistics' sampleKurtosis is the adjusted G2 = ((n + 1) g2 + 6)(n - 1)/((n - 2)(n - 3)).
      close(((m + 1) * s.excessKurtosis + 6) * (m - 1) / ((m - 2) * (m - 3)), ss.sampleKurtosis(x), 1e-9);
    });
  }
});

describe("quantiles vs simple-statistics", () => {
  it("the QQ plot's sample quantiles are the type-7 quantiles of the sample, standardised", () => {
    for (const { x } of samples()) {
      const d = qqData(x, 50);
      const { mean, sd } = meanSd(x);
      const K = d.observed.length;
      expect(K).toBe(Math.min(x.length, 50));
      for (let i = 0; i < K; i++) {
        const p = (i + 0.5) / K;
        close(d.theoretical[i], normalQuantile(p), 1e-12);
        close(d.observed[i], (ss.quantile(x, p) - mean) / sd, 1e-9);
      }
    }
  });

  it("the histogram's bins span [min, max] in equal widths and hold every value", () => {
    const { x } = samples()[1];
    const h = histogramData(x);
    const { mean, sd } = meanSd(x);
    close(h.edges[0] * sd + mean, ss.min(x), 1e-12);
    close(h.edges[h.edges.length - 1] * sd + mean, ss.max(x), 1e-12);
    const total = h.density.reduce((a, d, i) => a + d * (h.edges[i + 1] - h.edges[i]), 0);
    close(total, 1, 1e-12);
  });
});

describe("least squares vs simple-statistics", () => {
  it("GLS with identity weights gives the ordinary least-squares line", () => {
    const rng = seedrandom("regression");
    const pts = Array.from({ length: 40 }, (_, i) => [i / 3, 2.5 - 0.7 * (i / 3) + (rng() - 0.5)]);
    const y = pts.map((p) => p[1]);
    const design = pts.flatMap((p) => [1, p[0]]);
    const w = Float64Array.from({ length: 40 * 40 }, (_, k) => (k % 41 === 0 ? 1 : 0));
    const fit = linearGls(y, design, 2, w);
    const ref = ss.linearRegression(pts);
    close(fit.coef[0], ref.b, 1e-10);
    close(fit.coef[1], ref.m, 1e-10);
    // Residual sum of squares = chi2 with unit weights; R^2 from simple-statistics agrees.
    const line = ss.linearRegressionLine(ref);
    const rss = pts.reduce((a, p) => a + (p[1] - line(p[0])) ** 2, 0);
    close(fit.chi2, rss, 1e-9);
    close(1 - rss / (ss.sampleVariance(y) * 39), ss.rSquared(pts, line), 1e-9);
  });
});
