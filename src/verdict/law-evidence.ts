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
import { measureBlocks, measureSample } from "../run/series.js";
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

export function lawEvidenceInput(sim: Pick<SimulationResult, "suite" | "blocks" | "sample">, measure: Measure): LawEvidenceInput {
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

const WORKER_URL = new URL("../../dist/verdict/law-evidence-worker.js", import.meta.url);

interface Helper {
  worker: Worker;
  /** Measures sent and not yet answered, oldest first. */
  busy: Measure[];
  dead: boolean;
}

export class LawEvidenceThreads {
  private helpers: Helper[] = [];
  private queue: Measure[] = [];
  private sim: SimulationResult | null = null;
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
        this.results.set(msg.measure, msg.evidence);
        helper.busy = helper.busy.filter((m) => m !== msg.measure);
        this.wake?.();
      });
      helper.worker.on("error", lost);
      helper.worker.on("exit", lost);
      this.helpers.push(helper);
    }
  }

  /**
   * Hand the run's measures out: all of them to the helpers at once (in turn, the dearest first),
   * none kept for this thread while a helper lives. This thread is busy with the rest of the verdict
   * stage meanwhile, synchronously: a helper that had to wait for it to read an answer before
   * getting its next measure sat idle (measured), and a warm helper computes a measure in about a
   * third of the CPU a cold main thread needs. Without helpers this thread computes them in collect.
   */
  dispatch(sim: SimulationResult): void {
    this.start(sim.suite.measure.length);
    this.sim = sim;
    // The vertex count (continuity-corrected distance over few values) is the cheapest: last.
    const order = [...sim.suite.measure].sort((a, b) => Number(a === "vertices") - Number(b === "vertices"));
    const live = this.helpers.filter((h) => !h.dead);
    if (!live.length) {
      this.queue = order;
      return;
    }
    order.forEach((measure, i) => {
      const helper = live[i % live.length];
      helper.busy.push(measure);
      helper.worker.postMessage(lawEvidenceInput(sim, measure));
    });
  }

  /** Compute the measures left to this thread (no helper, or a helper failed), wait for the helpers, end them; the evidence of every measure. */
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
