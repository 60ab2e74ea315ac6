// WASM entry: the kernel API loaded by src/engine/wasm.ts.
export {
  allocF64,
  allocI32,
  setup,
  setWalk,
  seedBlock,
  setDrift,
  runPaths,
  pointsXPtr,
  pointsYPtr,
  hullXPtr,
  hullYPtr,
  getHullCount,
  drawSteps,
  hullOfPoints,
  measureHull,
  benchPaths,
  benchSurvival,
  benchResetStats,
  benchChunkDropped,
} from "./simulate";
export { fillNormals, fillNormalsPolar, nextSubstream, zigTable, benchUniforms } from "./rng";
