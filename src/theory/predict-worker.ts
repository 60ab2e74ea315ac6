// A thread that computes a suite's predictions (through the cache) while the main thread does other
// work (src/verdict/early-prediction.ts): one request, one answer, then it is ended.
import { parentPort } from "node:worker_threads";
import { predictCached, type CacheOptions } from "./cache.js";
import type { Suite } from "../suite/schema.js";
import type { PredictOptions } from "./types.js";

parentPort!.once("message", (msg: { suite: Suite; opts: PredictOptions; cache: CacheOptions }) => {
  try {
    parentPort!.postMessage({ prediction: predictCached(msg.suite, msg.opts, msg.cache) });
  } catch (e) {
    parentPort!.postMessage({ error: (e as Error).message });
  }
});
