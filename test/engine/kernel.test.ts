import { describe, expect, it } from "vitest";
import { compileWalks } from "../../src/engine/compile.js";
import { createWasmKernel, loadWasmModule, loadWasmModuleSync } from "../../src/engine/wasm.js";
import { createTwinKernel } from "../../src/engine/twin.js";
import { Rng, zigguratTables } from "../../src/engine/twin.js";
import type { Measure, StepLaw } from "../../src/suite/schema.js";
import { recordLayout } from "../../src/engine/types.js";
import { bruteMeasures, kernels, relErr, wasmModuleOnce, SAMPLE_LAWS, GAUSS_ISO } from "./engine-helpers.js";

const GRID = [1, 2, 7, 50, 300];

function maxRel(a: Float64Array, b: Float64Array): number {
  expect(a.length).toBe(b.length);
  let m = 0;
  for (let i = 0; i < a.length; i++) m = Math.max(m, relErr(a[i], b[i]));
  return m;
}

describe("WASM == twin", () => {
  it.each(Object.entries(SAMPLE_LAWS))("%s (one walk, and with a second drifting walk)", (_name, law) => {
    for (const laws of [[law], [law, { law: "gaussian", mean: [0, 1], cov: [[1, 0], [0, 1]] } as StepLaw]]) {
      const { twin, wasm } = kernels(laws, GRID, 12345);
      const a = twin.runBlock(3, 40), b = wasm.runBlock(3, 40);
      // Bit-identical except where exp/log/cos/sin/pow differ in the last ulp between V8 and
      // AssemblyScript's math library (circle steps, student tails).
      expect(maxRel(a, b)).toBeLessThan(1e-12);
      // Vertex counts are integers and must agree exactly.
      const layout = recordLayout(GRID.length);
      for (let i = 0; i < a.length; i += layout.width) {
        for (let g = 0; g < GRID.length; g++) expect(b[i + layout.index(g, "vertices")]).toBe(a[i + layout.index(g, "vertices")]);
      }
    }
  });
  it("three walks, large grid, several blocks", () => {
    const laws = [SAMPLE_LAWS.gaussian, SAMPLE_LAWS.discrete, GAUSS_ISO];
    const { twin, wasm } = kernels(laws, [10, 1000, 3000], 9);
    for (const block of [0, 1, 63]) expect(maxRel(twin.runBlock(block, 6), wasm.runBlock(block, 6))).toBe(0);
  });
  it("long grid segments (>= 2048 new points per walk: the chunk-bound extremes search) agree bit for bit", () => {
    const drifting: StepLaw[] = [
      { law: "gaussian", mean: [1, 0], cov: [[1, 0], [0, 1]] },
      { law: "gaussian", mean: [0, 1], cov: [[1, 0.3], [0.3, 0.5]] },
      { law: "gaussian", mean: [-0.7, -0.2], cov: [[0.5, 0], [0, 2]] },
      { law: "gaussian", mean: [0, 0], cov: [[1, 0], [0, 1]] },
    ];
    for (const k of [1, 2, 4]) {
      for (const grid of [[5000], [100, 6000]]) {
        const { twin, wasm } = kernels(drifting.slice(0, k), grid, 2718);
        expect(maxRel(twin.runBlock(1, 4), wasm.runBlock(1, 4))).toBe(0);
      }
    }
  });
  it("runBlock splits into chunks without changing the stream (more paths than one chunk)", () => {
    const { twin, wasm } = kernels([SAMPLE_LAWS.discrete], [5], 4);
    expect(maxRel(twin.runBlock(2, 700), wasm.runBlock(2, 700))).toBe(0);
  });
  it("samplePath: same points and hull", () => {
    const { twin, wasm } = kernels([SAMPLE_LAWS.gaussian, SAMPLE_LAWS.empirical], [20, 80], 77);
    const a = twin.samplePath(5), b = wasm.samplePath(5);
    expect(b.points.length).toBe(2);
    for (let j = 0; j < 2; j++) expect(Array.from(b.points[j])).toEqual(Array.from(a.points[j]));
    expect(Array.from(b.hull)).toEqual(Array.from(a.hull));
  });
  it("drawSteps: same raw steps for every law", () => {
    const laws = Object.values(SAMPLE_LAWS);
    const { twin, wasm } = kernels(laws, [10], 31);
    laws.forEach((_, j) => {
      const a = twin.drawSteps(4, j, 500), b = wasm.drawSteps(4, j, 500);
      expect(maxRel(a.x, b.x)).toBeLessThan(1e-12);
      expect(maxRel(a.y, b.y)).toBeLessThan(1e-12);
    });
  });
  it("loadWasmModule (async) gives a working module", async () => {
    const m = await loadWasmModule();
    const setup = { walks: compileWalks([GAUSS_ISO]), grid: [10], seed: 1 };
    const k = createWasmKernel(m, setup);
    expect(k.runBlock(0, 3).length).toBe(3 * recordLayout(1).width);
  });
});

describe("the twin filters as the kernel does", () => {
  it("the same filter survivors, path by path (k = 1, 2, 3; the bench build counts the kernel's)", () => {
    const bench = loadWasmModuleSync(new URL("../../build/walkhull.bench.wasm", import.meta.url));
    const laws = [SAMPLE_LAWS.gaussian, { law: "gaussian", mean: [0, 1], cov: [[1, 0.3], [0.3, 0.5]] } as StepLaw, GAUSS_ISO];
    for (const k of [1, 2, 3]) {
      const grid = [40, 300, 3000];
      const setup = { walks: compileWalks(laws.slice(0, k)), grid, seed: 31 };
      const twin = createTwinKernel(setup);
      twin.runBlock(2, 5);
      const ex = createWasmKernel(bench, setup).exports as unknown as { seedBlock(s: bigint, b: bigint): void; benchResetStats(): void; benchPaths(c: number, l: number): number; benchSurvival(): number };
      ex.benchResetStats();
      ex.seedBlock(31n, 2n);
      ex.benchPaths(5, 3);
      // benchSurvival = survivors / new points, new points = paths x k x n_max.
      expect(Math.round(ex.benchSurvival() * 5 * k * 3000)).toBe(twin.survivors);
      expect(twin.survivors).toBeGreaterThan(0);
    }
  });
});

describe("kernel values equal the oracles on the sampled path", () => {
  const cases: [string, StepLaw[]][] = [
    ["lattice walk (simple random walk)", [{ law: "discrete", atoms: [[1, 0], [-1, 0], [0, 1], [0, -1]], weights: [0.25, 0.25, 0.25, 0.25] }]],
    ["two lattice walks with drifts", [SAMPLE_LAWS.discrete, { law: "discrete", atoms: [[0, 1], [-1, 0], [1, 0]], weights: [0.5, 0.25, 0.25] }]],
    ["gaussian + singular gaussian", [SAMPLE_LAWS.gaussian, SAMPLE_LAWS["gaussian singular [[1,1],[1,1]]"]]],
    ["one singular gaussian (all points collinear)", [SAMPLE_LAWS["gaussian singular [[1,1],[1,1]]"]]],
    ["empirical with a zero step", [SAMPLE_LAWS.empirical]],
    ["gaussian rescaled by 1e-9", [{ law: "gaussian", mean: [1e-9, 0], cov: [[1e-18, 0.3e-18], [0.3e-18, 1e-18]] }]],
    ["two gaussians rescaled by 1e9", [
      { law: "gaussian", mean: [1e9, 0], cov: [[1e18, 0], [0, 1e18]] },
      { law: "gaussian", mean: [0, -1e9], cov: [[2e18, 0], [0, 1e18]] },
    ]],
    ["lattice walk far from the origin in relative terms (steps 2^20 and 1)", [
      { law: "discrete", atoms: [[1048576, 0], [1048576, 1], [1048576, -1], [1048575, 0]], weights: [0.25, 0.25, 0.25, 0.25] },
    ]],
  ];
  it.each(cases)("%s", (_name, laws) => {
    const grid = [1, 3, 12, 40, 90];
    const { twin, wasm } = kernels(laws, grid, 2024);
    for (const block of [0, 1, 2]) {
      for (const kernel of [twin, wasm]) {
        const values = kernel.runBlock(block, 1);
        const { points } = kernel.samplePath(block);
        grid.forEach((n, g) => {
          const xs: number[] = [], ys: number[] = [];
          for (const p of points) for (let i = 0; i <= n; i++) { xs.push(p[2 * i]); ys.push(p[2 * i + 1]); }
          const o = bruteMeasures(xs, ys);
          const layout = recordLayout(grid.length);
          const at = (m: Measure) => values[layout.index(g, m)];
          expect(at("vertices")).toBe(o.vertices);
          expect(relErr(at("perimeter"), o.perimeter)).toBeLessThan(1e-12);
          expect(relErr(at("diameter"), o.diameter)).toBeLessThan(1e-15);
          expect(Math.abs(at("area") - o.area)).toBeLessThanOrEqual(1e-12 * Math.max(o.area, 1));
          // Width: the rounding bound of test/engine/geometry.test.ts (AGREES.width).
          expect(Math.abs(at("width") - o.width)).toBeLessThanOrEqual(16 * 2 ** -53 * (o.diameter + o.width));
        });
      }
    }
  });
});

describe("streams", () => {
  const laws = [SAMPLE_LAWS.gaussian, SAMPLE_LAWS.student, SAMPLE_LAWS.discrete];
  it("grid consistency: values at n1 do not depend on the rest of the grid", () => {
    const full = kernels(laws, [30, 200, 1000], 8);
    const first = kernels(laws, [30], 8);
    const last = kernels(laws, [1000], 8);
    for (const kind of ["twin", "wasm"] as const) {
      const a = full[kind].runBlock(5, 20), b = first[kind].runBlock(5, 20), c = last[kind].runBlock(5, 20);
      const w = recordLayout(1).width; // one grid point's record
      for (let p = 0; p < 20; p++) {
        for (let m = 0; m < w; m++) {
          expect(a[3 * w * p + m]).toBe(b[w * p + m]);
          expect(a[3 * w * p + 2 * w + m]).toBe(c[w * p + m]);
        }
      }
    }
  });
  it("same (seed, block) -> same values; other blocks and seeds differ", () => {
    const { wasm, twin } = kernels(laws, [50], 8);
    const again = kernels(laws, [50], 8).wasm;
    const other = kernels(laws, [50], 9).wasm;
    const a = wasm.runBlock(4, 30);
    expect(Array.from(again.runBlock(4, 30))).toEqual(Array.from(a));
    expect(Array.from(wasm.runBlock(4, 30))).toEqual(Array.from(a)); // re-run on the same instance
    expect(Array.from(twin.runBlock(4, 30))).toEqual(Array.from(a));
    const w = recordLayout(1).width;
    const perims = (v: Float64Array) => Array.from({ length: 30 }, (_, p) => v[w * p + recordLayout(1).index(0, "perimeter")]);
    const pa = new Set(perims(a));
    for (const b of [wasm.runBlock(5, 30), wasm.runBlock(0, 30), other.runBlock(4, 30)]) {
      expect(perims(b).filter((x) => pa.has(x)).length).toBe(0);
    }
    // Paths within a block differ too.
    expect(pa.size).toBe(30);
  });
  it("xoshiro256** matches its reference recurrence (BigInt) and substreams are never all-zero", () => {
    const rng = new Rng();
    rng.seedBlock(0, 0);
    for (let sub = 0; sub < 50; sub++) {
      rng.nextSubstream();
      let s = rng.state();
      expect(s.some((w) => w !== 0n)).toBe(true);
      const M = (1n << 64n) - 1n;
      const rotl = (x: bigint, k: bigint) => ((x << k) | (x >> (64n - k))) & M;
      for (let i = 0; i < 20; i++) {
        const want = (rotl((s[1] * 5n) & M, 7n) * 9n) & M;
        const t = (s[1] << 17n) & M;
        const n2 = s[2] ^ s[0], n3 = s[3] ^ s[1];
        const n1 = s[1] ^ n2, n0 = s[0] ^ n3;
        s = [n0, n1, n2 ^ t, rotl(n3, 45n)];
        expect(rng.nextU64()).toBe(want);
        expect(rng.state()).toEqual(s);
      }
    }
  });
  it("splitmix64 seeding matches the reference mixer (BigInt)", () => {
    const M = (1n << 64n) - 1n;
    const mix = (z0: bigint) => {
      let z = z0 & M;
      z = ((z ^ (z >> 30n)) * 0xbf58476d1ce4e5b9n) & M;
      z = ((z ^ (z >> 27n)) * 0x94d049bb133111ebn) & M;
      return z ^ (z >> 31n);
    };
    for (const [seed, block] of [[0, 0], [1, 2], [2 ** 53 - 1, 12345]]) {
      const rng = new Rng();
      rng.seedBlock(seed, block);
      let sm = mix(mix(BigInt(seed) ^ 0x6a09e667f3bcc909n) ^ BigInt(block));
      for (let sub = 0; sub < 3; sub++) {
        rng.nextSubstream();
        const want: bigint[] = [];
        for (let r = 0; r < 4; r++) { sm = (sm + 0x9e3779b97f4a7c15n) & M; want.push(mix(sm)); }
        expect(rng.state()).toEqual(want);
      }
    }
  });
  it("ziggurat tables: AssemblyScript's own differ from V8's by at most a few ulps (the kernel loads V8's)", () => {
    const inst = new WebAssembly.Instance(wasmModuleOnce(), { env: { abort() { throw new Error("abort"); } } });
    const ex = inst.exports as unknown as { memory: WebAssembly.Memory; zigTable: WebAssembly.Global };
    const own = new Float64Array(ex.memory.buffer, Number(ex.zigTable.value), 514);
    const { X, F } = zigguratTables();
    for (let i = 0; i < 257; i++) {
      expect(relErr(own[i], X[i])).toBeLessThan(1e-14);
      expect(relErr(own[257 + i], F[i])).toBeLessThan(1e-14);
    }
    // Layers: X decreasing, each layer of area ZIG_V ("An improved ziggurat method to generate normal random samples", 2005), top layer closes at F = 1.
    for (let i = 1; i < 256; i++) expect(X[i + 1]).toBeLessThan(X[i]);
    expect(F[256]).toBe(1);
    for (let i = 1; i <= 255; i++) expect(relErr(X[i] * (F[i + 1] - F[i]), 0.00492867323399)).toBeLessThan(1e-9);
  });
});
