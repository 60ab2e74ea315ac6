// Raw per-path kernel values of one block -> that block's mergeable statistics and kept sample.
// Pure functions of numbers: used in-process, in worker threads, and by shard merging alike.

import { emptyCoMoments, emptyMoments, mergeCoMoments, mergeMoments, pushValue, pushVector } from "../stats/moments.js";
import { MEASURES_PER_RECORD } from "../engine/types.js";
import type { BlockStats, KeptSample } from "./types.js";

/** At most this many per-path records are kept for distributional checks (2^17). */
export const MAX_KEPT = 1 << 17;

/** Candidates for the kept sample: path index, its selection hash, and its values. */
export interface KeptCandidates {
  pathIndex: number[];
  hash: number[];
  /** Row-major: record i occupies values[i*dim .. (i+1)*dim), dim = grid.length * 4. */
  values: number[];
}

export interface BlockOutput {
  stats: BlockStats;
  kept: KeptCandidates;
  min: number[];
  max: number[];
}

/** Summarise the kernel output of one block (layout [path][gridIndex][measure]). */
export function summarizeBlock(
  values: Float64Array,
  gridLength: number,
  seed: number,
  block: number,
  firstPath: number,
  pathCount: number,
  keep: number = MAX_KEPT,
): BlockOutput {
  const dim = gridLength * MEASURES_PER_RECORD;
  const moments = Array.from({ length: dim }, emptyMoments);
  const comoments = emptyCoMoments(dim);
  const min = new Array<number>(dim).fill(Infinity);
  const max = new Array<number>(dim).fill(-Infinity);
  for (let p = 0; p < pathCount; p++) {
    const off = p * dim;
    for (let j = 0; j < dim; j++) {
      const x = values[off + j];
      pushValue(moments[j], x);
      if (x < min[j]) min[j] = x;
      if (x > max[j]) max[j] = x;
    }
    pushVector(comoments, values, off);
  }
  const kept = selectKept(values, dim, seed, firstPath, pathCount, keep);
  return { stats: { block, firstPath, paths: pathCount, moments, comoments }, kept, min, max };
}

/** Merge block statistics in block order (the fixed order makes the result independent of workers). */
export function mergeBlocks(blocks: BlockStats[]): { moments: BlockStats["moments"]; comoments: BlockStats["comoments"] } {
  const sorted = [...blocks].sort((a, b) => a.block - b.block);
  let moments = sorted[0].moments;
  let comoments = sorted[0].comoments;
  for (let i = 1; i < sorted.length; i++) {
    moments = moments.map((m, j) => mergeMoments(m, sorted[i].moments[j]));
    comoments = mergeCoMoments(comoments, sorted[i].comoments);
  }
  return { moments, comoments };
}

/**
 * Selection hash of a path: 53 bits from (seed, global path index) by murmur3's finaliser.
 * The kept sample is the MAX_KEPT paths with the smallest hashes, so it does not depend on how
 * paths are split into blocks, workers or shards.
 */
export function pathHash(seed: number, pathIndex: number): number {
  const s0 = seed >>> 0;
  const s1 = Math.floor(seed / 4294967296) >>> 0;
  const i0 = pathIndex >>> 0;
  const i1 = Math.floor(pathIndex / 4294967296) >>> 0;
  const k = fmix32(s0 ^ fmix32(s1 + 0x9e3779b9));
  const a = fmix32(i0 ^ fmix32(k ^ i1 ^ 0x85ebca6b));
  const b = fmix32(a ^ k ^ 0x27d4eb2f);
  return a * 2097152 + (b >>> 11);
}

function fmix32(h: number): number {
  h ^= h >>> 16;
  h = Math.imul(h, 0x85ebca6b);
  h ^= h >>> 13;
  h = Math.imul(h, 0xc2b2ae35);
  h ^= h >>> 16;
  return h >>> 0;
}

function byHash(hash: number[], pathIndex: number[]) {
  return (x: number, y: number) => hash[x] - hash[y] || pathIndex[x] - pathIndex[y];
}

function selectKept(
  values: Float64Array,
  dim: number,
  seed: number,
  firstPath: number,
  pathCount: number,
  keep: number,
): KeptCandidates {
  const hash = new Array<number>(pathCount);
  const pathIndex = new Array<number>(pathCount);
  for (let p = 0; p < pathCount; p++) {
    pathIndex[p] = firstPath + p;
    hash[p] = pathHash(seed, firstPath + p);
  }
  const order = Array.from({ length: pathCount }, (_, i) => i).sort(byHash(hash, pathIndex));
  const chosen = order.slice(0, Math.min(keep, pathCount));
  const out: KeptCandidates = { pathIndex: [], hash: [], values: [] };
  for (const p of chosen) {
    out.pathIndex.push(pathIndex[p]);
    out.hash.push(hash[p]);
    for (let j = 0; j < dim; j++) out.values.push(values[p * dim + j]);
  }
  return out;
}

/** Keep the `keep` candidates with the smallest hashes out of two candidate sets. */
export function mergeKept(a: KeptCandidates, b: KeptCandidates, dim: number, keep: number = MAX_KEPT): KeptCandidates {
  const hash = [...a.hash, ...b.hash];
  const pathIndex = [...a.pathIndex, ...b.pathIndex];
  const order = Array.from({ length: hash.length }, (_, i) => i).sort(byHash(hash, pathIndex));
  const out: KeptCandidates = { pathIndex: [], hash: [], values: [] };
  for (const i of order.slice(0, keep)) {
    out.pathIndex.push(pathIndex[i]);
    out.hash.push(hash[i]);
    const src = i < a.hash.length ? a.values : b.values;
    const row = i < a.hash.length ? i : i - a.hash.length;
    for (let j = 0; j < dim; j++) out.values.push(src[row * dim + j]);
  }
  return out;
}

/** The kept sample as columns, in ascending path order. */
export function keptToSample(k: KeptCandidates, dim: number): KeptSample {
  const order = Array.from({ length: k.pathIndex.length }, (_, i) => i).sort((x, y) => k.pathIndex[x] - k.pathIndex[y]);
  const values = Array.from({ length: dim }, () => new Float64Array(order.length));
  order.forEach((row, i) => {
    for (let j = 0; j < dim; j++) values[j][i] = k.values[row * dim + j];
  });
  return { pathIndex: order.map((r) => k.pathIndex[r]), values };
}
