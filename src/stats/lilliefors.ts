// Kolmogorov-Smirnov distance to a normal law with estimated mean and variance, and its
// Lilliefors p-value.
//
// Statistic: D = sup_x |F_m(x) - Phi((x - xbar)/s)|, s the unbiased sample SD (Lilliefors,
// JASA 62 (1967) 399). Ties: the supremum against a continuous Phi is attained at the jump points
// of the empirical CDF, so with a tied value v (k copies) the candidates are F_m(v) - Phi(v) (after
// the whole jump) and Phi(v) - F_m(v-) (before it); the usual i/m, (i-1)/m formula over the sorted
// sample gives exactly these, so D is exact with ties. What ties break is the p-value: both
// approximations below assume a continuous law (with lattice data the KS distance has a floor of
// about half the largest atom mass, so the p-value is too small).
// p-value: Dallal & Wilkinson, "An analytic approximation to the distribution of Lilliefors's test
// statistic for normality", Am. Stat. 40 (1986) 294-296 (for p < 0.1; n > 100 via D (n/100)^0.49
// at n = 100), and above 0.1 Stephens' modified statistic D* = D (sqrt m - 0.01 + 0.85/sqrt m)
// (Stephens, JASA 69 (1974) 730) with the piecewise polynomials used in the R package nortest
// (lillie.test; coefficients read from its source).
// Cost O(m log m) for the sort, O(m) after. Example: ksNormalDistance([-1, 0, 1]) = 0.1746.

import { normalCdf } from "./normal.js";

/** Sample mean and unbiased SD of a sorted or unsorted sample. */
export function meanSd(x: ArrayLike<number>): { mean: number; sd: number } {
  const m = x.length;
  let mean = 0;
  for (let i = 0; i < m; i++) mean += (x[i] - mean) / (i + 1);
  let ss = 0;
  for (let i = 0; i < m; i++) ss += (x[i] - mean) * (x[i] - mean);
  return { mean, sd: Math.sqrt(ss / (m - 1)) };
}

/** Returns an ascending copy (NaNs rejected with a field-named error). */
export function sortedCopy(x: ArrayLike<number>, field = "sample"): Float64Array {
  const s = Float64Array.from(x);
  for (let i = 0; i < s.length; i++) if (Number.isNaN(s[i])) throw new Error(`${field}[${i}]: NaN`);
  return s.sort();
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

/** Lilliefors p-value of D for a sample of size m >= 5 (Dallal-Wilkinson / Stephens). */
export function lillieforsPValue(d: number, m: number): number {
  if (!(m >= 5)) throw new Error(`m: the Lilliefors p-value needs m >= 5, got ${m}`);
  const kd = m <= 100 ? d : d * Math.pow(m / 100, 0.49);
  const nd = m <= 100 ? m : 100;
  let p = Math.exp(
    -7.01256 * kd * kd * (nd + 2.78019) + 2.99587 * kd * Math.sqrt(nd + 2.78019) - 0.122119 + 0.974598 / Math.sqrt(nd) + 1.67997 / nd,
  );
  if (p > 0.1) {
    const k = (Math.sqrt(m) - 0.01 + 0.85 / Math.sqrt(m)) * d;
    if (k <= 0.302) p = 1;
    else if (k <= 0.5) p = 2.76773 - 19.828315 * k + 80.709644 * k ** 2 - 138.55152 * k ** 3 + 81.218052 * k ** 4;
    else if (k <= 0.9) p = -4.901232 + 40.662806 * k - 97.490286 * k ** 2 + 94.029866 * k ** 3 - 32.355711 * k ** 4;
    else if (k <= 1.31) p = 6.198765 - 19.558097 * k + 23.186922 * k ** 2 - 12.234627 * k ** 3 + 2.423045 * k ** 4;
    else p = 0;
  }
  return Math.min(1, Math.max(0, p));
}
