// Delete-one-block jackknife of a vector statistic computed from per-block moment states.
//
// Method: the delete-a-group jackknife for groups of unequal size, "Delete-m jackknife for unequal
// m", Statistics and Computing 9 (1999) 3-8: with g blocks of
// sizes m_j, N = sum m_j, h_j = N / m_j, theta_(-j) the statistic with block j removed,
//   theta_J = g theta - sum_j (1 - m_j/N) theta_(-j),
//   pseudo_j = h_j theta - (h_j - 1) theta_(-j),
//   Cov = (1/g) sum_j (pseudo_j - theta_J)(pseudo_j - theta_J)' / (h_j - 1).
// With equal blocks this is the textbook (g-1)/g sum (theta_(-j) - mean)(...)' (An Introduction
// to the Bootstrap, 1993, ch. 11). Each theta_(-j) merges all blocks except j in
// block order (so the bits do not depend on how blocks were computed). Cost O(g^2 s) merges, s the
// number of series per block.
// Example: the mean of one series, blocks of equal size: Cov equals s^2/N up to the block effect.
// jackknifeVariance(result, f) applies the same formula to a scalar function f of the statistic
// (f evaluated on theta and on each theta_(-j)): the jackknife variance of f(theta), e.g. of the
// difference of two fits of the same data; for a linear f(v) = c'v it equals c' Cov c exactly.

import { emptyMoments, mergeMoments } from "./moments.js";
import type { MomentState } from "./types.js";

export interface JackknifeResult {
  /** The statistic on all blocks. */
  estimate: Float64Array;
  /** Bias-corrected jackknife estimate theta_J. */
  biasCorrected: Float64Array;
  /** Jackknife covariance (row-major d x d). */
  covariance: Float64Array;
  /** Number of blocks used. */
  blocks: number;
  /** theta_(-j): the statistic with block j removed, j = 0..g-1. */
  leaveOut: Float64Array[];
  /** Number of values (count) of each block. */
  sizes: number[];
}

/**
 * blocks[j][s] is the moment state of series s in block j (all blocks have the same series).
 * `statistic` maps the merged states (one per series) to a vector of fixed length d.
 */
export function blockJackknife(
  blocks: readonly (readonly MomentState[])[],
  statistic: (merged: MomentState[]) => ArrayLike<number>,
): JackknifeResult {
  const g = blocks.length;
  if (g < 2) throw new Error(`blocks: the jackknife needs at least 2 blocks, got ${g}`);
  const series = blocks[0].length;
  for (let j = 0; j < g; j++) {
    if (blocks[j].length !== series) throw new Error(`blocks[${j}]: has ${blocks[j].length} series, expected ${series}`);
  }
  const sizes = blocks.map((b, j) => {
    const c = b.length > 0 ? b[0].count : 0;
    if (!(c > 0)) throw new Error(`blocks[${j}]: empty block`);
    return c;
  });
  const mergeExcept = (skip: number): MomentState[] => {
    const out: MomentState[] = [];
    for (let s = 0; s < series; s++) {
      let acc = emptyMoments();
      for (let j = 0; j < g; j++) if (j !== skip) acc = mergeMoments(acc, blocks[j][s]);
      out.push(acc);
    }
    return out;
  };
  const full = Float64Array.from(statistic(mergeExcept(-1)));
  const d = full.length;
  const leaveOut: Float64Array[] = [];
  for (let j = 0; j < g; j++) {
    const t = Float64Array.from(statistic(mergeExcept(j)));
    if (t.length !== d) throw new Error(`statistic: returned length ${t.length}, expected ${d}`);
    leaveOut.push(t);
  }
  const { biasCorrected, covariance } = jackknifeFromReplicates(full, leaveOut, sizes);
  return { estimate: full, biasCorrected, covariance, blocks: g, leaveOut, sizes };
}

/**
 * The jackknife above from the full statistic, its delete-one-block values and the block sizes
 * (for statistics whose replicates are computed another way, e.g. control variates).
 */
export function jackknifeFromReplicates(
  full: ArrayLike<number>,
  leaveOut: readonly ArrayLike<number>[],
  sizes: readonly number[],
): { biasCorrected: Float64Array; covariance: Float64Array } {
  const g = leaveOut.length;
  const d = full.length;
  const total = sizes.reduce((a, b) => a + b, 0);
  const biasCorrected = new Float64Array(d);
  for (let a = 0; a < d; a++) {
    let s = g * full[a];
    for (let j = 0; j < g; j++) s -= (1 - sizes[j] / total) * leaveOut[j][a];
    biasCorrected[a] = s;
  }
  const covariance = new Float64Array(d * d);
  const dev = new Float64Array(d);
  for (let j = 0; j < g; j++) {
    const h = total / sizes[j];
    for (let a = 0; a < d; a++) dev[a] = h * full[a] - (h - 1) * leaveOut[j][a] - biasCorrected[a];
    const w = 1 / (g * (h - 1));
    for (let a = 0; a < d; a++) for (let b = 0; b < d; b++) covariance[a * d + b] += w * dev[a] * dev[b];
  }
  return { biasCorrected, covariance };
}
