// Evidence about the limit law of one measure, from the kept per-path sample and the block sums.
//
// Gate (house rule): finite-n laws are never exactly normal, so "normal" is judged by an effect
// size: the (1 - alpha) DKW upper bound of the Kolmogorov distance to the normal family at the
// largest n must be below the tolerance, and |skewness| must not grow significantly with n
// (one-sided z of |g1(n_max)| - |g1(n_min)|, jackknife SE over blocks, correlation included).
// Lilliefors and Anderson-Darling p-values, skewness and kurtosis z-scores are reported only.
// KS distance vs n: a log-log slope is given only over grid points where the distance exceeds
// 3x its resolution floor 0.87/sqrt(m); otherwise "below resolution".

import { andersonDarlingNormal, type AndersonDarlingResult } from "../stats/anderson-darling.js";
import { blockJackknife } from "../stats/jackknife.js";
import { ksNormalDistance, lillieforsPValue } from "../stats/lilliefors.js";
import { mergeAll, summarize } from "../stats/moments.js";
import { normalDistance, type NormalDistance } from "../stats/normal-distance.js";
import { normalSf } from "../stats/normal.js";
import { excessKurtosisZ, skewnessZ } from "../stats/shape.js";
import type { MomentState } from "../stats/types.js";

export interface NormalityEvidence {
  n: number;
  distance: NormalDistance;
  lillieforsD: number;
  lillieforsP: number;
  anderson: AndersonDarlingResult;
  skewness: number;
  skewnessZ: number;
  kurtosisZ: number;
  /** One-sided test that |skewness| grows from the smallest to the largest n (null with one n). */
  skewGrowth: { z: number; pValue: number } | null;
  /**
   * One-sided test that |skewness| at the largest n exceeds |g1(n_min)| sqrt(n_min/n_max), the
   * n^-1/2 decay a normal limit implies (first Edgeworth term; common practice): a skewness that
   * persists is evidence of a non-normal LIMIT even when the finite-n distance is below tolerance.
   */
  skewPersistence: { z: number; pValue: number } | null;
  /** KS distance vs n, or the reason it is not given. */
  ksTrend: string;
}

function skewness(st: MomentState): number {
  return st.m3 / st.count / Math.pow(st.m2 / st.count, 1.5);
}

/**
 * samples[g]: kept per-path values at grid point g; blocks[b][g]: block sums.
 * Throws `sample: ...` when the largest-n sample is unusable.
 */
export function normalityEvidence(n: number[], samples: ArrayLike<number>[], blocks: MomentState[][], tol: number, alpha: number): NormalityEvidence {
  const G = n.length;
  const last = samples[G - 1];
  const distance = normalDistance(last, tol, alpha);
  const lillieforsD = distance.momentFit;
  const lillieforsP = lillieforsPValue(lillieforsD, distance.size);
  const anderson = distance.size >= 8 ? andersonDarlingNormal(last) : { statistic: NaN, modified: NaN, pValue: NaN };
  const merged = summarize(mergeAll(blocks.map((b) => b[G - 1])));
  let skewGrowth: NormalityEvidence["skewGrowth"] = null;
  let skewPersistence: NormalityEvidence["skewPersistence"] = null;
  if (G >= 2 && blocks.length >= 2) {
    const jk = blockJackknife(blocks.map((b) => [b[0], b[G - 1]]), (m) => [skewness(m[0]), skewness(m[1])]);
    const [g0, g1] = jk.estimate;
    const s1 = Math.sign(g1) || 1;
    const s0 = Math.sign(g0) || 1;
    const diff = Math.abs(g1) - Math.abs(g0);
    const c = jk.covariance;
    const v = c[3] + c[0] - 2 * s1 * s0 * c[1];
    const z = v > 0 ? diff / Math.sqrt(v) : 0;
    skewGrowth = { z, pValue: normalSf(z) };
    const r = Math.sqrt(n[0] / n[G - 1]);
    const dp = Math.abs(g1) - r * Math.abs(g0);
    const vp = c[3] + r * r * c[0] - 2 * r * s1 * s0 * c[1];
    const zp = vp > 0 ? dp / Math.sqrt(vp) : 0;
    skewPersistence = { z: zp, pValue: normalSf(zp) };
  }
  const points: { n: number; d: number }[] = [];
  const below: number[] = [];
  for (let g = 0; g < G; g++) {
    const m = samples[g].length;
    if (m < 5) continue;
    let d: number;
    try {
      d = ksNormalDistance(samples[g]);
    } catch {
      continue;
    }
    if (d > 3 * (0.87 / Math.sqrt(m))) points.push({ n: n[g], d });
    else below.push(n[g]);
  }
  let ksTrend: string;
  if (points.length >= 2) {
    const xs = points.map((p) => Math.log(p.n));
    const ys = points.map((p) => Math.log(p.d));
    const mx = xs.reduce((a, b) => a + b, 0) / xs.length;
    const my = ys.reduce((a, b) => a + b, 0) / ys.length;
    let sxy = 0;
    let sxx = 0;
    for (let i = 0; i < xs.length; i++) {
      sxy += (xs[i] - mx) * (ys[i] - my);
      sxx += (xs[i] - mx) ** 2;
    }
    ksTrend = `KS distance ~ n^${(sxy / sxx).toFixed(2)} over n = ${points.map((p) => p.n).join(", ")} (least squares on log-log)` + (below.length ? `; below resolution at n = ${below.join(", ")}` : "");
  } else {
    ksTrend = "KS distance vs n: below resolution (3 x 0.87/sqrt(m)) at " + (points.length === 1 ? `all n but ${points[0].n}` : "every n");
  }
  return {
    n: n[G - 1],
    distance,
    lillieforsD,
    lillieforsP,
    anderson,
    skewness: merged.skewness,
    skewnessZ: skewnessZ(merged),
    kurtosisZ: excessKurtosisZ(merged),
    skewGrowth,
    skewPersistence,
    ksTrend,
  };
}
