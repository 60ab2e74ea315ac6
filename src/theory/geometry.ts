// The drift polygon P = conv{0, mu_1, ..., mu_k} and the quantities the linearisations need.
// Plain computational geometry (common practice): monotone chain hull, shoelace area.

import type { Vec2 } from "../suite/schema.js";

export interface DriftPolygon {
  /** Hull vertices in counter-clockwise order (indices into `points`; point 0 is the origin). */
  hull: number[];
  /** points[0] = origin, points[j + 1] = mu_j. */
  points: Vec2[];
  /** Perimeter of P (twice the length when P is a segment). */
  perimeter: number;
  area: number;
  /** Largest |mu_j|, the length scale of the tolerances (0 when all drifts vanish). */
  scale: number;
  /** P has empty interior (all drifts on one line through 0), up to the tie tolerance. */
  collinear: boolean;
}

const cross = (o: Vec2, a: Vec2, b: Vec2) => (a[0] - o[0]) * (b[1] - o[1]) - (a[1] - o[1]) * (b[0] - o[0]);
export const dist = (a: Vec2, b: Vec2) => Math.hypot(a[0] - b[0], a[1] - b[1]);

/**
 * Convex hull of the distinct points (duplicates within `tol * scale` merged, collinear interior
 * points dropped). Returns indices, counter-clockwise.
 */
export function hullIndices(points: Vec2[], tol: number): number[] {
  const scale = Math.max(1e-300, ...points.map((p) => Math.hypot(p[0], p[1])));
  const eps = tol * scale;
  const idx: number[] = [];
  for (let i = 0; i < points.length; i++) {
    if (!idx.some((j) => dist(points[i], points[j]) <= eps)) idx.push(i);
  }
  idx.sort((a, b) => points[a][0] - points[b][0] || points[a][1] - points[b][1]);
  if (idx.length <= 2) return idx;
  const build = (order: number[]) => {
    const out: number[] = [];
    for (const i of order) {
      while (out.length >= 2) {
        const c = cross(points[out[out.length - 2]], points[out[out.length - 1]], points[i]);
        const base = dist(points[out[out.length - 2]], points[i]);
        if (c <= eps * base) out.pop();
        else break;
      }
      out.push(i);
    }
    return out;
  };
  const lower = build(idx);
  const upper = build([...idx].reverse());
  const h = lower.slice(0, -1).concat(upper.slice(0, -1));
  return h;
}

export function driftPolygon(drifts: Vec2[], tol: number): DriftPolygon {
  const points: Vec2[] = [[0, 0], ...drifts];
  const scale = Math.max(0, ...drifts.map((m) => Math.hypot(m[0], m[1])));
  const hull = scale > 0 ? hullIndices(points, tol) : [0];
  let perimeter = 0, area = 0;
  if (hull.length === 2) perimeter = 2 * dist(points[hull[0]], points[hull[1]]);
  if (hull.length >= 3) {
    for (let i = 0; i < hull.length; i++) {
      const a = points[hull[i]], b = points[hull[(i + 1) % hull.length]];
      perimeter += dist(a, b);
      area += (a[0] * b[1] - a[1] * b[0]) / 2;
    }
  }
  return { hull, points, perimeter, area, scale, collinear: hull.length < 3 };
}

/** Location of the point `q` relative to the convex polygon with ccw vertex list `poly`. */
export function locate(poly: Vec2[], q: Vec2, tol: number): "interior" | "vertex" | "edge" | "outside" {
  const scale = Math.max(1e-300, ...poly.map((p) => Math.hypot(p[0], p[1])));
  if (poly.some((p) => dist(p, q) <= tol * scale)) return "vertex";
  if (poly.length < 3) {
    if (poly.length === 2) {
      const c = cross(poly[0], poly[1], q) / Math.max(dist(poly[0], poly[1]), 1e-300);
      const t = ((q[0] - poly[0][0]) * (poly[1][0] - poly[0][0]) + (q[1] - poly[0][1]) * (poly[1][1] - poly[0][1])) /
        dist(poly[0], poly[1]) ** 2;
      if (Math.abs(c) <= tol * scale && t > 0 && t < 1) return "edge";
    }
    return "outside";
  }
  let minSigned = Infinity;
  for (let i = 0; i < poly.length; i++) {
    const a = poly[i], b = poly[(i + 1) % poly.length];
    minSigned = Math.min(minSigned, cross(a, b, q) / dist(a, b));
  }
  if (minSigned < -tol * scale) return "outside";
  if (minSigned <= tol * scale) return "edge";
  return "interior";
}
