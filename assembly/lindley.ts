// The Lindley recursion of src/theory/running-max.ts in WebAssembly (build/lindley.wasm): the
// banded matrix-vector products u_i = K u_{i-1} that take ~90% of the k-walk Cauchy quadrature's
// time, with f64x2 SIMD and four partial sums. The set-up (nodes, kernel band K) stays in
// TypeScript; this module owns no state but one scratch region that the caller fills.
// Same window logic as the TypeScript loop it replaces (kept there as the fallback and the oracle).

export { reserve } from "./scratch";

// Index of the first node with z >= y (nodes increase).
@inline function firstAtLeast(z: usize, N: i32, y: f64): i32 {
  let lo: i32 = 0, hi: i32 = N;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (load<f64>(z + (<usize>mid << 3)) < y) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

// Row a of u_i = K u_{i-1}: the band from max(bLo[a], lo), SIMD with four partial sums.
@inline function bandRow(
  a: i32, N: i32, lo: i32, K: usize, off: usize, bLo: usize, bHi: usize, beyond: usize, cur: usize, nxt: usize,
): void {
  const bl = load<i32>(bLo + (<usize>a << 2));
  const b0 = max(bl, lo), b1 = load<i32>(bHi + (<usize>a << 2));
  let p = load<i32>(off + (<usize>a << 2)) + (b0 - bl);
  let b = b0;
  let acc0 = f64x2.splat(0), acc1 = f64x2.splat(0);
  for (; b + 3 < b1; b += 4, p += 4) {
    const kp = K + (<usize>p << 3), cb = cur + (<usize>b << 3);
    acc0 = f64x2.add(acc0, f64x2.mul(v128.load(kp), v128.load(cb)));
    acc1 = f64x2.add(acc1, f64x2.mul(v128.load(kp, 16), v128.load(cb, 16)));
  }
  let s: f64 = 0;
  for (; b < b1; b++, p++) s += load<f64>(K + (<usize>p << 3)) * load<f64>(cur + (<usize>b << 3));
  const acc = f64x2.add(acc0, acc1);
  s += f64x2.extract_lane(acc, 0) + f64x2.extract_lane(acc, 1);
  if (b1 == N) s += load<f64>(beyond + (<usize>a << 3));
  store<f64>(nxt + (<usize>a << 3), s > 1 ? 1 : s);
}

/**
 * Runs u_i for i = 1..ns[count-1] - 1 from cur (u_0 = 1), saving u_{ns[j]-1} into
 * saved + j * N * 8 and its (lo, hi) window into savedLoHi[2j], [2j+1]. Arrays: z, beyond, cur, nxt:
 * f64[N]; K: f64[off[N]]; off: i32[N+1]; bLo, bHi: i32[N]; ns: i32[count] (ascending).
 * Rows tStart <= a < tEnd share one band row, kern: f64[kLen] from b = a - shift (a Toeplitz band):
 * there eight rows are summed at once (four independent f64x2 sums: the loop is bound by the
 * latency of the additions, not by the loads), from the kernel row in cache instead of K.
 */
export function lindleySteps(
  N: i32, r: f64, tail: f64,
  z: usize, K: usize, off: usize, bLo: usize, bHi: usize, beyond: usize,
  cur: usize, nxt: usize, ns: usize, count: i32, saved: usize, savedLoHi: usize,
  kern: usize, kLen: i32, tStart: i32, tEnd: i32, shift: i32,
): void {
  const one = f64x2.splat(1);
  const n = load<i32>(ns + (<usize>(count - 1) << 2));
  let lo: i32 = 0, hi: i32 = 0, want: i32 = 0;
  for (let i: i32 = 1; i <= n && want < count; i++) {
    if (load<i32>(ns + (<usize>want << 2)) == i) {
      memory.copy(saved + <usize>want * (<usize>N << 3), cur, <usize>N << 3);
      store<i32>(savedLoHi + (<usize>(2 * want) << 2), lo);
      store<i32>(savedLoHi + (<usize>(2 * want + 1) << 2), hi);
      want++;
    }
    const aLo = firstAtLeast(z, N, load<f64>(z + (<usize>lo << 3)) + r - tail);
    const hz = load<f64>(z + (<usize>min(hi, N - 1) << 3));
    const aHi = min(N, firstAtLeast(z, N, hz + r + tail) + 1);
    // Toeplitz rows whose band lies above lo: [s0, s1), in blocks of eight.
    const s0 = max(aLo, max(tStart, lo + shift)), s1 = min(aHi, tEnd);
    let a = aLo;
    for (; a < aHi; a++) {
      if (a >= s0 && a + 8 <= s1) {
        for (; a + 8 <= s1; a += 8) {
          let c = cur + (<usize>(a - shift) << 3);
          let acc0 = f64x2.splat(0), acc1 = f64x2.splat(0), acc2 = f64x2.splat(0), acc3 = f64x2.splat(0);
          for (let t: i32 = 0; t < kLen; t++, c += 8) {
            const k = v128.load64_splat(kern + (<usize>t << 3));
            acc0 = f64x2.add(acc0, f64x2.mul(k, v128.load(c)));
            acc1 = f64x2.add(acc1, f64x2.mul(k, v128.load(c, 16)));
            acc2 = f64x2.add(acc2, f64x2.mul(k, v128.load(c, 32)));
            acc3 = f64x2.add(acc3, f64x2.mul(k, v128.load(c, 48)));
          }
          const o = nxt + (<usize>a << 3);
          v128.store(o, f64x2.pmin(acc0, one));
          v128.store(o, f64x2.pmin(acc1, one), 16);
          v128.store(o, f64x2.pmin(acc2, one), 32);
          v128.store(o, f64x2.pmin(acc3, one), 48);
        }
        if (a >= aHi) break;
      }
      bandRow(a, N, lo, K, off, bLo, bHi, beyond, cur, nxt);
    }
    // Nodes above the updated range stay at 1 in both buffers; below it, below `lo`, are ignored.
    let newHi = aHi;
    while (newHi > aLo && load<f64>(nxt + (<usize>(newHi - 1) << 3)) >= 1 - 1e-13) newHi--;
    let newLo = max(lo, aLo);
    while (newLo < newHi && load<f64>(nxt + (<usize>newLo << 3)) < 1e-30) newLo++;
    for (let a = aHi; a < N && a < aHi + 2; a++) store<f64>(nxt + (<usize>a << 3), 1);
    let fixed = r < 0 && newLo == lo && max(newHi, lo) == hi;
    for (let a = lo; fixed && a < N; a++) fixed = load<f64>(cur + (<usize>a << 3)) == load<f64>(nxt + (<usize>a << 3));
    const t = cur;
    cur = nxt;
    nxt = t;
    lo = newLo;
    hi = max(newHi, lo);
    // A fixed point (a negative drift's stationary law, reached to the last bit): every later u is cur.
    if (fixed) {
      for (; want < count; want++) {
        memory.copy(saved + <usize>want * (<usize>N << 3), cur, <usize>N << 3);
        store<i32>(savedLoHi + (<usize>(2 * want) << 2), lo);
        store<i32>(savedLoHi + (<usize>(2 * want + 1) << 2), hi);
      }
    }
  }
}
