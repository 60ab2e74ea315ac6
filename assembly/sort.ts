// Ascending sort of f64 values in WebAssembly (build/sort.wasm), for src/stats/sort.ts: an LSD radix
// sort on 16-bit digits of the order-preserving 64-bit key (negative numbers: every bit flipped;
// others: the sign bit set), at most four passes, O(n). The order is the one of Float64Array.prototype.sort
// (-0 before +0; the caller rejects NaN). This module owns one scratch region that the caller fills.

export { reserve } from "./scratch";

const SIGN: u64 = 0x8000000000000000;

/** Bytes of scratch sortF64 needs for n values: the values, as many again, four histograms. */
export function scratchBytes(n: i32): i32 {
  return n * 16 + 4 * 65536 * 4;
}

/** Sorts the n f64 values at p (p is reserve's region; it holds scratchBytes(n) bytes); n >= 1. */
export function sortF64(p: usize, n: i32): void {
  const a = p;
  const b = p + (<usize>n << 3);
  const counts = b + (<usize>n << 3);
  memory.fill(counts, 0, 4 * 65536 * 4);
  for (let i: i32 = 0; i < n; i++) {
    const at = a + (<usize>i << 3);
    let k = load<u64>(at);
    k = (k & SIGN) != 0 ? ~k : k | SIGN;
    store<u64>(at, k);
    for (let d: i32 = 0; d < 4; d++) {
      const c = counts + ((<usize>d << 18) + (<usize>((k >> (<u64>d << 4)) & 0xffff) << 2));
      store<u32>(c, load<u32>(c) + 1);
    }
  }
  let src = a, dst = b;
  for (let d: i32 = 0; d < 4; d++) {
    const hist = counts + (<usize>d << 18);
    // A digit every key shares (e.g. the top bits of values of one sign and scale) moves nothing.
    const first = load<u64>(src);
    if (load<u32>(hist + (<usize>((first >> (<u64>d << 4)) & 0xffff) << 2)) == <u32>n) continue;
    let sum: u32 = 0;
    for (let j: i32 = 0; j < 65536; j++) {
      const c = hist + (<usize>j << 2);
      const v = load<u32>(c);
      store<u32>(c, sum);
      sum += v;
    }
    const shift = <u64>d << 4;
    for (let i: i32 = 0; i < n; i++) {
      const k = load<u64>(src + (<usize>i << 3));
      const c = hist + (<usize>((k >> shift) & 0xffff) << 2);
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
}
