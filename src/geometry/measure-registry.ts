// The one registry of hull measures. Everything that lists measures derives from it: the suite's
// MEASURES and the JSON Schema enums (a test compares schema/*.json with it), the kernel record's
// slots, the twin's and the reports' columns. To add a measure: add an entry here, its function to
// convex-hull.ts, the same function to assembly/ and bench/native/walkhull.c (written at `slot`),
// and its brute-force oracle to test/engine/helpers.ts (a Record<Measure, ...> there fails to
// type-check until it exists).

import { areaOf, convexHull, diameterOf, perimeterOf, widthOf } from "./convex-hull.js";

/** A functional of a hull given by h strict vertices, counter-clockwise (see convex-hull.ts). */
export type HullFunctional = (hx: ArrayLike<number>, hy: ArrayLike<number>, h: number) => number;

export interface MeasureSpec {
  name: string;
  /** Position of the measure in each grid point of the kernel record (assembly/ writes it there). */
  slot: number;
  /**
   * Powers of n for E X_n / n^q (mean) and Var X_n / n^p (variance) when no theorem of src/theory
   * sets them (the diagnosis overrides them whenever one applies).
   */
  scaling: { mean: number; variance: number };
  /** The TS twin's implementation: same algorithm and arithmetic as the kernel's. */
  twin: HullFunctional;
  /** What the independent oracle of the tests computes (exact, brute force). */
  oracle: string;
}

export const MEASURE_REGISTRY = [
  { name: "perimeter", slot: 0, scaling: { mean: 1, variance: 1 }, twin: perimeterOf,
    oracle: "sum of the edge lengths of the brute-force hull (vertices by definition, ordered by angle)" },
  { name: "diameter", slot: 1, scaling: { mean: 1, variance: 1 }, twin: diameterOf,
    oracle: "largest distance over all pairs of points" },
  { name: "area", slot: 2, scaling: { mean: 1, variance: 1 }, twin: areaOf,
    oracle: "trapezoid sum over the edges of the brute-force hull" },
  { name: "vertices", slot: 3, scaling: { mean: 1, variance: 1 }, twin: (_hx, _hy, h) => h,
    oracle: "number of distinct points outside the hull of the others (exact orientation)" },
  { name: "width", slot: 4, scaling: { mean: 0.5, variance: 1 }, twin: widthOf,
    oracle: "over every pair of points whose line leaves all points on one side, the largest distance to it; the smallest" },
] as const satisfies readonly MeasureSpec[];

export type Measure = (typeof MEASURE_REGISTRY)[number]["name"];

/** Measure names in slot order. */
export const MEASURES: readonly Measure[] = MEASURE_REGISTRY.map((m) => m.name);

/** Number of measure slots per grid point of a kernel record. */
export const MEASURE_COUNT = MEASURE_REGISTRY.length;

const BY_NAME = new Map<string, MeasureSpec>(MEASURE_REGISTRY.map((m) => [m.name, m]));

/** The registry entry of a measure; throws `measure: unknown ...` for a name not in the registry. */
export function measureSpec(name: string): MeasureSpec {
  const spec = BY_NAME.get(name);
  if (!spec) throw new Error(`measure: unknown measure ${JSON.stringify(name)} (known: ${MEASURES.join(", ")})`);
  return spec;
}

/** Every measure of a hull, in slot order, written to out[offset + slot]. */
export function hullFunctionals(hx: ArrayLike<number>, hy: ArrayLike<number>, h: number, out: Float64Array, offset: number): void {
  for (const m of MEASURE_REGISTRY) out[offset + m.slot] = m.twin(hx, hy, h);
}

export type HullMeasures = Record<Measure, number>;

/** Every measure of the hull of a point set, by name. */
export function hullMeasures(xs: ArrayLike<number>, ys: ArrayLike<number>): HullMeasures {
  const { x, y } = convexHull(xs, ys);
  return Object.fromEntries(MEASURE_REGISTRY.map((m) => [m.name, m.twin(x, y, x.length)])) as HullMeasures;
}
