// Convex hull: exact orientation sign, conservative point filter, sort, monotone chain.

// ---- Exact sign of cross(a - b, c - d) = (ax-bx)(cy-dy) - (ay-by)(cx-dx).
// Filter: Shewchuk's orient2d error bound (J. R. Shewchuk, "Adaptive precision floating-point
// arithmetic and fast robust geometric predicates", DCG 18 (1997)): the same three-stage
// structure (differences, products, difference) so ccwerrboundA applies. Fallback: the eight
// products expanded exactly (Dekker's two-product) and summed into a nonoverlapping expansion
// (Shewchuk's grow-expansion); its sign is the sign of its largest nonzero component. Exact as
// long as no product underflows (|products| above ~1e-290) or overflows.
const EPS: f64 = 1.1102230246251565e-16;
const CCW_ERRBOUND_A: f64 = (3.0 + 16.0 * EPS) * EPS;
const SPLITTER: f64 = 134217729.0; // 2^27 + 1
const expansion: usize = heap.alloc(32 << 3);
let expLen: i32 = 0;

@inline function growWith(q0: f64): void {
  let q = q0;
  for (let i = 0; i < expLen; i++) {
    const e = load<f64>(expansion + (<usize>i << 3));
    const s = q + e;
    const bv = s - q;
    const av = s - bv;
    const h = (q - av) + (e - bv);
    store<f64>(expansion + (<usize>i << 3), h);
    q = s;
  }
  store<f64>(expansion + (<usize>expLen << 3), q);
  expLen++;
}

function addProduct(a: f64, b: f64): void {
  const x = a * b;
  let c = SPLITTER * a;
  const ahi = c - (c - a);
  const alo = a - ahi;
  c = SPLITTER * b;
  const bhi = c - (c - b);
  const blo = b - bhi;
  const err = alo * blo - (((x - ahi * bhi) - alo * bhi) - ahi * blo);
  growWith(err);
  growWith(x);
}

function crossSignExact(ax: f64, ay: f64, bx: f64, by: f64, cx: f64, cy: f64, dx: f64, dy: f64): i32 {
  expLen = 0;
  // (ax - bx)(cy - dy) - (ay - by)(cx - dx) expanded into eight products.
  addProduct(ax, cy);
  addProduct(-ax, dy);
  addProduct(-bx, cy);
  addProduct(bx, dy);
  addProduct(-ay, cx);
  addProduct(ay, dx);
  addProduct(by, cx);
  addProduct(-by, dx);
  for (let i = expLen - 1; i >= 0; i--) {
    const v = load<f64>(expansion + (<usize>i << 3));
    if (v > 0) return 1;
    if (v < 0) return -1;
  }
  return 0;
}

/** Exact sign of cross(a - b, c - d). */
@inline export function crossSign(ax: f64, ay: f64, bx: f64, by: f64, cx: f64, cy: f64, dx: f64, dy: f64): i32 {
  const l = (ax - bx) * (cy - dy);
  const r = (ay - by) * (cx - dx);
  const det = l - r;
  const bound = CCW_ERRBOUND_A * (Math.abs(l) + Math.abs(r));
  if (det > bound) return 1;
  if (-det > bound) return -1;
  return crossSignExact(ax, ay, bx, by, cx, cy, dx, dy);
}

/** Exact sign of orient(a, b, c) = cross(b - a, c - a): > 0 when a, b, c turn counter-clockwise. */
@inline export function orient(ax: f64, ay: f64, bx: f64, by: f64, cx: f64, cy: f64): i32 {
  return crossSign(bx, by, ax, ay, cx, cy, ax, ay);
}

// ---- Sorting (lexicographic by x, then y) of parallel arrays xs, ys.
@inline function lessAt(xs: usize, ys: usize, i: usize, px: f64, py: f64): bool {
  const x = load<f64>(xs + (i << 3));
  return x < px || (x == px && load<f64>(ys + (i << 3)) < py);
}

@inline function swap(xs: usize, ys: usize, i: usize, j: usize): void {
  const ix = xs + (i << 3), jx = xs + (j << 3), iy = ys + (i << 3), jy = ys + (j << 3);
  const tx = load<f64>(ix), ty = load<f64>(iy);
  store<f64>(ix, load<f64>(jx));
  store<f64>(iy, load<f64>(jy));
  store<f64>(jx, tx);
  store<f64>(jy, ty);
}

function insertionSort(xs: usize, ys: usize, lo: i32, hi: i32): void {
  for (let i = lo + 1; i <= hi; i++) {
    const px = load<f64>(xs + (<usize>i << 3)), py = load<f64>(ys + (<usize>i << 3));
    let j = i - 1;
    while (j >= lo) {
      const x = load<f64>(xs + (<usize>j << 3));
      if (x < px || (x == px && load<f64>(ys + (<usize>j << 3)) <= py)) break;
      store<f64>(xs + (<usize>(j + 1) << 3), x);
      store<f64>(ys + (<usize>(j + 1) << 3), load<f64>(ys + (<usize>j << 3)));
      j--;
    }
    store<f64>(xs + (<usize>(j + 1) << 3), px);
    store<f64>(ys + (<usize>(j + 1) << 3), py);
  }
}

/** Quicksort (median of three, Hoare partition, recursion on the smaller side) of xs/ys[lo..hi]. */
export function sortPoints(xs: usize, ys: usize, lo0: i32, hi0: i32): void {
  let lo = lo0, hi = hi0;
  while (hi - lo > 16) {
    const mid = lo + ((hi - lo) >> 1);
    if (lessAt(xs, ys, <usize>mid, load<f64>(xs + (<usize>lo << 3)), load<f64>(ys + (<usize>lo << 3)))) swap(xs, ys, <usize>mid, <usize>lo);
    if (lessAt(xs, ys, <usize>hi, load<f64>(xs + (<usize>lo << 3)), load<f64>(ys + (<usize>lo << 3)))) swap(xs, ys, <usize>hi, <usize>lo);
    if (lessAt(xs, ys, <usize>hi, load<f64>(xs + (<usize>mid << 3)), load<f64>(ys + (<usize>mid << 3)))) swap(xs, ys, <usize>hi, <usize>mid);
    const px = load<f64>(xs + (<usize>mid << 3)), py = load<f64>(ys + (<usize>mid << 3));
    let i = lo - 1, j = hi + 1;
    for (;;) {
      do { i++; } while (lessAt(xs, ys, <usize>i, px, py));
      do { j--; } while (
        px < load<f64>(xs + (<usize>j << 3)) ||
        (px == load<f64>(xs + (<usize>j << 3)) && py < load<f64>(ys + (<usize>j << 3)))
      );
      if (i >= j) break;
      swap(xs, ys, <usize>i, <usize>j);
    }
    if (j - lo < hi - j) {
      sortPoints(xs, ys, lo, j);
      lo = j + 1;
    } else {
      sortPoints(xs, ys, j + 1, hi);
      hi = j;
    }
  }
  insertionSort(xs, ys, lo, hi);
}

/**
 * Andrew's monotone chain (A. M. Andrew, IPL 9 (1979)) on count points sorted by (x, y), duplicates
 * allowed. Writes the strict hull vertices counter-clockwise, starting at the smallest (x, y),
 * into hx/hy (capacity count + 1) and returns their number (1 for a single distinct point, 2 for
 * a segment). Exact: collinear points are dropped by the exact orientation sign.
 */
export function monotoneChain(xs: usize, ys: usize, count: i32, hx: usize, hy: usize): i32 {
  if (count == 0) return 0;
  // Deduplicate in place (sorted input: duplicates are adjacent).
  let m = 1;
  for (let i = 1; i < count; i++) {
    const x = load<f64>(xs + (<usize>i << 3)), y = load<f64>(ys + (<usize>i << 3));
    if (x != load<f64>(xs + (<usize>(m - 1) << 3)) || y != load<f64>(ys + (<usize>(m - 1) << 3))) {
      store<f64>(xs + (<usize>m << 3), x);
      store<f64>(ys + (<usize>m << 3), y);
      m++;
    }
  }
  if (m == 1) {
    store<f64>(hx, load<f64>(xs));
    store<f64>(hy, load<f64>(ys));
    return 1;
  }
  let h = 0;
  // Lower hull.
  for (let i = 0; i < m; i++) {
    const x = load<f64>(xs + (<usize>i << 3)), y = load<f64>(ys + (<usize>i << 3));
    while (h >= 2 && orient(
      load<f64>(hx + (<usize>(h - 2) << 3)), load<f64>(hy + (<usize>(h - 2) << 3)),
      load<f64>(hx + (<usize>(h - 1) << 3)), load<f64>(hy + (<usize>(h - 1) << 3)), x, y) <= 0) h--;
    store<f64>(hx + (<usize>h << 3), x);
    store<f64>(hy + (<usize>h << 3), y);
    h++;
  }
  // Upper hull.
  const lowerSize = h + 1;
  for (let i = m - 2; i >= 0; i--) {
    const x = load<f64>(xs + (<usize>i << 3)), y = load<f64>(ys + (<usize>i << 3));
    while (h >= lowerSize && orient(
      load<f64>(hx + (<usize>(h - 2) << 3)), load<f64>(hy + (<usize>(h - 2) << 3)),
      load<f64>(hx + (<usize>(h - 1) << 3)), load<f64>(hy + (<usize>(h - 1) << 3)), x, y) <= 0) h--;
    store<f64>(hx + (<usize>h << 3), x);
    store<f64>(hy + (<usize>h << 3), y);
    h++;
  }
  return h - 1; // the last point repeats the first
}
