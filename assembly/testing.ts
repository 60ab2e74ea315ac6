// Test entry points (exported by the release build for the engine tests; not on the kernel's path).

import { nextSubstream } from "./rng";
import { drawStepsInto } from "./laws";
import { append, clearCandidates, filterGroup } from "./filters";
import { gatherGroup } from "./extremes";
import { chainCandidates, clearHull, hullCount } from "./paths";
import { writeMeasures } from "./measures";
import { HX, HY, lawCode, lawParams, setFrame } from "./setup";

/** `count` steps of walk j from the first substream of (seed, block). */
export function drawSteps(j: i32, count: i32, sx: usize, sy: usize, scratch: usize): void {
  nextSubstream();
  drawStepsInto(lawCode(j), lawParams(j), count, sx, sy, scratch);
}

/**
 * Hull of arbitrary points through the kernel's own path (frame from the points' moments,
 * extremes, filter, sort, chain). Needs buffers of capacity >= count (use a setup with
 * k * (n_max + 1) >= count). Returns the vertex count; vertices via hullXPtr/hullYPtr.
 */
export function hullOfPoints(xs: usize, ys: usize, count: i32, useFilter: bool): i32 {
  let sx = 0.0, sy = 0.0, sxx = 0.0, sxy = 0.0, syy = 0.0;
  for (let i = 0; i < count; i++) {
    const x = load<f64>(xs + (<usize>i << 3)), y = load<f64>(ys + (<usize>i << 3));
    sx += x; sy += y; sxx += x * x; sxy += x * y; syy += y * y;
  }
  setFrame(<f64>count, sx, sy, sxx, sxy, syy);
  clearCandidates();
  clearHull();
  if (count == 0) return 0;
  gatherGroup(xs, ys, 0, count);
  if (useFilter) filterGroup(xs, ys, 0, count);
  else append(xs, ys, 0, count);
  return chainCandidates();
}

/** The measures of the current hull into out (a record of one grid point). */
export function measureHull(out: usize): void {
  writeMeasures(out, HX, HY, hullCount);
}
