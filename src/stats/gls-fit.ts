// The GLS fit itself (src/stats/gls.ts has the method and its sources), without the misfit p-value:
// callers that read only the coefficients (the shape-limit fits of src/verdict/normality.ts, run on
// the law-evidence helper threads) then do not load the chi-square distribution's modules (~70 ms of
// a helper thread's start-up).

import { choleskyInverse, quadForm } from "./linalg.js";

export interface GlsFit {
  coef: Float64Array;
  /** Covariance of coef (k x k). */
  coefCov: Float64Array;
  chi2: number;
  df: number;
}

/** GLS of y (length m) on the m x k design X (row-major) with weight matrix W: coefficients, their covariance, misfit chi2. */
export function glsFit(y: ArrayLike<number>, x: ArrayLike<number>, k: number, w: ArrayLike<number>): GlsFit {
  const m = y.length;
  const xtwx = new Float64Array(k * k);
  const xtwy = new Float64Array(k);
  const col = (j: number) => Float64Array.from({ length: m }, (_, i) => x[i * k + j]);
  const cols = Array.from({ length: k }, (_, j) => col(j));
  for (let a = 0; a < k; a++) {
    xtwy[a] = quadForm(w, m, cols[a], y);
    for (let b = 0; b < k; b++) xtwx[a * k + b] = quadForm(w, m, cols[a], cols[b]);
  }
  const coefCov = choleskyInverse(xtwx, k, "design");
  const coef = new Float64Array(k);
  for (let a = 0; a < k; a++) for (let b = 0; b < k; b++) coef[a] += coefCov[a * k + b] * xtwy[b];
  const r = new Float64Array(m);
  for (let i = 0; i < m; i++) {
    let f = 0;
    for (let a = 0; a < k; a++) f += x[i * k + a] * coef[a];
    r[i] = y[i] - f;
  }
  const chi2 = quadForm(w, m, r);
  const df = m - k;
  return { coef, coefCov, chi2, df };
}
