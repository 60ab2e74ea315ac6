// The seam between the driver and the kernels (WASM or the plain-TS twin).
// A kernel simulates one block of paths from its own stream and returns raw per-path values;
// everything statistical happens above this seam.

import { MEASURE_COUNT, measureSpec, type Measure } from "../geometry/measure-registry.js";

/**
 * Layout of a kernel's per-path record: grid point after grid point, each holding `perPoint`
 * numbers, the measures first at their registry slots (further per-point values may follow them).
 * The only place that knows how a record is laid out; everything else asks it.
 */
export interface RecordLayout {
  gridLength: number;
  /** Numbers per grid point. */
  perPoint: number;
  /** Numbers per path: gridLength * perPoint. */
  width: number;
  /** Position of a measure's value at grid index g within a path's record. */
  index(g: number, measure: Measure): number;
}

export function recordLayout(gridLength: number): RecordLayout {
  const perPoint = MEASURE_COUNT;
  return {
    gridLength,
    perPoint,
    width: gridLength * perPoint,
    index: (g, measure) => g * perPoint + measureSpec(measure).slot,
  };
}

/** Law codes shared by assembly/ and the TS twin. */
export const LAW_CODE = { gaussian: 0, discrete: 1, circle: 2, student: 3, empirical: 4 } as const;

/**
 * One walk's step law, packed for the kernels (built by src/engine/compile.ts).
 * params layout by code:
 *  gaussian  0: [mx, my, l11, l21, l22]            step = m + L z, L lower-triangular, C = L L'
 *  discrete  1: [m, x_0, y_0, ..., x_{m-1}, y_{m-1}, prob_0..prob_{m-1}, alias_0..alias_{m-1}]  (Walker/Vose alias)
 *  circle    2: [mx, my, r]                         step = m + r (cos U, sin U)
 *  student   3: [mx, my, l11, l21, l22, dof]        step = m + L z / sqrt(W / dof), W ~ chi2(dof)
 *  empirical 4: [m, x_0, y_0, ..., x_{m-1}, y_{m-1}] step = a uniformly chosen row
 */
export interface CompiledWalk {
  code: number;
  params: Float64Array;
  /** Exact step mean (NaN when the law has none): centres the control values. */
  mean: [number, number];
}

/** Control values per walk and grid point: centred endpoint (x, y), centred integrated path (x, y). */
export const CONTROLS_PER_WALK = 4;

export interface KernelSetup {
  walks: CompiledWalk[];
  /** Strictly increasing step counts; values are computed at every n of the grid along one path. */
  grid: number[];
  /** Suite seed (non-negative integer < 2^53). */
  seed: number;
}

export interface Kernel {
  /**
   * Simulate `pathCount` paths of block `block`, the block's stream derived from (seed, block) by a
   * seed mixer. Returns a fresh Float64Array of pathCount records laid out as recordLayout(grid.length) says.
   * When `controls` is given (length pathCount * grid.length * walks * CONTROLS_PER_WALK) it is
   * filled with the control values, laid out [path][gridIndex][walk][Xx, Xy, Yx, Yy]:
   * X = S_n - n mu (centred endpoint), Y = sum_{i<=n} S_i - mu n(n+1)/2 (centred integrated path).
   */
  runBlock(block: number, pathCount: number, controls?: Float64Array): Float64Array;
  /**
   * One path of the block's stream (its first path), for plots: the points of each walk up to
   * the largest n (walk-major: walk j's points are points[j][0..nMax]) and the hull vertices
   * (counter-clockwise, no repeated or collinear vertices).
   */
  samplePath(block: number): { points: Float64Array[]; hull: Float64Array };
}
