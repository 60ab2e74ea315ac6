// Kolmogorov-Smirnov distance to a normal law with estimated mean and variance, and its
// Lilliefors p-value.
//
// Statistic: D = sup_x |F_m(x) - Phi((x - xbar)/s)|, s the unbiased sample SD ("On the
// Kolmogorov-Smirnov test for normality with mean and variance unknown", JASA 62 (1967) 399).
// Ties: the supremum against a continuous Phi is attained at the jump points of the empirical CDF,
// so with a tied value v (k copies) the candidates are F_m(v) - Phi(v) (after the whole jump) and
// Phi(v) - F_m(v-) (before it); the usual i/m, (i-1)/m formula over the sorted sample gives exactly
// these, so D is exact with ties. What ties break is the p-value: the null law below assumes a
// continuous law (with lattice data the KS distance has a floor of about half the largest atom mass,
// so the p-value is too small).
// p-value, from the primary papers:
// - m <= 100 and p <= 0.10: the analytic approximation of "An analytic approximation to the
//   distribution of Lilliefors's test statistic for normality", Am. Stat. 40 (1986) 294-296:
//   p = exp(-7.01256 D^2 (m + 2.78019) + 2.99587 D sqrt(m + 2.78019) - 0.122119 + 0.974598/sqrt(m)
//   + 1.67997/m), stated there for p < 0.1 [memory for the coefficients].
// - otherwise, the modified statistic D* = D (sqrt m - 0.01 + 0.85/sqrt m) and its published upper
//   percentage points for the normal law with estimated mean and variance: 0.775 (15%), 0.819 (10%),
//   0.895 (5%), 0.955 (2.5%), 1.035 (1%) ("EDF statistics for goodness of fit and some comparisons",
//   JASA 69 (1974) 730-737, table 1A; "Goodness-of-Fit Techniques" (1986), ch. 4, table 4.7, case 3)
//   [memory for the values]; ln p is interpolated linearly in D*^2 between them, and extrapolated
//   from the last two points beyond 1% (a Gaussian-type tail, common practice) [our interpolation].
//   The 1986 approximation's own rule for m > 100 (D (m/100)^0.49 at m = 100) drifts from these
//   points as m grows (p 1.6 times the level at the 1% point when m = 5000), so it is not used there.
// - D* below the 15% point: the tables give no finer value; the p-value is reported as its lower
//   bound LILLIEFORS_P_FLOOR = 0.15 (read it as "p >= 0.15"), never as a made-up number.
// Cost O(m log m) for the sort, O(m) after. Example: ksNormalDistance([-1, 0, 1]) = 0.1746.

import { normalCdf } from "./normal.js";
import { sortedFloat64 } from "./sort.js";

/** Sample mean and unbiased SD of a sorted or unsorted sample. */
export function meanSd(x: ArrayLike<number>): { mean: number; sd: number } {
  const m = x.length;
  let mean = 0;
  for (let i = 0; i < m; i++) mean += (x[i] - mean) / (i + 1);
  let ss = 0;
  for (let i = 0; i < m; i++) ss += (x[i] - mean) * (x[i] - mean);
  return { mean, sd: Math.sqrt(ss / (m - 1)) };
}

/**
 * meanSd of each sample, the same numbers. Samples of one length go three at a time through one
 * loop: each running mean is a chain of dependent divisions, and three independent chains overlap
 * (about half the CPU time of three meanSd calls on 10^5 values, measured).
 */
export function meanSdAll(xs: readonly ArrayLike<number>[]): { mean: number; sd: number }[] {
  const out: { mean: number; sd: number }[] = [];
  let k = 0;
  while (k < xs.length) {
    const m = xs[k].length;
    if (k + 2 < xs.length && xs[k + 1].length === m && xs[k + 2].length === m) {
      out.push(...meanSd3(xs[k], xs[k + 1], xs[k + 2]));
      k += 3;
    } else out.push(meanSd(xs[k++]));
  }
  return out;
}

/** meanSd of three samples of one length, in one loop per sum. */
function meanSd3(a: ArrayLike<number>, b: ArrayLike<number>, c: ArrayLike<number>): { mean: number; sd: number }[] {
  const m = a.length;
  const means = runningMeans3(a, b, c);
  const ss = squareSums3(a, b, c, means);
  return [0, 1, 2].map((k) => ({ mean: means[k], sd: Math.sqrt(ss[k] / (m - 1)) }));
}

// One loop per function, and nothing after it but the return: V8 compiles a long loop on-stack in
// its first call, and code after it that had not run yet sent every later call back to the
// interpreter (--trace-deopt), for the whole of a second loop.

function runningMeans3(a: ArrayLike<number>, b: ArrayLike<number>, c: ArrayLike<number>): [number, number, number] {
  const m = a.length;
  let ma = 0, mb = 0, mc = 0;
  for (let i = 0; i < m; i++) {
    const n = i + 1;
    ma += (a[i] - ma) / n;
    mb += (b[i] - mb) / n;
    mc += (c[i] - mc) / n;
  }
  return [ma, mb, mc];
}

function squareSums3(a: ArrayLike<number>, b: ArrayLike<number>, c: ArrayLike<number>, [ma, mb, mc]: [number, number, number]): [number, number, number] {
  const m = a.length;
  let sa = 0, sb = 0, sc = 0;
  for (let i = 0; i < m; i++) {
    sa += (a[i] - ma) * (a[i] - ma);
    sb += (b[i] - mb) * (b[i] - mb);
    sc += (c[i] - mc) * (c[i] - mc);
  }
  return [sa, sb, sc];
}

/** Returns an ascending copy (NaNs rejected with a field-named error). */
export function sortedCopy(x: ArrayLike<number>, field = "sample"): Float64Array {
  const { sorted, firstNaN } = sortedFloat64(x);
  if (firstNaN >= 0) throw new Error(`${field}[${firstNaN}]: NaN`);
  return sorted;
}

/** sup_x |F_m(x) - Phi((x - mu)/sigma)| for an ascending sample (exact with ties). */
export function ksDistanceSorted(sorted: ArrayLike<number>, mu: number, sigma: number): number {
  const m = sorted.length;
  let d = 0;
  let i = 0;
  while (i < m) {
    let j = i;
    while (j + 1 < m && sorted[j + 1] === sorted[i]) j++;
    const p = normalCdf((sorted[i] - mu) / sigma);
    d = Math.max(d, (j + 1) / m - p, p - i / m);
    i = j + 1;
  }
  return d;
}

/** The Lilliefors statistic: KS distance to the normal with the sample's mean and SD. */
export function ksNormalDistance(x: ArrayLike<number>): number {
  const s = sortedCopy(x);
  if (s.length < 5) throw new Error(`sample: the Lilliefors statistic needs at least 5 values, got ${s.length}`);
  const { mean, sd } = meanSd(s);
  if (!(sd > 0)) throw new Error("sample: zero variance");
  return ksDistanceSorted(s, mean, sd);
}

/** Upper percentage points of D* (normal law, mean and variance estimated), see above. */
export const LILLIEFORS_DSTAR_POINTS: readonly [number, number][] = [[0.775, 0.15], [0.819, 0.1], [0.895, 0.05], [0.955, 0.025], [1.035, 0.01]];
/** The p-value reported when D* is below the 15% point: a lower bound ("p >= 0.15"). */
export const LILLIEFORS_P_FLOOR = 0.15;

/** p-value from the percentage points of D*: ln p linear in D*^2 between (and beyond) them. */
function dstarPValue(dstar: number): number {
  const pts = LILLIEFORS_DSTAR_POINTS;
  if (dstar <= pts[0][0]) return LILLIEFORS_P_FLOOR;
  let k = 1;
  while (k < pts.length - 1 && dstar > pts[k][0]) k++;
  const [[d0, p0], [d1, p1]] = [pts[k - 1], pts[k]];
  const t = (dstar * dstar - d0 * d0) / (d1 * d1 - d0 * d0);
  return Math.exp(Math.log(p0) + t * (Math.log(p1) - Math.log(p0)));
}

/** Lilliefors p-value of D for a sample of size m >= 5 (see the sources above). */
export function lillieforsPValue(d: number, m: number): number {
  if (!(m >= 5)) throw new Error(`m: the Lilliefors p-value needs m >= 5, got ${m}`);
  const dstar = (Math.sqrt(m) - 0.01 + 0.85 / Math.sqrt(m)) * d;
  if (m <= 100) {
    const p = Math.exp(-7.01256 * d * d * (m + 2.78019) + 2.99587 * d * Math.sqrt(m + 2.78019) - 0.122119 + 0.974598 / Math.sqrt(m) + 1.67997 / m);
    if (p <= 0.1) return Math.max(0, p);
    return Math.max(0.1, dstarPValue(dstar));
  }
  return Math.min(1, dstarPValue(dstar));
}
