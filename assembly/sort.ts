// Ascending sort of f64 values in WebAssembly (build/sort.wasm), for src/stats/sort.ts: an LSD radix
// sort on 11-bit digits of the order-preserving 64-bit key (negative numbers: every bit flipped;
// others: the sign bit set), at most six passes, O(n). 11 bits rather than 16: six histograms of
// 2^11 counters stay in the first-level cache and each pass scatters into 2^11 runs, which on 10^5
// values is ~30% faster than four passes over 2^16 (measured, CPU time). The order is the one of Float64Array.prototype.sort
// (-0 before +0; the caller rejects NaN). This module owns one scratch region that the caller fills.

export { reserve } from "./scratch";

const SIGN: u64 = 0x8000000000000000;
/** Bits of +Infinity: a NaN's bits, sign cleared, are above it. */
const EXPONENT: u64 = 0x7ff0000000000000;
const BITS: u64 = 11;
const RADIX: i32 = 1 << 11;
const MASK: u64 = 0x7ff;
/** ceil(64 / 11) digits. */
const DIGITS: i32 = 6;

/** Bytes of scratch sortF64 needs for n values: the values, as many again, six histograms. */
export function scratchBytes(n: i32): i32 {
  return n * 16 + DIGITS * RADIX * 4;
}

/**
 * Sorts the n f64 values at p (p is reserve's region; it holds scratchBytes(n) bytes); n >= 1.
 * Returns the index of the first NaN in the input order, -1 without NaN (the callers reject NaN,
 * and this saves them a pass).
 */
export function sortF64(p: usize, n: i32): i32 {
  const a = p;
  const b = p + (<usize>n << 3);
  const counts = b + (<usize>n << 3);
  memory.fill(counts, 0, DIGITS * RADIX * 4);
  let nan: i32 = -1;
  let all: u64 = ~(<u64>0);
  let some: u64 = 0;
  for (let i: i32 = 0; i < n; i++) {
    const at = a + (<usize>i << 3);
    let k = load<u64>(at);
    if (nan < 0 && (k & ~SIGN) > EXPONENT) nan = i;
    k = (k & SIGN) != 0 ? ~k : k | SIGN;
    store<u64>(at, k);
    all &= k;
    some |= k;
  }
  // A digit every key shares (e.g. the top bits of values of one sign and scale, the low bits of
  // integers) is neither counted nor moved: counting it would add one increment of one counter
  // per value, a chain of dependent stores.
  const varying = all ^ some;
  let digits: i32 = 0;
  for (let d: i32 = 0; d < DIGITS; d++) if (((varying >> (<u64>d * BITS)) & MASK) != 0) digits |= 1 << d;
  for (let i: i32 = 0; i < n; i++) {
    const k = load<u64>(a + (<usize>i << 3));
    for (let d: i32 = 0; d < DIGITS; d++) {
      if ((digits & (1 << d)) == 0) continue;
      const c = counts + (<usize>(d * RADIX) << 2) + (<usize>((k >> (<u64>d * BITS)) & MASK) << 2);
      store<u32>(c, load<u32>(c) + 1);
    }
  }
  let src = a, dst = b;
  for (let d: i32 = 0; d < DIGITS; d++) {
    if ((digits & (1 << d)) == 0) continue;
    const hist = counts + (<usize>(d * RADIX) << 2);
    const shift = <u64>d * BITS;
    let sum: u32 = 0;
    for (let j: i32 = 0; j < RADIX; j++) {
      const c = hist + (<usize>j << 2);
      const v = load<u32>(c);
      store<u32>(c, sum);
      sum += v;
    }
    for (let i: i32 = 0; i < n; i++) {
      const k = load<u64>(src + (<usize>i << 3));
      const c = hist + (<usize>((k >> shift) & MASK) << 2);
      const at = load<u32>(c);
      store<u32>(c, at + 1);
      store<u64>(dst + (<usize>at << 3), k);
    }
    const t = src;
    src = dst;
    dst = t;
  }
  for (let i: i32 = 0; i < n; i++) {
    const at = src + (<usize>i << 3);
    const k = load<u64>(at);
    store<u64>(a + (<usize>i << 3), (k & SIGN) != 0 ? k ^ SIGN : ~k);
  }
  return nan;
}
