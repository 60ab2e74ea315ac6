// Synthetic SimulationResults for the verdict tests: per-path values drawn from laws with KNOWN
// moments (no hulls involved), summed into BlockStats exactly as the driver does (one MomentState
// per (gridIndex, measure) per block, blocks in order), plus a kept sample of the first paths.
// Co-moments are left empty: evaluateChecks does not read them (it uses the block jackknife).

import seedrandom from "seedrandom";
import { emptyCoMoments, emptyMoments, pushValue } from "../../src/stats/moments.js";
import type { BlockStats, SimulationResult } from "../../src/run/types.js";
import type { Claim, LoadedSuite, Measure } from "../../src/suite/schema.js";
import { MEASURES } from "../../src/suite/schema.js";
import { recordLayout } from "../../src/engine/types.js";

export type PathGenerator = (rng: () => number, grid: number[], out: Float64Array) => void;

export function gaussian(rng: () => number): number {
  const u = 1 - rng();
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * rng());
}

/** Perimeter-like: Var(X_n) = s2 n + c sqrt(n) (so Var/n = s2 + c n^-1/2), E X_n = g n + a ln n + b; Gaussian, correlated across n. */
export function driftPerimeter(s2: number, c: number, g: number, a: number, b: number): PathGenerator {
  return (rng, grid, out) => {
    let x = 0;
    let prevV = 0;
    grid.forEach((n, i) => {
      const v = s2 * n + c * Math.sqrt(n);
      x += Math.sqrt(v - prevV) * gaussian(rng);
      prevV = v;
      out[i] = g * n + a * Math.log(n) + b + x;
    });
  };
}

/**
 * Non-normal at every n: X_n = n (E - 1 + 0.3 Z_n), E ~ Exp(1), Z_n independent N(0,1)
 * (Var/n^2 = 1.09, skewness 2/1.09^1.5 = 1.757).
 */
export const exponentialArea: PathGenerator = (rng, grid, out) => {
  const e = -Math.log(1 - rng());
  grid.forEach((n, i) => (out[i] = n * (e - 1 + 0.3 * gaussian(rng))));
};

/** Exactly normal at every n: X_n = sqrt(n) (Z + 0.5 Z_n), Var/n = 1.25. */
export const normalDiameter: PathGenerator = (rng, grid, out) => {
  const z = gaussian(rng);
  grid.forEach((n, i) => (out[i] = Math.sqrt(n) * (z + 0.5 * gaussian(rng))));
};

export interface SynthOptions {
  seed: string;
  grid: number[];
  blocks: number;
  pathsPerBlock: number;
  keep: number;
  generators: Partial<Record<Measure, PathGenerator>>;
  claims?: Claim[];
  alpha?: number;
  expectedRate?: number;
}

export function synthesise(o: SynthOptions): SimulationResult {
  const rng = seedrandom(o.seed);
  const G = o.grid.length;
  const measures = MEASURES.filter((m) => o.generators[m] !== undefined);
  const layout = recordLayout(G);
  const keepValues = Array.from({ length: layout.width }, () => new Float64Array(o.keep));
  const out = new Float64Array(G);
  const blocks: BlockStats[] = [];
  let path = 0;
  for (let b = 0; b < o.blocks; b++) {
    const moments = Array.from({ length: layout.width }, () => emptyMoments());
    for (let p = 0; p < o.pathsPerBlock; p++, path++) {
      MEASURES.forEach((m) => {
        const gen = o.generators[m];
        if (gen) gen(rng, o.grid, out);
        else out.fill(0);
        for (let g = 0; g < G; g++) {
          pushValue(moments[layout.index(g, m)], out[g]);
          if (path < o.keep) keepValues[layout.index(g, m)][path] = out[g];
        }
      });
    }
    blocks.push({ block: b, firstPath: b * o.pathsPerBlock, paths: o.pathsPerBlock, moments, comoments: emptyCoMoments(layout.width) });
  }
  const suite: LoadedSuite = {
    title: "synthetic",
    seed: 1,
    walks: [{ law: "gaussian", mean: [1, 0], cov: [[1, 0], [0, 1]] }],
    measure: measures,
    n: o.grid,
    paths: o.blocks * o.pathsPerBlock,
    claims: o.claims,
    alpha: o.alpha,
    expectedRate: o.expectedRate,
    blocks: o.blocks,
    path: null,
    hash: "synthetic",
  };
  return {
    suite,
    blocks,
    blockCount: o.blocks,
    results: [],
    sample: { pathIndex: Array.from({ length: Math.min(o.keep, path) }, (_, i) => i), values: keepValues },
    min: [],
    max: [],
    wallSeconds: 0,
    workers: 1,
  };
}
