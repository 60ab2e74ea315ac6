// Start-up overlapped: `walkhull run` starts its worker threads, and compiles the WebAssembly module
// (once, shared by every worker as a WebAssembly.Module), before the main thread loads the command
// code, reads and validates the suite and opens its checkpoint. A worker started early loads its own
// code, then waits for the suite (a `setup` message, src/run/worker.ts); the pool takes it instead
// of starting a new one. Workers left unused are ended by releaseEarly. This module stays light (it
// is imported before everything else by src/cli.ts).

import { availableParallelism } from "node:os";
import { Worker } from "node:worker_threads";
import { loadWasmModule } from "../engine/wasm.js";
import { workerEntry } from "../paths.js";

/** The worker script is always the compiled one (tsx does not reach worker_threads on Node 20). */
export const WORKER_URL = workerEntry("run-worker", "dist/run/worker.js");

export interface EarlyWorker {
  worker: Worker;
  /** Set when the worker failed or exited before the pool took it (the pool then starts a new one). */
  dead: boolean;
}

export interface EarlyWorkers {
  workers: EarlyWorker[];
  /** The compiled kernel module (null if it could not be compiled: the pool reports that itself). */
  module: Promise<WebAssembly.Module | null>;
}

/** The worker count `walkhull run <args>` will ask for (the same default as the pool), or 0 when the args are not a run. */
function plannedWorkers(argv: string[]): number {
  if (argv[0] !== "run" || argv.includes("--help")) return 0;
  let workers = Math.max(1, availableParallelism());
  argv.forEach((a, i) => {
    const v = a === "--workers" ? argv[i + 1] : a.startsWith("--workers=") ? a.slice("--workers=".length) : undefined;
    if (v !== undefined) workers = /^\d+$/.test(v) ? Number(v) : 0;
  });
  if (argv.includes("--kernel=twin") || argv.some((a, i) => a === "--kernel" && argv[i + 1] === "twin")) return workers > 1 ? workers : 0;
  return workers > 1 ? Math.min(workers, 64) : 0;
}

/** Start the workers and the module compile for `walkhull run` with more than one worker; null otherwise. */
export function prestartWorkers(argv: string[]): EarlyWorkers | null {
  const count = plannedWorkers(argv);
  if (count <= 1) return null;
  const module = loadWasmModule().catch(() => null);
  const workers = Array.from({ length: count }, () => {
    const early: EarlyWorker = { worker: new Worker(WORKER_URL, { workerData: {} }), dead: false };
    early.worker.on("error", () => { early.dead = true; });
    early.worker.on("exit", () => { early.dead = true; });
    return early;
  });
  return { workers, module };
}

/** Take up to `count` live early workers (they leave the set). */
export function takeEarly(early: EarlyWorkers | null | undefined, count: number): Worker[] {
  if (!early) return [];
  const live = early.workers.filter((w) => !w.dead);
  const taken = live.slice(0, count);
  early.workers = early.workers.filter((w) => !taken.includes(w));
  return taken.map((w) => w.worker);
}

/** End the early workers nobody took. */
export function releaseEarly(early: EarlyWorkers | null | undefined): void {
  if (!early) return;
  for (const w of early.workers) void w.worker.terminate();
  early.workers = [];
}
