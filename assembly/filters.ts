// Filters: conservative point filters before the sort and chain. A group of points is tested
// against the octagon of its extremes (extremes.ts); the survivors become hull candidates
// (CX/CY). A second pass (filterJoint for several walks, filterRotated for one) filters them again.

import { absX, absY, boxFrom, boxSrc, boxTo, ex0, ex1, ex2, ex3, ex4, ex5, ex6, ex7, ey0, ey1, ey2, ey3, ey4, ey5, ey6, ey7, gatherGroup } from "./extremes";
import { BOX, CHUNK, CX, CY, EDGES, K, rotateFrame, segSums, setFrame } from "./setup";

/** Candidates below this count skip the filter (its set-up would cost more than it saves). */
export const FILTER_MIN: i32 = 32;

/** Number of hull candidates in CX/CY. */
export let candCount: i32 = 0;

/**
 * Points dropped in whole chunks, counted only in the bench build: BENCH_COUNTERS is a
 * compile-time constant (asconfig.json "use"), 0 in the release build, so the count compiles away.
 */
export let chunkDropped: f64 = 0;

let polyN: i32 = 0;
const polyX: usize = heap.alloc(8 << 3);
const polyY: usize = heap.alloc(8 << 3);

@inline function polyPush(x: f64, y: f64): void {
  if (polyN > 0 && load<f64>(polyX + (<usize>(polyN - 1) << 3)) == x && load<f64>(polyY + (<usize>(polyN - 1) << 3)) == y) return;
  store<f64>(polyX + (<usize>polyN << 3), x);
  store<f64>(polyY + (<usize>polyN << 3), y);
  polyN++;
}

/** Edge e of the octagon: a, b, c with "strictly inside" meaning a y - b x > c for every edge. */
@inline function edge(e: i32, k: i32): f64 {
  return load<f64>(EDGES + (<usize>(3 * e + k) << 3));
}

/**
 * Lanes of (xv, yv) strictly inside all eight edges (A_e y - B_e x > C_e): all ones where inside.
 * The same IEEE products, differences and comparisons as the scalar test (insideScalar).
 */
@inline function insideMask(
  xv: v128, yv: v128,
  A0: v128, B0: v128, C0: v128, A1: v128, B1: v128, C1: v128, A2: v128, B2: v128, C2: v128, A3: v128, B3: v128, C3: v128,
  A4: v128, B4: v128, C4: v128, A5: v128, B5: v128, C5: v128, A6: v128, B6: v128, C6: v128, A7: v128, B7: v128, C7: v128,
): v128 {
  let m = f64x2.gt(f64x2.sub(f64x2.mul(A0, yv), f64x2.mul(B0, xv)), C0);
  m = v128.and(m, f64x2.gt(f64x2.sub(f64x2.mul(A1, yv), f64x2.mul(B1, xv)), C1));
  m = v128.and(m, f64x2.gt(f64x2.sub(f64x2.mul(A2, yv), f64x2.mul(B2, xv)), C2));
  m = v128.and(m, f64x2.gt(f64x2.sub(f64x2.mul(A3, yv), f64x2.mul(B3, xv)), C3));
  m = v128.and(m, f64x2.gt(f64x2.sub(f64x2.mul(A4, yv), f64x2.mul(B4, xv)), C4));
  m = v128.and(m, f64x2.gt(f64x2.sub(f64x2.mul(A5, yv), f64x2.mul(B5, xv)), C5));
  m = v128.and(m, f64x2.gt(f64x2.sub(f64x2.mul(A6, yv), f64x2.mul(B6, xv)), C6));
  return v128.and(m, f64x2.gt(f64x2.sub(f64x2.mul(A7, yv), f64x2.mul(B7, xv)), C7));
}

/** One point strictly inside all eight edges (the lone last point of a chunk or a group). */
@inline function insideScalar(x: f64, y: f64): bool {
  return edge(0, 0) * y - edge(0, 1) * x > edge(0, 2) && edge(1, 0) * y - edge(1, 1) * x > edge(1, 2) &&
    edge(2, 0) * y - edge(2, 1) * x > edge(2, 2) && edge(3, 0) * y - edge(3, 1) * x > edge(3, 2) &&
    edge(4, 0) * y - edge(4, 1) * x > edge(4, 2) && edge(5, 0) * y - edge(5, 1) * x > edge(5, 2) &&
    edge(6, 0) * y - edge(6, 1) * x > edge(6, 2) && edge(7, 0) * y - edge(7, 1) * x > edge(7, 2);
}

/** Appends the lanes of (xv, yv) outside the octagon (m lane 0) to the candidates at w; returns the new w. */
@inline function keepOutside(xv: v128, yv: v128, m: v128, w: i32): i32 {
  if (i64x2.extract_lane(m, 0) == 0) {
    store<f64>(CX + (<usize>w << 3), f64x2.extract_lane(xv, 0));
    store<f64>(CY + (<usize>w << 3), f64x2.extract_lane(yv, 0));
    w++;
  }
  if (i64x2.extract_lane(m, 1) == 0) {
    store<f64>(CX + (<usize>w << 3), f64x2.extract_lane(xv, 1));
    store<f64>(CY + (<usize>w << 3), f64x2.extract_lane(yv, 1));
    w++;
  }
  return w;
}

/** Appends point i of src to the candidates at w unless strictly inside; returns the new w. */
@inline function keepScalar(srcX: usize, srcY: usize, i: i32, w: i32): i32 {
  const x = load<f64>(srcX + (<usize>i << 3));
  const y = load<f64>(srcY + (<usize>i << 3));
  if (!insideScalar(x, y)) {
    store<f64>(CX + (<usize>w << 3), x);
    store<f64>(CY + (<usize>w << 3), y);
    w++;
  }
  return w;
}

/**
 * Drops candidates strictly inside the polygon E0..E7 of extreme points (in the frame's angular
 * order). A point strictly left of every edge of a closed polygon lies in the interior of the
 * hull of its vertices (its winding number is positive and no line through it separates the
 * vertices), so dropping it cannot change the hull, whatever the rounding in picking the
 * extremes. "Strictly left" is certified: with E = b - a, the test E_x p_y - E_y p_x > c + eps,
 * c = E_x a_y - E_y a_x, eps = 4e-15 (|E_x| max|y| + |E_y| max|x|), bounds every rounding error
 * (about 7 u (|E_x| max|y| + |E_y| max|x|), u = 2^-53) with a margin of 5. The points of
 * src[from..to) that survive are appended to the candidates (read once from the walk, never
 * copied first); groups below FILTER_MIN or with a degenerate polygon are appended whole.
 * Returns the new candidate count.
 */
export function filterGroup(srcX: usize, srcY: usize, from: i32, to: i32): i32 {
  if (to - from < FILTER_MIN) {
    append(srcX, srcY, from, to);
    return candCount;
  }
  polyN = 0;
  polyPush(ex0, ey0); polyPush(ex1, ey1); polyPush(ex2, ey2); polyPush(ex3, ey3);
  polyPush(ex4, ey4); polyPush(ex5, ey5); polyPush(ex6, ey6); polyPush(ex7, ey7);
  while (polyN > 1 && load<f64>(polyX + (<usize>(polyN - 1) << 3)) == load<f64>(polyX) &&
    load<f64>(polyY + (<usize>(polyN - 1) << 3)) == load<f64>(polyY)) polyN--;
  const m = polyN;
  if (m < 3) {
    append(srcX, srcY, from, to);
    return candCount;
  }
  for (let e = 0; e < 8; e++) {
    // Edges beyond m repeat edge 0: the same constraint twice, so the test stays unrolled.
    const e0 = e < m ? e : 0;
    const f = e0 + 1 == m ? 0 : e0 + 1;
    const ax = load<f64>(polyX + (<usize>e0 << 3)), ay = load<f64>(polyY + (<usize>e0 << 3));
    const bx = load<f64>(polyX + (<usize>f << 3)), by = load<f64>(polyY + (<usize>f << 3));
    const exx = bx - ax, eyy = by - ay;
    const c = exx * ay - eyy * ax;
    const eps = 4e-15 * (Math.abs(exx) * absY + Math.abs(eyy) * absX);
    store<f64>(EDGES + (<usize>(3 * e) << 3), exx);
    store<f64>(EDGES + (<usize>(3 * e + 1) << 3), eyy);
    store<f64>(EDGES + (<usize>(3 * e + 2) << 3), c + eps);
  }
  // Two points per step (f64x2, insideMask): the same IEEE operations as the scalar test.
  const A0 = f64x2.splat(edge(0, 0)), B0 = f64x2.splat(edge(0, 1)), C0 = f64x2.splat(edge(0, 2));
  const A1 = f64x2.splat(edge(1, 0)), B1 = f64x2.splat(edge(1, 1)), C1 = f64x2.splat(edge(1, 2));
  const A2 = f64x2.splat(edge(2, 0)), B2 = f64x2.splat(edge(2, 1)), C2 = f64x2.splat(edge(2, 2));
  const A3 = f64x2.splat(edge(3, 0)), B3 = f64x2.splat(edge(3, 1)), C3 = f64x2.splat(edge(3, 2));
  const A4 = f64x2.splat(edge(4, 0)), B4 = f64x2.splat(edge(4, 1)), C4 = f64x2.splat(edge(4, 2));
  const A5 = f64x2.splat(edge(5, 0)), B5 = f64x2.splat(edge(5, 1)), C5 = f64x2.splat(edge(5, 2));
  const A6 = f64x2.splat(edge(6, 0)), B6 = f64x2.splat(edge(6, 1)), C6 = f64x2.splat(edge(6, 2));
  const A7 = f64x2.splat(edge(7, 0)), B7 = f64x2.splat(edge(7, 1)), C7 = f64x2.splat(edge(7, 2));
  let w = candCount;
  // Chunk by chunk (CHUNK is even, so the pairs are those of one pass over the group). When BOX
  // holds this group's boxes (gatherGroup just ran on it), whole chunks go first: if the 4
  // corners of a chunk's bounding box pass the test, so does every point of the chunk (rounding
  // is monotone: for each edge the computed a y - b x over the box is smallest at a corner), so
  // the chunk is dropped at once; otherwise its points are tested. The same points survive, in
  // the same order.
  const boxed = boxSrc == srcX && boxFrom == from && boxTo == to;
  let box = BOX;
  for (let cs = from; cs < to; cs += CHUNK) {
    const ce = min(cs + CHUNK, to);
    if (boxed) {
      const lo = v128.load(box), hi = v128.load(box + 16);
      box += 32;
      const xv = v128.shuffle<f64>(lo, hi, 0, 2); // [min x, max x]
      const y0 = f64x2.splat(f64x2.extract_lane(lo, 1));
      const y1 = f64x2.splat(f64x2.extract_lane(hi, 1));
      const corners = v128.and(
        insideMask(xv, y0, A0, B0, C0, A1, B1, C1, A2, B2, C2, A3, B3, C3, A4, B4, C4, A5, B5, C5, A6, B6, C6, A7, B7, C7),
        insideMask(xv, y1, A0, B0, C0, A1, B1, C1, A2, B2, C2, A3, B3, C3, A4, B4, C4, A5, B5, C5, A6, B6, C6, A7, B7, C7),
      );
      if (i64x2.all_true(corners)) {
        if (BENCH_COUNTERS) chunkDropped += <f64>(ce - cs);
        continue;
      }
    }
    let i = cs;
    for (; i + 1 < ce; i += 2) {
      const xv = v128.load(srcX + (<usize>i << 3));
      const yv = v128.load(srcY + (<usize>i << 3));
      const m = insideMask(xv, yv, A0, B0, C0, A1, B1, C1, A2, B2, C2, A3, B3, C3, A4, B4, C4, A5, B5, C5, A6, B6, C6, A7, B7, C7);
      if (i64x2.all_true(m)) continue;
      w = keepOutside(xv, yv, m, w);
    }
    if (i < ce) w = keepScalar(srcX, srcY, i, w);
  }
  candCount = w;
  return w;
}

/** Appends src[from..to) to the candidates without filtering. */
export function append(srcX: usize, srcY: usize, from: i32, to: i32): void {
  let w = candCount;
  for (let i = from; i < to; i++) {
    store<f64>(CX + (<usize>w << 3), load<f64>(srcX + (<usize>i << 3)));
    store<f64>(CY + (<usize>w << 3), load<f64>(srcY + (<usize>i << 3)));
    w++;
  }
  candCount = w;
}

/** Empties the candidates. */
export function clearCandidates(): void {
  candCount = 0;
}

/** Extremes then filter of src[from..to) (to > from), in the current frame; survivors appended. */
export function gatherAndFilter(srcX: usize, srcY: usize, from: i32, to: i32): void {
  gatherGroup(srcX, srcY, from, to);
  filterGroup(srcX, srcY, from, to);
}

/**
 * With several walks, the survivors of all walks are filtered once more, in place, against the
 * octagon of their joint extremes in the frame of the joint cloud (sum of the walks' moments):
 * a point of one walk can be outside its own walk's octagon yet deep inside the hull of all walks.
 * Conservative like every filter pass, so the hull is unchanged.
 */
function filterJoint(g: i32, hi: i32): void {
  let sx = 0.0, sy = 0.0, sxx = 0.0, sxy = 0.0, syy = 0.0;
  for (let j = 0; j < K; j++) {
    const o = segSums(j, g);
    sx += load<f64>(o); sy += load<f64>(o + 8);
    sxx += load<f64>(o + 16); sxy += load<f64>(o + 24); syy += load<f64>(o + 32);
  }
  setFrame(<f64>(K * (1 + hi)), sx, sy, sxx, sxy, syy);
  const count = candCount;
  gatherGroup(CX, CY, 0, count);
  candCount = 0;
  filterGroup(CX, CY, 0, count); // writes at w <= i: in place
}

/**
 * One walk: its survivors are filtered once more, in place, against the octagon of their extremes
 * in the walk's frame rotated by pi/8 (directions between the first octagon's): conservative, so
 * the hull is unchanged.
 */
function filterRotated(): void {
  const count = candCount;
  if (count < FILTER_MIN) return;
  rotateFrame();
  gatherGroup(CX, CY, 0, count);
  candCount = 0;
  filterGroup(CX, CY, 0, count);
}

/** The second pass over the candidates of grid point g (n = hi): joint for k > 1, rotated for k = 1. */
export function filterSecondPass(g: i32, hi: i32): void {
  if (K > 1) filterJoint(g, hi);
  else filterRotated();
}
