// Generalised least squares with a full covariance matrix, and the extrapolation model
//   y_i = s2 + c n_i^(-beta),  beta in [betaMin, betaMax] (default [0.1, 2]),
// for correlated finite-n estimates (e.g. Var(X_n)/n^p at the grid points of one simulation).
//
// Method: GLS ("On least squares and linear combination of observations", Proc. R. Soc. Edinb. 55
// (1935) [memory]; e.g. the textbook Linear Regression Analysis, 2nd ed., sec. 3.10):
// coef = (X' W X)^{-1} X' W y, Cov(coef) = (X' W X)^{-1}, misfit chi2 = r' W r on m - k degrees of
// freedom, with W = V^{-1}. When V is itself estimated from g blocks (jackknife), W is scaled by
// the Hartlap factor (g - m - 2)/(g - 1) ("Why your model parameter confidences might be too optimistic", A&A 464 (2007) 399 [memory for the title]) so that
// chi2 and the intervals are not overconfident. For beta: Gaussian profile likelihood,
// -2 log L(beta) = chi2(beta) + const; beta_hat minimises it on a 0.005 grid refined by golden
// section; the profile-likelihood interval of a parameter is {theta : chi2_prof(theta) - chi2_min
// <= chi2_{1, level}} ("A method for computing profile-likelihood-based confidence intervals",
// Applied Statistics 37 (1988) 87 [memory for the title]): for beta by bisection, for s2 in closed
// form over beta (fitPowerLawProfile says how).
// Cost: O(m^3) once, then O(m^2) per evaluation (~10^3 evaluations for both intervals).
// Example: y = 2 + 3 n^-0.5 exactly at n = 10..10^4 returns s2 = 2, beta = 0.5, chi2 = 0.

import { chiSquareQuantile, chiSquareSf } from "./chisquare.js";
import { glsFit, type GlsFit } from "./gls-fit.js";
import { choleskyInverse, quadForm } from "./linalg.js";

export interface LinearGlsResult extends GlsFit {
  /** Misfit p-value P(chi2_df > chi2); NaN when df = 0. */
  pValue: number;
}

/** Weight matrix W = V^{-1}, times the Hartlap factor when `blocks` (the number of jackknife blocks) is given. */
export function weightMatrix(cov: ArrayLike<number>, m: number, blocks?: number): Float64Array {
  const w = choleskyInverse(cov, m, "covariance");
  if (blocks !== undefined) {
    const f = (blocks - m - 2) / (blocks - 1);
    if (!(f > 0)) throw new Error(`blocks: ${blocks} blocks cannot estimate a ${m}x${m} covariance (need > ${m + 2})`);
    for (let i = 0; i < w.length; i++) w[i] *= f;
  }
  return w;
}

/** GLS of y (length m) on the m x k design X (row-major) with weight matrix W, with the misfit p-value. */
export function linearGls(y: ArrayLike<number>, x: ArrayLike<number>, k: number, w: ArrayLike<number>): LinearGlsResult {
  const fit = glsFit(y, x, k, w);
  return { ...fit, pValue: fit.df > 0 ? chiSquareSf(fit.chi2, fit.df) : NaN };
}

export interface PowerLawFit {
  mode: "profile" | "fixed";
  /** The limit s2 and its standard error given beta (conditional on beta). */
  s2: number;
  s2SE: number;
  c: number;
  beta: number;
  /** Profile-likelihood interval of beta (null when beta is fixed); may touch the bounds. */
  betaInterval: [number, number] | null;
  /** Profile-likelihood interval of s2 at `level` (for fixed beta: s2 -/+ z SE, the same thing). */
  s2Interval: [number, number];
  level: number;
  chi2: number;
  df: number;
  /** Misfit p-value (NaN when df = 0). */
  pValue: number;
  /** True when beta_hat sits on a bound of [betaMin, betaMax]. */
  betaAtBound: boolean;
}

export interface PowerLawOptions {
  betaMin?: number;
  betaMax?: number;
  /** Confidence level of the intervals, default 0.95. */
  level?: number;
  /** Number of jackknife blocks that estimated `cov` (enables the Hartlap factor). */
  blocks?: number;
  /** false: skip the profile intervals (s2Interval NaN, betaInterval null) when only the estimate is read. */
  intervals?: boolean;
  /** Tests only: the plain computations (linearGls and quadForm afresh per beta), which the fast path must equal bit for bit. */
  reference?: boolean;
}

function validate(n: ArrayLike<number>, y: ArrayLike<number>, cov: ArrayLike<number>): number {
  const m = n.length;
  if (y.length !== m) throw new Error(`y: length ${y.length}, expected ${m} (one per n)`);
  if (cov.length !== m * m) throw new Error(`cov: length ${cov.length}, expected ${m * m}`);
  for (let i = 0; i < m; i++) if (!(n[i] > 0)) throw new Error(`n[${i}]: must be positive, got ${n[i]}`);
  return m;
}

/** n^-beta at the grid points (x), with x' W x and x' W 1 (each summed as quadForm sums it). */
interface Powers {
  xb: Float64Array;
  xwx: number;
  xW1: number;
}

/**
 * chi2 of the model y = s2 + c n^-beta for given beta, minimised over (s2, c). The profile intervals
 * ask for ~10^3 of these on one data set, mostly at the same grid of beta, so the powers n^-beta
 * and x' W x are kept per grid point, and the products of W with 1 and y that do not depend on beta
 * are computed once. Every number is the one linearGls and quadForm would return (the same
 * operations in the same order: `reference` runs them, for the tests), only not recomputed.
 */
class PowerLawChi2 {
  private readonly m: number;
  /** W 1 and W y (rows summed as quadForm does), 1' W 1 and 1' W y. */
  private readonly w1: Float64Array;
  private readonly wy: Float64Array;
  private readonly oneW1: number;
  private readonly oneWy: number;
  private readonly r: Float64Array;
  /** Scratch powers for one-off beta (the golden-section points). */
  readonly scratch: Float64Array;

  constructor(readonly n: ArrayLike<number>, readonly y: ArrayLike<number>, readonly w: Float64Array, readonly reference = false) {
    const m = (this.m = n.length);
    this.r = new Float64Array(m);
    this.scratch = new Float64Array(m);
    this.w1 = new Float64Array(m);
    this.wy = new Float64Array(m);
    let oneW1 = 0;
    let oneWy = 0;
    for (let i = 0; i < m; i++) {
      let t1 = 0;
      let ty = 0;
      for (let j = 0; j < m; j++) {
        t1 += w[i * m + j] * 1;
        ty += w[i * m + j] * y[j];
      }
      this.w1[i] = t1;
      this.wy[i] = ty;
      oneW1 += 1 * t1;
      oneWy += 1 * ty;
    }
    this.oneW1 = oneW1;
    this.oneWy = oneWy;
  }

  /** The powers at beta, into `xb` (a new array by default). */
  powers(beta: number, xb: Float64Array = new Float64Array(this.m)): Powers {
    const m = this.m;
    const w = this.w;
    for (let i = 0; i < m; i++) xb[i] = Math.pow(this.n[i], -beta);
    let xwx = 0;
    let xW1 = 0;
    for (let i = 0; i < m; i++) {
      let t = 0;
      for (let j = 0; j < m; j++) t += w[i * m + j] * xb[j];
      xwx += xb[i] * t;
      xW1 += xb[i] * this.w1[i];
    }
    return { xb, xwx, xW1 };
  }

  /** Powers at the grid points of minimise1d(f, lo, hi, step), by index. */
  grid(lo: number, hi: number, step: number): Powers[] {
    const steps = Math.round((hi - lo) / step);
    return Array.from({ length: steps + 1 }, (_, i) => this.powers(i === 0 ? lo : gridPoint(lo, hi, steps, i)));
  }

  /** Over (s2, c): linearGls on the design [1, x], written out for k = 2 (its Cholesky inverse included). */
  full(p: Powers): { chi2: number; s2: number; c: number; s2SE: number } {
    if (this.reference) return this.fullReference(p);
    const m = this.m;
    const { xb } = p;
    let ty1 = 0;
    for (let i = 0; i < m; i++) ty1 += xb[i] * this.wy[i];
    // cholesky([1'W1, 1'Wx; x'W1, x'Wx]), then its inverse column by column (choleskySolve), symmetrised.
    let s = this.oneW1;
    if (!(s > 0)) throw new Error(`design: not positive definite (pivot 0 = ${s})`);
    const l00 = Math.sqrt(s);
    const l10 = p.xW1 / l00;
    s = p.xwx;
    s -= l10 * l10;
    if (!(s > 0)) throw new Error(`design: not positive definite (pivot 1 = ${s})`);
    const l11 = Math.sqrt(s);
    let y0 = 1 / l00;
    let y1 = (0 - l10 * y0) / l11;
    const inv10 = y1 / l11;
    const inv00 = (y0 - l10 * inv10) / l00;
    y0 = 0 / l00;
    s = 1;
    s -= l10 * y0;
    y1 = s / l11;
    const inv11 = y1 / l11;
    const inv01 = (y0 - l10 * inv11) / l00;
    const off = 0.5 * (inv01 + inv10);
    let c0 = 0;
    c0 += inv00 * this.oneWy;
    c0 += off * ty1;
    let c1 = 0;
    c1 += off * this.oneWy;
    c1 += inv11 * ty1;
    const r = this.r;
    for (let i = 0; i < m; i++) {
      let f = 0;
      f += 1 * c0;
      f += xb[i] * c1;
      r[i] = this.y[i] - f;
    }
    return { chi2: quadForm(this.w, m, r), s2: c0, c: c1, s2SE: Math.sqrt(inv00) };
  }

  private fullReference(p: Powers): { chi2: number; s2: number; c: number; s2SE: number } {
    const m = this.m;
    const { xb } = p;
    const design = new Float64Array(2 * m);
    for (let i = 0; i < m; i++) {
      design[2 * i] = 1;
      design[2 * i + 1] = xb[i];
    }
    const g = linearGls(this.y, design, 2, this.w);
    return { chi2: g.chi2, s2: g.coef[0], c: g.coef[1], s2SE: Math.sqrt(g.coefCov[0]) };
  }
}

/** Grid point i of steps on [lo, hi] (i >= 1), as minimise1d places it. */
const gridPoint = (lo: number, hi: number, steps: number, i: number) => lo + ((hi - lo) * i) / steps;

/**
 * Minimises f on [lo, hi]: grid of step `step`, then golden section around the best point;
 * atGrid(i) = f(grid point i) when given.
 */
function minimise1d(f: (b: number) => number, lo: number, hi: number, step = 0.005, atGrid?: (i: number) => number): { x: number; fx: number } {
  let bx = lo;
  const steps = Math.round((hi - lo) / step);
  let bf = atGrid ? atGrid(0) : f(lo);
  for (let i = 1; i <= steps; i++) {
    const x = gridPoint(lo, hi, steps, i);
    const fx = atGrid ? atGrid(i) : f(x);
    if (fx < bf) {
      bf = fx;
      bx = x;
    }
  }
  let a = Math.max(lo, bx - step);
  let b = Math.min(hi, bx + step);
  const gr = (Math.sqrt(5) - 1) / 2;
  let c = b - gr * (b - a);
  let d = a + gr * (b - a);
  let fc = f(c);
  let fd = f(d);
  for (let i = 0; i < 60; i++) {
    if (fc < fd) {
      b = d;
      d = c;
      fd = fc;
      c = b - gr * (b - a);
      fc = f(c);
    } else {
      a = c;
      c = d;
      fc = fd;
      d = a + gr * (b - a);
      fd = f(d);
    }
  }
  const x = 0.5 * (a + b);
  const fx = f(x);
  return fx < bf ? { x, fx } : { x: bx, fx: bf };
}

/** Fits y = s2 + c n^-beta with beta profiled over [betaMin, betaMax]. Needs m >= 4 points. */
export function fitPowerLawProfile(n: ArrayLike<number>, y: ArrayLike<number>, cov: ArrayLike<number>, opts: PowerLawOptions = {}): PowerLawFit {
  const m = validate(n, y, cov);
  if (m < 4) throw new Error(`n: estimating beta needs at least 4 grid points (3 parameters and a misfit test), got ${m}`);
  const betaMin = opts.betaMin ?? 0.1;
  const betaMax = opts.betaMax ?? 2;
  const level = opts.level ?? 0.95;
  const w = weightMatrix(cov, m, opts.blocks);
  const model = new PowerLawChi2(n, y, w, opts.reference === true);
  const fitGrid = model.grid(betaMin, betaMax, 0.005);
  const chi2At = (b: number) => model.full(model.powers(b, model.scratch)).chi2;
  const best = minimise1d(chi2At, betaMin, betaMax, 0.005, (i) => model.full(fitGrid[i]).chi2);
  const at = model.full(model.powers(best.x));
  const q = chiSquareQuantile(level, 1);
  const chi2Min = best.fx;
  const betaInterval: [number, number] = [betaMin, betaMax];
  const prof = (b: number) => chi2At(b) - chi2Min - q;
  // beta interval: scan the grid from beta_hat outwards to the first crossing, then bisect.
  for (const dir of opts.intervals === false ? [] : [-1, 1]) {
    let inner = best.x;
    const stepB = 0.005;
    let found = false;
    for (let b = best.x + dir * stepB; dir < 0 ? b >= betaMin - 1e-12 : b <= betaMax + 1e-12; b += dir * stepB) {
      if (prof(b) > 0) {
        let lo = inner;
        let hi = b;
        for (let i = 0; i < 50; i++) {
          const mid = 0.5 * (lo + hi);
          if (mid === lo || mid === hi) break; // adjacent numbers: nothing would change any more
          if (prof(mid) > 0) hi = mid;
          else lo = mid;
        }
        betaInterval[dir < 0 ? 0 : 1] = 0.5 * (lo + hi);
        found = true;
        break;
      }
      inner = b;
    }
    if (!found) betaInterval[dir < 0 ? 0 : 1] = dir < 0 ? betaMin : betaMax;
  }
  // s2's profile interval in closed form over beta. At fixed beta the chi2 minimised over c is
  // quadratic in s2: chi2(s2, beta) = chi2(beta) + (s2 - s2hat(beta))^2 / V00(beta), V = (X'WX)^-1
  // (partial minimisation of a quadratic form; common practice). So {s2 : min_beta chi2(s2, beta)
  // - chi2Min <= q} is the union over beta of s2hat(beta) -/+ sqrt((chi2Min + q - chi2(beta)) V00(beta)),
  // and its ends are the least lower end and the largest upper end over beta (the interval spanning
  // the union): two searches over beta (the 0.005 grid, then golden section) instead of a bisection
  // on s2 with a search over beta at each of its steps.
  const s2End = (sign: 1 | -1): number => {
    // -sign times the end of beta's interval: minimised; +Infinity where beta admits no s2.
    const f = (p: Powers): number => {
      const r = model.full(p);
      const d = chi2Min + q - r.chi2;
      return d >= 0 ? -sign * r.s2 - Math.sqrt(d) * r.s2SE : Infinity;
    };
    const found = minimise1d((b) => f(model.powers(b, model.scratch)), betaMin, betaMax, 0.005, (i) => f(fitGrid[i]));
    // beta_hat itself (chi2 = chi2Min there) always belongs; the grid may straddle it.
    return -sign * Math.min(found.fx, -sign * at.s2 - Math.sqrt(q) * at.s2SE);
  };
  const s2Interval: [number, number] = opts.intervals === false ? [NaN, NaN] : [s2End(-1), s2End(1)];
  const df = m - 3;
  return {
    mode: "profile",
    s2: at.s2,
    s2SE: at.s2SE,
    c: at.c,
    beta: best.x,
    betaInterval: opts.intervals === false ? null : betaInterval,
    s2Interval,
    level,
    chi2: chi2Min,
    df,
    pValue: df > 0 ? chiSquareSf(chi2Min, df) : NaN,
    betaAtBound: Math.abs(best.x - betaMin) < 1e-3 || Math.abs(best.x - betaMax) < 1e-3,
  };
}

/** Fits y = s2 + c n^-beta with beta fixed (an assumption). Needs m >= 2 points. */
export function fitPowerLawFixed(n: ArrayLike<number>, y: ArrayLike<number>, cov: ArrayLike<number>, beta: number, opts: PowerLawOptions = {}): PowerLawFit {
  const m = validate(n, y, cov);
  if (m < 2) throw new Error(`n: a fixed-rate extrapolation needs at least 2 grid points, got ${m}`);
  if (!(beta > 0)) throw new Error(`beta: must be positive, got ${beta}`);
  const level = opts.level ?? 0.95;
  const w = weightMatrix(cov, m, opts.blocks);
  const model = new PowerLawChi2(n, y, w, opts.reference === true);
  const at = model.full(model.powers(beta));
  const z = Math.sqrt(chiSquareQuantile(level, 1));
  const df = m - 2;
  return {
    mode: "fixed",
    s2: at.s2,
    s2SE: at.s2SE,
    c: at.c,
    beta,
    betaInterval: null,
    s2Interval: [at.s2 - z * at.s2SE, at.s2 + z * at.s2SE],
    level,
    chi2: at.chi2,
    df,
    pValue: df > 0 ? chiSquareSf(at.chi2, df) : NaN,
    betaAtBound: false,
  };
}

/**
 * Whether a grid can identify beta (house rule, common practice for rate fits): at least 5
 * distinct n spanning at least 1.5 decades, geometrically spaced in the sense that no gap in
 * log n exceeds twice the mean gap.
 */
export function gridIdentifiesRate(n: ArrayLike<number>): boolean {
  const m = n.length;
  if (m < 5) return false;
  const logs = Array.from(n, (v) => Math.log10(v)).sort((a, b) => a - b);
  const span = logs[m - 1] - logs[0];
  if (span < 1.5 - 1e-12) return false;
  const meanGap = span / (m - 1);
  for (let i = 1; i < m; i++) {
    if (logs[i] - logs[i - 1] <= 0) return false;
    if (logs[i] - logs[i - 1] > 2 * meanGap + 1e-12) return false;
  }
  return true;
}
