import { describe, expect, it } from "vitest";
import seedrandom from "seedrandom";
import {
  covarianceMatrix,
  emptyCoMoments,
  emptyMoments,
  mergeAll,
  mergeCoMoments,
  mergeMoments,
  pushValue,
  pushVector,
  summarize,
} from "../../src/stats/moments.js";

// Naive two-pass central moment sums (the oracle).
function naive(xs: number[]) {
  const n = xs.length;
  const mean = xs.reduce((a, b) => a + b, 0) / n;
  let m2 = 0, m3 = 0, m4 = 0;
  for (const x of xs) {
    const d = x - mean;
    m2 += d * d; m3 += d * d * d; m4 += d * d * d * d;
  }
  return { count: n, mean, m2, m3, m4 };
}

function sampleValues(seed: string, n: number, shift = 0): number[] {
  const rng = seedrandom(seed);
  const xs: number[] = [];
  for (let i = 0; i < n; i++) xs.push(shift + Math.pow(rng(), 2) * 10 - 3);
  return xs;
}

function close(a: number, b: number, rel = 1e-12) {
  expect(Math.abs(a - b)).toBeLessThanOrEqual(rel * Math.max(1, Math.abs(b)));
}

describe("moments (Pebay 2008)", () => {
  it("doc example: 1,2,3,4", () => {
    const s = emptyMoments();
    for (const x of [1, 2, 3, 4]) pushValue(s, x);
    expect(s.count).toBe(4);
    close(s.mean, 2.5); close(s.m2, 5); close(s.m3, 0); close(s.m4, 10.25);
    close(summarize(s).variance, 5 / 3);
  });

  it("one-pass equals the naive two-pass sums", () => {
    const xs = sampleValues("one-pass", 37, 1e3);
    const s = emptyMoments();
    for (const x of xs) pushValue(s, x);
    const t = naive(xs);
    close(s.mean, t.mean); close(s.m2, t.m2, 1e-9); close(s.m3, t.m3, 1e-7); close(s.m4, t.m4, 1e-9);
  });

  it("merge equals one-pass over the concatenation, and is deterministic", () => {
    const a = sampleValues("a", 13), b = sampleValues("b", 29, 2.5), c = sampleValues("c", 1);
    const sa = emptyMoments(), sb = emptyMoments(), sc = emptyMoments(), all = emptyMoments();
    for (const x of a) pushValue(sa, x);
    for (const x of b) pushValue(sb, x);
    for (const x of c) pushValue(sc, x);
    for (const x of [...a, ...b, ...c]) pushValue(all, x);
    const m = mergeAll([sa, sb, sc]);
    close(m.mean, all.mean); close(m.m2, all.m2, 1e-10); close(m.m3, all.m3, 1e-9); close(m.m4, all.m4, 1e-10);
    const t = naive([...a, ...b, ...c]);
    close(m.m4, t.m4, 1e-10);
    expect(mergeMoments(sa, sb)).toEqual(mergeMoments(sa, sb));
    expect(mergeMoments(emptyMoments(), sa)).toEqual(sa);
    expect(mergeMoments(sa, emptyMoments())).toEqual(sa);
  });

  it("summary against naive formulas", () => {
    const xs = sampleValues("sum", 50);
    const s = emptyMoments();
    for (const x of xs) pushValue(s, x);
    const t = naive(xs);
    const n = xs.length;
    const sm = summarize(s);
    const v = t.m2 / (n - 1);
    close(sm.variance, v, 1e-12);
    close(sm.meanSE, Math.sqrt(v / n), 1e-12);
    close(sm.skewness, (t.m3 / n) / Math.pow(t.m2 / n, 1.5), 1e-10);
    close(sm.excessKurtosis, (t.m4 / n) / Math.pow(t.m2 / n, 2) - 3, 1e-10);
    close(sm.varianceSE, Math.sqrt((t.m4 / n - ((n - 3) / (n - 1)) * v * v) / n), 1e-10);
    close(sm.skewnessSE, Math.sqrt((6 * 48) / (51 * 53)), 1e-14);
    close(sm.excessKurtosisSE, Math.sqrt((24 * 50 * 48 * 47) / (51 * 51 * 53 * 55)), 1e-14);
  });

  it("too few values give NaN, not garbage", () => {
    const s = emptyMoments();
    pushValue(s, 3);
    const sm = summarize(s);
    expect(sm.mean).toBe(3);
    expect(Number.isNaN(sm.variance)).toBe(true);
    expect(Number.isNaN(sm.skewness)).toBe(true);
  });
});

describe("co-moments (Pebay 2008)", () => {
  const dim = 3;
  function vectors(seed: string, m: number): number[] {
    const rng = seedrandom(seed);
    const out: number[] = [];
    for (let i = 0; i < m; i++) {
      const u = rng(), v = rng(), w = rng();
      out.push(u, u + 0.5 * v, 100 + w - u);
    }
    return out;
  }
  function naiveCov(flat: number[]): number[] {
    const m = flat.length / dim;
    const mean = [0, 0, 0];
    for (let i = 0; i < m; i++) for (let a = 0; a < dim; a++) mean[a] += flat[i * dim + a] / m;
    const c = new Array(dim * dim).fill(0);
    for (let i = 0; i < m; i++)
      for (let a = 0; a < dim; a++)
        for (let b = 0; b < dim; b++)
          c[a * dim + b] += (flat[i * dim + a] - mean[a]) * (flat[i * dim + b] - mean[b]);
    return c.map((x) => x / (m - 1));
  }

  it("one-pass and merge equal the naive covariance", () => {
    const x = vectors("x", 20), y = vectors("y", 7);
    const sx = emptyCoMoments(dim), sy = emptyCoMoments(dim), all = emptyCoMoments(dim);
    for (let i = 0; i < 20; i++) pushVector(sx, x, i * dim);
    for (let i = 0; i < 7; i++) pushVector(sy, y, i * dim);
    const xy = [...x, ...y];
    for (let i = 0; i < 27; i++) pushVector(all, xy, i * dim);
    const ref = naiveCov(xy);
    const one = covarianceMatrix(all);
    const merged = covarianceMatrix(mergeCoMoments(sx, sy));
    for (let k = 0; k < dim * dim; k++) {
      close(one[k], ref[k], 1e-10);
      close(merged[k], ref[k], 1e-10);
    }
    const diag = emptyMoments();
    for (let i = 0; i < 27; i++) pushValue(diag, xy[i * dim + 1]);
    close(one[4], summarize(diag).variance, 1e-12);
  });

  it("rejects mismatched dimensions with a field-named error", () => {
    expect(() => mergeCoMoments(emptyCoMoments(2), emptyCoMoments(3))).toThrow(/^comoments\.dim:/);
    expect(() => emptyCoMoments(0)).toThrow(/^dim:/);
  });
});
