// The series of one measure in a SimulationResult: what the verdict, report and plan stages read,
// so that none of them needs to know how the kernel record is laid out (engine/types.ts does).

import { recordLayout } from "../engine/types.js";
import type { Measure } from "../suite/schema.js";
import type { MomentState } from "../stats/types.js";
import type { SimulationResult } from "./types.js";

/** What the accessors read of a result: the grid, and the blocks or the kept sample. */
interface Source {
  suite: { n: readonly number[] };
  blocks: SimulationResult["blocks"];
  /** Only the values are read (in whatever order they are: the kept sample's is path order). */
  sample: Pick<SimulationResult["sample"], "values">;
}

/** Position of a measure's value at grid index g in the result's per-path records. */
export function seriesIndex(sim: Pick<Source, "suite">, measure: Measure, g: number): number {
  return recordLayout(sim.suite.n.length).index(g, measure);
}

/** Per-block moment sums of a measure: [block][gridIndex], blocks in the result's order. */
export function measureBlocks(sim: Pick<Source, "suite" | "blocks">, measure: Measure): MomentState[][] {
  const layout = recordLayout(sim.suite.n.length);
  const idx = sim.suite.n.map((_, g) => layout.index(g, measure));
  return sim.blocks.map((b) => idx.map((j) => b.moments[j]));
}

/** Kept per-path values of a measure: one column per grid index (empty when nothing was kept). */
export function measureSample(sim: Pick<Source, "suite" | "sample">, measure: Measure): Float64Array[] {
  const layout = recordLayout(sim.suite.n.length);
  return sim.suite.n.map((_, g) => sim.sample.values[layout.index(g, measure)] ?? new Float64Array(0));
}

/** Number of moment records each block of the result must hold (one per number of a path's record). */
export function seriesWidth(sim: Pick<Source, "suite">): number {
  return recordLayout(sim.suite.n.length).width;
}
