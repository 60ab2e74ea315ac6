// What one simulated suite produces, before verdicts: the data the verdict and report stages read.

import type { LoadedSuite, Measure } from "../suite/schema.js";
import type { CoMomentState, MomentState } from "../stats/types.js";

/** The statistics of one block of paths. */
export interface BlockStats {
  block: number;
  /** First global path index of the block and its number of paths. */
  firstPath: number;
  paths: number;
  /** Moment sums, one per number of the kernel record (see recordLayout; read them with measureBlocks). */
  moments: MomentState[];
  /** Co-moments of the kernel record, dim = recordLayout(grid.length).width. */
  comoments: CoMomentState;
  /**
   * Per grid point g: co-moments of [the 4 kernel measures, then the control values of every walk
   * (Xx, Xy, Yx, Yy per walk, engine/types.ts CONTROLS_PER_WALK)], dim = 4 + 4k. The sums the
   * control-variate regression of each measure on the controls needs (src/stats/control-variates.ts).
   */
  controlComoments: CoMomentState[];
}

/** One row of the JSON report's `results` array (contract: keep these names). */
export interface ResultRecord {
  measure: Measure;
  n: number;
  paths: number;
  mean: number;
  meanSE: number;
  variance: number;
  varianceSE: number;
  skewness: number;
  excessKurtosis: number;
  skewnessSE: number;
  excessKurtosisSE: number;
  min: number;
  max: number;
}

/** A deterministic sample of per-path values: the same paths whatever the worker count or parts. */
export interface KeptSample {
  /** Global path indices, ascending. */
  pathIndex: number[];
  /** One column per number of the kernel record (see recordLayout; read them with measureSample). */
  values: Float64Array[];
}

export interface SimulationResult {
  suite: LoadedSuite;
  /** Blocks in block order (all of them for a full run; a part holds a subset). */
  blocks: BlockStats[];
  /** Total number of blocks of the run (a part holds only some). */
  blockCount: number;
  results: ResultRecord[];
  sample: KeptSample;
  /** min/max per number of the kernel record over all paths. */
  min: number[];
  max: number[];
  wallSeconds: number;
  workers: number;
}
