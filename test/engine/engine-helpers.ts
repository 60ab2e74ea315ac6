// Shared helpers of the engine tests: exact brute-force hull oracles (BigInt arithmetic, no code
// shared with the kernels), statistical test utilities and kernel factories.

import { compileWalks } from "../../src/engine/compile.js";
import { createTwinKernel, type TwinKernel } from "../../src/engine/twin.js";
import { createWasmKernel, loadWasmModuleSync, type WasmKernel } from "../../src/engine/wasm.js";
import type { Measure, StepLaw } from "../../src/suite/schema.js";

// ---------------------------------------------------------------- exact arithmetic on doubles
const view = new DataView(new ArrayBuffer(8));

/** x = m * 2^e exactly, m an integer (BigInt). */
function decompose(x: number): { m: bigint; e: number } {
  if (x === 0) return { m: 0n, e: 0 };
  view.setFloat64(0, x);
  const bits = view.getBigUint64(0);
  const sign = bits >> 63n ? -1n : 1n;
  const expBits = Number((bits >> 52n) & 0x7ffn);
  const frac = bits & 0xfffffffffffffn;
  const m = expBits === 0 ? frac : frac | (1n << 52n);
  const e = (expBits === 0 ? 1 : expBits) - 1075;
  return { m: sign * m, e };
}

/** Points as exact integers on a common scale 2^eMin (the hull is invariant under scaling). */
export function exactPoints(xs: ArrayLike<number>, ys: ArrayLike<number>): { X: bigint[]; Y: bigint[] } {
  const dx = Array.from(xs, decompose), dy = Array.from(ys, decompose);
  let eMin = Infinity;
  for (const d of [...dx, ...dy]) if (d.m !== 0n) eMin = Math.min(eMin, d.e);
  if (!Number.isFinite(eMin)) eMin = 0;
  const scale = (d: { m: bigint; e: number }) => d.m << BigInt(d.e - eMin);
  return { X: dx.map(scale), Y: dy.map(scale) };
}

function orientB(X: bigint[], Y: bigint[], a: number, b: number, c: number): bigint {
  return (X[b] - X[a]) * (Y[c] - Y[a]) - (Y[b] - Y[a]) * (X[c] - X[a]);
}

/**
 * Brute-force strict hull vertices (indices of distinct points), by definition: p is a vertex iff
 * p is not in the hull of the other points, i.e. (separation theorem) the vectors r - p lie in an
 * open half-plane, i.e. some q has every other r strictly left of the line p->q or on the ray
 * p->q itself. Exact (BigInt), O(n^3).
 */
export function bruteVertices(xs: ArrayLike<number>, ys: ArrayLike<number>): number[] {
  const { X, Y } = exactPoints(xs, ys);
  const n = X.length;
  // Distinct points only (first occurrence).
  const idx: number[] = [];
  for (let i = 0; i < n; i++) {
    if (!idx.some((j) => X[j] === X[i] && Y[j] === Y[i])) idx.push(i);
  }
  if (idx.length <= 2) return idx;
  const out: number[] = [];
  for (const p of idx) {
    let extreme = false;
    for (const q of idx) {
      if (q === p) continue;
      let ok = true;
      for (const r of idx) {
        if (r === p || r === q) continue;
        const o = orientB(X, Y, p, q, r);
        if (o < 0n) { ok = false; break; }
        if (o === 0n) {
          const dot = (X[r] - X[p]) * (X[q] - X[p]) + (Y[r] - Y[p]) * (Y[q] - Y[p]);
          if (dot <= 0n) { ok = false; break; }
        }
      }
      if (ok) { extreme = true; break; }
    }
    if (extreme) out.push(p);
  }
  return out;
}

/**
 * Brute-force minimal width, by definition over every edge direction: for each pair of distinct
 * points whose line leaves every point on one side (exact BigInt orientation), the largest
 * distance of a point to that line; the smallest of those. 0 when all points are collinear.
 * Distances from the exact integer cross product (one rounding) over the rounded edge length.
 */
export function bruteWidth(xs: ArrayLike<number>, ys: ArrayLike<number>): number {
  const { X, Y } = exactPoints(xs, ys);
  const n = X.length;
  const scale = exactScale(xs, ys);
  let best = Infinity;
  let anyEdge = false;
  for (let a = 0; a < n; a++) {
    for (let b = 0; b < n; b++) {
      if (X[a] === X[b] && Y[a] === Y[b]) continue;
      let far = 0n, ok = true;
      for (let r = 0; r < n && ok; r++) {
        const o = orientB(X, Y, a, b, r);
        if (o < 0n) ok = false;
        else if (o > far) far = o;
      }
      if (!ok) continue;
      anyEdge = true;
      const len = Math.hypot(xs[b] - xs[a], ys[b] - ys[a]);
      // far is the cross product on the common scale 2^eMin of exactPoints (it scales like the
      // squared coordinates): one rounding in Number(far), exact powers of two after it.
      const d = (Number(far) * scale * scale) / len;
      if (d < best) best = d;
    }
  }
  return anyEdge && Number.isFinite(best) ? best : 0;
}

/** The factor 2^eMin with x = X * 2^eMin for the integers X of exactPoints. */
function exactScale(xs: ArrayLike<number>, ys: ArrayLike<number>): number {
  const { X, Y } = exactPoints(xs, ys);
  for (let i = 0; i < X.length; i++) {
    if (X[i] !== 0n) return xs[i] / Number(X[i]);
    if (Y[i] !== 0n) return ys[i] / Number(Y[i]);
  }
  return 1;
}

/** Oracle measures: vertices by definition, ordered by angle about their centroid. */
export function bruteMeasures(xs: ArrayLike<number>, ys: ArrayLike<number>): Record<Measure, number> & { vx: number[]; vy: number[] } {
  const v = bruteVertices(xs, ys);
  let cx = 0, cy = 0;
  for (const i of v) { cx += xs[i]; cy += ys[i]; }
  cx /= v.length; cy /= v.length;
  const order = v.slice().sort((a, b) => Math.atan2(ys[a] - cy, xs[a] - cx) - Math.atan2(ys[b] - cy, xs[b] - cx));
  const vx = order.map((i) => xs[i]), vy = order.map((i) => ys[i]);
  const h = vx.length;
  let perimeter = 0;
  if (h === 2) perimeter = 2 * Math.hypot(vx[1] - vx[0], vy[1] - vy[0]);
  else if (h > 2) for (let i = 0; i < h; i++) perimeter += Math.hypot(vx[(i + 1) % h] - vx[i], vy[(i + 1) % h] - vy[i]);
  // Area by the trapezoid rule over the edges (a different method from the kernels' fan).
  let area = 0;
  if (h > 2) {
    for (let i = 0; i < h; i++) {
      const j = (i + 1) % h;
      area += (vx[j] - vx[i]) * (vy[j] + vy[i] - 2 * cy);
    }
    area = Math.abs(area) / 2;
  }
  // Diameter: max distance over ALL pairs of points.
  let d2 = 0;
  for (let i = 0; i < xs.length; i++) {
    for (let j = i + 1; j < xs.length; j++) {
      const dx = xs[i] - xs[j], dy = ys[i] - ys[j];
      d2 = Math.max(d2, dx * dx + dy * dy);
    }
  }
  return { perimeter, diameter: Math.sqrt(d2), area, vertices: h, width: bruteWidth(xs, ys), vx, vy };
}

export function relErr(a: number, b: number): number {
  if (a === b) return 0;
  return Math.abs(a - b) / Math.max(Math.abs(a), Math.abs(b));
}

// ---------------------------------------------------------------- point-set fixtures
/** Deterministic uniform [0,1) source for fixtures (mulberry32, common practice). */
export function fixtureRandom(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

export interface PointSet { name: string; xs: number[]; ys: number[] }

/** Random, collinear, duplicate, tiny, rescaled and lattice-walk point sets (our own fixtures). */
export function pointSets(): PointSet[] {
  const sets: PointSet[] = [];
  const rnd = fixtureRandom(20240601);
  for (const n of [1, 2, 3, 5, 20, 45]) {
    const xs: number[] = [], ys: number[] = [];
    for (let i = 0; i < n; i++) { xs.push(rnd() * 2 - 1); ys.push(rnd() * 2 - 1); }
    sets.push({ name: `uniform square n=${n}`, xs, ys });
  }
  {
    const xs: number[] = [], ys: number[] = [];
    for (let i = 0; i < 40; i++) { const a = rnd() * 2 * Math.PI, r = Math.sqrt(rnd()); xs.push(r * Math.cos(a)); ys.push(r * Math.sin(a)); }
    sets.push({ name: "uniform disc n=40", xs, ys });
  }
  sets.push({ name: "two equal points", xs: [0.3, 0.3], ys: [-1, -1] });
  sets.push({ name: "three collinear", xs: [0, 1, 2], ys: [0, 3, 6] });
  sets.push({ name: "triangle", xs: [0, 1, 0], ys: [0, 0, 1] });
  {
    const xs: number[] = [], ys: number[] = [];
    for (let i = 0; i < 40; i++) { const t = Math.floor(rnd() * 50) - 25; xs.push(t); ys.push(3 * t + 1); }
    sets.push({ name: "40 collinear integer points (with repeats)", xs, ys });
  }
  {
    const xs: number[] = [], ys: number[] = [];
    for (let i = 0; i < 40; i++) { const t = rnd(); xs.push(t); ys.push(t); }
    sets.push({ name: "40 points on y = x", xs, ys });
  }
  {
    // A square with points on its edges and many duplicates.
    const xs: number[] = [], ys: number[] = [];
    for (let i = 0; i < 40; i++) {
      const side = i % 4, t = (i % 5) / 4;
      const p = [[t, 0], [1, t], [1 - t, 1], [0, 1 - t]][side];
      xs.push(p[0]); ys.push(p[1]);
      if (i % 3 === 0) { xs.push(p[0]); ys.push(p[1]); }
    }
    for (let i = 0; i < 5; i++) { xs.push(0.5); ys.push(0.5); }
    sets.push({ name: "square boundary with duplicates", xs, ys });
  }
  for (const scale of [1e-9, 1e-3, 1e3, 1e9]) {
    const xs: number[] = [], ys: number[] = [];
    for (let i = 0; i < 40; i++) { xs.push((rnd() - 0.5) * scale); ys.push((rnd() - 0.5) * scale); }
    sets.push({ name: `rescaled uniform x${scale}`, xs, ys });
    // Lattice points rescaled: exact collinearities survive scaling by a power of two only, so
    // this set tests near-degenerate (rounded) collinear input.
    const lx: number[] = [], ly: number[] = [];
    for (let i = 0; i < 40; i++) { lx.push(Math.floor(rnd() * 7) * scale); ly.push(Math.floor(rnd() * 7) * scale); }
    sets.push({ name: `rescaled 7x7 grid points x${scale}`, xs: lx, ys: ly });
  }
  for (const seed of [1, 2, 3]) {
    // Simple random walk on Z^2, 60 steps: collinear runs and repeated sites everywhere.
    const r = fixtureRandom(seed);
    const xs = [0], ys = [0];
    for (let i = 0; i < 60; i++) {
      const d = Math.floor(r() * 4);
      xs.push(xs[i] + [1, -1, 0, 0][d]);
      ys.push(ys[i] + [0, 0, 1, -1][d]);
    }
    sets.push({ name: `lattice walk seed ${seed}`, xs, ys });
  }
  {
    // Lattice walk with drift and large offsets (exact integers up to 2^24).
    const r = fixtureRandom(9);
    const xs = [16777216 - 30], ys = [-8388608];
    for (let i = 0; i < 60; i++) {
      const d = Math.floor(r() * 3);
      xs.push(xs[i] + [1, 1, 0][d]);
      ys.push(ys[i] + [0, 1, -1][d]);
    }
    sets.push({ name: "drifting lattice walk far from the origin", xs, ys });
  }
  return sets;
}

// ---------------------------------------------------------------- statistics
/** Mean and standard error of the mean. */
export function meanSE(v: ArrayLike<number>): { mean: number; se: number; sd: number } {
  const n = v.length;
  let m = 0;
  for (let i = 0; i < n; i++) m += v[i];
  m /= n;
  let s = 0;
  for (let i = 0; i < n; i++) s += (v[i] - m) ** 2;
  const sd = Math.sqrt(s / (n - 1));
  return { mean: m, se: sd / Math.sqrt(n), sd };
}

/**
 * Asymptotic Kolmogorov survival function P(sqrt(n) D_n > t) = 2 sum_{k>=1} (-1)^(k-1) exp(-2 k^2 t^2)
 * (Kolmogorov's distribution, 1933; see "Evaluating Kolmogorov's distribution", J. Stat. Softw. 8 (2003) on its accuracy:
 * fine for the sample sizes used here, n >= 10^4).
 */
export function kolmogorovPValue(sqrtnD: number): number {
  if (sqrtnD < 0.2) return 1;
  let s = 0;
  for (let k = 1; k <= 100; k++) s += (k % 2 ? 2 : -2) * Math.exp(-2 * k * k * sqrtnD * sqrtnD);
  return Math.min(1, Math.max(0, s));
}

/** One-sample Kolmogorov–Smirnov test of `sample` against the continuous CDF `cdf`. */
export function ksTest(sample: ArrayLike<number>, cdf: (x: number) => number): { d: number; p: number } {
  const v = Float64Array.from(sample).sort();
  const n = v.length;
  let d = 0;
  for (let i = 0; i < n; i++) {
    const f = cdf(v[i]);
    d = Math.max(d, (i + 1) / n - f, f - i / n);
  }
  return { d, p: kolmogorovPValue(Math.sqrt(n) * d) };
}

// ---------------------------------------------------------------- kernels
let wasmModule: WebAssembly.Module | undefined;
export function wasmModuleOnce(): WebAssembly.Module {
  wasmModule ??= loadWasmModuleSync();
  return wasmModule;
}

export function kernels(laws: StepLaw[], grid: number[], seed: number): { twin: TwinKernel; wasm: WasmKernel } {
  const setup = { walks: compileWalks(laws), grid, seed };
  return { twin: createTwinKernel(setup), wasm: createWasmKernel(wasmModuleOnce(), setup) };
}

export const GAUSS_ISO: StepLaw = { law: "gaussian", mean: [0, 0], cov: [[1, 0], [0, 1]] };
export const SAMPLE_LAWS: Record<string, StepLaw> = {
  gaussian: { law: "gaussian", mean: [0.7, -0.2], cov: [[2, 0.6], [0.6, 1]] },
  "gaussian singular [[1,1],[1,1]]": { law: "gaussian", mean: [0.5, 0], cov: [[1, 1], [1, 1]] },
  "gaussian singular [[0,0],[0,1]]": { law: "gaussian", mean: [1, 0], cov: [[0, 0], [0, 1]] },
  discrete: { law: "discrete", atoms: [[1, 0], [-1, 0], [0, 1], [0, -1], [1, 1]], weights: [0.3, 0.2, 0.25, 0.15, 0.1] },
  circle: { law: "circle", mean: [0.3, 0.1], radius: 1.5 },
  student: { law: "student", mean: [0.2, 0.4], scale: [[1, -0.3], [-0.3, 0.5]], dof: 3.5 },
  empirical: { law: "empirical", file: "fixture.csv", steps: [[1, 0.5], [-0.75, 0.25], [0.1, -1], [0, 0], [2, 2]] },
};
