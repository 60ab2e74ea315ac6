// Raw per-path kernel values of one block -> that block's mergeable statistics and kept sample.
// Pure functions of numbers: used in-process, in worker threads, and by combining parts alike.

import { emptyCoMoments, emptyMoments, mergeCoMoments, mergeMoments, pushValue, pushVector } from "../stats/moments.js";
import { CONTROLS_PER_WALK, recordLayout } from "../engine/types.js";
import type { CoMomentState } from "../stats/types.js";
import type { BlockStats, KeptSample } from "./types.js";

/** At most this many per-path records are kept for distributional checks (2^17). */
export const MAX_KEPT = 1 << 17;

/**
 * Candidates for the kept sample: path index, its selection hash, and its values. Typed arrays (both
 * integers below 2^53, so exact in a double): a block's set crosses threads as one copy of bytes,
 * and concatenating, ordering and checkpointing 10^5 rows of a 30-number record allocates no
 * numbers one by one.
 */
export interface KeptCandidates {
  pathIndex: Float64Array;
  hash: Float64Array;
  /** Row-major: record i occupies values[i*dim .. (i+1)*dim), dim = recordLayout(grid.length).width. */
  values: Float64Array;
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
  const pathIndex = new Float64Array(pathCount);
  const hash = new Float64Array(pathCount);
  const kept = new Float64Array(pathCount * dim);
  let count = 0;
  for (let p = 0; p < pathCount; p++) {
    const h = pathHash(seed, firstPath + p);
    if (h >= threshold) continue;
    pathIndex[count] = firstPath + p;
    hash[count] = h;
    for (let j = 0, from = p * dim, to = count * dim; j < dim; j++) kept[to + j] = values[from + j];
    count++;
  }
  // Copies of the used part (a view would carry the whole buffer to the main thread).
  return count === pathCount ? { pathIndex, hash, values: kept } : { pathIndex: pathIndex.slice(0, count), hash: hash.slice(0, count), values: kept.slice(0, count * dim) };
}

/**
 * Row order of non-negative integer keys below 2^53, ascending, ties in input order (a stable LSD
 * radix sort on 16-bit digits: O(rows), where a comparison sort of 10^5 rows through closures costs
 * ~0.3 s; the order is the same).
 */
export function integerOrder(keys: ArrayLike<number>): Int32Array {
  const count = keys.length;
  let order = Int32Array.from({ length: count }, (_, i) => i);
  let spare = new Int32Array(count);
  const lo = new Uint32Array(count);
  const hi = new Uint32Array(count);
  let maxHi = 0;
  for (let i = 0; i < count; i++) {
    const k = keys[i];
    if (!(Number.isInteger(k) && k >= 0 && k < 2 ** 53)) throw new Error(`keys[${i}]: not an integer in [0, 2^53): ${k}`);
    lo[i] = k % 4294967296;
    hi[i] = Math.floor(k / 4294967296);
    if (hi[i] > maxHi) maxHi = hi[i];
  }
  const counts = new Int32Array(65537);
  const digitPasses: [Uint32Array, number][] = [[lo, 0], [lo, 16]];
  if (maxHi > 0) digitPasses.push([hi, 0]);
  if (maxHi > 0xffff) digitPasses.push([hi, 16]);
  for (const [word, shift] of digitPasses) {
    counts.fill(0);
    for (let i = 0; i < count; i++) counts[((word[order[i]] >>> shift) & 0xffff) + 1]++;
    for (let d = 0; d < 65536; d++) counts[d + 1] += counts[d];
    for (let i = 0; i < count; i++) {
      const row = order[i];
      spare[counts[(word[row] >>> shift) & 0xffff]++] = row;
    }
    [order, spare] = [spare, order];
  }
  return order;
}

/** Where each row of the concatenated candidate sets lives: its set and its row within the set. */
function rowHomes(sets: KeptCandidates[]): { setOf: Int32Array; rowOf: Int32Array } {
  const total = sets.reduce((t, c) => t + c.pathIndex.length, 0);
  const setOf = new Int32Array(total);
  const rowOf = new Int32Array(total);
  let at = 0;
  sets.forEach((c, set) => {
    for (let row = 0; row < c.pathIndex.length; row++, at++) {
      setOf[at] = set;
      rowOf[at] = row;
    }
  });
  return { setOf, rowOf };
}

/** Keep the `keep` candidates with the smallest hashes (ties by path index) out of candidate sets. */
export function mergeKept(sets: KeptCandidates[], dim: number, keep: number = MAX_KEPT): KeptCandidates {
  const pathIndex = concatColumn(sets.map((k) => k.pathIndex));
  const hash = concatColumn(sets.map((k) => k.hash));
  // By path index, then (stable) by hash: hash order with ties broken by path index.
  const byPath = integerOrder(pathIndex);
  const byHash = integerOrder(Array.from(byPath, (r) => hash[r]));
  const rows = byHash.subarray(0, Math.min(keep, byHash.length));
  const { setOf, rowOf } = rowHomes(sets);
  const out: KeptCandidates = { pathIndex: new Float64Array(rows.length), hash: new Float64Array(rows.length), values: new Float64Array(rows.length * dim) };
  for (let i = 0; i < rows.length; i++) {
    const r = byPath[rows[i]];
    out.pathIndex[i] = pathIndex[r];
    out.hash[i] = hash[r];
    const v = sets[setOf[r]].values;
    const from = rowOf[r] * dim;
    for (let j = 0; j < dim; j++) out.values[i * dim + j] = v[from + j];
  }
  return out;
}

/** Columns end to end in one new array (the one column itself when there is one). */
export function concatColumn(columns: Float64Array[]): Float64Array {
  if (columns.length === 1) return columns[0];
  const out = new Float64Array(columns.reduce((t, c) => t + c.length, 0));
  let at = 0;
  for (const c of columns) {
    out.set(c, at);
    at += c.length;
  }
  return out;
}

/** Candidate sets as one: rows in the sets' order (the one set itself when there is one). */
export function concatKept(sets: KeptCandidates[]): KeptCandidates {
  return { pathIndex: concatColumn(sets.map((k) => k.pathIndex)), hash: concatColumn(sets.map((k) => k.hash)), values: concatColumn(sets.map((k) => k.values)) };
}

/**
 * Row order by path index when the path indexes are distinct and span at most 4x as many integers as
 * there are rows (a run's candidates: every path at most once, all of them when all are kept): a
 * slot per integer of the span, filled and read in order (O(rows), no sort). Null when two rows share
 * a path index or the span is wider (then integerOrder, which also keeps ties in input order).
 */
function slotOrder(pathIndex: ArrayLike<number>): Int32Array | null {
  const count = pathIndex.length;
  let min = Infinity;
  let max = -Infinity;
  for (let i = 0; i < count; i++) {
    const p = pathIndex[i];
    if (!Number.isInteger(p)) return null;
    if (p < min) min = p;
    if (p > max) max = p;
  }
  if (count === 0 || max - min + 1 > 4 * count) return null;
  const slot = new Int32Array(max - min + 1).fill(-1);
  for (let i = 0; i < count; i++) {
    const at = pathIndex[i] - min;
    if (slot[at] !== -1) return null;
    slot[at] = i;
  }
  const order = new Int32Array(count);
  let k = 0;
  for (let s = 0; s < slot.length; s++) if (slot[s] !== -1) order[k++] = slot[s];
  return order;
}

/** The kept sample as columns, in ascending path order (of one candidate set, or of all of several sets). */
export function keptToSample(k: KeptCandidates | KeptCandidates[], dim: number): KeptSample {
  const sets = Array.isArray(k) ? k : [k];
  const pathIndex = concatColumn(sets.map((c) => c.pathIndex));
  const order = slotOrder(pathIndex) ?? integerOrder(pathIndex);
  const { setOf, rowOf } = rowHomes(sets);
  const values = Array.from({ length: dim }, () => new Float64Array(order.length));
  for (let i = 0; i < order.length; i++) {
    const r = order[i];
    const v = sets[setOf[r]].values;
    const from = rowOf[r] * dim;
    for (let j = 0; j < dim; j++) values[j][i] = v[from + j];
  }
  const sortedPaths = new Array<number>(order.length);
  for (let i = 0; i < order.length; i++) sortedPaths[i] = pathIndex[order[i]];
  return { pathIndex: sortedPaths, values };
}
