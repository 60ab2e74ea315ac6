// Predictions (docs/theory.md sec. 6 and 7): variance limits of the perimeter and the diameter with drift, by linearising
// the functional of P = conv{0, mu_1..mu_k} at the endpoints S^j_n ~ n mu_j + sqrt(n) N(0, Sigma_j).
//
// Perimeter [derived, docs/theory.md sec. 6]: for each walk whose drift is a vertex of P, g_j = sum of the two
// unit vectors pointing into mu_j along the edges of P meeting there (2 mu/|mu| when P = [0, mu]);
// Var(L_n)/n -> sum_j g_j' Sigma_j g_j. One walk: 4 E[((Z - mu).mu_hat)^2] ("Convex hulls of planar
// random walks with drift", Proc. AMS 143 (2015), arXiv:1301.4059 [memory]); two walks: "On the convex
// hull of two planar random walks", arXiv:2403.17705; N walks: "Non-Gaussian limits for diameter and
// perimeter of convex hulls of multiple random walks", arXiv:2509.17590.  E L_n / n -> perimeter(P).
// Diameter [derived, docs/theory.md sec. 7]: farthest pair (a, b) of vertices of P unique, e = (a - b)/|a - b|:
// Var(D_n)/n -> e'(Sigma_a + Sigma_b) e (the origin vertex contributes nothing); one walk:
// E[((Z - mu).mu_hat)^2] ("The convex hull of a planar random walk: perimeter, diameter, and shape",
// arXiv:1803.08293).  E D_n / n -> diam(P).

import type { Mat2, Vec2 } from "../suite/schema.js";
import { dist, driftPolygon, type DriftPolygon } from "./geometry.js";
import { quad } from "./step-moments.js";

export const PERIMETER_VARIANCE_SOURCES = [
  "one walk: Convex hulls of planar random walks with drift, Proc. AMS 143 (2015), arXiv:1301.4059 [memory]",
  "two walks: On the convex hull of two planar random walks, arXiv:2403.17705 (2024)",
  "k walks: linearisation of perimeter(conv{0, S^j_n}) at n mu_j [derived, docs/theory.md sec. 6; cf. arXiv:2509.17590]",
];
export const DIAMETER_VARIANCE_SOURCES = [
  "one walk: The convex hull of a planar random walk: perimeter, diameter, and shape, arXiv:1803.08293 (2018)",
  "k walks: linearisation of |S^a_n - S^b_n| for the unique farthest pair of vertices of P [derived, docs/theory.md sec. 7; cf. arXiv:2509.17590]",
];

const unit = (v: Vec2): Vec2 => {
  const l = Math.hypot(v[0], v[1]);
  return [v[0] / l, v[1] / l];
};

/** For each hull vertex of P (ccw), the gradient of perimeter(P) with respect to that vertex. */
export function perimeterGradients(P: DriftPolygon): Map<number, Vec2> {
  const g = new Map<number, Vec2>();
  const h = P.hull;
  if (h.length === 2) {
    const [a, b] = [P.points[h[0]], P.points[h[1]]];
    const u = unit([b[0] - a[0], b[1] - a[1]]);
    g.set(h[1], [2 * u[0], 2 * u[1]]);
    g.set(h[0], [-2 * u[0], -2 * u[1]]);
    return g;
  }
  if (h.length < 3) return g;
  for (let i = 0; i < h.length; i++) {
    const v = P.points[h[i]], prev = P.points[h[(i + h.length - 1) % h.length]], next = P.points[h[(i + 1) % h.length]];
    const u1 = unit([v[0] - prev[0], v[1] - prev[1]]), u2 = unit([v[0] - next[0], v[1] - next[1]]);
    g.set(h[i], [u1[0] + u2[0], u1[1] + u2[1]]);
  }
  return g;
}

/** Gradient of area(P) with respect to each hull vertex (ccw): (1/2) J (v_{i+1} - v_{i-1}). */
export function areaGradients(P: DriftPolygon): Map<number, Vec2> {
  const g = new Map<number, Vec2>();
  const h = P.hull;
  if (h.length < 3) return g;
  for (let i = 0; i < h.length; i++) {
    const prev = P.points[h[(i + h.length - 1) % h.length]], next = P.points[h[(i + 1) % h.length]];
    g.set(h[i], [(next[1] - prev[1]) / 2, (prev[0] - next[0]) / 2]);
  }
  return g;
}

/** Walk indices (0-based) whose drift coincides with point index p of P (p = 0 is the origin). */
export function walksAt(P: DriftPolygon, p: number, tol: number): number[] {
  const target = P.points[p];
  const eps = tol * Math.max(P.scale, 1e-300);
  const out: number[] = [];
  for (let j = 1; j < P.points.length; j++) if (dist(P.points[j], target) <= eps) out.push(j - 1);
  return out;
}

/** sigma^2 = sum_j g_j' Sigma_j g_j over walks sitting at vertices (first walk at each vertex). */
export function linearisedVariance(P: DriftPolygon, grads: Map<number, Vec2>, covs: Mat2[], tol: number): {
  sigma2: number;
  perWalk: (Vec2 | null)[];
} {
  const perWalk: (Vec2 | null)[] = covs.map(() => null);
  let sigma2 = 0;
  for (const [p, g] of grads) {
    const ws = walksAt(P, p, tol);
    if (ws.length === 0) continue;
    perWalk[ws[0]] = g;
    sigma2 += quad(covs[ws[0]], g);
  }
  return { sigma2, perWalk };
}

export interface FarthestPair {
  a: number;
  b: number;
  d: number;
  /** Relative gap (d - second-largest distance) / d; Infinity when there is a single pair. */
  gap: number;
}

export function farthestPair(P: DriftPolygon): FarthestPair | null {
  const h = P.hull;
  if (h.length < 2) return null;
  const pairs: { a: number; b: number; d: number }[] = [];
  for (let i = 0; i < h.length; i++) {
    for (let j = i + 1; j < h.length; j++) pairs.push({ a: h[i], b: h[j], d: dist(P.points[h[i]], P.points[h[j]]) });
  }
  pairs.sort((x, y) => y.d - x.d);
  const gap = pairs.length > 1 ? (pairs[0].d - pairs[1].d) / pairs[0].d : Infinity;
  return { ...pairs[0], gap };
}

/** Every pair of hull vertices of P whose distance is within relative `tol` of the diameter (ties included). */
export function farthestPairs(P: DriftPolygon, tol: number): { a: number; b: number; d: number }[] {
  const h = P.hull;
  const pairs: { a: number; b: number; d: number }[] = [];
  for (let i = 0; i < h.length; i++) for (let j = i + 1; j < h.length; j++) pairs.push({ a: h[i], b: h[j], d: dist(P.points[h[i]], P.points[h[j]]) });
  const top = Math.max(0, ...pairs.map((p) => p.d));
  return pairs.filter((p) => top - p.d <= tol * top);
}

export function diameterVariance(drifts: Vec2[], covs: Mat2[], tol = 1e-9) {
  const P = driftPolygon(drifts, tol);
  const pair = farthestPair(P);
  if (!pair) return null;
  const e = unit([P.points[pair.a][0] - P.points[pair.b][0], P.points[pair.a][1] - P.points[pair.b][1]]);
  let sigma2 = 0;
  for (const p of [pair.a, pair.b]) {
    if (p === 0) continue; // the origin is a fixed point of the hull
    const ws = walksAt(P, p, tol);
    if (ws.length > 0) sigma2 += quad(covs[ws[0]], e);
  }
  return { P, pair, e, sigma2, meanGrowth: pair.d };
}
