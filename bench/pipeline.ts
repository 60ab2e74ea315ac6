// Pipeline bench: ns per walk step (a step moves every walk once) for steps + hull + the three
// functionals, WASM vs the TS twin side by side; and RNG + normals alone (ziggurat vs polar).
// Usage: node --import tsx bench/pipeline.ts [--smoke] [--cpu] [--json FILE]
//   --cpu  time with this process's CPU time (user + system) instead of the wall clock: steadier
//          when other jobs share the machine (it still counts GC and compiler threads).

import { writeFileSync } from "node:fs";
import os from "node:os";
import { Bench } from "tinybench";
import { compileWalks } from "../src/engine/compile.js";
import { createTwinKernel, Rng } from "../src/engine/twin.js";
import { createWasmKernel, loadWasmModuleSync } from "../src/engine/wasm.js";
import type { StepLaw } from "../src/suite/schema.js";

const args = process.argv.slice(2);
const smoke = args.includes("--smoke");
const cpuClock = args.includes("--cpu");
const jsonAt = args.indexOf("--json");
const jsonFile = jsonAt >= 0 ? args[jsonAt + 1] : undefined;
if (jsonAt >= 0 && !jsonFile) throw new Error("--json: missing FILE");

const STEPS_PER_CALL = smoke ? 20_000 : 400_000;
const benchOptions = smoke
  ? { time: 20, iterations: 2, warmupTime: 10, warmupIterations: 2 }
  : { time: 600, iterations: 8, warmupTime: 300, warmupIterations: 4 };

const drift = (mx: number, my: number): StepLaw => ({ law: "gaussian", mean: [mx, my], cov: [[1, 0], [0, 1]] });
const cases: { walks: number; laws: StepLaw[]; label: string }[] = [
  { walks: 1, laws: [drift(1, 0)], label: "drift (1,0)" },
  { walks: 2, laws: [drift(1, 0), drift(0, 1)], label: "drifts (1,0), (0,1)" },
];
const NS = [100, 1000, 10000];

interface Row { walks: number; laws: string; n: number; wasmNsPerStep: number; twinNsPerStep: number; ratio: number }
interface RngRow { sampler: string; wasmNsPerStep: number; twinNsPerStep: number; ratio: number }

function meanMs(bench: Bench, name: string): number {
  const task = bench.getTask(name);
  const result = task?.result as { latency?: { mean: number } } | undefined;
  if (!result?.latency) throw new Error(`bench: task ${name} has no result`);
  return result.latency.mean;
}

const module = loadWasmModuleSync();
const cpuNow = () => {
  const u = process.cpuUsage();
  return (u.user + u.system) / 1000;
};
const bench = new Bench({ name: "pipeline", ...benchOptions, ...(cpuClock ? { now: cpuNow } : {}) });
const perCall = new Map<string, number>();

for (const c of cases) {
  for (const n of NS) {
    const paths = Math.max(1, Math.round(STEPS_PER_CALL / n));
    const setup = { walks: compileWalks(c.laws), grid: [n], seed: 1 };
    const wasm = createWasmKernel(module, setup);
    const twin = createTwinKernel(setup);
    let block = 0;
    const key = (kind: string) => `${kind} k=${c.walks} n=${n}`;
    bench.add(key("wasm"), () => { wasm.runBlock(block++, paths); });
    bench.add(key("twin"), () => { twin.runBlock(block++, paths); });
    perCall.set(key("wasm"), paths * n);
    perCall.set(key("twin"), paths * n);
  }
}

// RNG + normals alone: 2 normals per step (one Gaussian walk).
const normalsPerCall = 2 * STEPS_PER_CALL;
const rngKernel = createWasmKernel(module, { walks: compileWalks([drift(0, 0)]), grid: [1], seed: 1 });
const ex = rngKernel.exports;
const wasmBuf = ex.allocF64(normalsPerCall);
const twinBuf = new Float64Array(normalsPerCall);
const twinRng = new Rng();
twinRng.seedBlock(1, 0);
twinRng.nextSubstream();
ex.seedBlock(1n, 0n);
ex.nextSubstream();
bench.add("wasm normals ziggurat", () => ex.fillNormals(wasmBuf, normalsPerCall));
bench.add("wasm normals polar", () => ex.fillNormalsPolar(wasmBuf, normalsPerCall));
bench.add("twin normals ziggurat", () => twinRng.fillNormals(twinBuf, normalsPerCall));
bench.add("twin normals polar", () => twinRng.fillNormalsPolar(twinBuf, normalsPerCall));
for (const k of ["wasm normals ziggurat", "wasm normals polar", "twin normals ziggurat", "twin normals polar"]) {
  perCall.set(k, STEPS_PER_CALL);
}

await bench.run();

const ns = (name: string) => (meanMs(bench, name) * 1e6) / perCall.get(name)!;
const rows: Row[] = [];
for (const c of cases) {
  for (const n of NS) {
    const w = ns(`wasm k=${c.walks} n=${n}`), t = ns(`twin k=${c.walks} n=${n}`);
    rows.push({ walks: c.walks, laws: c.label, n, wasmNsPerStep: w, twinNsPerStep: t, ratio: t / w });
  }
}
const rngRows: RngRow[] = ["ziggurat", "polar"].map((s) => {
  const w = ns(`wasm normals ${s}`), t = ns(`twin normals ${s}`);
  return { sampler: s, wasmNsPerStep: w, twinNsPerStep: t, ratio: t / w };
});

const f1 = (x: number) => x.toFixed(1);
const clock = cpuClock ? "process CPU time" : "wall clock";
console.log(`\nPipeline (Gaussian steps, cov I; ns per step, a step moves every walk once; ${clock})${smoke ? " [smoke]" : ""}`);
console.log("| walks | drifts | n | WASM ns/step | TS twin ns/step | twin / WASM |");
console.log("|---|---|---|---|---|---|");
for (const r of rows) console.log(`| ${r.walks} | ${r.laws} | ${r.n} | ${f1(r.wasmNsPerStep)} | ${f1(r.twinNsPerStep)} | ${r.ratio.toFixed(2)} |`);
console.log("\nRNG + normals alone (2 normals per step)");
console.log("| sampler | WASM ns/step | TS twin ns/step | twin / WASM |");
console.log("|---|---|---|---|");
for (const r of rngRows) console.log(`| ${r.sampler} | ${f1(r.wasmNsPerStep)} | ${f1(r.twinNsPerStep)} | ${r.ratio.toFixed(2)} |`);

const env = {
  node: process.version,
  cpu: os.cpus()[0]?.model ?? "unknown",
  cores: os.cpus().length,
  loadavg: os.loadavg(),
  smoke,
  clock,
  stepsPerCall: STEPS_PER_CALL,
  date: new Date().toISOString(),
};
console.log(`\n${env.cpu}, ${env.cores} cores, Node ${env.node}, load average ${env.loadavg.map((x) => x.toFixed(2)).join(" ")}`);
if (jsonFile) {
  writeFileSync(jsonFile, JSON.stringify({ env, pipeline: rows, normals: rngRows }, null, 2) + "\n");
  console.log(`wrote ${jsonFile}`);
}
