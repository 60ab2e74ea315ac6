// Runs blocks of a suite on this thread or on a pool of worker threads. Blocks are handed out
// dynamically; results are merged by block index, so the bits never depend on the worker count.
// A worker that fails or dies is reported and its block re-run on a fresh worker.

import { Worker } from "node:worker_threads";
import { availableParallelism } from "node:os";
import { loadWasmModuleSync } from "../engine/wasm.js";
import type { LoadedSuite } from "../suite/schema.js";
import { createKernel, runOneBlock, type BlockCollector, type KernelKind } from "./simulate.js";
import type { BlockOutput } from "./blocks.js";

import { takeEarly, WORKER_URL, type EarlyWorkers } from "./prestart.js";

const MAX_TRIES_PER_BLOCK = 3;

export function defaultWorkers(): number {
  return Math.max(1, availableParallelism());
}

/**
 * Workers whose run has ended, kept for the next run in this process: a library caller or a script
 * that runs many suites (the calibration, the bench) pays the thread start-up once, not per run.
 * A parked worker is unreferenced (it never keeps the process alive), dropped if it exits, and sent
 * the new suite (a `setup` message, src/run/worker.ts) when it is taken again.
 */
const parked: Worker[] = [];
const MAX_PARKED = 64;

function park(worker: Worker): void {
  for (const event of ["message", "error", "exit"]) worker.removeAllListeners(event);
  const drop = () => {
    const i = parked.indexOf(worker);
    if (i >= 0) parked.splice(i, 1);
  };
  worker.on("error", drop);
  worker.on("exit", drop);
  worker.unref();
  if (parked.length >= MAX_PARKED) void worker.terminate();
  else parked.push(worker);
}

function unpark(): Worker | undefined {
  const worker = parked.pop();
  if (!worker) return undefined;
  for (const event of ["error", "exit"]) worker.removeAllListeners(event);
  worker.ref();
  return worker;
}

/** End the parked workers (tests; a process that wants its threads gone before it exits). */
export async function endParkedWorkers(): Promise<void> {
  await Promise.all(parked.splice(0).map((w) => w.terminate()));
}

export interface PoolOptions {
  workers: number;
  kernel: KernelKind;
  /** Blocks still to run, in the order they are handed out. */
  blocks: number[];
  collector: BlockCollector;
  /** Called after each block is merged. */
  onBlock?: (block: number, out: BlockOutput) => void;
  /** Checked between blocks: when true, no new block is started and in-flight ones are dropped. */
  shouldStop?: () => boolean;
  /** Reported problems (a worker failed and its block is re-run...). */
  onWarning?: (message: string) => void;
  /** Testing hook: the worker that first receives this block throws (the block must be re-run). */
  failOnceAtBlock?: number;
  /** Workers (and the module compile) started ahead of the suite by prestartWorkers: taken first. */
  early?: EarlyWorkers | null;
}

export interface PoolOutcome {
  stopped: boolean;
  blocksRun: number;
}

export async function runBlocks(suite: LoadedSuite, opts: PoolOptions): Promise<PoolOutcome> {
  if (opts.blocks.length === 0) return { stopped: false, blocksRun: 0 };
  if (opts.workers <= 1 && opts.failOnceAtBlock === undefined) return runHere(suite, opts);
  const compiled = opts.kernel === "wasm" && opts.early ? await opts.early.module : null;
  return runOnWorkers(suite, opts, compiled);
}

async function runHere(suite: LoadedSuite, opts: PoolOptions): Promise<PoolOutcome> {
  const kernel = createKernel(suite, opts.kernel);
  let blocksRun = 0;
  for (const b of opts.blocks) {
    // Yield to the event loop between blocks so that signals and timers are served.
    await new Promise((r) => setImmediate(r));
    if (opts.shouldStop?.()) return { stopped: true, blocksRun };
    const out = runOneBlock(kernel, suite, b);
    opts.collector.add(out);
    blocksRun++;
    opts.onBlock?.(b, out);
  }
  return { stopped: false, blocksRun };
}

function runOnWorkers(suite: LoadedSuite, opts: PoolOptions, compiled: WebAssembly.Module | null): Promise<PoolOutcome> {
  const module = opts.kernel === "wasm" ? compiled ?? loadWasmModuleSync() : undefined;
  const queue = [...opts.blocks];
  const tries = new Map<number, number>();
  const live = new Set<Worker>();
  let blocksRun = 0;
  let finished = false;
  let failArmed = opts.failOnceAtBlock !== undefined;

  return new Promise<PoolOutcome>((resolve, reject) => {
    const finish = (outcome: PoolOutcome | Error) => {
      if (finished) return;
      finished = true;
      for (const w of live) void w.terminate();
      live.clear();
      if (outcome instanceof Error) reject(outcome);
      else resolve(outcome);
    };

    const spawn = (started?: Worker) => {
      const taken = started ?? unpark();
      const worker = taken ?? new Worker(WORKER_URL, { workerData: { suite, kernel: opts.kernel, module } });
      if (taken) worker.postMessage({ setup: { suite, kernel: opts.kernel, module } });
      live.add(worker);
      // Blocks sent to this worker and not yet answered, the running one first. One more waits
      // behind it while blocks remain for every live worker, so that the worker goes on while this
      // thread is busy (a checkpoint held both workers idle 0.3-0.75 s at 10^5 paths); near the end
      // one at a time, so that the last blocks go to whichever worker is free first.
      const inFlight: number[] = [];

      const send = (b: number) => {
        inFlight.push(b);
        const fail = failArmed && b === opts.failOnceAtBlock;
        if (fail) failArmed = false;
        worker.postMessage({ block: b, fail });
      };

      const next = () => {
        if (finished) return;
        if (opts.shouldStop?.()) return finish({ stopped: true, blocksRun });
        const depth = queue.length > live.size ? 2 : 1;
        while (inFlight.length < depth && queue.length > 0) send(queue.shift()!);
        if (inFlight.length === 0) {
          live.delete(worker);
          park(worker);
          if (live.size === 0) finish({ stopped: false, blocksRun });
        }
      };

      const lost = (why: string) => {
        if (finished || !live.has(worker)) return;
        live.delete(worker);
        void worker.terminate();
        const [running, ...waiting] = inFlight.splice(0);
        if (running !== undefined) {
          const t = (tries.get(running) ?? 0) + 1;
          tries.set(running, t);
          if (t >= MAX_TRIES_PER_BLOCK) return finish(new Error(`block ${running} failed ${t} times; last: ${why}`));
          opts.onWarning?.(`worker failed on block ${running} (${why}); re-running the block on a new worker`);
          queue.unshift(running, ...waiting);
        }
        spawn();
      };

      worker.on("message", (msg: { ready?: boolean; block: number; out?: BlockOutput; error?: string }) => {
        if (finished) return;
        if (msg.ready) return next();
        if (msg.error !== undefined || !msg.out) return lost(msg.error ?? "no output");
        const at = inFlight.indexOf(msg.block);
        if (at >= 0) inFlight.splice(at, 1);
        try {
          opts.collector.add(msg.out);
        } catch (e) {
          return finish(e as Error);
        }
        blocksRun++;
        opts.onBlock?.(msg.block, msg.out);
        next();
      });
      worker.on("error", (e) => lost(e.message));
      worker.on("exit", (code) => lost(`exited with code ${code}`));
    };

    const n = Math.min(opts.workers, queue.length);
    const early = takeEarly(opts.early, n);
    for (let i = 0; i < n; i++) spawn(early[i]);
  });
}
