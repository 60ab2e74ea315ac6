// The limit-law evidence of each measure (src/verdict/normality.ts), computed on helper threads
// while the main thread does the rest of the verdict stage.
//
// The evidence of one measure (sorting its kept samples, the distance to the normal family, the
// shape trends) is ~40% of the verdict stage and independent of every other measure, so `walkhull
// run` hands the measures to LawEvidenceThreads: one helper thread per spare core (started while
// blocks are still simulated, so that its start-up is over when the checks begin), while the main
// thread computes the rest of the verdict stage (it computes measures itself only without a helper,
// or for a helper that failed). A helper computes exactly what the main thread would (the same
// function on structured-cloned numbers, which keep every bit).

import { availableParallelism } from "node:os";
import { Worker } from "node:worker_threads";
import { recordLayout } from "../engine/types.js";
import { workerEntry } from "../paths.js";
import { measureBlocks, measureSample } from "../run/series.js";
import type { BlockCollector } from "../run/simulate.js";
import type { SimulationResult } from "../run/types.js";
import type { MomentState } from "../stats/types.js";
import type { Measure } from "../suite/schema.js";
import { lawDecision, normalityEvidence, type LawDecision, type NormalityEvidence } from "./normality.js";

/** The evidence state of a measure, or why its kept sample is unusable. */
export type LawEvidence = { ev: NormalityEvidence; decision: LawDecision } | string;

/** What one measure's evidence is computed from (what a helper thread is sent). */
export interface LawEvidenceInput {
  grid: number[];
  samples: Float64Array[];
  blocks: MomentState[][];
  tol: number;
  alpha: number;
  measure: Measure;
}

/**
 * What the evidence is computed from: the run's suite and blocks, and its kept values in any order
 * (the evidence sorts them: the same numbers whatever the order, but for the position a NaN is
 * reported at, see LawEvidenceThreads).
 */
export type LawSource = Pick<SimulationResult, "suite" | "blocks"> & { sample: Pick<SimulationResult["sample"], "values"> };

/** The source of the kept values before they are put in path order (runSuite's onSimulated): only the suite's measures' columns are filled. */
export function unorderedSource(collector: BlockCollector): LawSource {
  const suite = collector.suite;
  const layout = recordLayout(suite.n.length);
  const columns = suite.measure.flatMap((m) => suite.n.map((_, g) => layout.index(g, m)));
  const values: Float64Array[] = [];
  collector.keptColumns(columns).forEach((col, k) => (values[columns[k]] = col));
  return { suite, blocks: [...collector.blocks.values()].sort((a, b) => a.block - b.block), sample: { values } };
}

export function lawEvidenceInput(sim: LawSource, measure: Measure): LawEvidenceInput {
  const suite = sim.suite;
  return {
    grid: suite.n,
    samples: measureSample(sim, measure),
    blocks: measureBlocks(sim, measure),
    tol: suite.normalityTolerance ?? 0.01,
    alpha: suite.alpha ?? 0.01,
    measure,
  };
}

/** One measure's evidence and decision (the vertex count's shape trends run in log n). */
export function lawEvidenceOf(input: LawEvidenceInput): LawEvidence {
  const { grid, samples, blocks, tol, alpha, measure } = input;
  try {
    const e = normalityEvidence(grid, samples, blocks, tol, alpha, measure === "vertices");
    return { ev: e, decision: lawDecision(e, grid, tol, alpha) };
  } catch (e) {
    return `the kept sample at n = ${grid[grid.length - 1]} is unusable (${(e as Error).message})`;
  }
}

const WORKER_URL = workerEntry("law-evidence-worker", "dist/verdict/law-evidence-worker.js");

interface Helper {
  worker: Worker;
  /** Measures sent and not yet answered, oldest first. */
  busy: Measure[];
  dead: boolean;
}

export class LawEvidenceThreads {
  private helpers: Helper[] = [];
  private queue: Measure[] = [];
  /** The run's result: what this thread computes from (no helper, a helper's failure, an error answer to an early dispatch). */
  private sim: SimulationResult | null = null;
  /** The measures went out (early: with the kept values not yet in path order). */
  private sent = false;
  private early = false;
  private readonly results = new Map<Measure, LawEvidence>();
  private wake: (() => void) | null = null;

  /** Start the helper threads (idempotent): one per core beyond the main thread's, at most one per measure. */
  start(measures: number): void {
    if (this.helpers.length) return;
    const count = Math.max(0, Math.min(availableParallelism() - 1, measures));
    for (let i = 0; i < count; i++) {
      const helper: Helper = { worker: new Worker(WORKER_URL), busy: [], dead: false };
      const lost = () => {
        if (helper.dead) return;
        helper.dead = true;
        for (const m of helper.busy.splice(0)) if (!this.results.has(m)) this.queue.push(m);
        this.wake?.();
      };
      helper.worker.on("message", (msg: { measure: Measure; evidence: LawEvidence }) => {
        helper.busy = helper.busy.filter((m) => m !== msg.measure);
        // An error from unordered values may name another position than the ordered sample would
        // (the first NaN's): this thread computes that measure again from the run's result.
        if (this.early && typeof msg.evidence === "string") this.queue.push(msg.measure);
        else this.results.set(msg.measure, msg.evidence);
        this.wake?.();
      });
      helper.worker.on("error", lost);
      helper.worker.on("exit", lost);
      this.helpers.push(helper);
    }
  }

  /**
   * Once every block is merged, before the kept sample is put in path order (runSuite's
   * onSimulated): the measures go to the helpers with the values unordered, so that they need not
   * wait for the ordering (0.1-0.3 s of this thread's time at 10^5 paths). No-op without a live helper.
   */
  dispatchEarly(collector: BlockCollector): void {
    if (this.sent) return;
    this.start(collector.suite.measure.length);
    if (!this.helpers.some((h) => !h.dead)) return;
    this.early = true;
    this.send(unorderedSource(collector));
  }

  /**
   * With the run's result: hand the measures out unless dispatchEarly did. All of them go to the
   * helpers at once (in turn, the dearest first), none kept for this thread while a helper lives.
   * This thread is busy with the rest of the verdict stage meanwhile, synchronously: a helper that
   * had to wait for it to read an answer before getting its next measure sat idle (measured), and a
   * warm helper computes a measure in about a third of the CPU a cold main thread needs. Without
   * helpers this thread computes them in collect.
   */
  dispatch(sim: SimulationResult): void {
    this.sim = sim;
    if (this.sent) return;
    this.start(sim.suite.measure.length);
    this.send(sim);
  }

  private send(source: LawSource): void {
    this.sent = true;
    // The vertex count (continuity-corrected distance over few values) is the cheapest: last.
    const order = [...source.suite.measure].sort((a, b) => Number(a === "vertices") - Number(b === "vertices"));
    const live = this.helpers.filter((h) => !h.dead);
    if (!live.length) {
      this.queue = order;
      return;
    }
    order.forEach((measure, i) => {
      const helper = live[i % live.length];
      helper.busy.push(measure);
      helper.worker.postMessage(lawEvidenceInput(source, measure));
    });
  }

  /** Compute the measures left to this thread, wait for the helpers, end them; the evidence of every measure. */
  async collect(): Promise<Map<Measure, LawEvidence>> {
    const sim = this.sim;
    if (!sim) throw new Error("law evidence: collect before dispatch");
    for (;;) {
      const measure = this.queue.shift();
      if (measure !== undefined) {
        this.results.set(measure, lawEvidenceOf(lawEvidenceInput(sim, measure)));
        continue;
      }
      if (!this.helpers.some((h) => !h.dead && h.busy.length > 0)) break;
      await new Promise<void>((r) => (this.wake = r));
      this.wake = null;
    }
    this.dispose();
    return this.results;
  }

  /** End the helper threads. */
  dispose(): void {
    for (const h of this.helpers) {
      h.dead = true;
      void h.worker.terminate();
    }
    this.helpers = [];
  }
}
