// Ascending sort of a Float64Array in place, by the radix sort of build/sort.wasm (assembly/sort.ts:
// O(n), several times faster than Float64Array.prototype.sort on 10^5 values) when that module is
// built, else by Float64Array.prototype.sort. Both give the same array: an ascending order of
// numbers is unique, and both put -0 before +0. NaN is the caller's business (sortedCopy rejects it
// first; the radix sort would place it by its bits).
// Cost O(n) (radix) or O(n log n). Example: sortFloat64(Float64Array.of(2, -0, 0, -1)) -> [-1, -0, 0, 2].

import { loadHelperModule } from "../engine/helper-module.js";
import { projectFile } from "../paths.js";

interface SortExports {
  memory: WebAssembly.Memory;
  reserve(bytes: number): number;
  scratchBytes(n: number): number;
  sortF64(p: number, n: number): number;
}

/** Below this size the built-in sort is as fast (and needs no copy). */
const RADIX_FROM = 256;

/** build/sort.wasm (two levels below the project root from src/stats and dist/stats), or null when not built. */
const SORT_URL = projectFile("build/sort.wasm");
let radix: SortExports | null | undefined;
export function radixSortModule(): SortExports | null {
  if (radix === undefined) radix = loadHelperModule<SortExports>(SORT_URL);
  return radix;
}

/** Sorts x ascending in place and returns it (`engine` "builtin" forces Float64Array.prototype.sort). */
export function sortFloat64(x: Float64Array, engine: "auto" | "builtin" = "auto"): Float64Array {
  const radixed = engine === "auto" ? radixSorted(x) : null;
  if (!radixed) return x.sort();
  x.set(radixed.sorted);
  return x;
}

/**
 * An ascending copy of x (the numbers of Float64Array.from(x), sorted as sortFloat64 sorts them),
 * and the index of x's first NaN (-1 when none; the copy then holds NaN where the sort put it).
 */
export function sortedFloat64(x: ArrayLike<number>): { sorted: Float64Array; firstNaN: number } {
  const radixed = radixSorted(x);
  if (radixed) return { sorted: radixed.sorted.slice(), firstNaN: radixed.firstNaN };
  let firstNaN = -1;
  for (let i = 0; i < x.length && firstNaN < 0; i++) if (Number.isNaN(x[i])) firstNaN = i;
  return { sorted: Float64Array.from(x).sort(), firstNaN };
}

/** x sorted by the radix sort, as a view of the module's scratch (valid until its next use), or null (small x, module not built). */
function radixSorted(x: ArrayLike<number>): { sorted: Float64Array; firstNaN: number } | null {
  const w = x.length >= RADIX_FROM ? radixSortModule() : null;
  if (!w) return null;
  const n = x.length;
  const base = w.reserve(w.scratchBytes(n));
  const view = new Float64Array(w.memory.buffer, base, n);
  view.set(x);
  const firstNaN = w.sortF64(base, n);
  return { sorted: view, firstNaN };
}
