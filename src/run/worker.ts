// A pool worker: its own kernel (own WASM instance and buffers); simulates the blocks it is sent.

import { parentPort, workerData } from "node:worker_threads";
import { createKernel, runOneBlock, type KernelKind } from "./simulate.js";
import type { LoadedSuite } from "../suite/schema.js";

const data = workerData as { suite: LoadedSuite; kernel: KernelKind; module?: WebAssembly.Module };
const kernel = createKernel(data.suite, data.kernel, data.module);

parentPort!.on("message", (msg: { block: number; fail?: boolean }) => {
  if (msg.fail) throw new Error(`planted failure at block ${msg.block} (testing hook)`);
  try {
    parentPort!.postMessage({ block: msg.block, out: runOneBlock(kernel, data.suite, msg.block) });
  } catch (e) {
    parentPort!.postMessage({ block: msg.block, error: (e as Error).message });
  }
});
