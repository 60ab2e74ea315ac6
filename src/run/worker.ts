// A pool worker: its own kernel (own WASM instance and buffers); simulates the blocks it is sent.
// Started with the suite in workerData, or early (src/run/prestart.ts) and then sent a `setup`
// message; either way it answers `ready` once its kernel exists.

import { parentPort, workerData } from "node:worker_threads";
import { createKernel, runOneBlock, type KernelKind } from "./simulate.js";
import type { Kernel } from "../engine/types.js";
import type { LoadedSuite } from "../suite/schema.js";

interface Setup { suite: LoadedSuite; kernel: KernelKind; module?: WebAssembly.Module }
let setup: Setup | null = null;
let kernel: Kernel | null = null;

function start(s: Setup): void {
  setup = s;
  kernel = createKernel(s.suite, s.kernel, s.module);
  parentPort!.postMessage({ ready: true });
}

parentPort!.on("message", (msg: { setup?: Setup; block: number; fail?: boolean }) => {
  if (msg.setup) return start(msg.setup);
  if (msg.fail) throw new Error(`planted failure at block ${msg.block} (testing hook)`);
  try {
    if (!kernel || !setup) throw new Error("block before setup");
    parentPort!.postMessage({ block: msg.block, out: runOneBlock(kernel, setup.suite, msg.block) });
  } catch (e) {
    parentPort!.postMessage({ block: msg.block, error: (e as Error).message });
  }
});

const data = workerData as Partial<Setup>;
if (data.suite) start(data as Setup);
