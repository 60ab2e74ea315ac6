// Ascending sort of a Float64Array in place, by the radix sort of build/sort.wasm (assembly/sort.ts:
// O(n), several times faster than Float64Array.prototype.sort on 10^5 values) when that module is
// built, else by Float64Array.prototype.sort. Both give the same array: an ascending order of
// numbers is unique, and both put -0 before +0. NaN is the caller's business (sortedCopy rejects it
// first; the radix sort would place it by its bits).
// Cost O(n) (radix) or O(n log n). Example: sortFloat64(Float64Array.of(2, -0, 0, -1)) -> [-1, -0, 0, 2].

import { loadHelperModule } from "../engine/helper-module.js";

interface SortExports {
  memory: WebAssembly.Memory;
  reserve(bytes: number): number;
  scratchBytes(n: number): number;
  sortF64(p: number, n: number): void;
}

/** Below this size the built-in sort is as fast (and needs no copy). */
const RADIX_FROM = 256;

/** build/sort.wasm (two levels below the project root from src/stats and dist/stats), or null when not built. */
const SORT_URL = new URL("../../build/sort.wasm", import.meta.url);
let radix: SortExports | null | undefined;
export function radixSortModule(): SortExports | null {
  if (radix === undefined) radix = loadHelperModule<SortExports>(SORT_URL);
  return radix;
}

/** Sorts x ascending in place and returns it (`engine` "builtin" forces Float64Array.prototype.sort). */
export function sortFloat64(x: Float64Array, engine: "auto" | "builtin" = "auto"): Float64Array {
  const w = engine === "auto" && x.length >= RADIX_FROM ? radixSortModule() : null;
  if (!w) return x.sort();
  const n = x.length;
  const base = w.reserve(w.scratchBytes(n));
  new Float64Array(w.memory.buffer, base, n).set(x);
  w.sortF64(base, n);
  x.set(new Float64Array(w.memory.buffer, base, n));
  return x;
}
