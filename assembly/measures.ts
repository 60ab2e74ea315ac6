// Functionals of a hull given as h strict vertices, counter-clockwise (from monotoneChain), and
// the record they are written to: the measures at their slots of src/geometry/measure-registry.ts.

import { crossSign } from "./hull";

@inline function ld(ptr: usize, i: i32): f64 {
  return load<f64>(ptr + (<usize>i << 3));
}

/** Perimeter, Neumaier-compensated sum of edge lengths; a segment counts twice, a point is 0. */
export function perimeter(hx: usize, hy: usize, h: i32): f64 {
  if (h < 2) return 0.0;
  let sum = 0.0, comp = 0.0;
  for (let i = 0; i < h; i++) {
    const j = i + 1 == h ? 0 : i + 1;
    const dx = ld(hx, j) - ld(hx, i), dy = ld(hy, j) - ld(hy, i);
    const len = Math.sqrt(dx * dx + dy * dy);
    const t = sum + len;
    comp += Math.abs(sum) >= len ? (sum - t) + len : (len - t) + sum;
    sum = t;
  }
  return sum + comp;
}

/** Area by the shoelace formula about vertex 0, Neumaier-compensated; 0 for h < 3. */
export function area(hx: usize, hy: usize, h: i32): f64 {
  if (h < 3) return 0.0;
  const x0 = ld(hx, 0), y0 = ld(hy, 0);
  let sum = 0.0, comp = 0.0;
  for (let i = 1; i + 1 < h; i++) {
    const ax = ld(hx, i) - x0, ay = ld(hy, i) - y0;
    const bx = ld(hx, i + 1) - x0, by = ld(hy, i + 1) - y0;
    const v = ax * by - ay * bx;
    const t = sum + v;
    comp += Math.abs(sum) >= Math.abs(v) ? (sum - t) + v : (v - t) + sum;
    sum = t;
  }
  return 0.5 * (sum + comp);
}

@inline function dist2(hx: usize, hy: usize, i: i32, j: i32): f64 {
  const dx = ld(hx, i) - ld(hx, j), dy = ld(hy, i) - ld(hy, j);
  return dx * dx + dy * dy;
}

/**
 * Diameter by rotating calipers (M. I. Shamos, PhD thesis, Yale 1978): for each edge (i, i+1) the
 * antipodal vertex j advances while cross(edge i, edge j) > 0 (exact sign); the pairs (i, j),
 * (i+1, j), (i, j+1), (i+1, j+1) are measured, which covers parallel edges.
 */
export function diameter(hx: usize, hy: usize, h: i32): f64 {
  if (h < 2) return 0.0;
  if (h == 2) return Math.sqrt(dist2(hx, hy, 0, 1));
  let best = 0.0;
  let j = 1;
  let steps = 0;
  for (let i = 0; i < h; i++) {
    const i1 = i + 1 == h ? 0 : i + 1;
    for (;;) {
      const j1 = j + 1 == h ? 0 : j + 1;
      if (steps > 2 * h) break;
      if (crossSign(ld(hx, i1), ld(hy, i1), ld(hx, i), ld(hy, i), ld(hx, j1), ld(hy, j1), ld(hx, j), ld(hy, j)) > 0) {
        j = j1;
        steps++;
      } else break;
    }
    const j1 = j + 1 == h ? 0 : j + 1;
    let d = dist2(hx, hy, i, j);
    if (d > best) best = d;
    d = dist2(hx, hy, i1, j);
    if (d > best) best = d;
    d = dist2(hx, hy, i, j1);
    if (d > best) best = d;
    d = dist2(hx, hy, i1, j1);
    if (d > best) best = d;
  }
  return Math.sqrt(best);
}

/**
 * Minimal width by rotating calipers over the edges: for each edge (i, i+1) the vertex j farthest
 * from its line (j advances while the next vertex lies farther, exact sign; the distance along
 * a convex polygon is unimodal), and the smallest of those distances. The minimal width of a
 * convex polygon is attained with one side on an edge, so this is exact up to the rounding of the
 * distance. 0 for fewer than 3 vertices.
 */
export function width(hx: usize, hy: usize, h: i32): f64 {
  if (h < 3) return 0.0;
  let best = Infinity;
  let j = 1;
  for (let i = 0; i < h; i++) {
    const i1 = i + 1 == h ? 0 : i + 1;
    const ax = ld(hx, i), ay = ld(hy, i), bx = ld(hx, i1), by = ld(hy, i1);
    for (let s = 0; s < h; s++) {
      const j1 = j + 1 == h ? 0 : j + 1;
      if (crossSign(bx, by, ax, ay, ld(hx, j1), ld(hy, j1), ld(hx, j), ld(hy, j)) <= 0) break;
      j = j1;
    }
    const ex = bx - ax, ey = by - ay;
    const d = (ex * (ld(hy, j) - ay) - ey * (ld(hx, j) - ax)) / Math.sqrt(ex * ex + ey * ey);
    if (d < best) best = d;
  }
  return best;
}

/** Measures per grid point of a path's record (the registry's MEASURE_COUNT). */
export const MEASURE_COUNT: i32 = 5;

/** Every measure of the hull hx/hy (h vertices) at its registry slot of the record at r. */
export function writeMeasures(r: usize, hx: usize, hy: usize, h: i32): void {
  store<f64>(r, perimeter(hx, hy, h));
  store<f64>(r + 8, diameter(hx, hy, h));
  store<f64>(r + 16, area(hx, hy, h));
  store<f64>(r + 24, <f64>h);
  store<f64>(r + 32, width(hx, hy, h));
}
