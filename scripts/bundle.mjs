// Bundles the entry points of the built tool (tsc's output in dist/) into dist/bundle/: the CLI and
// the three worker threads, each one file, so that a process or thread loads one module instead of
// ~150-300 (measured: `walkhull help` 0.36-0.46 -> 0.21-0.23 s in 5 alternating runs; a law-evidence thread ready in ~75
// instead of ~150 ms). dist/bundle/ sits two levels below the root like dist/<folder>/, and
// src/paths.ts finds the root from any of them. Run by `npm run build:ts` after tsc.
import { build } from "esbuild";
import { rmSync } from "node:fs";

const entries = {
  cli: "dist/cli-main.js",
  "run-worker": "dist/run/worker.js",
  "law-evidence-worker": "dist/verdict/law-evidence-worker.js",
  "predict-worker": "dist/theory/predict-worker.js",
};
rmSync("dist/bundle", { recursive: true, force: true });
await build({
  entryPoints: entries,
  outdir: "dist/bundle",
  bundle: true,
  platform: "node",
  format: "esm",
  target: "node20",
  logLevel: "warning",
  // CommonJS dependencies inside an ES module bundle call require() for Node's built-ins.
  banner: { js: 'import { createRequire as __walkhullRequire } from "node:module"; const require = __walkhullRequire(import.meta.url);' },
});
