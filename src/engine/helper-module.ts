// Loads one of the small helper WebAssembly modules (build/lindley.wasm, build/sort.wasm; no imports
// but abort) synchronously: its exports, or null when it is not built or does not instantiate (the
// callers then use their TypeScript fallback).

import { readFileSync } from "node:fs";

export function loadHelperModule<T>(url: URL): T | null {
  try {
    const module = new WebAssembly.Module(readFileSync(url));
    const name = url.pathname.split("/").pop();
    return new WebAssembly.Instance(module, { env: { abort: () => { throw new Error(`${name}: abort`); } } }).exports as unknown as T;
  } catch {
    return null;
  }
}
