// Prediction: finite-n mean perimeter of the hull of k independent Gaussian walks (docs/theory.md sec. 5).
//
// Formula (Cauchy's surface-area formula; docs/theory.md sec. 5):
//   E L_n = int_0^{2 pi} E[max_j M_j(t)] dt,   M_j(t) = max_{i<=n} <S^j_i, e_t>,
//   E[max_j M_j(t)] = int_0^inf (1 - prod_j P(M_j(t) <= x)) dx   (independent walks).
// Each <S^j_i, e_t> is a 1-D Gaussian walk with steps N(m_t, s_t^2); P(M_j(t) <= x) comes from the
// Lindley recursion in running-max.ts (exponentially convergent Nyström scheme) [our method].
// Quadrature in t: the integrand is analytic but has near-kinks of width ~ s / (sqrt(n) |edge|) at the
// outward normals of the edges of P = conv{0, mu_j}; we use panels graded geometrically towards those
// directions, with nested Clenshaw–Curtis rules (9 and 5 points) whose difference bounds the error (conservatively:
// at n = 1000, k = 2 the bound is 3e-7 relative while a finer reference run differs by 3e-11).
// In x: composite 16-point Gauss–Legendre on panels of length 4 min_j s_j.
// Hypotheses: Gaussian steps with non-singular covariances (any drifts), k >= 1.
// Budget: the cost of one recursion is timed first; the largest n of the grid whose estimated cost fits
// PredictOptions.budgetSeconds is kept, larger n are dropped and reported.

import type { Mat2, Vec2 } from "../suite/schema.js";
import { driftPolygon } from "./geometry.js";
import { runningMaxLaw, spitzerMaxMean, type RunningMaxLaw } from "./running-max.js";
import { gaussLegendre, secondsSince } from "./special.js";

export const CAUCHY_SOURCE =
  "Cauchy's formula L = int_0^{2pi} h(theta) d theta with E max_j M_j(theta) by the Lindley recursion [our numerical method, docs/theory.md sec. 5]";

export interface GaussianWalk {
  mean: Vec2;
  cov: Mat2;
}

export interface CauchyResult {
  means: Record<string, number>;
  /** Estimated absolute error: angular (nested rule difference) + recursion (checked against Spitzer). */
  errors: Record<string, number>;
  reasons: string[];
  /** Wall time spent, seconds. */
  seconds: number;
  /** Number of angles evaluated. */
  angles: number;
}

export interface CauchyOptions {
  budgetSeconds?: number;
  /** Nyström node spacing (default 0.75). */
  h?: number;
}

function ccRule(N: number): { x: Float64Array; w: Float64Array } {
  const x = new Float64Array(N + 1), w = new Float64Array(N + 1);
  for (let j = 0; j <= N; j++) {
    x[j] = Math.cos((j * Math.PI) / N);
    let s = 0;
    for (let k = 1; k <= N / 2; k++) {
      const b = k === N / 2 ? 1 : 2;
      s += (b / (4 * k * k - 1)) * Math.cos((2 * k * j * Math.PI) / N);
    }
    w[j] = ((j === 0 || j === N ? 1 : 2) / N) * (1 - s);
  }
  return { x, w };
}
const GROW = 3; // panel growth ratio away from a near-kink
const NCC = 8; // Clenshaw–Curtis order (nested with NCC / 2)
const CC_FINE = ccRule(NCC), CC_COARSE = ccRule(NCC / 2);

/** Angular panels graded towards each breakpoint (angle, width). */
function angularPanels(breaks: { t: number; width: number }[]): [number, number][] {
  const TWO_PI = 2 * Math.PI;
  if (breaks.length === 0) {
    return Array.from({ length: 8 }, (_, i) => [(i * TWO_PI) / 8, ((i + 1) * TWO_PI) / 8] as [number, number]);
  }
  const bs = breaks.map((b) => ({ t: ((b.t % TWO_PI) + TWO_PI) % TWO_PI, width: b.width })).sort((a, b) => a.t - b.t);
  const merged: { t: number; width: number }[] = [];
  for (const b of bs) {
    const last = merged[merged.length - 1];
    if (last && b.t - last.t < 1e-9) last.width = Math.min(last.width, b.width);
    else merged.push({ ...b });
  }
  if (merged.length > 1 && merged[0].t + TWO_PI - merged[merged.length - 1].t < 1e-9) {
    merged[0].width = Math.min(merged[0].width, merged.pop()!.width);
  }
  const panels: [number, number][] = [];
  for (let i = 0; i < merged.length; i++) {
    const A = merged[i].t;
    const B = i + 1 < merged.length ? merged[i + 1].t : merged[0].t + TWO_PI;
    const mid = (A + B) / 2;
    const left: number[] = [A];
    for (let d = merged[i].width; A + d < mid; d *= GROW) left.push(A + d);
    const right: number[] = [B];
    const wB = i + 1 < merged.length ? merged[i + 1].width : merged[0].width;
    for (let d = wB; B - d > mid; d *= GROW) right.push(B - d);
    const pts = [...left, mid, ...right.reverse()];
    // Cap panel length at pi/4.
    for (let j = 0; j + 1 < pts.length; j++) {
      const len = pts[j + 1] - pts[j];
      const m = Math.max(1, Math.ceil(len / (Math.PI / 4)));
      for (let q = 0; q < m; q++) panels.push([pts[j] + (q * len) / m, pts[j] + ((q + 1) * len) / m]);
    }
  }
  return panels;
}

/** Breakpoints of the angular integrand: outward normals of the edges of P. */
function breakpoints(walks: GaussianWalk[], nMax: number): { t: number; width: number }[] {
  const P = driftPolygon(walks.map((w) => w.mean), 1e-9);
  if (P.hull.length < 2) return [];
  const sMax = Math.max(...walks.map((w) => {
    const tr = w.cov[0][0] + w.cov[1][1], det = w.cov[0][0] * w.cov[1][1] - w.cov[0][1] ** 2;
    return Math.sqrt(tr / 2 + Math.sqrt(Math.max(0, (tr * tr) / 4 - det)));
  }));
  const v = P.hull.map((i) => P.points[i]);
  const out: { t: number; width: number }[] = [];
  const edges = v.length === 2 ? [[v[0], v[1]], [v[1], v[0]]] : v.map((a, i) => [a, v[(i + 1) % v.length]]);
  for (const [a, b] of edges) {
    const dx = b[0] - a[0], dy = b[1] - a[1], len = Math.hypot(dx, dy);
    out.push({ t: Math.atan2(-dx, dy), width: Math.min(0.2, sMax / (Math.sqrt(nMax) * len)) });
  }
  return out;
}

function projected(w: GaussianWalk, t: number): { m: number; s: number } {
  const c = Math.cos(t), s = Math.sin(t);
  const v = w.cov[0][0] * c * c + 2 * w.cov[0][1] * c * s + w.cov[1][1] * s * s;
  return { m: w.mean[0] * c + w.mean[1] * s, s: Math.sqrt(v) };
}

/**
 * E[max_j M_j(t)] at each n of `ns` for one angle, and the recursion's own error estimate
 * sum_j |int (1 - F_j) - E M_j exact| (Spitzer).
 */
export function expectedMaxAtAngle(
  walks: GaussianWalk[],
  t: number,
  ns: number[],
  h: number,
  withCheck = true,
): { values: number[]; recursionError: number[] } {
  const proj = walks.map((w) => projected(w, t));
  const cache = new Map<string, RunningMaxLaw>();
  const laws = proj.map((p) => {
    const r = p.m / p.s;
    const key = r.toString();
    let law = cache.get(key);
    if (!law) { law = runningMaxLaw(r, ns, { h }); cache.set(key, law); }
    return law;
  });
  const gl = gaussLegendre(16);
  const sMin = Math.min(...proj.map((p) => p.s));
  const values: number[] = [], recursionError: number[] = [];
  for (let idx = 0; idx < ns.length; idx++) {
    let xLo = 0, xHi = 0;
    proj.forEach((p, j) => {
      const [lo, hi] = laws[j].support(idx);
      xLo = Math.max(xLo, p.s * lo);
      xHi = Math.max(xHi, p.s * hi);
    });
    // Single-walk integrals for the error check, and the k-walk integrand.
    const integrate = (g: (x: number) => number, a: number, b: number) => {
      if (b <= a) return 0;
      const m = Math.max(1, Math.ceil((b - a) / (4 * sMin)));
      const len = (b - a) / m;
      let s = 0;
      for (let q = 0; q < m; q++) {
        const c0 = a + (q + 0.5) * len;
        for (let i = 0; i < gl.x.length; i++) s += gl.w[i] * g(c0 + 0.5 * len * gl.x[i]);
      }
      return (s * len) / 2;
    };
    const value =
      xLo +
      integrate((x) => {
        let prod = 1;
        for (let j = 0; j < proj.length && prod > 0; j++) prod *= laws[j].cdf(idx, x / proj[j].s);
        return 1 - prod;
      }, xLo, xHi);
    values.push(value);
    let err = 0;
    if (!withCheck) {
      recursionError.push(0);
      continue;
    }
    if (proj.length > 1) {
      proj.forEach((p, j) => {
        const [lo, hi] = laws[j].support(idx);
        const single = p.s * (lo + integrate((y) => 1 - laws[j].cdf(idx, y), lo, hi));
        err += Math.abs(single - p.s * spitzerMaxMean(p.m / p.s, ns[idx]));
      });
    } else {
      err = Math.abs(value - proj[0].s * spitzerMaxMean(proj[0].m / proj[0].s, ns[idx]));
    }
    recursionError.push(err);
  }
  return { values, recursionError };
}

export function cauchyMeanPerimeter(walks: GaussianWalk[], ns: number[], opts: CauchyOptions = {}): CauchyResult {
  const start = performance.now();
  const budget = opts.budgetSeconds ?? 20;
  const h = opts.h ?? 0.75;
  const reasons: string[] = [];
  walks.forEach((w, j) => {
    const det = w.cov[0][0] * w.cov[1][1] - w.cov[0][1] ** 2;
    if (!(det > 1e-12 * Math.max(w.cov[0][0], w.cov[1][1]) ** 2)) {
      throw new Error(`walks[${j}].cov: the k-walk Cauchy quadrature needs a non-singular covariance`);
    }
  });
  let kept = [...ns].sort((a, b) => a - b);
  // Time one evaluation at the largest n, then keep the largest n that fits the budget.
  const panelsFor = (n: number) => angularPanels(breakpoints(walks, n)).length;
  // Warm up (the first call at a new size runs unoptimised code), then time one evaluation.
  expectedMaxAtAngle(walks, 0.3, [Math.min(kept[0], 50)], h, false);
  expectedMaxAtAngle(walks, 0.7, kept, h, false);
  const t1 = performance.now();
  expectedMaxAtAngle(walks, 1.1, kept, h, false);
  const perEval = secondsSince(t1);
  const nTop = kept[kept.length - 1];
  const estimate = (n: number) => perEval * Math.pow(n / nTop, 1.5) * NCC * panelsFor(n);
  while (kept.length > 0 && estimate(kept[kept.length - 1]) > budget - secondsSince(start)) {
    const n = kept.pop()!;
    reasons.push(
      `perimeter of ${walks.length} walks at n = ${n}: Cauchy quadrature skipped (estimated ${estimate(n).toFixed(1)} s > budget ${budget.toFixed(1)} s)`,
    );
  }
  const means: Record<string, number> = {}, errors: Record<string, number> = {};
  if (kept.length === 0) return { means, errors, reasons, seconds: secondsSince(start), angles: 0 };
  const panels = angularPanels(breakpoints(walks, kept[kept.length - 1]));
  const total = kept.map(() => 0), angErr = kept.map(() => 0), recErr = kept.map(() => 0);
  let angles = 0;
  let active = kept.length; // kept[0..active) are still being computed
  panels.forEach(([a, b], pi) => {
    const panelStart = performance.now();
    const half = (b - a) / 2, mid = (a + b) / 2;
    const ks = kept.slice(0, active);
    const fine = ks.map(() => 0), crude = ks.map(() => 0);
    for (let j = 0; j <= NCC; j++) {
      const t = mid + half * CC_FINE.x[j];
      // The recursion is checked against Spitzer's exact single-walk mean at each panel's centre.
      const check = j === NCC / 2;
      const { values, recursionError } = expectedMaxAtAngle(walks, t, ks, h, check);
      angles++;
      for (let q = 0; q < ks.length; q++) {
        fine[q] += CC_FINE.w[j] * values[q] * half;
        if (j % 2 === 0) crude[q] += CC_COARSE.w[j / 2] * values[q] * half;
        if (check) recErr[q] += 2 * half * recursionError[q];
      }
    }
    for (let q = 0; q < ks.length; q++) {
      total[q] += fine[q];
      angErr[q] += Math.abs(fine[q] - crude[q]);
    }
    // Projected time at the pace of this panel: drop the largest n while it would overrun the
    // budget; each drop rescales the pace by the cost ratio (about n^1.5, as in `estimate`).
    let pace = secondsSince(panelStart);
    while (active > 1 && secondsSince(start) + pace * (panels.length - pi - 1) > budget) {
      active--;
      pace *= Math.pow(kept[active - 1] / kept[active], 1.5);
      reasons.push(`perimeter of ${walks.length} walks at n = ${kept[active]}: Cauchy quadrature stopped (time budget ${budget} s)`);
    }
  });
  kept = kept.slice(0, active);
  kept.forEach((n, q) => {
    means[String(n)] = total[q];
    errors[String(n)] = angErr[q] + recErr[q] + 1e-15 * total[q] * angles;
  });
  const seconds = secondsSince(start);
  reasons.push(
    `perimeter of ${walks.length} walks: Cauchy quadrature at n <= ${kept[kept.length - 1]} with ${angles} angles in ${seconds.toFixed(1)} s`,
  );
  return { means, errors, reasons, seconds, angles };
}
