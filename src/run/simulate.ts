// One suite end to end on this thread: blocks -> kernel -> block statistics -> merged results.
// The worker pool (pool.ts) runs the same block function on other threads; both merge in block order.

import { compileWalks } from "../engine/compile.js";
import { createTwinKernel } from "../engine/twin.js";
import { createWasmKernel, loadWasmModuleSync } from "../engine/wasm.js";
import type { Kernel, KernelSetup } from "../engine/types.js";
import { CONTROLS_PER_WALK, recordLayout } from "../engine/types.js";
import { summarize } from "../stats/moments.js";
import { blockCount, blockRange } from "../suite/load.js";
import type { LoadedSuite, Suite } from "../suite/schema.js";
import { concatKept, keptToSample, MAX_KEPT, mergeBlockMoments, mergeKept, summarizeBlock, type BlockOutput, type KeptCandidates } from "./blocks.js";
import type { BlockStats, KeptSample, ResultRecord, SimulationResult } from "./types.js";
import type { RunState } from "./state.js";

export type KernelKind = "wasm" | "twin";

export function kernelSetup(suite: Suite): KernelSetup {
  return { walks: compileWalks(suite.walks), grid: suite.n, seed: suite.seed };
}

export function createKernel(suite: Suite, kind: KernelKind = "wasm", module?: WebAssembly.Module): Kernel {
  const setup = kernelSetup(suite);
  return kind === "twin" ? createTwinKernel(setup) : createWasmKernel(module ?? loadWasmModuleSync(), setup);
}

/** Simulate block b of the suite with the given kernel. */
export function runOneBlock(kernel: Kernel, suite: Suite, b: number): BlockOutput {
  const { first, count } = blockRange(suite.paths, blockCount(suite), b);
  const walks = suite.walks.length;
  const controls = new Float64Array(count * suite.n.length * walks * CONTROLS_PER_WALK);
  const values = kernel.runBlock(b, count, controls);
  return summarizeBlock(values, controls, walks, suite.n.length, suite.seed, b, first, count, suite.paths);
}

/** Accumulates block outputs (in any arrival order) into a SimulationResult. */
export class BlockCollector {
  readonly blocks = new Map<number, BlockStats>();
  /** Candidate chunks of the kept sample, compacted to the MAX_KEPT smallest hashes when large. */
  private kept: KeptCandidates[] = [];
  private keptCount = 0;
  private readonly dim: number;
  min: number[];
  max: number[];

  constructor(readonly suite: LoadedSuite) {
    this.dim = recordLayout(suite.n.length).width;
    this.min = new Array<number>(this.dim).fill(Infinity);
    this.max = new Array<number>(this.dim).fill(-Infinity);
  }

  add(out: BlockOutput): void {
    if (this.blocks.has(out.stats.block)) throw new Error(`block ${out.stats.block} delivered twice`);
    this.blocks.set(out.stats.block, out.stats);
    this.kept.push(out.kept);
    this.keptCount += out.kept.hash.length;
    if (this.keptCount > 4 * MAX_KEPT) this.compactKept();
    for (let j = 0; j < this.dim; j++) {
      this.min[j] = Math.min(this.min[j], out.min[j]);
      this.max[j] = Math.max(this.max[j], out.max[j]);
    }
  }

  private compactKept(): KeptCandidates {
    const merged = mergeKept(this.kept, this.dim, MAX_KEPT);
    this.kept = [merged];
    this.keptCount = merged.hash.length;
    return merged;
  }

  /** Start from a checkpoint's state (blocks done, kept candidates, extremes). */
  restore(state: RunState): void {
    for (const b of state.blocks) {
      if (this.blocks.has(b.block)) throw new Error(`block ${b.block} restored twice`);
      this.blocks.set(b.block, b);
    }
    this.kept.push(state.kept);
    this.keptCount += state.kept.hash.length;
    this.min = [...state.min];
    this.max = [...state.max];
  }

  /**
   * The state to write into a checkpoint or a part file. With at most MAX_KEPT candidates all are
   * kept, so they are written as they arrived (concatenated): the hash-order merge (0.3-0.5 s of this
   * thread at 10^5 paths, while the workers wait for their next block) is needed only to drop some.
   * Every reader orders them itself (path order, or hash order when it has to drop).
   */
  snapshot(): RunState {
    let kept: KeptCandidates;
    if (this.keptCount <= MAX_KEPT) this.kept = [(kept = concatKept(this.kept))];
    else kept = this.compactKept();
    return { blocks: [...this.blocks.values()].sort((a, b) => a.block - b.block), kept, min: this.min, max: this.max };
  }

  /**
   * Kept values of the record numbers `columns`, one array each, in storage order (no path order):
   * the same values `result()` puts in path order, for readers that sort them anyway and need not
   * wait for the ordering (the limit-law evidence).
   */
  keptColumns(columns: number[]): Float64Array[] {
    const sets = this.keptCount <= MAX_KEPT ? this.kept : [this.compactKept()];
    const count = sets.reduce((s, c) => s + c.pathIndex.length, 0);
    const dim = this.dim;
    const cols = columns.map(() => new Float64Array(count));
    const width = columns.length;
    // Row by row (the values are stored row-major): one pass over the memory.
    let i = 0;
    for (const c of sets) {
      const v = c.values;
      for (let r = 0, from = 0; r < c.pathIndex.length; r++, from += dim, i++) {
        for (let k = 0; k < width; k++) cols[k][i] = v[from + columns[k]];
      }
    }
    return cols;
  }

  /**
   * The run's result. Its kept sample is put in path order when first read (0.1 s and ~25 MB at
   * 10^5 paths of a 6-point grid): a run without --samples, a report folder or a check that reads
   * it in path order never pays for it (the limit-law evidence reads keptColumns).
   */
  result(wallSeconds: number, workers: number): SimulationResult {
    const blocks = [...this.blocks.values()].sort((a, b) => a.block - b.block);
    // At most MAX_KEPT candidates: all of them are kept, and the hash order is not needed.
    const sets = this.keptCount <= MAX_KEPT ? [...this.kept] : [this.compactKept()];
    const dim = this.dim;
    let sample: KeptSample | undefined;
    return {
      suite: this.suite,
      blocks,
      blockCount: blockCount(this.suite),
      results: resultRecords(this.suite, blocks, this.min, this.max),
      get sample() {
        return (sample ??= keptToSample(sets, dim));
      },
      min: this.min,
      max: this.max,
      wallSeconds,
      workers,
    };
  }
}

/** The `results` rows: one per measure of the suite and n of its grid, from block-ordered merges. */
export function resultRecords(suite: Suite, blocks: BlockStats[], min: number[], max: number[]): ResultRecord[] {
  if (blocks.length === 0) return [];
  const moments = mergeBlockMoments(blocks);
  const layout = recordLayout(suite.n.length);
  const rows: ResultRecord[] = [];
  for (const measure of suite.measure) {
    suite.n.forEach((n, g) => {
      const j = layout.index(g, measure);
      const s = summarize(moments[j]);
      rows.push({
        measure,
        n,
        paths: s.count,
        mean: s.mean,
        meanSE: s.meanSE,
        variance: s.variance,
        varianceSE: s.varianceSE,
        skewness: s.skewness,
        excessKurtosis: s.excessKurtosis,
        skewnessSE: s.skewnessSE,
        excessKurtosisSE: s.excessKurtosisSE,
        min: min[j],
        max: max[j],
      });
    });
  }
  return rows;
}

export interface SimulateOptions {
  kernel?: KernelKind;
  /** Only these blocks (a part of the run); default all. */
  blocks?: number[];
  onBlock?: (done: number, total: number, paths: number) => void;
}

/** Simulate a suite on this thread. */
export function simulateInProcess(suite: LoadedSuite, opts: SimulateOptions = {}): SimulationResult {
  const t0 = performance.now();
  const kernel = createKernel(suite, opts.kernel ?? "wasm");
  const all = Array.from({ length: blockCount(suite) }, (_, b) => b);
  const todo = opts.blocks ?? all;
  const collector = new BlockCollector(suite);
  let done = 0;
  let paths = 0;
  for (const b of todo) {
    const out = runOneBlock(kernel, suite, b);
    collector.add(out);
    done++;
    paths += out.stats.paths;
    opts.onBlock?.(done, todo.length, paths);
  }
  return collector.result((performance.now() - t0) / 1000, 1);
}
