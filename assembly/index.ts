// WASM entry of the release build: the kernel API loaded by src/engine/wasm.ts, and the test
// entry points (assembly/testing.ts). Bench entry points live in assembly/bench.ts (target "bench").
export { allocF64, allocI32, setup, setWalk, seedBlock, setDrift } from "./setup";
export { runPaths, pointsXPtr, pointsYPtr, hullXPtr, hullYPtr, getHullCount } from "./paths";
export { drawSteps, hullOfPoints, measureHull } from "./testing";
export { fillNormals, fillNormalsPolar, nextSubstream, zigTable } from "./rng";
