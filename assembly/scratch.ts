// The one scratch region of the small helper modules (build/lindley.wasm, build/sort.wasm): they own
// no state; the caller reserves the region, fills it and reads the results back.

/** Start of a scratch region of `bytes` bytes (the whole region after the data segment, grown as needed). */
export function reserve(bytes: i32): usize {
  const base = (__heap_base + 15) & ~(<usize>15);
  const need = base + <usize>bytes;
  const have = (<usize>memory.size()) << 16;
  if (need > have) memory.grow(<i32>((need - have + 0xffff) >>> 16));
  return base;
}
