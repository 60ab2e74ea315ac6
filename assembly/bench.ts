// Bench entry (build/walkhull.bench.wasm, target "bench"): the release API plus per-stage entry
// points and the filter's survival counters, which the release build does not carry.

import { fillNormals, nextSubstream, s0, s1, s2, s3, TWO_M53 } from "./rng";
import { candCount, chunkDropped } from "./filters";
import { filterStep, chainCandidates, clearHull } from "./paths";
import { area, diameter, perimeter } from "./measures";
import { G, gridAt, HX, HY, K, N, NZ, PX } from "./setup";
import { generateWalks } from "./walks";

export * from "./index";

const BENCH_FUNCTIONAL_REPS: i32 = 8;
let statGathered: f64 = 0;
let statKept: f64 = 0;

/**
 * Runs `count` paths of the current block stream through the pipeline's stages up to `level`:
 * 0 normals only (PRNG + ziggurat, 2 per step and walk), 1 + walk positions and moments,
 * 2 + extremes and point filter, 3 + sort and monotone chain, 4 + perimeter, 5 + diameter,
 * 6 + area. Levels 4-6 evaluate each functional BENCH_FUNCTIONAL_REPS times per hull (the bench divides
 * their differences by it). Differences between levels give each stage's cost.
 * Returns a checksum; benchSurvival() gives the filter's survival fraction over these calls.
 */
export function benchPaths(count: i32, level: i32): f64 {
  let check = 0.0;
  for (let p = 0; p < count; p++) {
    if (level == 0) {
      for (let j = 0; j < K; j++) {
        nextSubstream();
        fillNormals(NZ, N << 1);
        check += load<f64>(NZ);
      }
      continue;
    }
    generateWalks();
    if (level == 1) {
      check += load<f64>(PX + (<usize>N << 3));
      continue;
    }
    let prev = 0;
    for (let g = 0; g < G; g++) {
      const hi = gridAt(g);
      filterStep(g, prev, hi);
      statGathered += <f64>(K * (hi - prev));
      statKept += <f64>candCount;
      if (level == 2) {
        check += <f64>candCount;
        clearHull();
      } else {
        const h = chainCandidates();
        check += <f64>h;
        // Each functional runs BENCH_FUNCTIONAL_REPS times so that its cost stands out of the noise.
        for (let r = 0; r < BENCH_FUNCTIONAL_REPS; r++) {
          if (level >= 4) check += perimeter(HX, HY, h);
          if (level >= 5) check += diameter(HX, HY, h);
          if (level >= 6) check += area(HX, HY, h);
        }
      }
      prev = hi;
    }
  }
  return check;
}

/**
 * Survival fraction of the point filters since the last benchResetStats: candidates left for the
 * sort and chain (after the per-walk pass and the joint (k > 1) or rotated (k = 1) pass) per new point.
 */
export function benchSurvival(): f64 {
  return statGathered > 0 ? statKept / statGathered : 0.0;
}

export function benchResetStats(): void {
  statGathered = 0;
  statKept = 0;
  chunkDropped = 0;
}

/**
 * Points dropped in whole chunks (filterGroup's box test, any pass) per new point, over the
 * benchPaths calls since the last benchResetStats.
 */
export function benchChunkDropped(): f64 {
  return statGathered > 0 ? chunkDropped / statGathered : 0.0;
}

/** The sum of `count` uniforms on [0, 1) (xoshiro256** alone, state in locals). */
export function benchUniforms(count: i32): f64 {
  let a = s0, b = s1, c = s2, d = s3;
  let sum = 0.0;
  for (let k = 0; k < count; k++) {
    const r = rotl<u64>(b * 5, 7) * 9;
    const t = b << 17;
    c ^= a; d ^= b; b ^= c; a ^= d; c ^= t; d = rotl<u64>(d, 45);
    sum += <f64>(r >> 11) * TWO_M53;
  }
  s0 = a; s1 = b; s2 = c; s3 = d;
  return sum;
}
