// A/B timing of two kernel builds side by side in one process: the full pipeline (runBlock) of
// each build, alternating A and B run by run, so both see the same machine state. Prints the
// median ns per step of each and the ratio B/A per (walks, n), and checks that both builds give
// the same values bit for bit (the measures both have, when one build has more).
// Usage: node --import tsx bench/ab.ts A.wasm B.wasm [--runs R] [--cpu] [--a-width W]

import { readFileSync } from "node:fs";
import { cpuUsage } from "node:process";
import { compileWalks } from "../src/engine/compile.js";
import type { KernelSetup } from "../src/engine/types.js";
import { createWasmKernel } from "../src/engine/wasm.js";
import type { StepLaw } from "../src/suite/schema.js";

const args = process.argv.slice(2);
const files = args.filter((a, i) => !a.startsWith("--") && !(i > 0 && (args[i - 1] === "--runs" || args[i - 1] === "--a-width")));
if (files.length !== 2) throw new Error("usage: bench/ab.ts A.wasm B.wasm [--runs R] [--cpu]");
const runsAt = args.indexOf("--runs");
const RUNS = runsAt >= 0 ? Number(args[runsAt + 1]) : 15;
const cpu = args.includes("--cpu");
const aWidthAt = args.indexOf("--a-width");
const aWidth = aWidthAt >= 0 ? Number(args[aWidthAt + 1]) : undefined;
const now = (): number => (cpu ? (cpuUsage().user + cpuUsage().system) / 1000 : performance.now());

const modules = files.map((f) => new WebAssembly.Module(new Uint8Array(readFileSync(f))));
const gaussian = (mx: number, my: number): StepLaw => ({ law: "gaussian", mean: [mx, my], cov: [[1, 0], [0, 1]] });
const lawsFor = (k: number): StepLaw[] => [gaussian(1, 0), gaussian(0, 1), gaussian(-1, 0), gaussian(0, -1)].slice(0, k);
const STEPS_PER_RUN = 400_000;
const median = (xs: number[]): number => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];

console.log(`A = ${files[0]}\nB = ${files[1]}\n${RUNS} alternating runs of ~${STEPS_PER_RUN} steps, clock: ${cpu ? "process CPU time" : "wall"}\n`);
console.log("| walks | n | A ns/step | B ns/step | B/A |\n|---|---|---|---|---|");
const ratios: number[] = [];
for (const k of [1, 2, 4]) {
  for (const n of [100, 1000, 10000, 100000]) {
    const setup: KernelSetup = { walks: compileWalks(lawsFor(k)), grid: [n], seed: 1 };
    const kernels = modules.map((m) => createWasmKernel(m, setup));
    const paths = Math.max(1, Math.round(STEPS_PER_RUN / n));
    const a = kernels[0].runBlock(7, paths), b = kernels[1].runBlock(7, paths);
    // A build with fewer measures (--a-width: its numbers per path at one grid point) writes narrower
    // records, packed at the start of each chunk the wrapper copies: the paths of the first chunk
    // (src/engine/wasm.ts CHUNK_PATHS = 256) are compared on the measures both have.
    const wb = b.length / paths, wa = aWidth ?? wb, w = Math.min(wa, wb);
    for (let p = 0; p < Math.min(paths, 256); p++) {
      for (let m = 0; m < w; m++) if (!Object.is(a[p * wa + m], b[p * wb + m])) throw new Error(`k=${k} n=${n}: the builds disagree`);
    }
    const times: number[][] = [[], []];
    for (let r = 0; r < RUNS + 2; r++) {
      for (const w of r % 2 ? [1, 0] : [0, 1]) {
        const t0 = now();
        kernels[w].runBlock(100 + r, paths);
        if (r >= 2) times[w].push(((now() - t0) * 1e6) / (paths * n)); // first two runs: warm-up
      }
    }
    const [ta, tb] = times.map(median);
    ratios.push(tb / ta);
    console.log(`| ${k} | ${n} | ${ta.toFixed(1)} | ${tb.toFixed(1)} | ${(tb / ta).toFixed(3)} |`);
  }
}
const geo = Math.exp(ratios.reduce((s, r) => s + Math.log(r), 0) / ratios.length);
console.log(`\ngeometric mean of B/A over the ${ratios.length} cases: ${geo.toFixed(3)}`);
