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
  const sorted = engine === "auto" ? radixSorted(x) : null;
  if (!sorted) return x.sort();
  x.set(sorted);
  return x;
}

/** An ascending copy of x (the numbers of Float64Array.from(x), sorted as sortFloat64 sorts them). */
export function sortedFloat64(x: ArrayLike<number>): Float64Array {
  return radixSorted(x)?.slice() ?? Float64Array.from(x).sort();
}

/** x sorted by the radix sort, as a view of the module's scratch (valid until its next use), or null (small x, module not built). */
function radixSorted(x: ArrayLike<number>): Float64Array | null {
  const w = x.length >= RADIX_FROM ? radixSortModule() : null;
  if (!w) return null;
  const n = x.length;
  const base = w.reserve(w.scratchBytes(n));
  const view = new Float64Array(w.memory.buffer, base, n);
  view.set(x);
  w.sortF64(base, n);
  return view;
}
