// Extremes: for a group of points, in the current frame (setup.ts), the first point of largest
// and smallest u, v, u + v, u - v (the eight vertices of the filter's octagon) and max |x|, |y|;
// per chunk of CHUNK points, the bounding box (BOX) the filter's whole-chunk test reads.

import { BND, BOX, CHUNK, fa, fb, fc, fd, ldx } from "./setup";

/** Groups from this size on evaluate only the chunks whose bounds may hold an extreme; smaller ones evaluate all. */
const GUIDED_MIN: i32 = 8192;
/** The group BOX describes (filterGroup uses the boxes only for that group). */
export let boxSrc: usize = 0, boxFrom: i32 = -1, boxTo: i32 = -1;

// The octagon's vertices E0..E7 (directions u, u + v, v, -(u - v), -u, -(u + v), -v, u - v) and
// the group's max |x|, |y| (the filter's rounding bound).
export let ex0: f64 = 0, ey0: f64 = 0, ex1: f64 = 0, ey1: f64 = 0, ex2: f64 = 0, ey2: f64 = 0, ex3: f64 = 0, ey3: f64 = 0;
export let ex4: f64 = 0, ey4: f64 = 0, ex5: f64 = 0, ey5: f64 = 0, ex6: f64 = 0, ey6: f64 = 0, ex7: f64 = 0, ey7: f64 = 0;
export let absX: f64 = 0, absY: f64 = 0;

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

/**
 * Extremes of u, v, u + v, u - v over src[cs..ce), merged into the best values (a better value, or
 * the same value in an earlier chunk); with `boxed` (a literal, so inlining drops the other branch)
 * also the chunk's bounding box, stored at box as [min x, min y], [max x, max y]. Two points per
 * step; a lone last point fills both lanes.
 */
@inline function scanChunk(srcX: usize, srcY: usize, cs: i32, ce: i32, boxed: bool, box: usize): void {
  const A = f64x2.splat(fa), D = f64x2.splat(fd), B = f64x2.splat(fb), C = f64x2.splat(fc);
  const NEG = f64x2.splat(-Infinity), POS = f64x2.splat(Infinity);
  let uMx = NEG, uMn = POS, vMx = NEG, vMn = POS, sMx = NEG, sMn = POS, dMx = NEG, dMn = POS;
  let xMn = POS, xMx = NEG, yMn = POS, yMx = NEG;
  for (let i = cs; i < ce; i += 2) {
    let xv: v128, yv: v128;
    if (i + 1 < ce) {
      xv = v128.load(srcX + (<usize>i << 3));
      yv = v128.load(srcY + (<usize>i << 3));
    } else {
      xv = f64x2.splat(ldx(srcX, i));
      yv = f64x2.splat(ldx(srcY, i));
    }
    const U = f64x2.add(f64x2.mul(xv, A), f64x2.mul(yv, D));
    const V = f64x2.add(f64x2.mul(xv, B), f64x2.mul(yv, C));
    const S = f64x2.add(U, V), Dd = f64x2.sub(U, V);
    uMx = f64x2.pmax(uMx, U); uMn = f64x2.pmin(uMn, U);
    vMx = f64x2.pmax(vMx, V); vMn = f64x2.pmin(vMn, V);
    sMx = f64x2.pmax(sMx, S); sMn = f64x2.pmin(sMn, S);
    dMx = f64x2.pmax(dMx, Dd); dMn = f64x2.pmin(dMn, Dd);
    if (boxed) {
      xMn = f64x2.pmin(xMn, xv); xMx = f64x2.pmax(xMx, xv);
      yMn = f64x2.pmin(yMn, yv); yMx = f64x2.pmax(yMx, yv);
    }
  }
  const PMx = f64x2.pmax(v128.shuffle<f64>(uMx, vMx, 0, 2), v128.shuffle<f64>(uMx, vMx, 1, 3));
  const PMn = f64x2.pmin(v128.shuffle<f64>(uMn, vMn, 0, 2), v128.shuffle<f64>(uMn, vMn, 1, 3));
  const QMx = f64x2.pmax(v128.shuffle<f64>(sMx, dMx, 0, 2), v128.shuffle<f64>(sMx, dMx, 1, 3));
  const QMn = f64x2.pmin(v128.shuffle<f64>(sMn, dMn, 0, 2), v128.shuffle<f64>(sMn, dMn, 1, 3));
  const CI = f64x2.splat(<f64>cs);
  let m = v128.or(f64x2.gt(PMx, gPMax), v128.and(f64x2.eq(PMx, gPMax), f64x2.lt(CI, ipMax)));
  gPMax = v128.bitselect(PMx, gPMax, m); ipMax = v128.bitselect(CI, ipMax, m);
  m = v128.or(f64x2.lt(PMn, gPMin), v128.and(f64x2.eq(PMn, gPMin), f64x2.lt(CI, ipMin)));
  gPMin = v128.bitselect(PMn, gPMin, m); ipMin = v128.bitselect(CI, ipMin, m);
  m = v128.or(f64x2.gt(QMx, gQMax), v128.and(f64x2.eq(QMx, gQMax), f64x2.lt(CI, iqMax)));
  gQMax = v128.bitselect(QMx, gQMax, m); iqMax = v128.bitselect(CI, iqMax, m);
  m = v128.or(f64x2.lt(QMn, gQMin), v128.and(f64x2.eq(QMn, gQMin), f64x2.lt(CI, iqMin)));
  gQMin = v128.bitselect(QMn, gQMin, m); iqMin = v128.bitselect(CI, iqMin, m);
  if (boxed) {
    v128.store(box, f64x2.pmin(v128.shuffle<f64>(xMn, yMn, 0, 2), v128.shuffle<f64>(xMn, yMn, 1, 3)));
    v128.store(box + 16, f64x2.pmax(v128.shuffle<f64>(xMx, yMx, 0, 2), v128.shuffle<f64>(xMx, yMx, 1, 3)));
  }
}

/** scanChunk over src[cs..min(cs + CHUNK, to)) without its box (the guided search). */
function evalChunk(srcX: usize, srcY: usize, cs: i32, to: i32): void {
  scanChunk(srcX, srcY, cs, min(cs + CHUNK, to), false, 0);
}

/**
 * Finds, for src[from..to) (to > from), in the current frame, the first point of largest u, u + v,
 * v, -(u - v), -u, -(u + v), -v, u - v into E0..E7, and max |x|, |y| into absX, absY.
 */
export function gatherGroup(srcX: usize, srcY: usize, from: i32, to: i32): void {
  // Chunks of CHUNK points, two points per step; each chunk's bounding box in x, y goes to BOX
  // (filterGroup's chunk test), and the first chunk holding each extreme value of u, v, u + v,
  // u - v is rescanned for its first point with it (firstWith: the same IEEE operations), so the
  // extreme points are those of a point-by-point scan. Small groups evaluate every chunk in
  // the same pass. Groups of GUIDED_MIN points or more first compute only the boxes, and bounds
  // on u, v, u + v, u - v over each chunk (into BND) from the box corners: rounding is
  // monotone, so the computed u = a x + d y of any point of the box lies between its values at
  // the corners, and u + v, u - v between the sums and differences of those bounds. Then only
  // the chunks that may hold an extreme are evaluated (evalChunk): first the chunk of the
  // largest bound in each direction, then, in order, every chunk whose bound reaches the best
  // value found.
  const A = f64x2.splat(fa), D = f64x2.splat(fd), B = f64x2.splat(fb), C = f64x2.splat(fc);
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
    // Small groups: boxes and extremes of every chunk in one pass, chunks in order.
    for (let cs = from; cs < to; cs += CHUNK) {
      scanChunk(srcX, srcY, cs, min(cs + CHUNK, to), true, box);
      gLo = f64x2.pmin(gLo, v128.load(box));
      gHi = f64x2.pmax(gHi, v128.load(box + 16));
      box += 32;
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
  const i0 = firstWith(srcX, srcY, <i32>f64x2.extract_lane(ipMax, 0), to, 0, f64x2.extract_lane(gPMax, 0));
  const i2 = firstWith(srcX, srcY, <i32>f64x2.extract_lane(ipMax, 1), to, 2, f64x2.extract_lane(gPMax, 1));
  const i4 = firstWith(srcX, srcY, <i32>f64x2.extract_lane(ipMin, 0), to, 0, f64x2.extract_lane(gPMin, 0));
  const i6 = firstWith(srcX, srcY, <i32>f64x2.extract_lane(ipMin, 1), to, 2, f64x2.extract_lane(gPMin, 1));
  const i1 = firstWith(srcX, srcY, <i32>f64x2.extract_lane(iqMax, 0), to, 1, f64x2.extract_lane(gQMax, 0));
  const i7 = firstWith(srcX, srcY, <i32>f64x2.extract_lane(iqMax, 1), to, 3, f64x2.extract_lane(gQMax, 1));
  const i5 = firstWith(srcX, srcY, <i32>f64x2.extract_lane(iqMin, 0), to, 1, f64x2.extract_lane(gQMin, 0));
  const i3 = firstWith(srcX, srcY, <i32>f64x2.extract_lane(iqMin, 1), to, 3, f64x2.extract_lane(gQMin, 1));
  absX = max(Math.abs(f64x2.extract_lane(gLo, 0)), Math.abs(f64x2.extract_lane(gHi, 0)));
  absY = max(Math.abs(f64x2.extract_lane(gLo, 1)), Math.abs(f64x2.extract_lane(gHi, 1)));
  ex0 = ldx(srcX, i0); ey0 = ldx(srcY, i0);
  ex1 = ldx(srcX, i1); ey1 = ldx(srcY, i1);
  ex2 = ldx(srcX, i2); ey2 = ldx(srcY, i2);
  ex3 = ldx(srcX, i3); ey3 = ldx(srcY, i3);
  ex4 = ldx(srcX, i4); ey4 = ldx(srcY, i4);
  ex5 = ldx(srcX, i5); ey5 = ldx(srcY, i5);
  ex6 = ldx(srcX, i6); ey6 = ldx(srcY, i6);
  ex7 = ldx(srcX, i7); ey7 = ldx(srcY, i7);
}

