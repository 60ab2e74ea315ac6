// One suite end to end with workers, progress, checkpoints, signals and parts (--part K --parts N).

import { blockCount } from "../suite/load.js";
import type { LoadedSuite } from "../suite/schema.js";
import { toolVersion } from "../version.js";
import { readCheckpoint, writeCheckpoint, type PartSpec } from "./checkpoint.js";
import { defaultWorkers, runBlocks } from "./pool.js";
import { Progress } from "./progress.js";
import type { EarlyWorkers } from "./prestart.js";
import { BlockCollector, type KernelKind } from "./simulate.js";
import type { BlockStats, SimulationResult } from "./types.js";

export interface RunOptions {
  workers?: number;
  kernel?: KernelKind;
  part?: PartSpec | null;
  /** Checkpoint file; null disables checkpoints. */
  checkpoint?: string | null;
  resume?: boolean;
  checkpointEverySeconds?: number;
  /** Deterministic stop for tests: stop (with a checkpoint) once this many blocks are merged. */
  stopAfterBlocks?: number;
  /** Live progress on stderr (the caller decides: a TTY and not --quiet). */
  progress?: boolean;
  /** Install SIGINT/SIGTERM handlers that checkpoint and stop. */
  handleSignals?: boolean;
  onWarning?: (message: string) => void;
  failOnceAtBlock?: number;
  /** Where progress and the final summary go (default stderr). */
  log?: (text: string) => void;
  /** Workers started ahead of the suite (src/run/prestart.ts). */
  early?: EarlyWorkers | null;
  /** After each merged block, the blocks merged so far (e.g. to start the predictions early). */
  onBlockMerged?: (blocks: Map<number, BlockStats>) => void;
  /**
   * Once every block is merged, before the kept sample is put in path order: the collector, whose
   * keptColumns() gives the kept values unordered (e.g. to start the limit-law evidence early).
   */
  onSimulated?: (collector: BlockCollector) => void;
}

export type RunOutcome =
  | { status: "done"; sim: SimulationResult; collector: BlockCollector }
  | { status: "stopped"; reason: "SIGINT" | "SIGTERM" | "stop-after-blocks"; blocksDone: number; checkpoint: string | null };

/** The blocks a run (or part K of N: blocks K, K+N, ...) is responsible for. */
export function partBlocks(total: number, part: PartSpec | null | undefined): number[] {
  const all = Array.from({ length: total }, (_, b) => b);
  return part ? all.filter((b) => b % part.count === part.index) : all;
}

/**
 * Whether a periodic checkpoint is due after a block is merged: at most every `everyMs`, never more
 * than ~2% of the run's time in checkpoints (50 x the last save's cost apart), and none once every
 * block is merged (the run is complete; a save would only delay its end, 0.2-0.3 s at 10^5 paths).
 */
export function checkpointDue(merged: number, total: number, sinceLastMs: number, everyMs: number, lastCostMs: number): boolean {
  return merged < total && sinceLastMs >= Math.max(everyMs, 50 * lastCostMs);
}

export async function runSuite(suite: LoadedSuite, opts: RunOptions = {}): Promise<RunOutcome> {
  const t0 = performance.now();
  const total = blockCount(suite);
  const part = opts.part ?? null;
  const version = toolVersion();
  const collector = new BlockCollector(suite);
  const checkpoint = opts.checkpoint ?? null;
  if (opts.resume) {
    if (!checkpoint) throw new Error("--resume needs a checkpoint file");
    collector.restore(readCheckpoint(checkpoint, suite, version, total, part));
  }
  const mine = partBlocks(total, part);
  const todo = mine.filter((b) => !collector.blocks.has(b));
  const workers = Math.max(1, Math.min(opts.workers ?? defaultWorkers(), Math.max(todo.length, 1)));
  const log = opts.log ?? ((t: string) => process.stderr.write(t));
  const progress = new Progress(suite.title, suite.paths, mine.length, collector, opts.progress ?? false, log);

  let stopReason: "SIGINT" | "SIGTERM" | "stop-after-blocks" | null = null;
  const save = () => {
    if (checkpoint) writeCheckpoint(checkpoint, suite, version, total, part, collector.snapshot());
  };
  const onSignal = (sig: "SIGINT" | "SIGTERM") => () => {
    stopReason ??= sig;
  };
  const handlers = { SIGINT: onSignal("SIGINT"), SIGTERM: onSignal("SIGTERM") };
  if (opts.handleSignals) {
    process.on("SIGINT", handlers.SIGINT);
    process.on("SIGTERM", handlers.SIGTERM);
  }
  let lastSave = performance.now();
  let lastSaveCost = 0;
  const every = (opts.checkpointEverySeconds ?? 5) * 1000;
  try {
    const outcome = await runBlocks(suite, {
      workers,
      kernel: opts.kernel ?? "wasm",
      blocks: todo,
      collector,
      failOnceAtBlock: opts.failOnceAtBlock,
      early: opts.early,
      onWarning: opts.onWarning ?? ((m) => log(`walkhull: warning: ${m}\n`)),
      shouldStop: () => stopReason !== null,
      onBlock: () => {
        progress.update();
        opts.onBlockMerged?.(collector.blocks);
        if (opts.stopAfterBlocks !== undefined && collector.blocks.size >= opts.stopAfterBlocks) stopReason ??= "stop-after-blocks";
        if (checkpoint && checkpointDue(collector.blocks.size, mine.length, performance.now() - lastSave, every, lastSaveCost)) {
          const t = performance.now();
          save();
          lastSave = performance.now();
          lastSaveCost = lastSave - t;
        }
      },
    });
    if (outcome.stopped || (stopReason !== null && collector.blocks.size < mine.length)) {
      save();
      progress.finish(`stopped (${stopReason}) after ${collector.blocks.size}/${mine.length} blocks${checkpoint ? `; checkpoint ${checkpoint}` : ""}`);
      return { status: "stopped", reason: stopReason ?? "SIGINT", blocksDone: collector.blocks.size, checkpoint };
    }
  } finally {
    if (opts.handleSignals) {
      process.off("SIGINT", handlers.SIGINT);
      process.off("SIGTERM", handlers.SIGTERM);
    }
  }
  const wall = (performance.now() - t0) / 1000;
  opts.onSimulated?.(collector);
  const sim = collector.result(wall, workers);
  progress.finish(`done: ${sim.blocks.reduce((s, b) => s + b.paths, 0)} paths in ${wall.toFixed(2)} s on ${workers} worker(s)`);
  return { status: "done", sim, collector };
}
