// Loads build/walkhull.wasm (built by `npm run build:wasm`) and wraps one instance as a Kernel.
// This file runs as src/engine/wasm.ts (vitest, tsx) and as dist/engine/wasm.js: both sit two
// levels below the project root, so one relative URL finds the module.

import { readFileSync } from "node:fs";
import { readFile } from "node:fs/promises";
import { fileURLToPath } from "node:url";
import { CONTROLS_PER_WALK, recordLayout, type Kernel, type KernelSetup } from "./types.js";
import type { instantiate } from "../../build/walkhull.js";
import { zigguratTables } from "./prng.js";
import { MEASURE_COUNT } from "../geometry/measure-registry.js";
import { projectFile } from "../paths.js";

const WASM_URL = projectFile("build/walkhull.wasm");

function missing(err: unknown): Error {
  return new Error(
    `build/walkhull.wasm: cannot read ${fileURLToPath(WASM_URL)} (run \`npm run build:wasm\`): ${String(err)}`,
  );
}

export async function loadWasmModule(url: URL = WASM_URL): Promise<WebAssembly.Module> {
  let bytes: Buffer;
  try {
    bytes = await readFile(url);
  } catch (err) {
    throw missing(err);
  }
  return WebAssembly.compile(new Uint8Array(bytes));
}

/**
 * Modules compiled in this process, by URL: a module is immutable, and reusing it keeps the code V8
 * has already optimised (its tier-up is per module), so the workers of a later run in the same
 * process (the bench, the calibration, a library caller) do not start again from baseline code.
 */
const compiledModules = new Map<string, WebAssembly.Module>();

/** The compiled kernel (default build/walkhull.wasm; the bench passes build/walkhull.bench.wasm), compiled once per process. */
export function loadWasmModuleSync(url: URL = WASM_URL): WebAssembly.Module {
  const known = compiledModules.get(url.href);
  if (known) return known;
  let bytes: Buffer;
  try {
    bytes = readFileSync(url);
  } catch (err) {
    throw missing(err);
  }
  const module = new WebAssembly.Module(new Uint8Array(bytes));
  compiledModules.set(url.href, module);
  return module;
}

/**
 * The raw exports of assembly/index.ts (pointers are byte offsets into memory), typed from the
 * declarations asc generates beside the module (build/walkhull.d.ts): a changed kernel signature
 * is a type error here, not a silent mismatch.
 */
export type WalkhullExports = Awaited<ReturnType<typeof instantiate>>;

/** Paths simulated per runPaths call (the output buffer holds this many records). */
const CHUNK_PATHS = 256;

/** A WASM kernel; the extra methods serve tests and benches (they reuse setup-time buffers). */
export interface WasmKernel extends Kernel {
  readonly exports: WalkhullExports;
  /** `count` raw steps of walk j from the first substream of (seed, block). */
  drawSteps(block: number, j: number, count: number): { x: Float64Array; y: Float64Array };
  /**
   * Hull of a point set through the kernel's filter + chain; count <= k * (nMax + 1).
   * Returns the vertices and the measures in registry slot order.
   */
  hullOfPoints(xs: ArrayLike<number>, ys: ArrayLike<number>, useFilter?: boolean): { x: Float64Array; y: Float64Array; measures: Float64Array };
  /** `count` normals (ziggurat or polar) from the first substream of (seed, block) (bench). */
  normals(block: number, count: number, method: "ziggurat" | "polar"): Float64Array;
}

export function createWasmKernel(module: WebAssembly.Module, setup: KernelSetup): WasmKernel {
  const instance = new WebAssembly.Instance(module, {
    env: {
      abort(_msg: number, _file: number, line: number, column: number): never {
        throw new Error(`walkhull.wasm: abort at ${line}:${column}`);
      },
    },
  });
  const ex = instance.exports as unknown as WalkhullExports;
  const k = setup.walks.length;
  const G = setup.grid.length;
  const nMax = setup.grid[G - 1];
  const rec = recordLayout(G).width;
  const capacity = k * (nMax + 1);
  const seed = BigInt(setup.seed);

  // Inputs are written right after their allocation through a fresh view; the long-lived view
  // (`heap`) is re-created whenever memory has grown.
  const gridPtr = ex.allocI32(G);
  new Int32Array(ex.memory.buffer, gridPtr, G).set(setup.grid);
  const paramPtrs = setup.walks.map((w) => {
    const ptr = ex.allocF64(w.params.length);
    new Float64Array(ex.memory.buffer, ptr, w.params.length).set(w.params);
    return ptr;
  });
  ex.setup(k, gridPtr, G);
  setup.walks.forEach((w, j) => {
    ex.setWalk(j, w.code, paramPtrs[j]);
    ex.setDrift(j, w.mean[0], w.mean[1]);
  });
  // The ziggurat tables of the twin (V8's exp/log), so both kernels draw the same normals;
  // AssemblyScript's own exp/log give tables differing in the last ulp.
  const zig = zigguratTables();
  const zigPtr = Number(ex.zigTable.value);
  new Float64Array(ex.memory.buffer, zigPtr, 257).set(zig.X);
  new Float64Array(ex.memory.buffer, zigPtr + 257 * 8, 257).set(zig.F);
  const outPtr = ex.allocF64(CHUNK_PATHS * rec);
  const crec = G * k * CONTROLS_PER_WALK;
  const ctlPtr = ex.allocF64(CHUNK_PATHS * crec);
  const inXPtr = ex.allocF64(capacity);
  const inYPtr = ex.allocF64(capacity);
  const measPtr = ex.allocF64(MEASURE_COUNT);
  let scratch = { count: 0, x: 0, y: 0, z: 0 };

  let heap = new Float64Array(ex.memory.buffer);
  const refresh = (): Float64Array => {
    if (heap.buffer !== ex.memory.buffer) heap = new Float64Array(ex.memory.buffer);
    return heap;
  };

  const ensureScratch = (count: number) => {
    if (count > scratch.count) {
      scratch = { count, x: ex.allocF64(count), y: ex.allocF64(count), z: ex.allocF64(2 * count) };
    }
  };

  const readHull = (): Float64Array => {
    const h = ex.getHullCount();
    const H = refresh();
    const hx = ex.hullXPtr() / 8, hy = ex.hullYPtr() / 8;
    const hull = new Float64Array(2 * h);
    for (let i = 0; i < h; i++) {
      hull[2 * i] = H[hx + i];
      hull[2 * i + 1] = H[hy + i];
    }
    return hull;
  };

  return {
    exports: ex,
    runBlock(block: number, pathCount: number, controls?: Float64Array): Float64Array {
      const out = new Float64Array(pathCount * rec);
      if (controls && controls.length !== pathCount * crec) throw new Error(`controls: length ${controls.length}, expected ${pathCount * crec}`);
      ex.seedBlock(seed, BigInt(block));
      for (let done = 0; done < pathCount; done += CHUNK_PATHS) {
        const c = Math.min(CHUNK_PATHS, pathCount - done);
        ex.runPaths(c, outPtr, ctlPtr);
        const H = refresh();
        out.set(H.subarray(outPtr / 8, outPtr / 8 + c * rec), done * rec);
        if (controls) controls.set(H.subarray(ctlPtr / 8, ctlPtr / 8 + c * crec), done * crec);
      }
      return out;
    },
    // Points and hull are interleaved: [x_0, y_0, x_1, y_1, ...]; points[j] has nMax + 1 points.
    samplePath(block: number) {
      ex.seedBlock(seed, BigInt(block));
      ex.runPaths(1, outPtr, ctlPtr);
      const H = refresh();
      const px = ex.pointsXPtr() / 8, py = ex.pointsYPtr() / 8;
      const stride = nMax + 1;
      const points: Float64Array[] = [];
      for (let j = 0; j < k; j++) {
        const pts = new Float64Array(2 * stride);
        for (let i = 0; i < stride; i++) {
          pts[2 * i] = H[px + j * stride + i];
          pts[2 * i + 1] = H[py + j * stride + i];
        }
        points.push(pts);
      }
      return { points, hull: readHull() };
    },
    drawSteps(block: number, j: number, count: number) {
      ensureScratch(count);
      ex.seedBlock(seed, BigInt(block));
      ex.drawSteps(j, count, scratch.x, scratch.y, scratch.z);
      const H = refresh();
      return {
        x: H.slice(scratch.x / 8, scratch.x / 8 + count),
        y: H.slice(scratch.y / 8, scratch.y / 8 + count),
      };
    },
    hullOfPoints(xs, ys, useFilter = true) {
      const count = xs.length;
      if (count > capacity) throw new Error(`points: ${count} points exceed the kernel capacity ${capacity}`);
      const H = refresh();
      for (let i = 0; i < count; i++) {
        H[inXPtr / 8 + i] = xs[i];
        H[inYPtr / 8 + i] = ys[i];
      }
      const h = ex.hullOfPoints(inXPtr, inYPtr, count, useFilter);
      ex.measureHull(measPtr);
      const hull = readHull();
      const x = new Float64Array(h), y = new Float64Array(h);
      for (let i = 0; i < h; i++) { x[i] = hull[2 * i]; y[i] = hull[2 * i + 1]; }
      return { x, y, measures: refresh().slice(measPtr / 8, measPtr / 8 + MEASURE_COUNT) };
    },
    normals(block: number, count: number, method: "ziggurat" | "polar"): Float64Array {
      ensureScratch(count);
      ex.seedBlock(seed, BigInt(block));
      ex.nextSubstream();
      if (method === "ziggurat") ex.fillNormals(scratch.z, count);
      else ex.fillNormalsPolar(scratch.z, count);
      return refresh().slice(scratch.z / 8, scratch.z / 8 + count);
    },
  };
}
