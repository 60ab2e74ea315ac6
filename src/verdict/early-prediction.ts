// Predictions computed while the workers simulate, sized from an early estimate of the run's
// standard errors: the lead-in blocks 0..K-1, K = max(8, total/8), the same blocks whatever the
// timing or the worker count. Each early target is the SE/10 of the lead-in extrapolated to the full
// run (SE ~ paths^-1/2), rounded down to a power of 2 and halved, so that it is almost always at or
// below the final SE/10. The targets a run's predictions are computed for (predictionTargets) are the
// early ones when every one of them is at or below the final one (the predictions are then at least
// as accurate as the run needs), else the final ones: a function of the block statistics alone, so a
// run, a resumed run and a combination of parts ask for the same predictions. On a machine with more
// cores than workers the quadrature then costs no wall time; with as many, it shares the cores with
// the simulation instead of running after it.

import { Worker } from "node:worker_threads";
import { cachedPrediction, predictCached } from "../theory/cache.js";
import type { MeanTargets, Prediction } from "../theory/types.js";
import { blockCount, canonicalJson } from "../suite/load.js";
import { workerEntry } from "../paths.js";
import type { LoadedSuite } from "../suite/schema.js";
import { requiredMeanAccuracy, runMeanTargets } from "./accuracy.js";
import type { BlockStats, SimulationResult } from "../run/types.js";

const WORKER_URL = workerEntry("predict-worker", "dist/theory/predict-worker.js");

/** Blocks whose statistics size the early targets: 0..K-1. */
export function leadInBlocks(total: number): number {
  return Math.min(total, Math.max(8, Math.ceil(total / 8)));
}

/** Early targets from the lead-in blocks: SE/10 extrapolated to all paths, rounded down to a power of 2, halved. */
export function earlyTargets(suite: LoadedSuite, leadIn: BlockStats[]): MeanTargets {
  const paths = leadIn.reduce((s, b) => s + b.paths, 0);
  const partial = { suite, blocks: leadIn, blockCount: leadIn.length } as unknown as SimulationResult;
  const absolute: NonNullable<MeanTargets["absolute"]> = {};
  for (const measure of suite.measure) {
    const byN: Record<string, number> = {};
    suite.n.forEach((n, g) => {
      const t = requiredMeanAccuracy(partial, measure, g) * Math.sqrt(paths / suite.paths);
      if (t > 0 && Number.isFinite(t)) byN[String(n)] = 2 ** (Math.floor(Math.log2(t)) - 1);
    });
    absolute[measure] = byN;
  }
  return { absolute };
}

/** True when every target of `final` is met by a prediction computed for `early` (early <= final everywhere). */
export function atLeastAsAccurate(early: MeanTargets, final: MeanTargets): boolean {
  return Object.entries(final.absolute ?? {}).every(([m, byN]) =>
    Object.entries(byN ?? {}).every(([n, t]) => {
      const e = early.absolute?.[m as keyof typeof early.absolute]?.[n];
      return e !== undefined && e <= t;
    }));
}

/** Early targets from the lead-in blocks of a finished run (null when one is missing). */
function leadInTargets(sim: SimulationResult): MeanTargets | null {
  const k = leadInBlocks(blockCount(sim.suite));
  const leadIn = sim.blocks.filter((b) => b.block < k);
  return leadIn.length === k ? earlyTargets(sim.suite, leadIn) : null;
}

/** The targets a finished run's predictions are computed for: the early ones when at least as accurate as the final ones. */
export function predictionTargets(sim: SimulationResult): MeanTargets {
  const final = runMeanTargets(sim);
  const early = leadInTargets(sim);
  return early && atLeastAsAccurate(early, final) ? early : final;
}

export class EarlyPrediction {
  private worker: Worker | null = null;
  private targets: MeanTargets | null = null;
  private answer: Promise<Prediction | null> | null = null;

  constructor(private readonly suite: LoadedSuite, private readonly budgetSeconds: number, private readonly cache: boolean) {}

  /** After each merged block: starts the prediction thread once the lead-in blocks are all in. */
  offer(blocks: Map<number, BlockStats>): void {
    if (this.answer) return;
    const k = leadInBlocks(blockCount(this.suite));
    const leadIn: BlockStats[] = [];
    for (let b = 0; b < k; b++) {
      const s = blocks.get(b);
      if (!s) return;
      leadIn.push(s);
    }
    this.targets = earlyTargets(this.suite, leadIn);
    // A cache hit is read here: no thread to start (it would cost the simulation more than the read).
    const opts = { budgetSeconds: this.budgetSeconds, meanTargets: this.targets };
    const hit = cachedPrediction(this.suite, opts, { use: this.cache });
    if (hit) {
      this.answer = Promise.resolve(hit);
      return;
    }
    const worker = new Worker(WORKER_URL);
    this.worker = worker;
    this.answer = new Promise<Prediction | null>((resolve) => {
      worker.once("message", (msg: { prediction?: Prediction; error?: string }) => resolve(msg.prediction ?? null));
      worker.once("error", () => resolve(null));
      worker.once("exit", () => resolve(null));
    }).finally(() => this.dispose());
    worker.postMessage({ suite: this.suite, opts, cache: { use: this.cache } });
  }

  /** The predictions for the finished run: the early ones when they were asked for predictionTargets(sim), else computed now. */
  async resolve(sim: SimulationResult): Promise<Prediction> {
    const targets = predictionTargets(sim);
    if (this.answer && this.targets && canonicalJson(targets) === canonicalJson(this.targets)) {
      const early = await this.answer;
      if (early) return early;
    }
    this.dispose();
    return predictCached(this.suite, { budgetSeconds: this.budgetSeconds, meanTargets: targets }, { use: this.cache });
  }

  /** End the thread (a stopped run, or done). */
  dispose(): void {
    if (this.worker) void this.worker.terminate();
    this.worker = null;
  }
}
