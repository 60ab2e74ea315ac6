// Setup and frame: the buffers of one worker (allocated once, sized from n_max and k, reused for
// every path), the accessors that know their layout, and the normalising frame of a point cloud.

import { seedBlockStream } from "./rng";
import { MEASURE_COUNT } from "./measures";

export let K: i32 = 0; // walks
export let N: i32 = 0; // n_max
export let G: i32 = 0; // grid points
let gridPtr: usize = 0; // i32[G]
let codesPtr: usize = 0; // i32[K]
let paramsPtr: usize = 0; // usize[K] (pointers to f64 params)
let MU: usize = 0; // f64[2 * K]: each walk's exact step mean (for the centred controls)
export let PX: usize = 0, PY: usize = 0; // f64[K * (N + 1)], walk-major positions (walkPoints)
export let SX: usize = 0, SY: usize = 0, NZ: usize = 0; // step scratch
export let CX: usize = 0, CY: usize = 0; // candidates
export let HX: usize = 0, HY: usize = 0; // hull
let SEG: usize = 0; // f64[K * G * 5] per walk, cumulative sums x, y, xx, xy, yy up to n_g (segSums)
export let EDGES: usize = 0; // f64[8 * 3]: the filter's edges
export let BOX: usize = 0; // f64[4 * chunks]: per chunk of the last gathered group, min x, min y, max x, max y
export let BND: usize = 0; // f64[8 * chunks]: per chunk, bounds on u, v, u + v, u - v (gatherGroup)

/** Points per chunk of gatherGroup's bounding boxes and filterGroup's whole-chunk test. */
export const CHUNK: i32 = 32;

/** Numbers per grid point of a path's output record (the measures at their registry slots). */
export const RECORD_PER_POINT: i32 = MEASURE_COUNT;
/** Control values per walk and grid point: centred endpoint (x, y), centred integrated path (x, y). */
export const CONTROLS_PER_WALK: i32 = 4;

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
  const candCap = 2 * pts + 8;
  CX = allocF64(candCap);
  CY = allocF64(candCap);
  HX = allocF64(2 * candCap + 2);
  HY = allocF64(2 * candCap + 2);
  SEG = allocF64(5 * g * k);
  MU = allocF64(2 * k);
  EDGES = allocF64(24);
  BOX = allocF64(4 * (candCap / CHUNK + 2));
  BND = allocF64(8 * (candCap / CHUNK + 2));
}

export function setWalk(j: i32, code: i32, params: usize): void {
  store<i32>(codesPtr + (<usize>j << 2), code);
  store<usize>(paramsPtr + (<usize>j << 3), params);
}

/** The exact step mean of walk j: the controls are centred with it (their means are then 0). */
export function setDrift(j: i32, mx: f64, my: f64): void {
  store<f64>(MU + (<usize>(2 * j) << 3), mx);
  store<f64>(MU + (<usize>(2 * j + 1) << 3), my);
}

export function seedBlock(seed: u64, block: u64): void {
  seedBlockStream(seed, block);
}

// ---- Layout accessors: the only code that knows where a value lives.

/** n at grid index g. */
@inline export function gridAt(g: i32): i32 {
  return load<i32>(gridPtr + (<usize>g << 2));
}
/** Law code of walk j. */
@inline export function lawCode(j: i32): i32 {
  return load<i32>(codesPtr + (<usize>j << 2));
}
/** Pointer to the packed law parameters of walk j. */
@inline export function lawParams(j: i32): usize {
  return load<usize>(paramsPtr + (<usize>j << 3));
}
/** Step mean of walk j, coordinate c (0: x, 1: y). */
@inline export function drift(j: i32, c: i32): f64 {
  return load<f64>(MU + (<usize>(2 * j + c) << 3));
}
/** Index of point i (0..N) of walk j in PX/PY. */
@inline export function walkPoint(j: i32, i: i32): i32 {
  return j * (N + 1) + i;
}
/** The five cumulative sums (x, y, xx, xy, yy) of walk j up to grid index g: pointer to the first. */
@inline export function segSums(j: i32, g: i32): usize {
  return SEG + (<usize>(5 * (j * G + g)) << 3);
}
/** Zeroes every walk's cumulative sums. */
export function clearSegSums(): void {
  memory.fill(SEG, 0, <usize>(5 * G * K) << 3);
}
/** Byte size of one path's output record. */
@inline export function recordBytes(): usize {
  return <usize>(G * RECORD_PER_POINT) << 3;
}
/** Byte size of one path's control record. */
@inline export function controlBytes(): usize {
  return <usize>(G * CONTROLS_PER_WALK * K) << 3;
}
/** Pointer to grid point g of the output record at out. */
@inline export function recordAt(out: usize, g: i32): usize {
  return out + (<usize>(RECORD_PER_POINT * g) << 3);
}
/** Pointer to the controls of walk j at grid point g in the control record at ctl. */
@inline export function controlAt(ctl: usize, g: i32, j: i32): usize {
  return ctl + (<usize>(CONTROLS_PER_WALK * (g * K + j)) << 3);
}
@inline export function ldx(src: usize, i: i32): f64 {
  return load<f64>(src + (<usize>i << 3));
}

// ---- Frame: u = fa x + fd y, v = fb x + fc y, in which the filters look for extremes.
export let fa: f64 = 1, fb: f64 = 0, fc: f64 = 1, fd: f64 = 0;

/**
 * Frame from the second moments of the points so far (cnt points, sums): the inverse Cholesky
 * factor of their covariance, so the cloud looks round (a needle-shaped drifting walk included).
 * Falls back to the identity for (near) collinear clouds. Any frame keeps the filter correct.
 */
export function setFrame(cnt: f64, sx: f64, sy: f64, sxx: f64, sxy: f64, syy: f64): void {
  fa = 1; fb = 0; fc = 1; fd = 0;
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

/** Frame from the cumulative sums at s (segSums) of cnt points. */
export function setFrameFromSums(cnt: f64, s: usize): void {
  setFrame(cnt, load<f64>(s), load<f64>(s + 8), load<f64>(s + 16), load<f64>(s + 24), load<f64>(s + 32));
}

// cos and sin of pi/8: the rotated frame's octagon directions bisect the first's.
const COS_PI8: f64 = 0.9238795325112867;
const SIN_PI8: f64 = 0.3826834323650898;

/** Rotates the current frame by pi/8 (u, v directions between the previous octagon's). */
export function rotateFrame(): void {
  const a = fa, b = fb, c = fc;
  fa = COS_PI8 * a + SIN_PI8 * b;
  fd = SIN_PI8 * c;
  fb = COS_PI8 * b - SIN_PI8 * a;
  fc = COS_PI8 * c;
}
