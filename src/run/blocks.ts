// Raw per-path kernel values of one block -> that block's mergeable statistics and kept sample.
// Pure functions of numbers: used in-process, in worker threads, and by combining parts alike.

import { emptyCoMoments, emptyMoments, mergeCoMoments, mergeMoments, pushValue, pushVector } from "../stats/moments.js";
import { CONTROLS_PER_WALK, recordLayout } from "../engine/types.js";
import type { CoMomentState } from "../stats/types.js";
import type { BlockStats, KeptSample } from "./types.js";

/** At most this many per-path records are kept for distributional checks (2^17). */
export const MAX_KEPT = 1 << 17;

/** Candidates for the kept sample: path index, its selection hash, and its values. */
export interface KeptCandidates {
  pathIndex: number[];
  hash: number[];
  /** Row-major: record i occupies values[i*dim .. (i+1)*dim), dim = recordLayout(grid.length).width. */
  values: number[];
}

export interface BlockOutput {
  stats: BlockStats;
  kept: KeptCandidates;
  min: number[];
  max: number[];
}

/** Summarise the kernel output of one block (pathCount records laid out as recordLayout(gridLength)). */
export function summarizeBlock(
  values: Float64Array,
  controls: Float64Array,
  walks: number,
  gridLength: number,
  seed: number,
  block: number,
  firstPath: number,
  pathCount: number,
  totalPaths: number,
  keep: number = MAX_KEPT,
): BlockOutput {
  const dim = recordLayout(gridLength).width;
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
  const kept = selectKept(values, dim, seed, firstPath, pathCount, totalPaths, keep);
  const controlComoments = controlSums(values, controls, walks, gridLength, pathCount);
  return { stats: { block, firstPath, paths: pathCount, moments, comoments, controlComoments }, kept, min, max };
}

/** Per grid point, co-moments of [the record's numbers at that point, controls] (BlockStats.controlComoments). */
function controlSums(values: Float64Array, controls: Float64Array, walks: number, gridLength: number, pathCount: number): CoMomentState[] {
  const c = walks * CONTROLS_PER_WALK;
  const q = recordLayout(gridLength).perPoint;
  const d = q + c;
  if (controls.length !== pathCount * gridLength * c) throw new Error(`controls: length ${controls.length}, expected ${pathCount * gridLength * c}`);
  const out = Array.from({ length: gridLength }, () => emptyCoMoments(d));
  const row = new Float64Array(d);
  const scratch = new Float64Array(d);
  for (let p = 0; p < pathCount; p++) {
    for (let g = 0; g < gridLength; g++) {
      const vo = (p * gridLength + g) * q;
      const co = (p * gridLength + g) * c;
      for (let m = 0; m < q; m++) row[m] = values[vo + m];
      for (let a = 0; a < c; a++) row[q + a] = controls[co + a];
      pushVector(out[g], row, 0, scratch);
    }
  }
  return out;
}

/** Blocks in block order: the fixed merge order makes results independent of workers. */
function inBlockOrder(blocks: BlockStats[]): BlockStats[] {
  return [...blocks].sort((a, b) => a.block - b.block);
}

/** Moment sums of all blocks, merged in block order. */
export function mergeBlockMoments(blocks: BlockStats[]): BlockStats["moments"] {
  const sorted = inBlockOrder(blocks);
  let moments = sorted[0].moments;
  for (let i = 1; i < sorted.length; i++) moments = moments.map((m, j) => mergeMoments(m, sorted[i].moments[j]));
  return moments;
}

/** Per grid point, the control co-moments of all blocks merged in block order. */
export function mergeBlockControlComoments(blocks: BlockStats[]): CoMomentState[] {
  const sorted = inBlockOrder(blocks);
  let acc = sorted[0].controlComoments;
  for (let i = 1; i < sorted.length; i++) acc = acc.map((c, g) => mergeCoMoments(c, sorted[i].controlComoments[g]));
  return acc;
}

/** Co-moment sums of all blocks, merged in block order. */
export function mergeBlockComoments(blocks: BlockStats[]): BlockStats["comoments"] {
  const sorted = inBlockOrder(blocks);
  let comoments = sorted[0].comoments;
  for (let i = 1; i < sorted.length; i++) comoments = mergeCoMoments(comoments, sorted[i].comoments);
  return comoments;
}

/**
 * Selection hash of a path: 53 bits from (seed, global path index) by murmur3's finaliser.
 * The kept sample is the MAX_KEPT paths with the smallest hashes, so it does not depend on how
 * paths are split into blocks, workers or parts.
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

/**
 * Candidates of one block: the paths whose hash is below a threshold set so that about 1.1 x keep
 * paths of the whole run pass it (all paths when the run has at most `keep`). The final sample is
 * the `keep` smallest hashes among the candidates: with a margin of 0.1 keep >> sqrt(keep) the
 * threshold almost never leaves fewer than `keep`, and when it does the sample is smaller but still
 * the same for any split of the run. No per-block sort is needed.
 */
function selectKept(
  values: Float64Array,
  dim: number,
  seed: number,
  firstPath: number,
  pathCount: number,
  totalPaths: number,
  keep: number,
): KeptCandidates {
  const threshold = totalPaths <= keep ? Infinity : Math.ceil((1.1 * keep * 2 ** 53) / totalPaths);
  const out: KeptCandidates = { pathIndex: [], hash: [], values: [] };
  for (let p = 0; p < pathCount; p++) {
    const h = pathHash(seed, firstPath + p);
    if (h >= threshold) continue;
    out.pathIndex.push(firstPath + p);
    out.hash.push(h);
    for (let j = 0; j < dim; j++) out.values.push(values[p * dim + j]);
  }
  return out;
}

/** Keep the `keep` candidates with the smallest hashes (ties by path index) out of candidate sets. */
export function mergeKept(sets: KeptCandidates[], dim: number, keep: number = MAX_KEPT): KeptCandidates {
  const refs: { set: number; row: number }[] = [];
  sets.forEach((k, set) => {
    for (let row = 0; row < k.hash.length; row++) refs.push({ set, row });
  });
  const h = (r: { set: number; row: number }) => sets[r.set].hash[r.row];
  const idx = (r: { set: number; row: number }) => sets[r.set].pathIndex[r.row];
  refs.sort((x, y) => h(x) - h(y) || idx(x) - idx(y));
  const out: KeptCandidates = { pathIndex: [], hash: [], values: [] };
  for (const r of refs.slice(0, keep)) {
    out.pathIndex.push(idx(r));
    out.hash.push(h(r));
    const v = sets[r.set].values;
    for (let j = 0; j < dim; j++) out.values.push(v[r.row * dim + j]);
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
