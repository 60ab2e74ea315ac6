// The law of M = max_i W_i for a zero-mean Gaussian vector W = (W_1..W_m) with covariance C
// (possibly singular; m = 1 allowed): CDF F(x) = P(W_1 <= x, ..., W_m <= x) (an orthant
// probability of the multivariate normal), mean and variance, each with an error bound
// (docs/theory.md sec. 7.1). Used for the diameter when several pairs of vertices of the drift
// polygon tie for the farthest pair.
//
// Reduction (exact): forms of zero variance are the constant 0 (they only put M >= 0); forms equal
// almost surely (Var(W_i - W_j) = 0) are merged. Then, with d the number of forms left:
// - d = 1: F(x) = Phi(x/s); E M = 0, Var M = s^2.
// - d = 2: F(x) = Phi_2(x/s1, x/s2; rho), the bivariate normal CDF by the integral
//     Phi_2(h, k; rho) = Phi(h) Phi(k) + (1/2 pi) int_0^{asin rho} exp(-(h^2 - 2hk sin t + k^2)/(2 cos^2 t)) dt
//   ("Numerical computation of rectangular bivariate and trivariate normal and t probabilities",
//   Statistics and Computing 14 (2004) [memory]; the formula follows from Plackett's identity
//   d Phi_2/d rho = phi_2); mean and variance in closed form: max(a, b) = (a + b)/2 + |a - b|/2 gives
//     E M = theta / sqrt(2 pi),  E M^2 = (s1^2 + s2^2)/2,  theta^2 = Var(W_1 - W_2)
//   ("The greatest of a finite set of random variables", Operations Research 9 (1961) [memory];
//   derived again here in two lines, docs/theory.md sec. 7.1).
// - d >= 3: condition on the form of largest variance, W_k = s z:
//     P(W <= t) = int_{z <= t_k/s} phi(z) P(W' <= t' - beta z) dz,  beta_j = C_jk / C_kk,
//   W' with the conditional covariance C_jl - C_jk C_lk / C_kk, recursively down to d = 2
//   (forms whose conditional variance vanishes become indicators: the integral is split at their
//   jumps). The cost grows like (nodes)^(d-2): used for d = 3 (QUADRATURE_FORMS).
// - 4 <= d <= MAX_FORMS: randomised quasi-Monte Carlo. The CDF by the separation-of-variables
//   transform of the orthant probability ("Numerical computation of multivariate normal
//   probabilities", Journal of Computational and Graphical Statistics 1, 1992 [memory]) on a
//   Kronecker lattice k sqrt(p_i) mod 1 (p_i the primes) with the tent (baker's) periodisation, the
//   same points for every x (so F is smooth in x); E M and E M^2 directly as averages of
//   max(L z), z = Phi^-1(u), over a lattice in d dimensions. Error: R = 8 random shifts (seeded,
//   so the result is deterministic); the bound is 5 standard errors over the shifts (Student's t
//   with 7 degrees of freedom exceeds 5 in absolute value with probability 0.0016): a probabilistic
//   bound, about 1e-3 for the moments and 1e-4 for the CDF, not 1e-9.
// Mean and variance: E M = int_0^inf (1 - F) - int_-inf^0 F, E M^2 = int_0^inf 2x (1 - F) +
// int_-inf^0 2|x| F, on [-L, L], L = 10 max_i s_i (tails below m Phi(-10) ~ 1e-23 m).
// Quadrature: adaptive Gauss-Legendre (10 against 20 nodes on each panel, bisected until they agree;
// common practice): the reported error is the sum of |G20 - G10| over the accepted panels plus the
// inner errors and truncation bounds, a conservative estimate for these analytic integrands (the
// 20-node value kept is far more accurate than the 10-node comparison). Normal CDF: stdlib erfc,
// relative accuracy ~1e-15 (src/stats/normal.ts).

import seedrandom from "seedrandom";
import { normalCdf, normalQuantile } from "../stats/normal.js";
import { gaussLegendre, INV_SQRT_2PI } from "./special.js";

/** Largest number of distinct forms integrated by nested quadrature; beyond it, quasi-Monte Carlo. */
export const QUADRATURE_FORMS = 3;
/** Largest number of distinct non-degenerate forms whose law is computed. */
export const MAX_FORMS = 12;

export interface ValueWithError {
  value: number;
  error: number;
}

const G10 = gaussLegendre(10);
const G20 = gaussLegendre(20);

/** Adaptive Gauss-Legendre of f on [a, b] to absolute tolerance tol (error: sum of |G20 - G10| over panels). */
export function adaptiveIntegral(f: (x: number) => number, a: number, b: number, tol: number, depth = 0): ValueWithError {
  if (!(b > a)) return { value: 0, error: 0 };
  const c = (a + b) / 2, h = (b - a) / 2;
  let s10 = 0, s20 = 0;
  for (let i = 0; i < 10; i++) s10 += G10.w[i] * f(c + h * G10.x[i]);
  for (let i = 0; i < 20; i++) s20 += G20.w[i] * f(c + h * G20.x[i]);
  s10 *= h;
  s20 *= h;
  const err = Math.abs(s20 - s10);
  if (err <= tol || depth >= 40) return { value: s20, error: err };
  const left = adaptiveIntegral(f, a, c, tol / 2, depth + 1);
  const right = adaptiveIntegral(f, c, b, tol / 2, depth + 1);
  return { value: left.value + right.value, error: left.error + right.error };
}

/** Phi_2(h, k; rho) = P(X <= h, Y <= k) for standard normals with correlation rho. */
export function bivariateNormalCdf(h: number, k: number, rho: number, tol = 1e-14): ValueWithError {
  if (h === -Infinity || k === -Infinity) return { value: 0, error: 0 };
  if (h === Infinity) return { value: normalCdf(k), error: 0 };
  if (k === Infinity) return { value: normalCdf(h), error: 0 };
  if (rho >= 1 - 1e-15) return { value: normalCdf(Math.min(h, k)), error: 0 };
  if (rho <= -1 + 1e-15) return { value: Math.max(0, normalCdf(h) - normalCdf(-k)), error: 1e-16 };
  const hk = h * k, hh = (h * h + k * k) / 2;
  const f = (t: number) => {
    const s = Math.sin(t), c2 = 1 - s * s;
    return c2 > 0 ? Math.exp((hk * s - hh) / c2) : 0;
  };
  const a = Math.asin(rho);
  const r = a >= 0 ? adaptiveIntegral(f, 0, a, tol * 2 * Math.PI) : adaptiveIntegral(f, a, 0, tol * 2 * Math.PI);
  const integral = (a >= 0 ? r.value : -r.value) / (2 * Math.PI);
  const value = Math.min(1, Math.max(0, normalCdf(h) * normalCdf(k) + integral));
  return { value, error: r.error / (2 * Math.PI) + 1e-16 };
}

const phi = (z: number) => INV_SQRT_2PI * Math.exp(-0.5 * z * z);

/** Lower end of the conditioning variable: Phi(-Z_LOW) = 1.1e-19. */
const Z_LOW = 9;

/**
 * P(W <= t) for W ~ N(0, C) (C symmetric positive semi-definite, d x d); `scale2` is the variance
 * scale below which a variance counts as 0 (relative tolerance applied by the caller).
 */
export function orthantProbability(C: number[][], t: number[], scale2: number, tol = 1e-12): ValueWithError {
  const d = t.length;
  const eps = 1e-12 * scale2;
  // Degenerate coordinates: W_i = 0 a.s.
  const keep: number[] = [];
  for (let i = 0; i < d; i++) {
    if (C[i][i] <= eps) {
      if (t[i] < 0) return { value: 0, error: 0 };
    } else keep.push(i);
  }
  if (keep.length < d) return orthantProbability(keep.map((i) => keep.map((j) => C[i][j])), keep.map((i) => t[i]), scale2, tol);
  if (d === 0) return { value: 1, error: 0 };
  const s = C.map((row, i) => Math.sqrt(row[i]));
  if (d === 1) return { value: normalCdf(t[0] / s[0]), error: 1e-16 };
  if (d === 2) {
    const rho = Math.max(-1, Math.min(1, C[0][1] / (s[0] * s[1])));
    return bivariateNormalCdf(t[0] / s[0], t[1] / s[1], rho, tol);
  }
  if (d > QUADRATURE_FORMS) throw new Error(`orthantProbability: ${d} forms (nested quadrature for at most ${QUADRATURE_FORMS})`);
  // Condition on the coordinate of largest variance.
  let k = 0;
  for (let i = 1; i < d; i++) if (C[i][i] > C[k][k]) k = i;
  const rest = Array.from({ length: d }, (_, i) => i).filter((i) => i !== k);
  const beta = rest.map((j) => C[j][k] / C[k][k]);
  const cond = rest.map((i, a) => rest.map((j, b) => {
    const v = C[i][j] - C[i][k] * C[j][k] / C[k][k];
    return a === b ? Math.max(0, v) : v;
  }));
  const upper = t[k] / s[k];
  if (upper <= -Z_LOW) return { value: 0, error: normalCdf(upper) };
  // Jumps of the integrand where a conditionally degenerate form crosses its threshold.
  const cuts = [-Z_LOW, upper];
  rest.forEach((j, a) => {
    if (cond[a][a] <= eps && beta[a] !== 0) {
      const z = t[j] / (beta[a] * s[k]);
      if (z > -Z_LOW && z < upper) cuts.push(z);
    }
  });
  cuts.sort((x, y) => x - y);
  let innerError = 0;
  const f = (z: number) => {
    const r = orthantProbability(cond, rest.map((j, a) => t[j] - beta[a] * s[k] * z), scale2, tol);
    innerError = Math.max(innerError, r.error);
    return phi(z) * r.value;
  };
  let value = 0, error = normalCdf(-Z_LOW);
  for (let i = 0; i + 1 < cuts.length; i++) {
    const r = adaptiveIntegral(f, cuts[i], cuts[i + 1], tol / cuts.length);
    value += r.value;
    error += r.error;
  }
  return { value: Math.min(1, Math.max(0, value)), error: error + innerError };
}

export interface GaussianMaximumLaw {
  /** Number of forms m as given. */
  forms: number;
  /** Forms left after merging a.s. equal forms and dropping zero forms. */
  distinctForms: number;
  /** Whether a form is identically 0 (then M >= 0 and F jumps at 0). */
  hasZeroForm: boolean;
  /** E M and Var M with absolute error bounds. */
  mean: number;
  meanError: number;
  variance: number;
  varianceError: number;
  /** "closed form" (d <= 2) or "nested quadrature" (d = 3). */
  method: string;
  /** F(x) = P(M <= x) with its error bound. */
  cdf: (x: number) => ValueWithError;
  /** Step of the CDF table in units of the largest form SD (coarser when each value is costly). */
  tableStep?: number;
}

/** Forms after the exact reduction: indices kept, and whether a zero form exists. */
function reduce(C: number[][]): { keep: number[]; zero: boolean; scale2: number } {
  const m = C.length;
  const scale2 = Math.max(1e-300, ...C.map((r, i) => r[i]));
  const eps = 1e-12 * scale2;
  const keep: number[] = [];
  let zero = false;
  for (let i = 0; i < m; i++) {
    if (C[i][i] <= eps) {
      zero = true;
      continue;
    }
    if (keep.some((j) => C[i][i] + C[j][j] - 2 * C[i][j] <= eps)) continue;
    keep.push(i);
  }
  return { keep, zero, scale2 };
}

/** Checks C: square, symmetric, finite, non-negative diagonal, |C_ij| <= sqrt(C_ii C_jj) (to rounding). */
function checkCovariance(C: number[][]): void {
  const m = C.length;
  if (m < 1) throw new Error("covariance: expected at least one form");
  const scale = Math.max(1e-300, ...C.map((r, i) => Math.abs(r?.[i] ?? NaN)));
  C.forEach((row, i) => {
    if (!Array.isArray(row) || row.length !== m) throw new Error(`covariance[${i}]: expected ${m} entries`);
    row.forEach((v, j) => {
      if (!Number.isFinite(v)) throw new Error(`covariance[${i}][${j}]: not a finite number`);
      if (Math.abs(v - C[j][i]) > 1e-9 * scale) throw new Error(`covariance[${i}][${j}]: not symmetric`);
    });
    if (C[i][i] < -1e-12 * scale) throw new Error(`covariance[${i}][${i}]: negative variance`);
  });
  for (let i = 0; i < m; i++) for (let j = 0; j < i; j++) {
    if (C[i][j] ** 2 > Math.max(0, C[i][i]) * Math.max(0, C[j][j]) * (1 + 1e-9) + 1e-18 * scale * scale) throw new Error(`covariance[${i}][${j}]: |C_ij| > sqrt(C_ii C_jj): not a covariance`);
  }
}

/** The law of the maximum of m zero-mean jointly Gaussian forms with covariance C. */
export function gaussianMaximum(C: number[][], tol = 1e-10): GaussianMaximumLaw {
  checkCovariance(C);
  const m = C.length;
  const { keep, zero, scale2 } = reduce(C);
  const Ck = keep.map((i) => keep.map((j) => C[i][j]));
  const d = keep.length;
  if (d > MAX_FORMS) throw new Error(`covariance: ${d} distinct forms (at most ${MAX_FORMS} are computed)`);
  const cdf = (x: number): ValueWithError => {
    if (Number.isNaN(x)) return { value: NaN, error: 0 };
    if (zero && x < 0) return { value: 0, error: 0 };
    return orthantProbability(Ck, keep.map(() => x), scale2, tol / 100);
  };
  const base = { forms: m, distinctForms: d, hasZeroForm: zero, cdf };
  if (d === 0) return { ...base, mean: 0, meanError: 0, variance: 0, varianceError: 0, method: "closed form (M = 0)" };
  if (zero && d === 1) {
    // M = max(0, W): E M = s phi(0), E M^2 = s^2 / 2.
    const v = Ck[0][0];
    return { ...base, mean: Math.sqrt(v) * INV_SQRT_2PI, meanError: 1e-15 * Math.sqrt(v), variance: v / 2 - v / (2 * Math.PI), varianceError: 1e-15 * v, method: "closed form (one form and the constant 0)" };
  }
  if (!zero && d === 1) return { ...base, mean: 0, meanError: 0, variance: Ck[0][0], varianceError: 1e-16 * Ck[0][0], method: "closed form (one form)" };
  if (d > QUADRATURE_FORMS) return qmcLaw(Ck, zero, scale2, base);
  if (!zero && d === 2) {
    const theta2 = Math.max(0, Ck[0][0] + Ck[1][1] - 2 * Ck[0][1]);
    const mean = Math.sqrt(theta2) * INV_SQRT_2PI;
    const variance = (Ck[0][0] + Ck[1][1]) / 2 - theta2 / (2 * Math.PI);
    return { ...base, mean, meanError: 1e-15 * Math.sqrt(scale2), variance, varianceError: 1e-15 * scale2, method: "closed form (two forms)" };
  }
  // Quadrature of the CDF: panels split at 0 (F jumps there with a zero form).
  const L = 10 * Math.sqrt(Math.max(...Ck.map((r, i) => r[i])));
  let cdfError = 0;
  const F = (x: number) => {
    const r = cdf(x);
    cdfError = Math.max(cdfError, r.error);
    return r.value;
  };
  // One pass per moment (the integrands differ); a shared cache of F keeps the cost of one.
  const cache = new Map<number, number>();
  const Fc = (x: number) => {
    let v = cache.get(x);
    if (v === undefined) {
      v = F(x);
      cache.set(x, v);
    }
    return v;
  };
  const mPos = adaptiveIntegral((x) => 1 - Fc(x), 0, L, tol / 4);
  const mNeg = adaptiveIntegral((x) => Fc(-x), 0, L, tol / 4);
  const sPos = adaptiveIntegral((x) => 2 * x * (1 - Fc(x)), 0, L, (tol * Math.sqrt(scale2)) / 4);
  const sNeg = adaptiveIntegral((x) => 2 * x * Fc(-x), 0, L, (tol * Math.sqrt(scale2)) / 4);
  // Tails beyond L: 1 - F(x) <= m Phi(-x/s_max), F(-x) <= Phi(-x/s_max): int_L^inf Phi(-x/s) dx <= s phi(L/s) s/L.
  const smax = L / 10;
  const tail = d * smax * phi(10) / 10;
  const mean = mPos.value - mNeg.value;
  const meanError = mPos.error + mNeg.error + 2 * L * cdfError + 2 * tail;
  const second = sPos.value + sNeg.value;
  const secondError = sPos.error + sNeg.error + 2 * L * L * cdfError + 2 * tail * (L + smax);
  return {
    ...base, mean, meanError, variance: second - mean * mean, varianceError: secondError + 2 * Math.abs(mean) * meanError + meanError * meanError,
    method: `adaptive Gauss-Legendre of the CDF (${d} distinct forms${zero ? " and the constant 0" : ""}; nested quadrature for the orthant probability)`,
  };
}

/**
 * The CDF tabulated for many evaluations (a KS distance over 10^5 sample points): values on a grid
 * of step h = 0.04 s_max (0.1 s_max for a quasi-Monte Carlo law) over [-10 s_max, 10 s_max], cubic
 * interpolation in between. The bound
 * returned is the largest difference, at every panel midpoint, between the interpolant and the
 * direct value, plus the direct values' own error: checked, not assumed.
 */
export interface TabulatedCdf {
  cdf: (x: number) => number;
  /** The left limit F(x-) (differs from F(x) only at 0 when a form is the constant 0). */
  cdfLeft: (x: number) => number;
  error: number;
}

export function tabulatedCdf(law: GaussianMaximumLaw, C: number[][]): TabulatedCdf {
  const smax = Math.sqrt(Math.max(1e-300, ...C.map((r, i) => r[i])));
  if (law.distinctForms === 0) return { cdf: (x) => (x < 0 ? 0 : 1), cdfLeft: (x) => (x <= 0 ? 0 : 1), error: 0 };
  const L = 10 * smax, h = (law.tableStep ?? 0.04) * smax;
  const N = 2 * Math.round(L / h);
  const xs = Float64Array.from({ length: N + 1 }, (_, i) => -L + i * h);
  let error = 0;
  const value = (x: number) => {
    const r = law.cdf(x);
    error = Math.max(error, r.error);
    return r.value;
  };
  const F = xs.map(value);
  // With a zero form M >= 0: F = 0 left of 0 (the jump at 0 is not interpolated).
  const jump = law.hasZeroForm;
  const interp = (x: number): number => {
    if (x < -L || (jump && x < 0)) return 0;
    if (x >= L) return 1;
    // Cubic through the four nearest grid values (Lagrange; common practice).
    const u = (x + L) / h;
    const i = Math.max(jump ? N / 2 + 1 : 1, Math.min(N - 2, Math.floor(u)));
    const w = u - i;
    const a = F[i - 1], b = F[i], c = F[i + 1], e = F[i + 2];
    return Math.min(1, Math.max(0,
      (-w * (w - 1) * (w - 2) * a) / 6 + ((w + 1) * (w - 1) * (w - 2) * b) / 2 - ((w + 1) * w * (w - 2) * c) / 2 + ((w + 1) * w * (w - 1) * e) / 6));
  };
  let interpError = 0;
  for (let i = 0; i < N; i++) {
    const x = xs[i] + h / 2;
    if (!(jump && x < 0)) interpError = Math.max(interpError, Math.abs(interp(x) - value(x)));
  }
  // Outside [-L, L]: F(-L) <= Phi(-10), 1 - F(L) <= m Phi(-10).
  const cdfLeft = (x: number) => (jump && x <= 0 ? 0 : interp(x));
  return { cdf: interp, cdfLeft, error: error + 2 * interpError + law.forms * normalCdf(-10) };
}

/**
 * Kolmogorov distance sup_x |F_m(x) - F(x)| between the empirical CDF of a sorted sample and a CDF
 * given with its left limits (exact with ties in the sample and atoms in F: both sides of each jump
 * are compared).
 */
export function ksDistanceToCdf(sorted: ArrayLike<number>, F: (x: number) => number, Fleft: (x: number) => number): number {
  const m = sorted.length;
  let d = 0;
  for (let i = 0; i < m;) {
    const x = sorted[i];
    let j = i + 1;
    while (j < m && sorted[j] === x) j++;
    // Below x the empirical CDF is i/m, at x it is j/m (j - i tied values).
    d = Math.max(d, Math.abs(i / m - Fleft(x)), Math.abs(j / m - F(x)));
    i = j;
  }
  return d;
}

// --- quasi-Monte Carlo for d > QUADRATURE_FORMS ---------------------------------------------

const PRIMES = [2, 3, 5, 7, 11, 13, 17, 19, 23, 29, 31, 37, 41, 43, 47, 53];
const SHIFTS = 8;
/** Bound = T_BOUND standard errors over the 8 shifts: P(|t_7| > 5) = 0.0016 (Student's t, 7 df). */
const T_BOUND = 5;

/** SHIFTS point sets of N points in `dim` dimensions: frac(k sqrt(p_i) + shift_i), tent-transformed. */
function latticeSets(dim: number, N: number): Float64Array[] {
  const rng = seedrandom(`gaussian-maximum lattice ${dim} ${N}`);
  const alpha = PRIMES.slice(0, dim).map((p) => Math.sqrt(p) % 1);
  return Array.from({ length: SHIFTS }, () => {
    const shift = alpha.map(() => rng());
    const pts = new Float64Array(N * dim);
    for (let k = 0; k < N; k++) {
      for (let i = 0; i < dim; i++) {
        const u = (((k + 1) * alpha[i] + shift[i]) % 1);
        pts[k * dim + i] = Math.min(1 - 1e-15, Math.max(1e-15, 1 - Math.abs(2 * u - 1)));
      }
    }
    return pts;
  });
}

/** Lower-triangular L with L L' = C (Cholesky; a pivot below eps leaves a zero column: C singular). */
function choleskyPsd(C: number[][], eps: number): number[][] {
  const d = C.length;
  const L = C.map(() => new Array<number>(d).fill(0));
  for (let j = 0; j < d; j++) {
    let v = C[j][j];
    for (let k = 0; k < j; k++) v -= L[j][k] * L[j][k];
    if (v <= eps) continue;
    L[j][j] = Math.sqrt(v);
    for (let i = j + 1; i < d; i++) {
      let w = C[i][j];
      for (let k = 0; k < j; k++) w -= L[i][k] * L[j][k];
      L[i][j] = w / L[j][j];
    }
  }
  return L;
}

/** Mean over the shifts of per-shift averages, and T_BOUND standard errors over the shifts. */
function overShifts(values: number[]): ValueWithError {
  const R = values.length;
  const mean = values.reduce((a, b) => a + b, 0) / R;
  const v = values.reduce((a, b) => a + (b - mean) ** 2, 0) / (R - 1);
  return { value: mean, error: T_BOUND * Math.sqrt(v / R) };
}

/** P(L z <= t) by separation of variables on the given point sets (dimension d - 1). */
function orthantQmc(L: number[][], t: number[], sets: Float64Array[]): ValueWithError {
  const d = t.length, dim = d - 1;
  const y = new Float64Array(d);
  const per = sets.map((pts) => {
    const N = pts.length / Math.max(1, dim);
    let sum = 0;
    for (let k = 0; k < N; k++) {
      let f = 1;
      for (let i = 0; i < d && f > 0; i++) {
        let s = 0;
        for (let j = 0; j < i; j++) if (L[i][j] !== 0) s += L[i][j] * y[j];
        const e = L[i][i] > 0 ? normalCdf((t[i] - s) / L[i][i]) : t[i] - s >= 0 ? 1 : 0;
        f *= e;
        if (i < dim) y[i] = L[i][i] > 0 && e > 0 ? Math.max(-40, normalQuantile(Math.max(1e-300, pts[k * dim + i] * e))) : 0;
      }
      sum += f;
    }
    return sum / N;
  });
  const r = overShifts(per);
  return { value: Math.min(1, Math.max(0, r.value)), error: r.error };
}

function qmcLaw(C: number[][], zero: boolean, scale2: number, base: Pick<GaussianMaximumLaw, "forms" | "distinctForms" | "hasZeroForm" | "cdf">): GaussianMaximumLaw {
  const d = C.length;
  const L = choleskyPsd(C, 1e-12 * scale2);
  const cdfSets = latticeSets(d - 1, 512);
  const cdf = (x: number): ValueWithError => (Number.isNaN(x) ? { value: NaN, error: 0 } : zero && x < 0 ? { value: 0, error: 0 } : orthantQmc(L, C.map(() => x), cdfSets));
  // Moments: M = max(L z) (and 0 with a zero form), z = Phi^-1(u) over a d-dimensional lattice.
  const N = 1 << 15;
  const m1: number[] = [], m2: number[] = [];
  const z = new Float64Array(d);
  for (const pts of latticeSets(d, N)) {
    let s1 = 0, s2 = 0;
    for (let k = 0; k < N; k++) {
      for (let j = 0; j < d; j++) z[j] = normalQuantile(pts[k * d + j]);
      let M = zero ? 0 : -Infinity;
      for (let i = 0; i < d; i++) {
        let w = 0;
        for (let j = 0; j <= i; j++) w += L[i][j] * z[j];
        if (w > M) M = w;
      }
      s1 += M;
      s2 += M * M;
    }
    m1.push(s1 / N);
    m2.push(s2 / N);
  }
  const mean = overShifts(m1);
  const variance = overShifts(m1.map((a, r) => m2[r] - a * a));
  return {
    ...base, cdf, tableStep: 0.1, mean: mean.value, meanError: mean.error, variance: variance.value, varianceError: variance.error,
    method: `randomised quasi-Monte Carlo (${d} distinct forms${zero ? " and the constant 0" : ""}; lattice with ${SHIFTS} random shifts, bounds of 5 standard errors over the shifts)`,
  };
}
