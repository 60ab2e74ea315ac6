// Prediction: finite-n mean perimeter of the hull of k independent Gaussian walks (docs/theory.md sec. 5).
//
// Formula (Cauchy's surface-area formula; docs/theory.md sec. 5):
//   E L_n = int_0^{2 pi} E[max_j M_j(t)] dt,   M_j(t) = max_{i<=n} <S^j_i, e_t>,
//   E[max_j M_j(t)] = int_0^inf (1 - prod_j P(M_j(t) <= x)) dx   (independent walks).
// Each <S^j_i, e_t> is a 1-D Gaussian walk with steps N(m_t, s_t^2); P(M_j(t) <= x) comes from the
// Lindley recursion in running-max.ts (exponentially convergent Nyström scheme) [our method].
//
// Accuracy-targeted [our method]: each mean is computed until its error bound is at most the target
// the caller asks for (CauchyOptions.tolerance: a run asks for 1/10 of its own standard error), not
// for a fixed time. Quadrature in t: the integrand is analytic but has near-kinks of width
// ~ s / (sqrt(n) |edge|) at the outward normals of the edges of P = conv{0, mu_j}; panels are graded
// geometrically towards those directions, then refined adaptively (the panel whose error is largest
// against its target first): Clenshaw–Curtis rules of 5 and 9 points (nested: every refinement
// reuses the points already computed), then halving. A panel's error is |Q_N - Q_{N/2}| (the
// error of the coarser rule: conservative for Q_N) plus the weighted errors of its points.
// Mirror [derived]: when a reflection of the plane maps the walks onto themselves, the integrand is
// symmetric about the reflection's line and half the circle is integrated (mirrorLine).
// In x: composite 16-point Gauss–Legendre on panels graded from 4 min_j s_j up to 2 sqrt(n) min_j s_j.
// Dominance short cut [derived]: at an angle where one walk b outruns the others, E max_j M_j =
// E M_b + int F_b (1 - prod_{a != b} F_a) dx, and
//   0 <= int F_b (1 - prod F_a) <= int P(S^b_n <= x) sum_a min(1, P(M_a >= x)) dx =: D,
// with P(M_a >= x) <= exp(-theta x + n (theta m + theta^2 s^2 / 2)) for any theta > 0 with
// theta m + theta^2 s^2 / 2 >= 0 (Doob's maximal inequality for the submartingale exp(theta S_k):
// common practice). E M_b is exact (Spitzer, see running-max.ts), so the recursion is skipped where
// D/2 is below 1/10 of the target per 2 pi radians; the value is E M_b + D/2 with error D/2.
// Hypotheses: Gaussian steps with non-singular covariances (any drifts), k >= 1.
// Time cap: PredictOptions.budgetSeconds only guards against runaway cost: the largest n whose first
// pass cannot fit are dropped, and a mean whose bound has not reached its target when the cap is hit
// is reported with its bound and listed in `missed` (its check is then not gated).

import type { Mat2, Vec2 } from "../suite/schema.js";
import { driftPolygon } from "./geometry.js";
import { normalCdfFast, runningMaxLaw, spitzerMaxMeans, type RunningMaxLaw } from "./running-max.js";
import { gaussLegendre, secondsSince } from "./special.js";

export const CAUCHY_SOURCE =
  "Cauchy's formula L = int_0^{2pi} h(theta) d theta with E max_j M_j(theta) by the Lindley recursion [our numerical method, docs/theory.md sec. 5]";

export interface GaussianWalk {
  mean: Vec2;
  cov: Mat2;
}

export interface CauchyResult {
  means: Record<string, number>;
  /** Error bound of each mean: angular (nested rules) + recursion (checked against Spitzer) + short cuts. */
  errors: Record<string, number>;
  /** The absolute error bound each mean was asked to reach (same keys as `means`). */
  targets: Record<string, number>;
  /** The n whose bound did not reach its target before the time cap (their checks are not gated). */
  missed: number[];
  reasons: string[];
  /** Wall time spent, seconds. */
  seconds: number;
  /** Number of angles evaluated. */
  angles: number;
}

export interface CauchyOptions {
  /** Time cap in seconds (default 60): a guard against runaway cost, not the accuracy control. */
  budgetSeconds?: number;
  /** Nyström node spacing (default 0.75). */
  h?: number;
  /**
   * The absolute error bound wanted for the mean at n; `estimate` approximates the mean from below
   * (int max_j E M_j(t) dt) for callers that want a relative target. Default: 1e-6 * estimate.
   */
  tolerance?: (n: number, estimate: number) => number;
  /** Integrate half the circle when the walks have a mirror line (default true; false: the whole circle, for cross-checks). */
  mirror?: boolean;
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
const FIRST_ORDER = 4; // Clenshaw–Curtis order of a new panel (5 points; error against the 3-point rule)
const MAX_ORDER = 8; // past this order a panel is halved (graded panels already sit at the kinks)
const MAX_PANELS = 4096;
/** Share of a mean's target the dominance short cuts may use (over the whole circle). */
const SHORTCUT_SHARE = 0.1;
const CC_RULES = new Map<number, { x: Float64Array; w: Float64Array }>();
function cc(N: number): { x: Float64Array; w: Float64Array } {
  let r = CC_RULES.get(N);
  if (!r) { r = ccRule(N); CC_RULES.set(N, r); }
  return r;
}

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

/**
 * A mirror line of the suite: the reflection R across the line at angle `alpha` maps the walks onto
 * themselves (R mu_i = mu_{pi(i)}, R C_i R^T = C_{pi(i)} for a permutation pi, to 1e-12 relative).
 * Then <S^i, e_{2 alpha - t}> = <R S^i, e_t> has the law of <S^{pi(i)}, e_t>, so h(2 alpha - t) = h(t) and
 * the circle is integrated over [alpha, alpha + pi], twice [derived]. `slack(n)` bounds |h(2 alpha - t) - h(t)|
 * from the rounding left in the match: coupling the steps, |E max_i S'_i - E max_i S_i| <= n |dm| + |ds| E max_i |S_i - i m|
 * <= n |dm| + 2 sqrt(n) |ds| (Doob's L2 inequality), |ds| <= |dC| / s_min, and |max_j a_j - max_j b_j| <= sum_j |a_j - b_j|.
 */
export function mirrorLine(walks: GaussianWalk[]): { alpha: number; slack: (n: number) => number } | null {
  const anchor = walks.find((w) => Math.hypot(w.mean[0], w.mean[1]) > 0);
  if (!anchor) return null;
  const scaleM = Math.max(...walks.map((w) => Math.hypot(w.mean[0], w.mean[1])));
  const scaleC = Math.max(...walks.map((w) => Math.abs(w.cov[0][0]) + Math.abs(w.cov[1][1]) + 2 * Math.abs(w.cov[0][1])));
  const sMin = Math.min(...walks.map((w) => {
    const [[a, b], [, d]] = w.cov;
    return Math.sqrt(Math.max(0, (a + d) / 2 - Math.sqrt(((a - d) / 2) ** 2 + b * b)));
  }));
  const phi0 = Math.atan2(anchor.mean[1], anchor.mean[0]);
  for (const target of walks) {
    const alpha = (phi0 + Math.atan2(target.mean[1], target.mean[0])) / 2;
    const c = Math.cos(2 * alpha), s = Math.sin(2 * alpha);
    const used = walks.map(() => false);
    let dm = 0, dc = 0;
    const matched = walks.every((w) => {
      const m: Vec2 = [c * w.mean[0] + s * w.mean[1], s * w.mean[0] - c * w.mean[1]];
      // R C R^T for R = [[c, s], [s, -c]].
      const [[a, b], [, d]] = w.cov;
      const ra = c * c * a + 2 * c * s * b + s * s * d, rd = s * s * a - 2 * c * s * b + c * c * d;
      const rb = c * s * (a - d) - (c * c - s * s) * b;
      let best = -1, bestM = Infinity, bestC = Infinity;
      walks.forEach((v, j) => {
        if (used[j]) return;
        const em = Math.hypot(m[0] - v.mean[0], m[1] - v.mean[1]);
        const ec = Math.hypot(ra - v.cov[0][0], rd - v.cov[1][1], Math.SQRT2 * (rb - v.cov[0][1]));
        if (em <= 1e-12 * scaleM && ec <= 1e-12 * scaleC && em / scaleM + ec / scaleC < bestM / scaleM + bestC / scaleC) {
          best = j; bestM = em; bestC = ec;
        }
      });
      if (best < 0) return false;
      used[best] = true;
      dm += bestM;
      dc += bestC;
      return true;
    });
    if (matched) return { alpha, slack: (n: number) => n * dm + (2 * Math.sqrt(n) * dc) / sMin };
  }
  return null;
}

function projected(w: GaussianWalk, t: number): { m: number; s: number } {
  const c = Math.cos(t), s = Math.sin(t);
  const v = w.cov[0][0] * c * c + 2 * w.cov[0][1] * c * s + w.cov[1][1] * s * s;
  return { m: w.mean[0] * c + w.mean[1] * s, s: Math.sqrt(v) };
}

/** Upper bound of P(M_n >= x) for steps N(m, s^2), x > 0 (Doob, see the header). */
function maxTail(m: number, s: number, n: number, x: number): number {
  const s2 = s * s;
  const theta = Math.max((x - n * m) / (n * s2), m < 0 ? (-2 * m) / s2 : 0);
  if (theta <= 0) return 1;
  return Math.min(1, Math.exp(-theta * x + n * (theta * m + 0.5 * theta * theta * s2)));
}

/** D = int_0^inf P(S^b_n <= x) sum_{a != b} min(1, P(M_a >= x)) dx (the short cut's bound). */
function dominanceBound(proj: { m: number; s: number }[], b: number, n: number): number {
  const rn = Math.sqrt(n);
  const sb = proj[b].s * rn, cb = n * proj[b].m;
  let hi = 0, sMin = sb;
  proj.forEach((p, a) => {
    if (a === b) return;
    hi = Math.max(hi, Math.max(n * p.m, 0) + 12 * p.s * rn);
    sMin = Math.min(sMin, p.s * rn);
  });
  const lo = Math.max(0, cb - 12 * sb);
  // Beyond [lo, hi] one factor is below exp(-72): the pieces there are bounded by 1e-30 per unit scale.
  let total = 1e-30 * (sb + proj.length * sMin);
  if (hi <= lo) return total;
  const gl = gaussLegendre(16);
  const m = Math.min(400, Math.max(1, Math.ceil((hi - lo) / (0.5 * sMin))));
  const len = (hi - lo) / m;
  for (let q = 0; q < m; q++) {
    const c0 = lo + (q + 0.5) * len;
    let acc = 0;
    for (let i = 0; i < gl.x.length; i++) {
      const x = c0 + 0.5 * len * gl.x[i];
      let tail = 0;
      for (let a = 0; a < proj.length && tail < 1; a++) if (a !== b) tail += maxTail(proj[a].m, proj[a].s, n, x);
      acc += gl.w[i] * normalCdfFast((x - cb) / sb) * Math.min(1, tail);
    }
    total += (acc * len) / 2;
  }
  return total;
}

/** Value of E[max_j M_j(t)] at each n of an angle, with the error bound of each value. */
export interface AngleValue {
  values: number[];
  /** Error bound: recursion error (against Spitzer's exact single-walk means) or half the short cut's D. */
  errors: number[];
  /** How many n used the dominance short cut (no recursion). */
  shortcuts: number;
}

/**
 * E[max_j M_j(t)] at each n of `ns` (ascending) for one angle. `shortcutBelow[q]`: the short cut is
 * taken at ns[q] when D/2 is at most this (0: never).
 */
export function expectedMaxAtAngle(
  walks: GaussianWalk[],
  t: number,
  ns: number[],
  h: number,
  shortcutBelow: number[] = ns.map(() => 0),
): AngleValue {
  const proj = walks.map((w) => projected(w, t));
  const exactMax = proj.map((p) => spitzerMaxMeans(p.m / p.s, ns).map((v) => p.s * v));
  const values = ns.map(() => 0), errors = ns.map(() => 0);
  const need: number[] = [];
  let shortcuts = 0;
  ns.forEach((n, q) => {
    let b = 0;
    for (let j = 1; j < proj.length; j++) if (exactMax[j][q] > exactMax[b][q]) b = j;
    const d = proj.length === 1 ? 0 : shortcutBelow[q] > 0 ? dominanceBound(proj, b, n) : Infinity;
    if (d / 2 <= shortcutBelow[q] || proj.length === 1) {
      values[q] = exactMax[b][q] + d / 2;
      errors[q] = d / 2;
      shortcuts++;
    } else {
      need.push(q);
    }
  });
  if (need.length === 0) return { values, errors, shortcuts };
  const sub = need.map((q) => ns[q]);
  const cache = new Map<number, RunningMaxLaw>();
  const laws = proj.map((p) => {
    const r = p.m / p.s;
    let law = cache.get(r);
    if (!law) { law = runningMaxLaw(r, sub, { h }); cache.set(r, law); }
    return law;
  });
  const gl = gaussLegendre(16);
  const sMin = Math.min(...proj.map((p) => p.s));
  // Panels of 16-point Gauss–Legendre from a, 4 sMin long, growing by 3/2 up to 2 sMin sqrt(n): the
  // laws vary on the scale of one step near where they start and of sqrt(n) steps in the bulk.
  const integrate = (g: (x: number) => number, a: number, b: number, n: number) => {
    let s = 0;
    const cap = Math.max(4, 2 * Math.sqrt(n)) * sMin;
    for (let x0 = a, len = 4 * sMin; x0 < b; x0 += len, len = Math.min(cap, 1.5 * len)) {
      const l = Math.min(len, b - x0), c0 = x0 + 0.5 * l;
      let p = 0;
      for (let i = 0; i < gl.x.length; i++) p += gl.w[i] * g(c0 + 0.5 * l * gl.x[i]);
      s += (p * l) / 2;
    }
    return s;
  };
  need.forEach((q, idx) => {
    let xLo = 0, xHi = 0;
    proj.forEach((p, j) => {
      const [lo, hi] = laws[j].support(idx);
      xLo = Math.max(xLo, p.s * lo);
      xHi = Math.max(xHi, p.s * hi);
    });
    values[q] = xLo + integrate((x) => {
      let prod = 1;
      for (let j = 0; j < proj.length && prod > 0; j++) prod *= laws[j].cdf(idx, x / proj[j].s);
      return 1 - prod;
    }, xLo, xHi, ns[q]);
    // The recursion's own error: sum_j |int (1 - F_j) - E M_j exact (Spitzer)|.
    let err = 0;
    proj.forEach((p, j) => {
      const [lo, hi] = laws[j].support(idx);
      const single = p.s * (lo + integrate((y) => 1 - laws[j].cdf(idx, y), lo, hi, ns[q]));
      err += Math.abs(single - exactMax[j][q]);
    });
    errors[q] = err;
  });
  return { values, errors, shortcuts };
}

interface Panel {
  a: number;
  b: number;
  /** Clenshaw–Curtis order N (N + 1 points). */
  order: number;
  /** Q_N per n, the quadrature error |Q_N - Q_{N/2}|, and the weighted point errors. */
  value: number[];
  quadError: number[];
  pointError: number[];
}

export function cauchyMeanPerimeter(walks: GaussianWalk[], ns: number[], opts: CauchyOptions = {}): CauchyResult {
  const start = performance.now();
  const budget = opts.budgetSeconds ?? 60;
  const h = opts.h ?? 0.75;
  const reasons: string[] = [];
  walks.forEach((w, j) => {
    const det = w.cov[0][0] * w.cov[1][1] - w.cov[0][1] ** 2;
    if (!(det > 1e-12 * Math.max(w.cov[0][0], w.cov[1][1]) ** 2)) {
      throw new Error(`walks[${j}].cov: the k-walk Cauchy quadrature needs a non-singular covariance`);
    }
  });
  const kept = [...ns].sort((a, b) => a - b);
  // Targets: from the caller, given int max_j E M_j(t) dt (a Riemann sum on 64 angles) as the estimate.
  const estimate = kept.map(() => 0);
  for (let i = 0; i < 64; i++) {
    const proj = walks.map((w) => projected(w, (i * 2 * Math.PI) / 64));
    const em = proj.map((p) => spitzerMaxMeans(p.m / p.s, kept).map((v) => p.s * v));
    kept.forEach((_, q) => { estimate[q] += (Math.max(...em.map((e) => e[q])) * 2 * Math.PI) / 64; });
  }
  const tolerance = opts.tolerance ?? ((_n: number, e: number) => 1e-6 * e);
  let targets = kept.map((n, q) => tolerance(n, estimate[q]));
  targets.forEach((t, q) => {
    if (!(t > 0)) throw new Error(`tolerance: the error bound for n = ${kept[q]} must be positive, got ${t}`);
  });
  // A mirror line halves the circle: panels on [alpha, alpha + pi] (both ends made breakpoints), weighted twice.
  const mirror = opts.mirror === false ? null : mirrorLine(walks);
  const fold = mirror ? 2 : 1;
  const initialPanels = (n: number) => {
    if (!mirror) return angularPanels(breakpoints(walks, n));
    const { alpha } = mirror;
    const ends = [{ t: alpha, width: 0.2 }, { t: alpha + Math.PI, width: 0.2 }];
    const TWO_PI = 2 * Math.PI;
    return angularPanels([...breakpoints(walks, n), ...ends])
      .filter(([a, b]) => ((((a + b) / 2 - alpha) % TWO_PI) + TWO_PI) % TWO_PI < Math.PI);
  };
  // Time one evaluation at the largest n (after a warm-up), then drop the largest n while the first
  // pass (FIRST_ORDER + 1 points per panel) would not fit the cap.
  expectedMaxAtAngle(walks, 0.3, [Math.min(kept[0], 50)], h);
  const t1 = performance.now();
  expectedMaxAtAngle(walks, 1.1, kept, h);
  const perEval = secondsSince(t1);
  const nTop = kept[kept.length - 1];
  const firstPass = (n: number) => perEval * Math.pow(n / nTop, 1.5) * (FIRST_ORDER * initialPanels(n).length + 1);
  while (kept.length > 0 && firstPass(kept[kept.length - 1]) > budget - secondsSince(start)) {
    const n = kept.pop()!;
    targets = targets.slice(0, kept.length);
    reasons.push(
      `perimeter of ${walks.length} walks at n = ${n}: Cauchy quadrature skipped (first pass estimated ${firstPass(n).toFixed(1)} s > time cap ${budget.toFixed(1)} s)`,
    );
  }
  const means: Record<string, number> = {}, errors: Record<string, number> = {}, targetOut: Record<string, number> = {};
  if (kept.length === 0) return { means, errors, targets: targetOut, missed: [], reasons, seconds: secondsSince(start), angles: 0 };
  const Q = kept.length;
  // The short cuts may use at most SHORTCUT_SHARE of the target over the whole circle.
  const shortcutBelow = targets.map((t) => (SHORTCUT_SHARE * t) / (2 * Math.PI));
  const seen = new Map<number, AngleValue>();
  let shortcuts = 0;
  const at = (t: number): AngleValue => {
    let v = seen.get(t);
    if (!v) {
      v = expectedMaxAtAngle(walks, t, kept, h, shortcutBelow);
      shortcuts += v.shortcuts;
      seen.set(t, v);
    }
    return v;
  };
  const evaluate = (a: number, b: number, order: number): Panel => {
    const half = (fold * (b - a)) / 2, mid = (a + b) / 2;
    const fine = cc(order), coarse = cc(order / 2);
    const value = new Array<number>(Q).fill(0), crude = new Array<number>(Q).fill(0), pointError = new Array<number>(Q).fill(0);
    for (let j = 0; j <= order; j++) {
      const t = j === 0 ? b : j === order ? a : mid + ((b - a) / 2) * fine.x[j];
      const v = at(t);
      for (let q = 0; q < Q; q++) {
        value[q] += fine.w[j] * v.values[q] * half;
        pointError[q] += fine.w[j] * v.errors[q] * half;
        if (j % 2 === 0) crude[q] += coarse.w[j / 2] * v.values[q] * half;
      }
    }
    return { a, b, order, value, quadError: value.map((x, q) => Math.abs(x - crude[q])), pointError };
  };
  const panels = initialPanels(kept[Q - 1]).map(([a, b]) => evaluate(a, b, FIRST_ORDER));
  const totals = () => {
    const value = new Array<number>(Q).fill(0), error = new Array<number>(Q).fill(0), fixed = new Array<number>(Q).fill(0);
    for (const p of panels) {
      for (let q = 0; q < Q; q++) {
        value[q] += p.value[q];
        error[q] += p.quadError[q] + p.pointError[q];
        fixed[q] += p.pointError[q];
      }
    }
    // Rounding in the sums (a generous 1e-15 relative per angle); the mirror's slack over the folded half.
    for (let q = 0; q < Q; q++) {
      error[q] += 1e-15 * Math.abs(value[q]) * seen.size;
      if (mirror) {
        error[q] += Math.PI * mirror.slack(kept[q]);
        fixed[q] += Math.PI * mirror.slack(kept[q]);
      }
    }
    return { value, error, fixed };
  };
  let sum = totals();
  let capped = false;
  for (;;) {
    // Open: a target not met that refinement can still meet (the points' own errors, which do not
    // shrink with more angles, are below it).
    const open = kept.map((_, q) => q).filter((q) => !(sum.error[q] <= targets[q]) && sum.fixed[q] < targets[q]);
    if (open.length === 0) break;
    if (secondsSince(start) > budget || panels.length >= MAX_PANELS) { capped = true; break; }
    // Refine the panel with the largest quadrature error against the targets not yet met.
    let worst = -1, worstRatio = 0;
    panels.forEach((p, i) => {
      for (const q of open) {
        const ratio = p.quadError[q] / targets[q];
        if (ratio > worstRatio) { worstRatio = ratio; worst = i; }
      }
    });
    // Nothing left to refine (the point errors alone exceed a target): stop and say so.
    if (worst < 0 || worstRatio < 1e-6) { capped = true; break; }
    const p = panels[worst];
    if (p.order < MAX_ORDER) {
      panels[worst] = evaluate(p.a, p.b, p.order * 2);
    } else {
      const mid = (p.a + p.b) / 2;
      panels.splice(worst, 1, evaluate(p.a, mid, FIRST_ORDER), evaluate(mid, p.b, FIRST_ORDER));
    }
    sum = totals();
  }
  const missed: number[] = [];
  kept.forEach((n, q) => {
    means[String(n)] = sum.value[q];
    errors[String(n)] = sum.error[q];
    targetOut[String(n)] = targets[q];
    if (!(sum.error[q] <= targets[q])) missed.push(n);
  });
  const seconds = secondsSince(start);
  reasons.push(
    `perimeter of ${walks.length} walks: Cauchy quadrature at n <= ${kept[Q - 1]} with ${seen.size} angles (${panels.length} panels, ` +
      `${shortcuts} angle-n pairs by the dominance short cut) in ${seconds.toFixed(1)} s`,
  );
  for (const n of missed) {
    const key = String(n);
    reasons.push(
      `perimeter of ${walks.length} walks at n = ${n}: error bound ${errors[key].toExponential(1)} did not reach the target ` +
        `${targetOut[key].toExponential(1)} (${capped && secondsSince(start) > budget ? `time cap ${budget} s` : "limit of the method"}): shown, not gated`,
    );
  }
  return { means, errors, targets: targetOut, missed, reasons, seconds, angles: seen.size };
}
