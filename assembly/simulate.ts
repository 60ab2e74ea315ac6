// One block of paths: k walks from the origin, hulls at every n of the grid along one path.
// Per grid segment (n_{g-1}, n_g]: candidates = previous hull vertices + the new points of every
// walk; a conservative point filter drops new points strictly inside the polygon of 8 extreme
// points of their walk's segment; the survivors are sorted and chained (hull(prefix n_g) = hull(hull(prefix n_{g-1}) +
// new points)). All buffers are allocated once in setup and reused for every path.

import { fillNormals, nextSubstream, seedBlockStream } from "./rng";
import { drawStepsInto, LAW_GAUSSIAN } from "./laws";
import { monotoneChain, sortPoints } from "./hull";
import { area, diameter, perimeter } from "./measures";

let K: i32 = 0;
let N: i32 = 0;
let G: i32 = 0;
let gridPtr: usize = 0; // i32[G]
let codesPtr: usize = 0; // i32[K]
let paramsPtr: usize = 0; // usize[K] (pointers to f64 params)
let PX: usize = 0, PY: usize = 0; // f64[K * (N + 1)], walk-major positions
let SX: usize = 0, SY: usize = 0, NZ: usize = 0; // step scratch
let CX: usize = 0, CY: usize = 0; // candidates
let HX: usize = 0, HY: usize = 0; // hull
let SEG: usize = 0; // f64[K * G * 5] per walk, cumulative sums x, y, xx, xy, yy up to n_g
let EDGES: usize = 0; // f64[8 * 3]
let hullCount: i32 = 0;
let candCap: i32 = 0;

/** Candidates below this count skip the filter (its set-up would cost more than it saves). */
const FILTER_MIN: i32 = 32;

export function allocF64(count: i32): usize {
  return heap.alloc(<usize>max(count, 1) << 3);
}
export function allocI32(count: i32): usize {
  return heap.alloc(<usize>max(count, 1) << 2);
}

/**
 * Sets up k walks and the grid (gridPtr: i32[g], strictly increasing). Buffers sized from n_max
 * and k. Call setWalk for each walk afterwards.
 */
export function setup(k: i32, grid: usize, g: i32): void {
  K = k;
  G = g;
  gridPtr = grid;
  N = load<i32>(grid + (<usize>(g - 1) << 2));
  codesPtr = allocI32(k);
  paramsPtr = heap.alloc(<usize>k << 3);
  const pts = k * (N + 1);
  PX = allocF64(pts);
  PY = allocF64(pts);
  SX = allocF64(N);
  SY = allocF64(N);
  NZ = allocF64(2 * N);
  candCap = 2 * pts + 8;
  CX = allocF64(candCap);
  CY = allocF64(candCap);
  HX = allocF64(2 * candCap + 2);
  HY = allocF64(2 * candCap + 2);
  SEG = allocF64(5 * g * k);
  EDGES = allocF64(24);
}

export function setWalk(j: i32, code: i32, params: usize): void {
  store<i32>(codesPtr + (<usize>j << 2), code);
  store<usize>(paramsPtr + (<usize>j << 3), params);
}

export function seedBlock(seed: u64, block: u64): void {
  seedBlockStream(seed, block);
}

@inline function gridAt(g: i32): i32 {
  return load<i32>(gridPtr + (<usize>g << 2));
}

// ---- Extremes in 8 directions of a normalised frame x' = fa x, y' = fb x + fc y.
let fa: f64 = 1, fb: f64 = 0, fc: f64 = 1;
let eU0: f64 = 0, eS1: f64 = 0, eV2: f64 = 0, eD3: f64 = 0, eU4: f64 = 0, eS5: f64 = 0, eV6: f64 = 0, eD7: f64 = 0;
let ex0: f64 = 0, ey0: f64 = 0, ex1: f64 = 0, ey1: f64 = 0, ex2: f64 = 0, ey2: f64 = 0, ex3: f64 = 0, ey3: f64 = 0;
let ex4: f64 = 0, ey4: f64 = 0, ex5: f64 = 0, ey5: f64 = 0, ex6: f64 = 0, ey6: f64 = 0, ex7: f64 = 0, ey7: f64 = 0;
let absX: f64 = 0, absY: f64 = 0;
let candCount: i32 = 0;

/**
 * Frame from the second moments of the points so far (cnt points, sums): the inverse Cholesky
 * factor of their covariance, so the cloud looks round (a needle-shaped drifting walk included).
 * Falls back to the identity for (near) collinear clouds. Any frame keeps the filter correct.
 */
export function setFrame(cnt: f64, sx: f64, sy: f64, sxx: f64, sxy: f64, syy: f64): void {
  fa = 1; fb = 0; fc = 1;
  const mx = sx / cnt, my = sy / cnt;
  const cxx = sxx / cnt - mx * mx;
  const cxy = sxy / cnt - mx * my;
  const cyy = syy / cnt - my * my;
  if (!(cxx > 0) || !(cyy > 0)) return;
  const l11 = Math.sqrt(cxx);
  const l21 = cxy / l11;
  const schur = cyy - l21 * l21;
  if (!(schur > 1e-9 * cyy)) return;
  const l22 = Math.sqrt(schur);
  fa = 1.0 / l11;
  fb = -l21 / (l11 * l22);
  fc = 1.0 / l22;
}

/** Starts a candidate list with its first point (initialises the extremes). */
function resetExtremes(x: f64, y: f64): void {
  const u = fa * x, v = fb * x + fc * y;
  const s = u + v, d = u - v;
  eU0 = u; eU4 = u; eS1 = s; eS5 = s; eV2 = v; eV6 = v; eD3 = d; eD7 = d;
  ex0 = x; ex1 = x; ex2 = x; ex3 = x; ex4 = x; ex5 = x; ex6 = x; ex7 = x;
  ey0 = y; ey1 = y; ey2 = y; ey3 = y; ey4 = y; ey5 = y; ey6 = y; ey7 = y;
  absX = Math.abs(x);
  absY = Math.abs(y);
}

/** Appends src[from..to) to the candidates, updating the extremes and max |x|, |y|. */
function gather(srcX: usize, srcY: usize, from: i32, to: i32): void {
  let u0 = eU0, s1 = eS1, v2 = eV2, d3 = eD3, u4 = eU4, s5 = eS5, v6 = eV6, d7 = eD7;
  let mxa = absX, mya = absY;
  const a = fa, b = fb, c = fc;
  let w = candCount;
  for (let i = from; i < to; i++) {
    const x = load<f64>(srcX + (<usize>i << 3));
    const y = load<f64>(srcY + (<usize>i << 3));
    store<f64>(CX + (<usize>w << 3), x);
    store<f64>(CY + (<usize>w << 3), y);
    w++;
    const u = a * x, v = b * x + c * y;
    const s = u + v, d = u - v;
    if (u > u0) { u0 = u; ex0 = x; ey0 = y; }
    if (u < u4) { u4 = u; ex4 = x; ey4 = y; }
    if (s > s1) { s1 = s; ex1 = x; ey1 = y; }
    if (s < s5) { s5 = s; ex5 = x; ey5 = y; }
    if (v > v2) { v2 = v; ex2 = x; ey2 = y; }
    if (v < v6) { v6 = v; ex6 = x; ey6 = y; }
    if (d < d3) { d3 = d; ex3 = x; ey3 = y; }
    if (d > d7) { d7 = d; ex7 = x; ey7 = y; }
    mxa = max(mxa, Math.abs(x));
    mya = max(mya, Math.abs(y));
  }
  eU0 = u0; eS1 = s1; eV2 = v2; eD3 = d3; eU4 = u4; eS5 = s5; eV6 = v6; eD7 = d7;
  absX = mxa; absY = mya;
  candCount = w;
}

let polyN: i32 = 0;
let polyX: usize = heap.alloc(8 << 3);
let polyY: usize = heap.alloc(8 << 3);

@inline function polyPush(x: f64, y: f64): void {
  if (polyN > 0 && load<f64>(polyX + (<usize>(polyN - 1) << 3)) == x && load<f64>(polyY + (<usize>(polyN - 1) << 3)) == y) return;
  store<f64>(polyX + (<usize>polyN << 3), x);
  store<f64>(polyY + (<usize>polyN << 3), y);
  polyN++;
}

/**
 * Drops candidates strictly inside the polygon E0..E7 of extreme points (in the frame's angular
 * order). A point strictly left of every edge of a closed polygon lies in the interior of the
 * hull of its vertices (its winding number is positive and no line through it separates the
 * vertices), so dropping it cannot change the hull, whatever the rounding in picking the
 * extremes. "Strictly left" is certified: with E = b - a, the test E_x p_y - E_y p_x > c + eps,
 * c = E_x a_y - E_y a_x, eps = 4e-15 (|E_x| max|y| + |E_y| max|x|), bounds every rounding error
 * (about 7 u (|E_x| max|y| + |E_y| max|x|), u = 2^-53) with a margin of 5. Returns the new count.
 */
export function filterCandidates(start: i32): i32 {
  const count = candCount;
  if (count - start < FILTER_MIN) return count;
  polyN = 0;
  polyPush(ex0, ey0); polyPush(ex1, ey1); polyPush(ex2, ey2); polyPush(ex3, ey3);
  polyPush(ex4, ey4); polyPush(ex5, ey5); polyPush(ex6, ey6); polyPush(ex7, ey7);
  while (polyN > 1 && load<f64>(polyX + (<usize>(polyN - 1) << 3)) == load<f64>(polyX) &&
    load<f64>(polyY + (<usize>(polyN - 1) << 3)) == load<f64>(polyY)) polyN--;
  const m = polyN;
  if (m < 3) return count;
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
  const a0 = load<f64>(EDGES), b0 = load<f64>(EDGES + 8), c0 = load<f64>(EDGES + 16);
  const a1 = load<f64>(EDGES + 24), b1 = load<f64>(EDGES + 32), c1 = load<f64>(EDGES + 40);
  const a2 = load<f64>(EDGES + 48), b2 = load<f64>(EDGES + 56), c2 = load<f64>(EDGES + 64);
  const a3 = load<f64>(EDGES + 72), b3 = load<f64>(EDGES + 80), c3 = load<f64>(EDGES + 88);
  const a4 = load<f64>(EDGES + 96), b4 = load<f64>(EDGES + 104), c4 = load<f64>(EDGES + 112);
  const a5 = load<f64>(EDGES + 120), b5 = load<f64>(EDGES + 128), c5 = load<f64>(EDGES + 136);
  const a6 = load<f64>(EDGES + 144), b6 = load<f64>(EDGES + 152), c6 = load<f64>(EDGES + 160);
  const a7 = load<f64>(EDGES + 168), b7 = load<f64>(EDGES + 176), c7 = load<f64>(EDGES + 184);
  let w = start;
  for (let i = start; i < count; i++) {
    const x = load<f64>(CX + (<usize>i << 3));
    const y = load<f64>(CY + (<usize>i << 3));
    const inside =
      a0 * y - b0 * x > c0 && a1 * y - b1 * x > c1 && a2 * y - b2 * x > c2 && a3 * y - b3 * x > c3 &&
      a4 * y - b4 * x > c4 && a5 * y - b5 * x > c5 && a6 * y - b6 * x > c6 && a7 * y - b7 * x > c7;
    if (!inside) {
      store<f64>(CX + (<usize>w << 3), x);
      store<f64>(CY + (<usize>w << 3), y);
      w++;
    }
  }
  candCount = w;
  return w;
}

/** Appends src[from..to) to the candidates without filtering. */
function append(srcX: usize, srcY: usize, from: i32, to: i32): void {
  let w = candCount;
  for (let i = from; i < to; i++) {
    store<f64>(CX + (<usize>w << 3), load<f64>(srcX + (<usize>i << 3)));
    store<f64>(CY + (<usize>w << 3), load<f64>(srcY + (<usize>i << 3)));
    w++;
  }
  candCount = w;
}

/** Hull of the current candidates into HX/HY; returns the vertex count. */
function chainCandidates(): i32 {
  const n = candCount;
  sortPoints(CX, CY, 0, n - 1);
  hullCount = monotoneChain(CX, CY, n, HX, HY);
  return hullCount;
}

/**
 * Simulates one path; writes G * 4 values (perimeter, diameter, area, vertices per grid n).
 * Each walk's new points are filtered against the polygon of their own extremes, in the frame
 * of that walk's own cloud (so k needles pointing different ways are each filtered well): a point
 * strictly inside one walk's hull is strictly inside the hull of all walks.
 */
export function runPath(out: usize): void {
  const stride = N + 1;
  for (let q = 0; q < 5 * G * K; q++) store<f64>(SEG + (<usize>q << 3), 0.0);
  for (let j = 0; j < K; j++) {
    nextSubstream();
    const code = load<i32>(codesPtr + (<usize>j << 2));
    const params = load<usize>(paramsPtr + (<usize>j << 3));
    // Gaussian steps are formed from the normals inside the position loop (one pass fewer),
    // with the same arithmetic as drawStepsInto.
    const gauss = code == LAW_GAUSSIAN;
    let mx = 0.0, my = 0.0, l11 = 0.0, l21 = 0.0, l22 = 0.0;
    if (gauss) {
      fillNormals(NZ, N << 1);
      mx = load<f64>(params); my = load<f64>(params + 8);
      l11 = load<f64>(params + 16); l21 = load<f64>(params + 24); l22 = load<f64>(params + 32);
    } else {
      drawStepsInto(code, params, N, SX, SY, NZ);
    }
    const px = PX + (<usize>(j * stride) << 3), py = PY + (<usize>(j * stride) << 3);
    let x = 0.0, y = 0.0;
    store<f64>(px, 0.0);
    store<f64>(py, 0.0);
    let i = 0;
    let sx = 0.0, sy = 0.0, sxx = 0.0, sxy = 0.0, syy = 0.0; // cumulative over the walk
    for (let g = 0; g < G; g++) {
      const hi = gridAt(g);
      for (; i < hi; i++) {
        if (gauss) {
          const z1 = load<f64>(NZ + (<usize>i << 4));
          const z2 = load<f64>(NZ + (<usize>i << 4) + 8);
          x += mx + l11 * z1;
          y += my + (l21 * z1 + l22 * z2);
        } else {
          x += load<f64>(SX + (<usize>i << 3));
          y += load<f64>(SY + (<usize>i << 3));
        }
        store<f64>(px + (<usize>(i + 1) << 3), x);
        store<f64>(py + (<usize>(i + 1) << 3), y);
        sx += x; sy += y; sxx += x * x; sxy += x * y; syy += y * y;
      }
      const o = SEG + (<usize>(5 * (j * G + g)) << 3);
      store<f64>(o, sx);
      store<f64>(o + 8, sy);
      store<f64>(o + 16, sxx);
      store<f64>(o + 24, sxy);
      store<f64>(o + 32, syy);
    }
  }
  let prev = 0;
  for (let g = 0; g < G; g++) {
    const hi = gridAt(g);
    candCount = 0;
    if (g == 0) append(PX, PY, 0, 1); // the origin, once
    else append(HX, HY, 0, hullCount);
    for (let j = 0; j < K; j++) {
      const o = SEG + (<usize>(5 * (j * G + g)) << 3);
      setFrame(<f64>(1 + hi), load<f64>(o), load<f64>(o + 8), load<f64>(o + 16), load<f64>(o + 24), load<f64>(o + 32));
      const base = j * stride;
      const start = candCount;
      const first = base + prev + 1;
      resetExtremes(load<f64>(PX + (<usize>first << 3)), load<f64>(PY + (<usize>first << 3)));
      gather(PX, PY, first, base + hi + 1);
      filterCandidates(start);
    }
    const h = chainCandidates();
    const r = out + (<usize>(4 * g) << 3);
    store<f64>(r, perimeter(HX, HY, h));
    store<f64>(r + 8, diameter(HX, HY, h));
    store<f64>(r + 16, area(HX, HY, h));
    store<f64>(r + 24, <f64>h);
    prev = hi;
  }
}

/** Runs `count` paths of the current block stream into out (count * G * 4 f64). */
export function runPaths(count: i32, out: usize): void {
  const rec = <usize>(G * 4) << 3;
  for (let p = 0; p < count; p++) runPath(out + <usize>p * rec);
}

export function pointsXPtr(): usize { return PX; }
export function pointsYPtr(): usize { return PY; }
export function hullXPtr(): usize { return HX; }
export function hullYPtr(): usize { return HY; }
export function getHullCount(): i32 { return hullCount; }

/** Test/bench helper: `count` steps of walk j from the first substream of (seed, block). */
export function drawSteps(j: i32, count: i32, sx: usize, sy: usize, scratch: usize): void {
  nextSubstream();
  drawStepsInto(load<i32>(codesPtr + (<usize>j << 2)), load<usize>(paramsPtr + (<usize>j << 3)), count, sx, sy, scratch);
}

/**
 * Test helper: hull of arbitrary points through the kernel's own path (frame from the points'
 * moments, extremes, filter, sort, chain). Needs buffers of capacity >= count (use a setup with
 * k * (n_max + 1) >= count). Returns the vertex count; vertices via hullXPtr/hullYPtr.
 */
export function hullOfPoints(xs: usize, ys: usize, count: i32, useFilter: bool): i32 {
  let sx = 0.0, sy = 0.0, sxx = 0.0, sxy = 0.0, syy = 0.0;
  for (let i = 0; i < count; i++) {
    const x = load<f64>(xs + (<usize>i << 3)), y = load<f64>(ys + (<usize>i << 3));
    sx += x; sy += y; sxx += x * x; sxy += x * y; syy += y * y;
  }
  setFrame(<f64>count, sx, sy, sxx, sxy, syy);
  candCount = 0;
  hullCount = 0;
  if (count == 0) return 0;
  resetExtremes(load<f64>(xs), load<f64>(ys));
  gather(xs, ys, 0, count);
  if (useFilter) filterCandidates(0);
  return chainCandidates();
}

/** Test helper: the measures of the current hull into out[0..4). */
export function measureHull(out: usize): void {
  store<f64>(out, perimeter(HX, HY, hullCount));
  store<f64>(out + 8, diameter(HX, HY, hullCount));
  store<f64>(out + 16, area(HX, HY, hullCount));
  store<f64>(out + 24, <f64>hullCount);
}
