// Evidence about a claimed linearisation of a measure M_n (docs/theory.md sec. 6.1):
//
//   M_n - E M_n = n^s sum_j g_j . X_n^j + n^(s-1) sum_j h_j . Y_n^j + R_n,   s = (p - 1)/2,
//
// with X_n^j = S_n^j - n mu_j and Y_n^j = sum_{i<=n} (S_i^j - i mu_j) the kernel's control values
// (their covariances are known: Cov X = n Sigma, Cov Y = n(n+1)(2n+1)/6 Sigma, Cov(X, Y) =
// n(n+1)/2 Sigma; sums of i.i.d. steps, common practice) and p the measure's variance scaling. The
// claim says R_n = o(n^(p/2)) in L2, i.e. Var(R_n)/n^p -> 0.
//
// What is estimated at every grid n, from the per-block co-moments of [measures, controls]:
// - b_n: least-squares coefficients of M_n on the claim's controls (with an intercept). If the
//   claim holds, b_n / n^s -> g_j (and b_n / n^(s-1) -> h_j): the best linear predictor's
//   coefficient is g + Cov(R_n, Z_n) Cov(Z_n)^-1, and |Cov(R_n, Z_n)| <= sd(R_n) sd(Z_n) = o(n^(p/2)) sd(Z_n).
// - Var(R_n)/n^p with R_n = M_n - (claimed functional), computed from the same co-moments
//   (S_MM - 2 c'S_ZM + c'S_ZZ c)/(N - 1), c the claimed coefficients at this n;
// - corr(M_n, claimed functional).
// Standard errors: delete-one-block jackknife with everything refitted in every replicate,
// correlations across n included (src/stats/jackknife.ts).
// Limits: the coefficient series are extrapolated like every limit (src/verdict/extrapolate.ts:
// L + c n^-beta, systematic from alternative fits); the remainder's decay rate gamma is the GLS
// slope of log(Var(R_n)/n^p) on log n (delta-method covariance of the logs; misfit scaling as in
// extrapolate.ts), and its limit is extrapolated too, to tell "decays to 0" from "settles above 0".
// A walk with infinite step variance gives no control: the claim is then not checkable.

import { controlVariatePoint, leaveOneOutStates, projectControls, type ControlBasis } from "../stats/control-variates.js";
import { jackknifeFromReplicates } from "../stats/jackknife.js";
import { linearGls, weightMatrix } from "../stats/gls.js";
import { symmetricEigen2 } from "../stats/linalg.js";
import { normalQuantile } from "../stats/normal.js";
import type { CoMomentState } from "../stats/types.js";
import { CONTROLS_PER_WALK, recordLayout } from "../engine/types.js";
import { stepMoments } from "../theory/step-moments.js";
import type { SimulationResult } from "../run/types.js";
import type { Linearisation, Measure, Vec2 } from "../suite/schema.js";
import { extrapolate, MISFIT_SCALE_P, type Extrapolation } from "./extrapolate.js";
import { controlCovarianceFactor, formatDirection } from "./estimates.js";

/** One claimed coefficient (a walk, endpoint or path, one direction). */
export interface CoefficientEvidence {
  /** e.g. "g1.x", "h2.y", or "g1.(0.6,0.8)" along an eigenvector of a singular step covariance. */
  label: string;
  walk: number;
  kind: "endpoint" | "path";
  /** Unit direction the coefficient is read along (x, y, or an eigenvector of Sigma_j). */
  direction: Vec2;
  claimed: number;
  /** b_n / n^s per grid n, with jackknife SE. */
  perN: { n: number; value: number; standardError: number }[];
}

export interface RemainderPoint {
  n: number;
  /** Var(R_n)/n^p. */
  value: number;
  standardError: number;
  /** Var(M_n)/n^p (plain), for scale. */
  measureVariance: number;
  /** corr(M_n, claimed functional). */
  correlation: number;
}

export interface DecayRate {
  /** gamma in Var(R_n)/n^p ~ C n^-gamma. */
  estimate: number;
  standardError: number;
  /** (1 - alpha) interval (misfit-scaled when the power law misfits). */
  ci: [number, number];
  misfitPValue: number | null;
  /** Grid points used (Var(R_n) > 0 with relative SE < 1/2, so the log is linearisable). */
  points: number[];
  /** log C of the fitted line (for plots). */
  logC: number;
}

export interface LinearisationEvidence {
  measure: Measure;
  /** The variance scaling p; coefficients on X are scaled by n^((p-1)/2), on Y by n^((p-3)/2). */
  scaling: number;
  coefficients: CoefficientEvidence[];
  /** Claimed coefficients that cannot be checked (a direction in which the walk does not move). */
  unidentified: string[];
  remainder: RemainderPoint[];
  rate: DecayRate | null;
  /** Why nothing could be estimated (no control values, infinite step variance...), else null. */
  unavailable: string | null;
}

interface Row {
  walk: number;
  /** 0 = endpoint X, 1 = integrated path Y. */
  t: 0 | 1;
  u: Vec2;
  label: string;
  /** The claimed coefficient along u (g_j . u), before the n^s scaling. */
  claimed: number;
  /** Sigma_j quadratic form along u (for the known covariance). */
  cov: [[number, number], [number, number]];
}

const dot = (a: Vec2, b: Vec2) => a[0] * b[0] + a[1] * b[1];
/** The power of n a coefficient is divided by: (p - 1)/2 on an endpoint, (p - 3)/2 on an integrated path. */
export function coefficientPower(kind: CoefficientEvidence["kind"], scaling: number): number {
  return kind === "endpoint" ? (scaling - 1) / 2 : (scaling - 3) / 2;
}

/** Rows of the claim's controls: x and y per walk, or the eigenvectors of a singular Sigma_j with non-zero variance. */
function claimRows(sim: SimulationResult, spec: Linearisation): { rows: Row[]; unidentified: string[]; unavailable: string | null } {
  const rows: Row[] = [];
  const unidentified: string[] = [];
  const kinds: [0 | 1, Vec2[] | undefined][] = [[0, spec.endpoint], [1, spec.path]];
  for (let j = 0; j < sim.suite.walks.length; j++) {
    let m;
    try {
      m = stepMoments(sim.suite.walks[j], `walks[${j}]`);
    } catch (e) {
      return { rows, unidentified, unavailable: `walks[${j}]: ${(e as Error).message}` };
    }
    const cov = m.cov as [[number, number], [number, number]];
    if (!m.secondMomentFinite || ![cov[0][0], cov[0][1], cov[1][1]].every(Number.isFinite))
      return { rows, unidentified, unavailable: `walks[${j}] has infinite step variance: its endpoint has no covariance to regress on` };
    const [[a, b], [, d]] = cov;
    const tr = a + d;
    const eig = symmetricEigen2(a, b, d);
    const small = eig.values[1] <= 1e-12 * Math.max(tr, 1e-300);
    let dirs: { u: Vec2; name: string }[];
    if (!small) dirs = [{ u: [1, 0], name: "x" }, { u: [0, 1], name: "y" }];
    else {
      const [first, perp] = eig.vectors;
      dirs = tr > 0 ? [{ u: first, name: `(${formatDirection(first)})` }] : [];
      for (const [t, vs] of kinds) if (vs && (tr === 0 || dot(vs[j], perp) !== 0)) unidentified.push(`${t === 0 ? "g" : "h"}${j + 1}${tr === 0 ? "" : ` along (${formatDirection(perp)})`}: walks[${j}] does not move in that direction`);
    }
    for (const [t, vs] of kinds) {
      if (!vs) continue;
      for (const { u, name } of dirs) rows.push({ walk: j, t, u, label: `${t === 0 ? "g" : "h"}${j + 1}.${name}`, claimed: dot(vs[j], u), cov });
    }
  }
  return { rows, unidentified, unavailable: rows.length === 0 ? "no walk moves: nothing to regress on" : null };
}

/** The controls of the claim at step count n, with their known covariance. */
function claimBasis(rows: Row[], walks: number, n: number): ControlBasis {
  const c = walks * CONTROLS_PER_WALK;
  const p = rows.length;
  const transform = new Float64Array(p * c);
  rows.forEach((r, i) => {
    const base = r.walk * CONTROLS_PER_WALK + 2 * r.t;
    transform[i * c + base] = r.u[0];
    transform[i * c + base + 1] = r.u[1];
  });
  const F = controlCovarianceFactor(n);
  const known = new Float64Array(p * p);
  for (let i = 0; i < p; i++)
    for (let k = 0; k < p; k++) {
      const A = rows[i], B = rows[k];
      if (A.walk !== B.walk) continue;
      const S = A.cov;
      const uSv = A.u[0] * (S[0][0] * B.u[0] + S[0][1] * B.u[1]) + A.u[1] * (S[1][0] * B.u[0] + S[1][1] * B.u[1]);
      known[i * p + k] = F[A.t][B.t] * uSv;
    }
  return { p, c, transform, known };
}

/** Var(M - c'Z), Var(M) and corr(M, c'Z) from projected co-moments of [q responses, p controls]. */
function remainderStats(s: CoMomentState, q: number, r: number, c: Float64Array): { varR: number; varM: number; corr: number } {
  const d = s.dim;
  const p = d - q;
  const N = s.count;
  const Smm = s.c[r * d + r];
  let cSzm = 0, cSzzc = 0;
  for (let a = 0; a < p; a++) {
    cSzm += c[a] * s.c[(q + a) * d + r];
    for (let b = 0; b < p; b++) cSzzc += c[a] * c[b] * s.c[(q + a) * d + (q + b)];
  }
  return { varR: Math.max(0, Smm - 2 * cSzm + cSzzc) / (N - 1), varM: Smm / (N - 1), corr: cSzzc > 0 && Smm > 0 ? cSzm / Math.sqrt(Smm * cSzzc) : NaN };
}

/** A series over the grid with its jackknife covariance (G x G). */
export interface GridSeries {
  y: number[];
  cov: Float64Array;
}

/** The evidence (reported) and the series behind it (extrapolated by the checks, not reported). */
export interface LinearisationFit {
  evidence: LinearisationEvidence;
  coefficientSeries: GridSeries[];
  remainderSeries: GridSeries | null;
}

/** Everything a linearisation check reads, for one measure and one claimed (g, h). */
export function linearisationEvidence(sim: SimulationResult, measure: Measure, spec: Linearisation, scaling: number, alpha: number): LinearisationFit {
  const out: LinearisationEvidence = { measure, scaling, coefficients: [], unidentified: [], remainder: [], rate: null, unavailable: null };
  const result: LinearisationFit = { evidence: out, coefficientSeries: [], remainderSeries: null };
  const grid = sim.suite.n;
  const G = grid.length;
  const layout = recordLayout(G);
  const q = layout.perPoint;
  const r = layout.index(0, measure);
  const K = sim.suite.walks.length;
  if (sim.blocks.length < 2 || sim.blocks.some((b) => !b.controlComoments || b.controlComoments.length !== G || b.controlComoments[0].dim !== q + K * CONTROLS_PER_WALK)) {
    out.unavailable = "the simulation recorded no control values (endpoints and integrated paths) per block";
    return result;
  }
  const { rows, unidentified, unavailable } = claimRows(sim, spec);
  out.unidentified = unidentified;
  if (unavailable) {
    out.unavailable = unavailable;
    return result;
  }
  const sizes = sim.blocks.map((b) => b.paths);
  const B = sizes.length;
  // Per grid point: coefficients (scaled) and remainder statistics, full and leave-one-block-out.
  const coefFull: number[][] = rows.map(() => new Array<number>(G));
  const coefLoo: number[][][] = rows.map(() => Array.from({ length: B }, () => new Array<number>(G)));
  const remFull = new Array<number>(G);
  const remLoo = Array.from({ length: B }, () => new Array<number>(G));
  const extra: { varM: number; corr: number }[] = [];
  grid.forEach((n, g) => {
    const basis = claimBasis(rows, K, n);
    const scale = rows.map((row) => Math.pow(n, coefficientPower(row.t === 0 ? "endpoint" : "path", scaling)));
    const claimedAtN = Float64Array.from(rows, (row, i) => row.claimed * scale[i]);
    const projected = sim.blocks.map((b) => projectControls(b.controlComoments[g], q, basis));
    const { full, leaveOut } = leaveOneOutStates(projected);
    const put = (st: CoMomentState, coefDst: (i: number, v: number) => void, remDst: (v: number) => void) => {
      const f = controlVariatePoint(st, q, r, basis.known);
      rows.forEach((_, i) => coefDst(i, f.coef[i] / scale[i]));
      const rs = remainderStats(st, q, r, claimedAtN);
      remDst(rs.varR / Math.pow(n, scaling));
      return rs;
    };
    const rs = put(full, (i, v) => (coefFull[i][g] = v), (v) => (remFull[g] = v));
    leaveOut.forEach((st, j) => put(st, (i, v) => (coefLoo[i][j][g] = v), (v) => (remLoo[j][g] = v)));
    extra.push({ varM: rs.varM / Math.pow(n, scaling), corr: rs.corr });
  });
  const covOf = (full: number[], loo: number[][]) => jackknifeFromReplicates(full, loo, sizes).covariance;
  const seOf = (cov: Float64Array, g: number) => Math.sqrt(cov[g * G + g]);
  out.coefficients = rows.map((row, i) => {
    const cov = covOf(coefFull[i], coefLoo[i]);
    result.coefficientSeries.push({ y: coefFull[i], cov });
    return {
      label: row.label, walk: row.walk, kind: row.t === 0 ? "endpoint" : "path", direction: row.u, claimed: row.claimed,
      perN: grid.map((n, g) => ({ n, value: coefFull[i][g], standardError: seOf(cov, g) })),
    };
  });
  const remCov = covOf(remFull, remLoo);
  result.remainderSeries = { y: remFull, cov: remCov };
  out.remainder = grid.map((n, g) => ({ n, value: remFull[g], standardError: seOf(remCov, g), measureVariance: extra[g].varM, correlation: extra[g].corr }));
  out.rate = decayRate(grid, remFull, remCov, B, alpha);
  return result;
}

/**
 * gamma by GLS of log v_n = a - gamma log n over the points with v_n > 0 and relative SE < 1/2
 * (delta method: Cov(log v_i, log v_k) = C_ik / (v_i v_k)); null with fewer than 3 such points.
 * Statistical errors scaled by sqrt(chi2/df) when the power law misfits (p < MISFIT_SCALE_P).
 */
export function decayRate(n: number[], v: number[], cov: Float64Array, blocks: number, alpha: number): DecayRate | null {
  const G = n.length;
  const keep = n.map((_, g) => g).filter((g) => v[g] > 0 && Math.sqrt(cov[g * G + g]) < 0.5 * v[g]);
  const m = keep.length;
  if (m < 3 || blocks <= m + 2) return null;
  const y = keep.map((g) => Math.log(v[g]));
  const x = keep.flatMap((g) => [1, Math.log(n[g])]);
  const c = new Float64Array(m * m);
  keep.forEach((g, i) => keep.forEach((h, k) => (c[i * m + k] = cov[g * G + h] / (v[g] * v[h]))));
  let fit;
  try {
    fit = linearGls(y, x, 2, weightMatrix(c, m, blocks));
  } catch {
    return null;
  }
  const misfit = fit.df > 0 ? fit.pValue : null;
  const S = misfit !== null && misfit < MISFIT_SCALE_P ? Math.sqrt(fit.chi2 / fit.df) : 1;
  const se = Math.sqrt(fit.coefCov[3]) * S;
  const gamma = -fit.coef[1];
  const z = normalQuantile(1 - alpha / 2);
  return { estimate: gamma, standardError: se, ci: [gamma - z * se, gamma + z * se], misfitPValue: misfit, points: keep.map((g) => n[g]), logC: fit.coef[0] };
}

/** How a coefficient's series is named in notes: b(<label>)/n^<power>. */
export function coefficientSeriesName(c: CoefficientEvidence, scaling: number): string {
  return `b(${c.label})/n^${coefficientPower(c.kind, scaling)}`;
}

/** Extrapolation of a coefficient series (signed: a limit below 0 is a value like any other). */
export function extrapolateCoefficient(fit: LinearisationFit, i: number, n: number[], blocks: number, expectedRate: number): Extrapolation {
  const { measure, scaling } = fit.evidence;
  const c = fit.evidence.coefficients[i];
  const { y, cov } = fit.coefficientSeries[i];
  return extrapolate({ measure, quantity: "varianceLimit", scaling, n, y, cov, blocks, expectedRate, signed: true, rateFreeDecides: true, name: coefficientSeriesName(c, scaling) });
}

/** Extrapolation of Var(R_n)/n^p (signed, so that a limit estimated slightly below 0 keeps its interval). */
export function extrapolateRemainder(fit: LinearisationFit, n: number[], blocks: number, expectedRate: number): Extrapolation | null {
  if (!fit.remainderSeries) return null;
  const { y, cov } = fit.remainderSeries;
  return extrapolate({ measure: fit.evidence.measure, quantity: "varianceLimit", scaling: fit.evidence.scaling, n, y, cov, blocks, expectedRate, signed: true, rateFreeDecides: true, name: `Var(R_n)/n^${fit.evidence.scaling}` });
}

/** The verdict on the remainder: does Var(R_n)/n^p vanish? */
export interface RemainderDecision {
  verdict: "pass" | "fail" | "inconclusive";
  why: string;
  /** Materiality threshold: tolerance x Var(M_n)/n^p at the largest n. */
  threshold: number;
  /** Extrapolated lim Var(R_n)/n^p with its (1 - alpha) interval, when the grid allows one. */
  limit: { estimate: number; interval: [number, number]; note: string } | null;
  pathsToDecide: number | null;
}

/**
 * fail: Var(R_n)/n^p is shown not to vanish, materially: the (1 - alpha) interval of its
 *       extrapolated limit lies above the threshold (the linear part would miss more than a
 *       fraction `tolerance` of the variance), or the decay rate's interval lies below 0 while the
 *       remainder is already above the threshold at the largest n;
 * pass: the decay rate's (1 - alpha) interval lies above 0 and the limit is immaterial (its
 *       interval's upper end below the threshold; without an extrapolated limit, the value at the
 *       largest n below it), and no fail;
 * else inconclusive, with the paths that would put the rate interval above 0 (its SE shrinks like
 * 1/sqrt(paths); the estimate assumed unchanged).
 */
export function remainderDecision(ev: LinearisationEvidence, ex: Extrapolation | null, alpha: number, tolerance: number, paths: number): RemainderDecision {
  const last = ev.remainder[ev.remainder.length - 1];
  const threshold = tolerance * last.measureVariance;
  const share = last.value / last.measureVariance;
  let limit: RemainderDecision["limit"] = null;
  if (ex && ex.undecidable === null && ex.testable) {
    const iv = ex.interval(1 - alpha);
    if (iv.every(Number.isFinite)) limit = { estimate: ex.limit.estimate, interval: iv, note: ex.limit.note };
  }
  const pct = `${(100 * (1 - alpha)).toFixed(0)}%`;
  const f = (x: number) => Number(x.toPrecision(3)).toString();
  const rate = ev.rate;
  const rateText = rate ? `decay rate gamma = ${f(rate.estimate)} (${pct} interval [${f(rate.ci[0])}, ${f(rate.ci[1])}]${rate.misfitPValue !== null && rate.misfitPValue < MISFIT_SCALE_P ? `, power law misfits p = ${rate.misfitPValue.toExponential(1)}: SE scaled` : ""})` : "no decay rate (fewer than 3 grid points with a usable Var(R_n))";
  const limitText = limit ? `extrapolated limit ${f(limit.estimate)} (${pct} interval [${f(limit.interval[0])}, ${f(limit.interval[1])}])` : "no extrapolated limit";
  const facts = `Var(R_n)/n^${ev.scaling} = ${f(last.value)} at n = ${last.n} (${f(100 * share)}% of Var(M_n)/n^${ev.scaling}); ${rateText}; ${limitText}; materiality threshold ${f(threshold)} (tolerance ${tolerance} x Var(M_n)/n^${ev.scaling})`;
  if (limit && limit.interval[0] > threshold)
    return { verdict: "fail", why: `${facts}. FAIL: the remainder settles above the threshold: the linear functional misses a material part of the fluctuations`, threshold, limit, pathsToDecide: null };
  if (rate && rate.ci[1] < 0 && share > tolerance)
    return { verdict: "fail", why: `${facts}. FAIL: the remainder grows relative to n^${ev.scaling} and is already above the threshold`, threshold, limit, pathsToDecide: null };
  // A decreasing remainder may still settle above 0: a pass also needs its limit to be immaterial
  // (the interval's upper end below the threshold; without a limit, the value at the largest n).
  const immaterial = limit ? limit.interval[1] <= threshold : last.value <= threshold;
  if (rate && rate.ci[0] > 0 && immaterial)
    return { verdict: "pass", why: `${facts}. PASS: the decay rate's interval lies above 0 and ${limit ? "the extrapolated limit's interval" : "Var(R_n)/n^p at the largest n"} lies below the threshold`, threshold, limit, pathsToDecide: null };
  if (rate && rate.ci[0] > 0)
    return { verdict: "inconclusive", why: `${facts}. INCONCLUSIVE: the remainder decreases but a material limit is not excluded (${limit ? "the extrapolated limit's interval reaches above the threshold" : "no extrapolated limit, and the value at the largest n is above the threshold"}); a grid reaching larger n or more paths would decide`, threshold, limit, pathsToDecide: null };
  let need: number | null = null;
  if (rate && rate.estimate > 0 && rate.standardError > 0) need = Math.ceil(paths * ((normalQuantile(1 - alpha / 2) * rate.standardError) / rate.estimate) ** 2);
  return {
    verdict: "inconclusive",
    why: `${facts}. INCONCLUSIVE: ${rate ? "the decay rate's interval contains 0" : "the decay cannot be assessed on this grid"}; ${need !== null ? `about ${need} paths would put it above 0 (estimate assumed unchanged)` : "more paths alone may not decide: a grid reaching larger n would"}`,
    threshold, limit, pathsToDecide: need,
  };
}
