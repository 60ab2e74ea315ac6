// One block of paths: k walks from the origin, hulls at every n of the grid along one path.
// Per grid segment (n_{g-1}, n_g]: candidates = previous hull vertices + the new points of every
// walk; a conservative point filter drops new points strictly inside the polygon of 8 extreme
// points of their walk's segment; a second pass filters the survivors again (k > 1: against the
// octagon of all candidates in the joint frame; k = 1: in the walk's frame rotated by pi/8); the
// survivors are sorted and chained (hull(prefix n_g) = hull(hull(prefix n_{g-1}) + new points)).
// All buffers are allocated once in setup and reused for every path.

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
let MU: usize = 0; // f64[2 * K]: each walk's exact step mean (for the centred controls)
let CTL: usize = 0; // f64[G * 4 * K]: scratch controls record of one path (bench entry points)
let EDGES: usize = 0; // f64[8 * 3]
let BOX: usize = 0; // f64[4 * chunks]: per chunk of the last gathered group, min x, min y, max x, max y
let BND: usize = 0; // f64[8 * chunks]: per chunk, bounds on u, v, u + v, u - v (gatherGroup)
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
  MU = allocF64(2 * k);
  CTL = allocF64(4 * g * k);
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

@inline function gridAt(g: i32): i32 {
  return load<i32>(gridPtr + (<usize>g << 2));
}

// ---- Extremes in 8 directions of a normalised frame x' = fa x, y' = fb x + fc y.
let fa: f64 = 1, fb: f64 = 0, fc: f64 = 1, fd: f64 = 0; // x' = fa x + fd y (fd = 0 but in rotated frames)
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

@inline function ldx(src: usize, i: i32): f64 {
  return load<f64>(src + (<usize>i << 3));
}

/** Points per chunk of gatherGroup's bounding boxes and filterGroup's whole-chunk test. */
const CHUNK: i32 = 32;
/** Groups from this size on evaluate only the chunks whose bounds may hold an extreme; smaller ones evaluate all. */
const GUIDED_MIN: i32 = 8192;
let boxSrc: usize = 0, boxFrom: i32 = -1, boxTo: i32 = -1; // the group BOX describes

/**
 * First point of src[cs..min(cs + CHUNK, to)) whose value in direction kind (0: u, 1: u + v,
 * 2: v, 3: u - v) equals target, computed as in gatherGroup; cs if none (never, for a target
 * taken from that chunk; an infinite extreme may leave cs = to, then to - 1).
 */
function firstWith(srcX: usize, srcY: usize, cs: i32, to: i32, kind: i32, target: f64): i32 {
  const a = fa, b = fb, c = fc, dd = fd;
  const ce = min(cs + CHUNK, to);
  for (let i = cs; i < ce; i++) {
    const x = ldx(srcX, i), y = ldx(srcY, i);
    const u = x * a + y * dd, v = x * b + y * c;
    const val = kind == 0 ? u : kind == 1 ? u + v : kind == 2 ? v : u - v;
    if (val == target) return i;
  }
  return cs < to ? cs : to - 1;
}

// Best values found so far by evalChunk ([u, v] and [u + v, u - v], largest and smallest) and
// the first chunk (its first index, as f64) holding each.
let gPMax: v128 = f64x2.splat(0), gPMin: v128 = f64x2.splat(0), gQMax: v128 = f64x2.splat(0), gQMin: v128 = f64x2.splat(0);
let ipMax: v128 = f64x2.splat(0), ipMin: v128 = f64x2.splat(0), iqMax: v128 = f64x2.splat(0), iqMin: v128 = f64x2.splat(0);

/** Extremes of u, v, u + v, u - v over src[cs..min(cs + CHUNK, to)), merged into the best values. */
function evalChunk(srcX: usize, srcY: usize, cs: i32, to: i32): void {
  const A = f64x2.splat(fa), D = f64x2.splat(fd), B = f64x2.splat(fb), C = f64x2.splat(fc);
  const NEG = f64x2.splat(-Infinity), POS = f64x2.splat(Infinity);
  const ce = min(cs + CHUNK, to);
  let uMx = NEG, uMn = POS, vMx = NEG, vMn = POS, sMx = NEG, sMn = POS, dMx = NEG, dMn = POS;
  for (let i = cs; i < ce; i += 2) {
    let xv: v128, yv: v128;
    if (i + 1 < ce) {
      xv = v128.load(srcX + (<usize>i << 3));
      yv = v128.load(srcY + (<usize>i << 3));
    } else {
      xv = f64x2.splat(ldx(srcX, i)); // a lone last point in both lanes
      yv = f64x2.splat(ldx(srcY, i));
    }
    const U = f64x2.add(f64x2.mul(xv, A), f64x2.mul(yv, D));
    const V = f64x2.add(f64x2.mul(xv, B), f64x2.mul(yv, C));
    const S = f64x2.add(U, V), Dd = f64x2.sub(U, V);
    uMx = f64x2.pmax(uMx, U); uMn = f64x2.pmin(uMn, U);
    vMx = f64x2.pmax(vMx, V); vMn = f64x2.pmin(vMn, V);
    sMx = f64x2.pmax(sMx, S); sMn = f64x2.pmin(sMn, S);
    dMx = f64x2.pmax(dMx, Dd); dMn = f64x2.pmin(dMn, Dd);
  }
  const PMx = f64x2.pmax(v128.shuffle<f64>(uMx, vMx, 0, 2), v128.shuffle<f64>(uMx, vMx, 1, 3));
  const PMn = f64x2.pmin(v128.shuffle<f64>(uMn, vMn, 0, 2), v128.shuffle<f64>(uMn, vMn, 1, 3));
  const QMx = f64x2.pmax(v128.shuffle<f64>(sMx, dMx, 0, 2), v128.shuffle<f64>(sMx, dMx, 1, 3));
  const QMn = f64x2.pmin(v128.shuffle<f64>(sMn, dMn, 0, 2), v128.shuffle<f64>(sMn, dMn, 1, 3));
  const CI = f64x2.splat(<f64>cs);
  // A better value, or the same value in an earlier chunk.
  let m = v128.or(f64x2.gt(PMx, gPMax), v128.and(f64x2.eq(PMx, gPMax), f64x2.lt(CI, ipMax)));
  gPMax = v128.bitselect(PMx, gPMax, m); ipMax = v128.bitselect(CI, ipMax, m);
  m = v128.or(f64x2.lt(PMn, gPMin), v128.and(f64x2.eq(PMn, gPMin), f64x2.lt(CI, ipMin)));
  gPMin = v128.bitselect(PMn, gPMin, m); ipMin = v128.bitselect(CI, ipMin, m);
  m = v128.or(f64x2.gt(QMx, gQMax), v128.and(f64x2.eq(QMx, gQMax), f64x2.lt(CI, iqMax)));
  gQMax = v128.bitselect(QMx, gQMax, m); iqMax = v128.bitselect(CI, iqMax, m);
  m = v128.or(f64x2.lt(QMn, gQMin), v128.and(f64x2.eq(QMn, gQMin), f64x2.lt(CI, iqMin)));
  gQMin = v128.bitselect(QMn, gQMin, m); iqMin = v128.bitselect(CI, iqMin, m);
}

/**
 * Finds, for src[from..to) (to > from), in the current frame, the first point of largest u = x', u + v, v, -(u - v), -u, -(u + v), -v, u - v (v = y'), and max |x|, |y|.
 * Branch-free updates (a drifting walk sets a new maximum almost every step).
 */
function gatherGroup(srcX: usize, srcY: usize, from: i32, to: i32): void {
  const a = fa, b = fb, c = fc, dd = fd;
  let x = ldx(srcX, from), y = ldx(srcY, from);
  let u0 = a * x + dd * y, v2 = b * x + c * y;
  let s1 = u0 + v2, d7 = u0 - v2;
  let u4 = u0, s5 = s1, v6 = v2, d3 = d7;
  let i0 = from, i1 = from, i2 = from, i3 = from, i4 = from, i5 = from, i6 = from, i7 = from;
  let mxa = Math.abs(x), mya = Math.abs(y);
  if (ASC_FEATURE_SIMD) {
    // Chunks of CHUNK points, two points per step; each chunk's bounding box in x, y goes to BOX
    // (filterGroup's chunk test), and the first chunk holding each extreme value of u, v, u + v,
    // u - v (the same IEEE operations as the scalar loop below) is rescanned for its first point
    // with it: the same extreme points as the scalar loop. Small groups evaluate every chunk in
    // the same pass. Groups of GUIDED_MIN points or more first compute only the boxes, and bounds
    // on u, v, u + v, u - v over each chunk (into BND) from the box corners: rounding is
    // monotone, so the computed u = a x + d y of any point of the box lies between its values at
    // the corners, and u + v, u - v between the sums and differences of those bounds. Then only
    // the chunks that may hold an extreme are evaluated (evalChunk): first the chunk of the
    // largest bound in each direction, then, in order, every chunk whose bound reaches the best
    // value found.
    const A = f64x2.splat(a), D = f64x2.splat(dd), B = f64x2.splat(b), C = f64x2.splat(c);
    const NEG = f64x2.splat(-Infinity), POS = f64x2.splat(Infinity);
    let bPMax = NEG, bPMin = POS, bQMax = NEG, bQMin = POS; // largest bounds: [u, v], [u + v, u - v]
    const f0 = f64x2.splat(<f64>from);
    let jpMax = f0, jpMin = f0, jqMax = f0, jqMin = f0;
    let gLo = POS, gHi = NEG; // [x, y]
    let box = BOX, bnd = BND;
    const guided = to - from >= GUIDED_MIN;
    gPMax = NEG; gPMin = POS; gQMax = NEG; gQMin = POS;
    const late = f64x2.splat(<f64>(guided ? to : from));
    ipMax = late; ipMin = late; iqMax = late; iqMin = late;
    if (!guided) {
      // Small groups: boxes and extremes of every chunk in one pass.
      for (let cs = from; cs < to; cs += CHUNK) {
        const ce = min(cs + CHUNK, to);
        let uMx = NEG, uMn = POS, vMx = NEG, vMn = POS, sMx = NEG, sMn = POS, dMx = NEG, dMn = POS;
        let xMn = POS, xMx = NEG, yMn = POS, yMx = NEG;
        for (let i = cs; i < ce; i += 2) {
          let xv: v128, yv: v128;
          if (i + 1 < ce) {
            xv = v128.load(srcX + (<usize>i << 3));
            yv = v128.load(srcY + (<usize>i << 3));
          } else {
            xv = f64x2.splat(ldx(srcX, i)); // a lone last point in both lanes
            yv = f64x2.splat(ldx(srcY, i));
          }
          const U = f64x2.add(f64x2.mul(xv, A), f64x2.mul(yv, D));
          const V = f64x2.add(f64x2.mul(xv, B), f64x2.mul(yv, C));
          const S = f64x2.add(U, V), Dd = f64x2.sub(U, V);
          uMx = f64x2.pmax(uMx, U); uMn = f64x2.pmin(uMn, U);
          vMx = f64x2.pmax(vMx, V); vMn = f64x2.pmin(vMn, V);
          sMx = f64x2.pmax(sMx, S); sMn = f64x2.pmin(sMn, S);
          dMx = f64x2.pmax(dMx, Dd); dMn = f64x2.pmin(dMn, Dd);
          xMn = f64x2.pmin(xMn, xv); xMx = f64x2.pmax(xMx, xv);
          yMn = f64x2.pmin(yMn, yv); yMx = f64x2.pmax(yMx, yv);
        }
        const CI = f64x2.splat(<f64>cs);
        const PMx = f64x2.pmax(v128.shuffle<f64>(uMx, vMx, 0, 2), v128.shuffle<f64>(uMx, vMx, 1, 3));
        const PMn = f64x2.pmin(v128.shuffle<f64>(uMn, vMn, 0, 2), v128.shuffle<f64>(uMn, vMn, 1, 3));
        const QMx = f64x2.pmax(v128.shuffle<f64>(sMx, dMx, 0, 2), v128.shuffle<f64>(sMx, dMx, 1, 3));
        const QMn = f64x2.pmin(v128.shuffle<f64>(sMn, dMn, 0, 2), v128.shuffle<f64>(sMn, dMn, 1, 3));
        // Chunks in order: strict comparisons keep the first chunk holding each extreme value.
        let m = f64x2.gt(PMx, gPMax); gPMax = v128.bitselect(PMx, gPMax, m); ipMax = v128.bitselect(CI, ipMax, m);
        m = f64x2.lt(PMn, gPMin); gPMin = v128.bitselect(PMn, gPMin, m); ipMin = v128.bitselect(CI, ipMin, m);
        m = f64x2.gt(QMx, gQMax); gQMax = v128.bitselect(QMx, gQMax, m); iqMax = v128.bitselect(CI, iqMax, m);
        m = f64x2.lt(QMn, gQMin); gQMin = v128.bitselect(QMn, gQMin, m); iqMin = v128.bitselect(CI, iqMin, m);
        const lo = f64x2.pmin(v128.shuffle<f64>(xMn, yMn, 0, 2), v128.shuffle<f64>(xMn, yMn, 1, 3));
        const hi = f64x2.pmax(v128.shuffle<f64>(xMx, yMx, 0, 2), v128.shuffle<f64>(xMx, yMx, 1, 3));
        v128.store(box, lo);
        v128.store(box + 16, hi);
        box += 32;
        gLo = f64x2.pmin(gLo, lo);
        gHi = f64x2.pmax(gHi, hi);
      }
    } else {
    for (let cs = from; cs < to; cs += CHUNK) {
      const ce = min(cs + CHUNK, to);
      let xMn = POS, xMx = NEG, yMn = POS, yMx = NEG;
      let i = cs;
      for (; i + 1 < ce; i += 2) {
        const xv = v128.load(srcX + (<usize>i << 3));
        const yv = v128.load(srcY + (<usize>i << 3));
        xMn = f64x2.pmin(xMn, xv); xMx = f64x2.pmax(xMx, xv);
        yMn = f64x2.pmin(yMn, yv); yMx = f64x2.pmax(yMx, yv);
      }
      if (i < ce) {
        const xv = f64x2.splat(ldx(srcX, i)), yv = f64x2.splat(ldx(srcY, i));
        xMn = f64x2.pmin(xMn, xv); xMx = f64x2.pmax(xMx, xv);
        yMn = f64x2.pmin(yMn, yv); yMx = f64x2.pmax(yMx, yv);
      }
      const lo = f64x2.pmin(v128.shuffle<f64>(xMn, yMn, 0, 2), v128.shuffle<f64>(xMn, yMn, 1, 3));
      const hi = f64x2.pmax(v128.shuffle<f64>(xMx, yMx, 0, 2), v128.shuffle<f64>(xMx, yMx, 1, 3));
      v128.store(box, lo);
      v128.store(box + 16, hi);
      box += 32;
      gLo = f64x2.pmin(gLo, lo);
      gHi = f64x2.pmax(gHi, hi);
      // Corners: XS = [min x, max x] with min y (Y0) and max y (Y1).
      const XS = v128.shuffle<f64>(lo, hi, 0, 2);
      const Y0 = f64x2.splat(f64x2.extract_lane(lo, 1)), Y1 = f64x2.splat(f64x2.extract_lane(hi, 1));
      const U0 = f64x2.add(f64x2.mul(XS, A), f64x2.mul(Y0, D)), U1 = f64x2.add(f64x2.mul(XS, A), f64x2.mul(Y1, D));
      const V0 = f64x2.add(f64x2.mul(XS, B), f64x2.mul(Y0, C)), V1 = f64x2.add(f64x2.mul(XS, B), f64x2.mul(Y1, C));
      const uH = f64x2.pmax(U0, U1), uL = f64x2.pmin(U0, U1), vH = f64x2.pmax(V0, V1), vL = f64x2.pmin(V0, V1);
      const PH = f64x2.pmax(v128.shuffle<f64>(uH, vH, 0, 2), v128.shuffle<f64>(uH, vH, 1, 3)); // [u, v] upper bounds
      const PL = f64x2.pmin(v128.shuffle<f64>(uL, vL, 0, 2), v128.shuffle<f64>(uL, vL, 1, 3)); // lower bounds
      const QH = f64x2.add(f64x2.splat(f64x2.extract_lane(PH, 0)), v128.shuffle<f64>(PH, f64x2.neg(PL), 1, 3));
      const QL = f64x2.add(f64x2.splat(f64x2.extract_lane(PL, 0)), v128.shuffle<f64>(PL, f64x2.neg(PH), 1, 3));
      v128.store(bnd, PH);
      v128.store(bnd + 16, PL);
      v128.store(bnd + 32, QH);
      v128.store(bnd + 48, QL);
      bnd += 64;
      const CI = f64x2.splat(<f64>cs);
      let m = f64x2.gt(PH, bPMax); bPMax = v128.bitselect(PH, bPMax, m); jpMax = v128.bitselect(CI, jpMax, m);
      m = f64x2.lt(PL, bPMin); bPMin = v128.bitselect(PL, bPMin, m); jpMin = v128.bitselect(CI, jpMin, m);
      m = f64x2.gt(QH, bQMax); bQMax = v128.bitselect(QH, bQMax, m); jqMax = v128.bitselect(CI, jqMax, m);
      m = f64x2.lt(QL, bQMin); bQMin = v128.bitselect(QL, bQMin, m); jqMin = v128.bitselect(CI, jqMin, m);
    }
    evalChunk(srcX, srcY, <i32>f64x2.extract_lane(jpMax, 0), to);
    evalChunk(srcX, srcY, <i32>f64x2.extract_lane(jpMax, 1), to);
    evalChunk(srcX, srcY, <i32>f64x2.extract_lane(jpMin, 0), to);
    evalChunk(srcX, srcY, <i32>f64x2.extract_lane(jpMin, 1), to);
    evalChunk(srcX, srcY, <i32>f64x2.extract_lane(jqMax, 0), to);
    evalChunk(srcX, srcY, <i32>f64x2.extract_lane(jqMax, 1), to);
    evalChunk(srcX, srcY, <i32>f64x2.extract_lane(jqMin, 0), to);
    evalChunk(srcX, srcY, <i32>f64x2.extract_lane(jqMin, 1), to);
    bnd = BND;
    for (let cs = from; cs < to; cs += CHUNK) {
      let m = f64x2.ge(v128.load(bnd), gPMax);
      m = v128.or(m, f64x2.le(v128.load(bnd + 16), gPMin));
      m = v128.or(m, f64x2.ge(v128.load(bnd + 32), gQMax));
      m = v128.or(m, f64x2.le(v128.load(bnd + 48), gQMin));
      bnd += 64;
      if (v128.any_true(m)) evalChunk(srcX, srcY, cs, to);
    }
    }
    boxSrc = srcX; boxFrom = from; boxTo = to;
    i0 = firstWith(srcX, srcY, <i32>f64x2.extract_lane(ipMax, 0), to, 0, f64x2.extract_lane(gPMax, 0));
    i2 = firstWith(srcX, srcY, <i32>f64x2.extract_lane(ipMax, 1), to, 2, f64x2.extract_lane(gPMax, 1));
    i4 = firstWith(srcX, srcY, <i32>f64x2.extract_lane(ipMin, 0), to, 0, f64x2.extract_lane(gPMin, 0));
    i6 = firstWith(srcX, srcY, <i32>f64x2.extract_lane(ipMin, 1), to, 2, f64x2.extract_lane(gPMin, 1));
    i1 = firstWith(srcX, srcY, <i32>f64x2.extract_lane(iqMax, 0), to, 1, f64x2.extract_lane(gQMax, 0));
    i7 = firstWith(srcX, srcY, <i32>f64x2.extract_lane(iqMax, 1), to, 3, f64x2.extract_lane(gQMax, 1));
    i5 = firstWith(srcX, srcY, <i32>f64x2.extract_lane(iqMin, 0), to, 1, f64x2.extract_lane(gQMin, 0));
    i3 = firstWith(srcX, srcY, <i32>f64x2.extract_lane(iqMin, 1), to, 3, f64x2.extract_lane(gQMin, 1));
    mxa = max(Math.abs(f64x2.extract_lane(gLo, 0)), Math.abs(f64x2.extract_lane(gHi, 0)));
    mya = max(Math.abs(f64x2.extract_lane(gLo, 1)), Math.abs(f64x2.extract_lane(gHi, 1)));
  } else {
    for (let i = from + 1; i < to; i++) {
      x = ldx(srcX, i);
      y = ldx(srcY, i);
      const u = a * x + dd * y, v = b * x + c * y;
      const s = u + v, d = u - v;
      let t = u > u0; u0 = select<f64>(u, u0, t); i0 = select<i32>(i, i0, t);
      t = u < u4; u4 = select<f64>(u, u4, t); i4 = select<i32>(i, i4, t);
      t = s > s1; s1 = select<f64>(s, s1, t); i1 = select<i32>(i, i1, t);
      t = s < s5; s5 = select<f64>(s, s5, t); i5 = select<i32>(i, i5, t);
      t = v > v2; v2 = select<f64>(v, v2, t); i2 = select<i32>(i, i2, t);
      t = v < v6; v6 = select<f64>(v, v6, t); i6 = select<i32>(i, i6, t);
      t = d < d3; d3 = select<f64>(d, d3, t); i3 = select<i32>(i, i3, t);
      t = d > d7; d7 = select<f64>(d, d7, t); i7 = select<i32>(i, i7, t);
      // select, not f64.max: V8's f64.max handles NaN and signed zeros with extra branches.
      const ax = Math.abs(x), ay = Math.abs(y);
      mxa = select<f64>(ax, mxa, ax > mxa);
      mya = select<f64>(ay, mya, ay > mya);
    }
  }
  ex0 = ldx(srcX, i0); ey0 = ldx(srcY, i0);
  ex1 = ldx(srcX, i1); ey1 = ldx(srcY, i1);
  ex2 = ldx(srcX, i2); ey2 = ldx(srcY, i2);
  ex3 = ldx(srcX, i3); ey3 = ldx(srcY, i3);
  ex4 = ldx(srcX, i4); ey4 = ldx(srcY, i4);
  ex5 = ldx(srcX, i5); ey5 = ldx(srcY, i5);
  ex6 = ldx(srcX, i6); ey6 = ldx(srcY, i6);
  ex7 = ldx(srcX, i7); ey7 = ldx(srcY, i7);
  absX = mxa; absY = mya;
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
  const a0 = load<f64>(EDGES), b0 = load<f64>(EDGES + 8), c0 = load<f64>(EDGES + 16);
  const a1 = load<f64>(EDGES + 24), b1 = load<f64>(EDGES + 32), c1 = load<f64>(EDGES + 40);
  const a2 = load<f64>(EDGES + 48), b2 = load<f64>(EDGES + 56), c2 = load<f64>(EDGES + 64);
  const a3 = load<f64>(EDGES + 72), b3 = load<f64>(EDGES + 80), c3 = load<f64>(EDGES + 88);
  const a4 = load<f64>(EDGES + 96), b4 = load<f64>(EDGES + 104), c4 = load<f64>(EDGES + 112);
  const a5 = load<f64>(EDGES + 120), b5 = load<f64>(EDGES + 128), c5 = load<f64>(EDGES + 136);
  const a6 = load<f64>(EDGES + 144), b6 = load<f64>(EDGES + 152), c6 = load<f64>(EDGES + 160);
  const a7 = load<f64>(EDGES + 168), b7 = load<f64>(EDGES + 176), c7 = load<f64>(EDGES + 184);
  let w = candCount;
  let i = from;
  if (ASC_FEATURE_SIMD) {
    // Two points per step (f64x2): the same IEEE products, differences and comparisons as the
    // scalar test, so the same points survive, in the same order.
    const A0 = f64x2.splat(a0), B0 = f64x2.splat(b0), C0 = f64x2.splat(c0);
    const A1 = f64x2.splat(a1), B1 = f64x2.splat(b1), C1 = f64x2.splat(c1);
    const A2 = f64x2.splat(a2), B2 = f64x2.splat(b2), C2 = f64x2.splat(c2);
    const A3 = f64x2.splat(a3), B3 = f64x2.splat(b3), C3 = f64x2.splat(c3);
    const A4 = f64x2.splat(a4), B4 = f64x2.splat(b4), C4 = f64x2.splat(c4);
    const A5 = f64x2.splat(a5), B5 = f64x2.splat(b5), C5 = f64x2.splat(c5);
    const A6 = f64x2.splat(a6), B6 = f64x2.splat(b6), C6 = f64x2.splat(c6);
    const A7 = f64x2.splat(a7), B7 = f64x2.splat(b7), C7 = f64x2.splat(c7);
    // Whole chunks first: if the 4 corners of a chunk's bounding box (BOX, from gatherGroup)
    // pass the test, so does every point of the chunk (rounding is monotone: for each edge the
    // computed a y - b x over the box is smallest at a corner), so the chunk is dropped at once;
    // otherwise its points are tested. The same points survive, in the same order.
    if (boxSrc == srcX && boxFrom == from && boxTo == to) {
      let box = BOX;
      for (let cs = from; cs < to; cs += CHUNK) {
        const ce = min(cs + CHUNK, to);
        const lo = v128.load(box), hi = v128.load(box + 16);
        box += 32;
        const xv = v128.shuffle<f64>(lo, hi, 0, 2); // [min x, max x]
        const y0 = f64x2.splat(f64x2.extract_lane(lo, 1));
        const y1 = f64x2.splat(f64x2.extract_lane(hi, 1));
        let m = f64x2.gt(f64x2.sub(f64x2.mul(A0, y0), f64x2.mul(B0, xv)), C0);
        m = v128.and(m, f64x2.gt(f64x2.sub(f64x2.mul(A0, y1), f64x2.mul(B0, xv)), C0));
        m = v128.and(m, f64x2.gt(f64x2.sub(f64x2.mul(A1, y0), f64x2.mul(B1, xv)), C1));
        m = v128.and(m, f64x2.gt(f64x2.sub(f64x2.mul(A1, y1), f64x2.mul(B1, xv)), C1));
        m = v128.and(m, f64x2.gt(f64x2.sub(f64x2.mul(A2, y0), f64x2.mul(B2, xv)), C2));
        m = v128.and(m, f64x2.gt(f64x2.sub(f64x2.mul(A2, y1), f64x2.mul(B2, xv)), C2));
        m = v128.and(m, f64x2.gt(f64x2.sub(f64x2.mul(A3, y0), f64x2.mul(B3, xv)), C3));
        m = v128.and(m, f64x2.gt(f64x2.sub(f64x2.mul(A3, y1), f64x2.mul(B3, xv)), C3));
        m = v128.and(m, f64x2.gt(f64x2.sub(f64x2.mul(A4, y0), f64x2.mul(B4, xv)), C4));
        m = v128.and(m, f64x2.gt(f64x2.sub(f64x2.mul(A4, y1), f64x2.mul(B4, xv)), C4));
        m = v128.and(m, f64x2.gt(f64x2.sub(f64x2.mul(A5, y0), f64x2.mul(B5, xv)), C5));
        m = v128.and(m, f64x2.gt(f64x2.sub(f64x2.mul(A5, y1), f64x2.mul(B5, xv)), C5));
        m = v128.and(m, f64x2.gt(f64x2.sub(f64x2.mul(A6, y0), f64x2.mul(B6, xv)), C6));
        m = v128.and(m, f64x2.gt(f64x2.sub(f64x2.mul(A6, y1), f64x2.mul(B6, xv)), C6));
        m = v128.and(m, f64x2.gt(f64x2.sub(f64x2.mul(A7, y0), f64x2.mul(B7, xv)), C7));
        m = v128.and(m, f64x2.gt(f64x2.sub(f64x2.mul(A7, y1), f64x2.mul(B7, xv)), C7));
        if (i64x2.all_true(m)) {
          statChunkPoints += <f64>(ce - cs);
          continue;
        }
        i = cs;
        for (; i + 1 < ce; i += 2) {
          const xv = v128.load(srcX + (<usize>i << 3));
          const yv = v128.load(srcY + (<usize>i << 3));
          let m = f64x2.gt(f64x2.sub(f64x2.mul(A0, yv), f64x2.mul(B0, xv)), C0);
          m = v128.and(m, f64x2.gt(f64x2.sub(f64x2.mul(A1, yv), f64x2.mul(B1, xv)), C1));
          m = v128.and(m, f64x2.gt(f64x2.sub(f64x2.mul(A2, yv), f64x2.mul(B2, xv)), C2));
          m = v128.and(m, f64x2.gt(f64x2.sub(f64x2.mul(A3, yv), f64x2.mul(B3, xv)), C3));
          m = v128.and(m, f64x2.gt(f64x2.sub(f64x2.mul(A4, yv), f64x2.mul(B4, xv)), C4));
          m = v128.and(m, f64x2.gt(f64x2.sub(f64x2.mul(A5, yv), f64x2.mul(B5, xv)), C5));
          m = v128.and(m, f64x2.gt(f64x2.sub(f64x2.mul(A6, yv), f64x2.mul(B6, xv)), C6));
          m = v128.and(m, f64x2.gt(f64x2.sub(f64x2.mul(A7, yv), f64x2.mul(B7, xv)), C7));
          if (i64x2.all_true(m)) continue;
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
        }
        if (i < ce) {
          const x = load<f64>(srcX + (<usize>i << 3));
          const y = load<f64>(srcY + (<usize>i << 3));
          const inside =
            a0 * y - b0 * x > c0 && a1 * y - b1 * x > c1 && a2 * y - b2 * x > c2 && a3 * y - b3 * x > c3 &&
            a4 * y - b4 * x > c4 && a5 * y - b5 * x > c5 && a6 * y - b6 * x > c6 && a7 * y - b7 * x > c7;
          if (!inside) {
            store<f64>(CX + (<usize>w << 3), x);
            store<f64>(CY + (<usize>w << 3), y);
            w++;
          }
        }
      }
      i = to;
    }
    for (; i + 1 < to; i += 2) {
      const xv = v128.load(srcX + (<usize>i << 3));
      const yv = v128.load(srcY + (<usize>i << 3));
      let m = f64x2.gt(f64x2.sub(f64x2.mul(A0, yv), f64x2.mul(B0, xv)), C0);
      m = v128.and(m, f64x2.gt(f64x2.sub(f64x2.mul(A1, yv), f64x2.mul(B1, xv)), C1));
      m = v128.and(m, f64x2.gt(f64x2.sub(f64x2.mul(A2, yv), f64x2.mul(B2, xv)), C2));
      m = v128.and(m, f64x2.gt(f64x2.sub(f64x2.mul(A3, yv), f64x2.mul(B3, xv)), C3));
      m = v128.and(m, f64x2.gt(f64x2.sub(f64x2.mul(A4, yv), f64x2.mul(B4, xv)), C4));
      m = v128.and(m, f64x2.gt(f64x2.sub(f64x2.mul(A5, yv), f64x2.mul(B5, xv)), C5));
      m = v128.and(m, f64x2.gt(f64x2.sub(f64x2.mul(A6, yv), f64x2.mul(B6, xv)), C6));
      m = v128.and(m, f64x2.gt(f64x2.sub(f64x2.mul(A7, yv), f64x2.mul(B7, xv)), C7));
      if (i64x2.all_true(m)) continue;
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
    }
  }
  for (; i < to; i++) {
    const x = load<f64>(srcX + (<usize>i << 3));
    const y = load<f64>(srcY + (<usize>i << 3));
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

/** Draws the steps of every walk of one path into PX/PY and their cumulative moments into SEG. */
function generateWalks(): void {
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
    const o = SEG + (<usize>(5 * (j * G + g)) << 3);
    sx += load<f64>(o); sy += load<f64>(o + 8);
    sxx += load<f64>(o + 16); sxy += load<f64>(o + 24); syy += load<f64>(o + 32);
  }
  setFrame(<f64>(K * (1 + hi)), sx, sy, sxx, sxy, syy);
  const count = candCount;
  gatherGroup(CX, CY, 0, count);
  candCount = 0;
  filterGroup(CX, CY, 0, count); // writes at w <= i: in place
}

// cos and sin of pi/8: the second pass's octagon directions bisect the first's.
const COS_PI8: f64 = 0.9238795325112867;
const SIN_PI8: f64 = 0.3826834323650898;

/**
 * One walk: its survivors are filtered once more, in place, against the octagon of their extremes
 * in the walk's frame rotated by pi/8 (directions between the first octagon's): conservative, so
 * the hull is unchanged.
 */
function filterRotated(): void {
  const count = candCount;
  if (count < FILTER_MIN) return;
  const a = fa, b = fb, c = fc;
  fa = COS_PI8 * a + SIN_PI8 * b;
  fd = SIN_PI8 * c;
  fb = COS_PI8 * b - SIN_PI8 * a;
  fc = COS_PI8 * c;
  gatherGroup(CX, CY, 0, count);
  candCount = 0;
  filterGroup(CX, CY, 0, count);
}

/**
 * Writes the control values of grid point g (step count n = hi) for every walk j into ctl:
 * the centred endpoint X = S_n - n mu and the centred integrated path Y = sum_{i<=n} S_i -
 * mu n(n+1)/2 (both with mean 0 exactly; their covariances follow from the step covariance),
 * laid out [g][walk][Xx, Xy, Yx, Yy].
 */
function writeControls(ctl: usize, g: i32, hi: i32): void {
  const stride = N + 1;
  const fn = <f64>hi;
  const tri = 0.5 * fn * (fn + 1.0);
  for (let j = 0; j < K; j++) {
    const mx = load<f64>(MU + (<usize>(2 * j) << 3));
    const my = load<f64>(MU + (<usize>(2 * j + 1) << 3));
    const at = <usize>(j * stride + hi) << 3;
    const o = SEG + (<usize>(5 * (j * G + g)) << 3);
    const r = ctl + (<usize>(4 * (g * K + j)) << 3);
    store<f64>(r, load<f64>(PX + at) - fn * mx);
    store<f64>(r + 8, load<f64>(PY + at) - fn * my);
    store<f64>(r + 16, load<f64>(o) - tri * mx);
    store<f64>(r + 24, load<f64>(o + 8) - tri * my);
  }
}

/**
 * Simulates one path; writes G * 4 values (perimeter, diameter, area, vertices per grid n) into
 * out and G * 4 * K control values (writeControls) into ctl.
 * Each walk's new points are filtered against the polygon of their own extremes, in the frame
 * of that walk's own cloud (so k needles pointing different ways are each filtered well): a point
 * strictly inside one walk's hull is strictly inside the hull of all walks.
 */
export function runPath(out: usize, ctl: usize): void {
  generateWalks();
  const stride = N + 1;
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
      const first = base + prev + 1;
      gatherGroup(PX, PY, first, base + hi + 1);
      filterGroup(PX, PY, first, base + hi + 1);
    }
    if (K > 1) filterJoint(g, hi);
    else filterRotated();
    const h = chainCandidates();
    const r = out + (<usize>(4 * g) << 3);
    store<f64>(r, perimeter(HX, HY, h));
    store<f64>(r + 8, diameter(HX, HY, h));
    store<f64>(r + 16, area(HX, HY, h));
    store<f64>(r + 24, <f64>h);
    writeControls(ctl, g, hi);
    prev = hi;
  }
}

/** Runs `count` paths of the current block stream into out (count * G * 4 f64) and ctl (count * G * 4K f64). */
export function runPaths(count: i32, out: usize, ctl: usize): void {
  const rec = <usize>(G * 4) << 3;
  const crec = <usize>(G * 4 * K) << 3;
  for (let p = 0; p < count; p++) runPath(out + <usize>p * rec, ctl + <usize>p * crec);
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
  gatherGroup(xs, ys, 0, count);
  if (useFilter) filterGroup(xs, ys, 0, count);
  else append(xs, ys, 0, count);
  return chainCandidates();
}

/** Test helper: the measures of the current hull into out[0..4). */
export function measureHull(out: usize): void {
  store<f64>(out, perimeter(HX, HY, hullCount));
  store<f64>(out + 8, diameter(HX, HY, hullCount));
  store<f64>(out + 16, area(HX, HY, hullCount));
  store<f64>(out + 24, <f64>hullCount);
}

// ---- Bench entry points (per-stage timing; not used by the kernel API). ----
const BENCH_FUNCTIONAL_REPS: i32 = 8;
let statGathered: f64 = 0;
let statKept: f64 = 0;
let statChunkPoints: f64 = 0;

/**
 * Runs `count` paths of the current block stream through the pipeline's stages up to `level`:
 * 0 normals only (PRNG + ziggurat, 2 per step and walk), 1 + walk positions and moments,
 * 2 + extremes and point filter, 3 + sort and monotone chain, 4 + perimeter, 5 + diameter,
 * 6 + area. Levels 4-6 evaluate each functional BENCH_FUNCTIONAL_REPS times per hull (the bench divides
 * their differences by it). Differences between levels give each stage's cost.
 * Returns a checksum; benchSurvival() gives the filter's survival fraction over these calls.
 */
export function benchPaths(count: i32, level: i32): f64 {
  let check = 0.0;
  for (let p = 0; p < count; p++) {
    if (level == 0) {
      for (let j = 0; j < K; j++) {
        nextSubstream();
        fillNormals(NZ, N << 1);
        check += load<f64>(NZ);
      }
      continue;
    }
    generateWalks();
    if (level == 1) {
      check += load<f64>(PX + (<usize>N << 3));
      continue;
    }
    const stride = N + 1;
    let prev = 0;
    for (let g = 0; g < G; g++) {
      const hi = gridAt(g);
      candCount = 0;
      if (g == 0) append(PX, PY, 0, 1);
      else append(HX, HY, 0, hullCount);
      for (let j = 0; j < K; j++) {
        const o = SEG + (<usize>(5 * (j * G + g)) << 3);
        setFrame(<f64>(1 + hi), load<f64>(o), load<f64>(o + 8), load<f64>(o + 16), load<f64>(o + 24), load<f64>(o + 32));
        const base = j * stride;
        gatherGroup(PX, PY, base + prev + 1, base + hi + 1);
        filterGroup(PX, PY, base + prev + 1, base + hi + 1);
        statGathered += <f64>(hi - prev);
      }
      if (K > 1) filterJoint(g, hi);
      else filterRotated();
      statKept += <f64>candCount;
      if (level == 2) {
        check += <f64>candCount;
        hullCount = 0;
      } else {
        const h = chainCandidates();
        check += <f64>h;
        // Each functional runs BENCH_FUNCTIONAL_REPS times so that its cost stands out of the noise.
        for (let r = 0; r < BENCH_FUNCTIONAL_REPS; r++) {
          if (level >= 4) check += perimeter(HX, HY, h);
          if (level >= 5) check += diameter(HX, HY, h);
          if (level >= 6) check += area(HX, HY, h);
        }
      }
      prev = hi;
    }
  }
  return check;
}

/**
 * Survival fraction of the point filters since the last benchResetStats: candidates left for the
 * sort and chain (after the per-walk pass and the joint (k > 1) or rotated (k = 1) pass) per new point.
 */
export function benchSurvival(): f64 {
  return statGathered > 0 ? statKept / statGathered : 0.0;
}

export function benchResetStats(): void {
  statGathered = 0;
  statKept = 0;
  statChunkPoints = 0;
}

/**
 * Points dropped in whole chunks (filterGroup's box test, any pass) per new point, over the
 * benchPaths calls since the last benchResetStats.
 */
export function benchChunkDropped(): f64 {
  return statGathered > 0 ? statChunkPoints / statGathered : 0.0;
}
