// Planar convex hulls in plain TS: the twin of assembly/hull.ts and assembly/measures.ts (same algorithms, same arithmetic), plus
// convenience helpers on point sets for tests.

// ---- Exact sign of cross(a - b, c - d) = (ax-bx)(cy-dy) - (ay-by)(cx-dx): Shewchuk's orient2d
// filter (J. R. Shewchuk, DCG 18 (1997), ccwerrboundA), then an exact expansion of the eight
// products (Dekker's two-product, Shewchuk's grow-expansion).
const EPS = 1.1102230246251565e-16;
const CCW_ERRBOUND_A = (3.0 + 16.0 * EPS) * EPS;
const SPLITTER = 134217729.0;
const expansion = new Float64Array(32);
let expLen = 0;

function growWith(q0: number): void {
  let q = q0;
  for (let i = 0; i < expLen; i++) {
    const e = expansion[i];
    const s = q + e;
    const bv = s - q;
    const av = s - bv;
    expansion[i] = q - av + (e - bv);
    q = s;
  }
  expansion[expLen++] = q;
}

function addProduct(a: number, b: number): void {
  const x = a * b;
  let c = SPLITTER * a;
  const ahi = c - (c - a);
  const alo = a - ahi;
  c = SPLITTER * b;
  const bhi = c - (c - b);
  const blo = b - bhi;
  const err = alo * blo - (x - ahi * bhi - alo * bhi - ahi * blo);
  growWith(err);
  growWith(x);
}

function crossSignExact(ax: number, ay: number, bx: number, by: number, cx: number, cy: number, dx: number, dy: number): number {
  expLen = 0;
  addProduct(ax, cy);
  addProduct(-ax, dy);
  addProduct(-bx, cy);
  addProduct(bx, dy);
  addProduct(-ay, cx);
  addProduct(ay, dx);
  addProduct(by, cx);
  addProduct(-by, dx);
  for (let i = expLen - 1; i >= 0; i--) {
    const v = expansion[i];
    if (v > 0) return 1;
    if (v < 0) return -1;
  }
  return 0;
}

/** Exact sign of cross(a - b, c - d). */
export function crossSign(ax: number, ay: number, bx: number, by: number, cx: number, cy: number, dx: number, dy: number): number {
  const l = (ax - bx) * (cy - dy);
  const r = (ay - by) * (cx - dx);
  const det = l - r;
  const bound = CCW_ERRBOUND_A * (Math.abs(l) + Math.abs(r));
  if (det > bound) return 1;
  if (-det > bound) return -1;
  return crossSignExact(ax, ay, bx, by, cx, cy, dx, dy);
}

/** Exact sign of orient(a, b, c): > 0 for a counter-clockwise turn. */
export function orient(ax: number, ay: number, bx: number, by: number, cx: number, cy: number): number {
  return crossSign(bx, by, ax, ay, cx, cy, ax, ay);
}

// ---- Sorting by (x, y), same quicksort as assembly/hull.ts.
function insertionSort(xs: Float64Array, ys: Float64Array, lo: number, hi: number): void {
  for (let i = lo + 1; i <= hi; i++) {
    const px = xs[i], py = ys[i];
    let j = i - 1;
    while (j >= lo) {
      const x = xs[j];
      if (x < px || (x === px && ys[j] <= py)) break;
      xs[j + 1] = x;
      ys[j + 1] = ys[j];
      j--;
    }
    xs[j + 1] = px;
    ys[j + 1] = py;
  }
}

function lessAt(xs: Float64Array, ys: Float64Array, i: number, px: number, py: number): boolean {
  const x = xs[i];
  return x < px || (x === px && ys[i] < py);
}

function swap(xs: Float64Array, ys: Float64Array, i: number, j: number): void {
  const tx = xs[i], ty = ys[i];
  xs[i] = xs[j]; ys[i] = ys[j];
  xs[j] = tx; ys[j] = ty;
}

export function sortPoints(xs: Float64Array, ys: Float64Array, lo0: number, hi0: number): void {
  let lo = lo0, hi = hi0;
  while (hi - lo > 16) {
    const mid = lo + ((hi - lo) >> 1);
    if (lessAt(xs, ys, mid, xs[lo], ys[lo])) swap(xs, ys, mid, lo);
    if (lessAt(xs, ys, hi, xs[lo], ys[lo])) swap(xs, ys, hi, lo);
    if (lessAt(xs, ys, hi, xs[mid], ys[mid])) swap(xs, ys, hi, mid);
    const px = xs[mid], py = ys[mid];
    let i = lo - 1, j = hi + 1;
    for (;;) {
      do { i++; } while (lessAt(xs, ys, i, px, py));
      do { j--; } while (px < xs[j] || (px === xs[j] && py < ys[j]));
      if (i >= j) break;
      swap(xs, ys, i, j);
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
 * Andrew's monotone chain (IPL 9 (1979)) on `count` sorted points (duplicates allowed, dropped in
 * place). Strict vertices counter-clockwise from the smallest (x, y) into hx/hy (capacity
 * 2 * count + 2); returns their number.
 */
export function monotoneChain(xs: Float64Array, ys: Float64Array, count: number, hx: Float64Array, hy: Float64Array): number {
  if (count === 0) return 0;
  let m = 1;
  for (let i = 1; i < count; i++) {
    const x = xs[i], y = ys[i];
    if (x !== xs[m - 1] || y !== ys[m - 1]) {
      xs[m] = x; ys[m] = y; m++;
    }
  }
  if (m === 1) {
    hx[0] = xs[0]; hy[0] = ys[0];
    return 1;
  }
  let h = 0;
  for (let i = 0; i < m; i++) {
    const x = xs[i], y = ys[i];
    while (h >= 2 && orient(hx[h - 2], hy[h - 2], hx[h - 1], hy[h - 1], x, y) <= 0) h--;
    hx[h] = x; hy[h] = y; h++;
  }
  const lowerSize = h + 1;
  for (let i = m - 2; i >= 0; i--) {
    const x = xs[i], y = ys[i];
    while (h >= lowerSize && orient(hx[h - 2], hy[h - 2], hx[h - 1], hy[h - 1], x, y) <= 0) h--;
    hx[h] = x; hy[h] = y; h++;
  }
  return h - 1;
}

// ---- Measures of a hull (h strict vertices, counter-clockwise), as assembly/measures.ts.
export function perimeterOf(hx: ArrayLike<number>, hy: ArrayLike<number>, h: number): number {
  if (h < 2) return 0;
  let sum = 0, comp = 0;
  for (let i = 0; i < h; i++) {
    const j = i + 1 === h ? 0 : i + 1;
    const dx = hx[j] - hx[i], dy = hy[j] - hy[i];
    const len = Math.sqrt(dx * dx + dy * dy);
    const t = sum + len;
    comp += Math.abs(sum) >= len ? sum - t + len : len - t + sum;
    sum = t;
  }
  return sum + comp;
}

export function areaOf(hx: ArrayLike<number>, hy: ArrayLike<number>, h: number): number {
  if (h < 3) return 0;
  const x0 = hx[0], y0 = hy[0];
  let sum = 0, comp = 0;
  for (let i = 1; i + 1 < h; i++) {
    const ax = hx[i] - x0, ay = hy[i] - y0;
    const bx = hx[i + 1] - x0, by = hy[i + 1] - y0;
    const v = ax * by - ay * bx;
    const t = sum + v;
    comp += Math.abs(sum) >= Math.abs(v) ? sum - t + v : v - t + sum;
    sum = t;
  }
  return 0.5 * (sum + comp);
}

function dist2(hx: ArrayLike<number>, hy: ArrayLike<number>, i: number, j: number): number {
  const dx = hx[i] - hx[j], dy = hy[i] - hy[j];
  return dx * dx + dy * dy;
}

/** Rotating calipers (Shamos 1978) with the exact sign for advancing; see assembly/measures.ts. */
export function diameterOf(hx: ArrayLike<number>, hy: ArrayLike<number>, h: number): number {
  if (h < 2) return 0;
  if (h === 2) return Math.sqrt(dist2(hx, hy, 0, 1));
  let best = 0;
  let j = 1;
  let steps = 0;
  for (let i = 0; i < h; i++) {
    const i1 = i + 1 === h ? 0 : i + 1;
    for (;;) {
      const j1 = j + 1 === h ? 0 : j + 1;
      if (steps > 2 * h) break;
      if (crossSign(hx[i1], hy[i1], hx[i], hy[i], hx[j1], hy[j1], hx[j], hy[j]) > 0) {
        j = j1;
        steps++;
      } else break;
    }
    const j1 = j + 1 === h ? 0 : j + 1;
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
 * Minimal width by rotating calipers over the edges, as assembly/measures.ts width: for each edge
 * the farthest vertex from its line (advanced with the exact sign), the smallest such distance.
 */
export function widthOf(hx: ArrayLike<number>, hy: ArrayLike<number>, h: number): number {
  if (h < 3) return 0;
  let best = Infinity;
  let j = 1;
  for (let i = 0; i < h; i++) {
    const i1 = i + 1 === h ? 0 : i + 1;
    const ax = hx[i], ay = hy[i], bx = hx[i1], by = hy[i1];
    for (let s = 0; s < h; s++) {
      const j1 = j + 1 === h ? 0 : j + 1;
      if (crossSign(bx, by, ax, ay, hx[j1], hy[j1], hx[j], hy[j]) <= 0) break;
      j = j1;
    }
    const ex = bx - ax, ey = by - ay;
    const d = (ex * (hy[j] - ay) - ey * (hx[j] - ax)) / Math.sqrt(ex * ex + ey * ey);
    if (d < best) best = d;
  }
  return best;
}

/** Hull vertices (counter-clockwise, strict, from the smallest (x, y)) of a point set. */
export function convexHull(xs: ArrayLike<number>, ys: ArrayLike<number>): { x: Float64Array; y: Float64Array } {
  const n = xs.length;
  const cx = Float64Array.from(xs), cy = Float64Array.from(ys);
  const hx = new Float64Array(2 * n + 2), hy = new Float64Array(2 * n + 2);
  sortPoints(cx, cy, 0, n - 1);
  const h = monotoneChain(cx, cy, n, hx, hy);
  return { x: hx.slice(0, h), y: hy.slice(0, h) };
}
