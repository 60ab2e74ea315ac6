// Synthetic SimulationResults for the verdict tests: per-path values drawn from laws with KNOWN
// moments (no hulls involved), summed into BlockStats exactly as the driver does (one MomentState
// per (gridIndex, measure) per block, blocks in order), plus a kept sample of the first paths.
// Co-moments across n are left empty (evaluateChecks does not read them). The per-n co-moments of
// [measures, controls] are filled: without `controls`, with the measures alone (no control values:
// plain estimates only); with `controls`, one Gaussian walk (step covariance I, the suite's walk)
// is simulated exactly on the grid (segment increments of the centred endpoint X_n and integrated
// path Y_n drawn jointly: Cov = F_m (x) I, F_m = [[m, m(m+1)/2], [m(m+1)/2, m(m+1)(2m+1)/6]]) and the
// generators receive its values to build measures that depend on them.

import seedrandom from "seedrandom";
import { emptyCoMoments, emptyMoments, pushValue, pushVector } from "../../src/stats/moments.js";
import type { BlockStats, SimulationResult } from "../../src/run/types.js";
import type { Claim, LoadedSuite, Measure } from "../../src/suite/schema.js";
import { MEASURES } from "../../src/suite/schema.js";
import { recordLayout } from "../../src/engine/types.js";

/** ctl (with `controls`): per grid point g, [Xx, Xy, Yx, Yy] at ctl[4g..4g+4) of this path. */
export type PathGenerator = (rng: () => number, grid: number[], out: Float64Array, ctl?: Float64Array) => void;

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
  tolerance?: number;
  /** Simulate the control values of one Gaussian walk and hand them to the generators. */
  controls?: boolean;
}

/** The centred endpoint and integrated path of a Gaussian walk (step covariance I) on the grid. */
export function gaussianControls(rng: () => number, grid: number[], ctl: Float64Array): void {
  const X = [0, 0], Y = [0, 0];
  let prev = 0;
  grid.forEach((n, g) => {
    const m = n - prev;
    // Within the segment: dX ~ N(0, m I), I_m = sum of partial sums ~ N(0, m(m+1)(2m+1)/6 I), Cov = m(m+1)/2 I.
    const a = m, b = (m * (m + 1)) / 2, c = (m * (m + 1) * (2 * m + 1)) / 6;
    const l11 = Math.sqrt(a), l21 = b / l11, l22 = Math.sqrt(Math.max(0, c - l21 * l21));
    for (let d = 0; d < 2; d++) {
      const z1 = gaussian(rng), z2 = gaussian(rng);
      const dX = l11 * z1, I = l21 * z1 + l22 * z2;
      Y[d] += m * X[d] + I;
      X[d] += dX;
    }
    ctl.set([X[0], X[1], Y[0], Y[1]], 4 * g);
    prev = n;
  });
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
  const C = o.controls ? 4 : 0;
  const q = layout.perPoint;
  const ctl = new Float64Array(4 * G);
  const row = new Float64Array(q + C);
  const values = new Float64Array(layout.width);
  for (let b = 0; b < o.blocks; b++) {
    const moments = Array.from({ length: layout.width }, () => emptyMoments());
    const controlComoments = Array.from({ length: G }, () => emptyCoMoments(q + C));
    for (let p = 0; p < o.pathsPerBlock; p++, path++) {
      if (o.controls) gaussianControls(rng, o.grid, ctl);
      MEASURES.forEach((m) => {
        const gen = o.generators[m];
        if (gen) gen(rng, o.grid, out, o.controls ? ctl : undefined);
        else out.fill(0);
        for (let g = 0; g < G; g++) {
          pushValue(moments[layout.index(g, m)], out[g]);
          values[layout.index(g, m)] = out[g];
          if (path < o.keep) keepValues[layout.index(g, m)][path] = out[g];
        }
      });
      for (let g = 0; g < G; g++) {
        for (let mi = 0; mi < q; mi++) row[mi] = values[g * q + mi];
        for (let a = 0; a < C; a++) row[q + a] = ctl[4 * g + a];
        pushVector(controlComoments[g], row, 0);
      }
    }
    blocks.push({ block: b, firstPath: b * o.pathsPerBlock, paths: o.pathsPerBlock, moments, comoments: emptyCoMoments(layout.width), controlComoments });
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
    tolerance: o.tolerance,
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

/**
 * Perimeter-like measure driven by the walk: M_n = 3 n + a X_n.x + b X_n.y + e_n with e_n a
 * Gaussian random walk in n^1/2 (Var e_n = c sqrt(n)), independent of the walk (needs `controls`).
 * With step covariance I: Var M_n / n = a^2 + b^2 + c n^-1/2, E M_n = 3 n; the linearisation is
 * g = (a, b) with remainder e_n (Var(R_n)/n = c n^-1/2).
 */
export function linearPerimeter(a: number, b: number, c: number): PathGenerator {
  return (rng, grid, out, ctl) => {
    let e = 0, prev = 0;
    grid.forEach((n, g) => {
      e += Math.sqrt(c * (Math.sqrt(n) - Math.sqrt(prev))) * gaussian(rng);
      prev = n;
      out[g] = 3 * n + a * ctl![4 * g] + b * ctl![4 * g + 1] + e;
    });
  };
}

