import { describe, expect, it } from "vitest";
import seedrandom from "seedrandom";
import { integerOrder, keptToSample, mergeKept, pathHash, type KeptCandidates } from "../../src/run/blocks.js";

/** Candidates as plain arrays (easy to build and filter here); `typed` gives the library's form. */
interface PlainKept {
  pathIndex: number[];
  hash: number[];
  values: number[];
}
const typed = (k: PlainKept): KeptCandidates => ({ pathIndex: Float64Array.from(k.pathIndex), hash: Float64Array.from(k.hash), values: Float64Array.from(k.values) });
const typedAll = (sets: PlainKept[]) => sets.map(typed);

// Reference: the definitions, by comparison sorts of row records.
function referenceMerge(sets: PlainKept[], dim: number, keep: number): PlainKept {
  const rows = sets.flatMap((k) => k.hash.map((h, r) => ({ h, p: k.pathIndex[r], v: k.values.slice(r * dim, (r + 1) * dim) })));
  rows.sort((a, b) => a.h - b.h || a.p - b.p);
  const top = rows.slice(0, keep);
  return { pathIndex: top.map((r) => r.p), hash: top.map((r) => r.h), values: top.flatMap((r) => r.v) };
}

/** Candidate sets of contiguous path ranges (blocks), in a shuffled arrival order. */
function blockSets(rng: () => number, blocks: number, perBlock: number, dim: number, clash = false): PlainKept[] {
  const sets: PlainKept[] = [];
  for (let b = 0; b < blocks; b++) {
    const k: PlainKept = { pathIndex: [], hash: [], values: [] };
    for (let r = 0; r < perBlock; r++) {
      const p = b * perBlock + r;
      k.pathIndex.push(p);
      // clash: few distinct hashes, so ties must fall back to the path index
      k.hash.push(clash ? Math.floor(rng() * 20) : pathHash(7, p));
      for (let j = 0; j < dim; j++) k.values.push(rng());
    }
    sets.push(k);
  }
  return sets.sort(() => rng() - 0.5);
}

describe("kept sample order without comparison sorts", () => {
  it("integerOrder sorts integers below 2^53 ascending and keeps ties in input order", () => {
    const rng = seedrandom("integer-order");
    const keys = Array.from({ length: 5000 }, (_, i) => (i % 3 === 0 ? Math.floor(rng() * 2 ** 53) : i % 3 === 1 ? Math.floor(rng() * 40) : Math.floor(rng() * 2 ** 33)));
    const ref = keys.map((_, i) => i).sort((a, b) => keys[a] - keys[b] || a - b);
    expect(Array.from(integerOrder(keys))).toEqual(ref);
    expect(() => integerOrder([1, 0.5])).toThrow(/^keys\[1\]/);
  });

  it("mergeKept keeps the smallest hashes, ties by path index, as the comparison sort does", () => {
    const rng = seedrandom("merge-kept");
    for (const clash of [false, true]) {
      const sets = blockSets(rng, 9, 37, 3, clash);
      for (const keep of [1, 50, 333, 1000]) expect(mergeKept(typedAll(sets), 3, keep)).toEqual(typed(referenceMerge(sets, 3, keep)));
    }
  });

  it("keptToSample of the candidate sets equals keptToSample of their merge when all are kept", () => {
    const rng = seedrandom("kept-sample");
    const sets = blockSets(rng, 12, 25, 4);
    const all = mergeKept(typedAll(sets), 4, 10_000);
    const direct = keptToSample(typedAll(sets), 4);
    expect(direct).toEqual(keptToSample(all, 4));
    expect(direct.pathIndex).toEqual(Array.from({ length: 300 }, (_, i) => i));
  });

  it("keptToSample puts rows in ascending path order: dense distinct indexes (slots), sparse or repeated ones (radix sort)", () => {
    const rng = seedrandom("kept-runs");
    const dim = 3;
    // Reference: a comparison sort of row records by path index.
    const reference = (sets: PlainKept[]) => {
      const rows = sets.flatMap((k) => k.pathIndex.map((p, r) => ({ p, v: k.values.slice(r * dim, (r + 1) * dim) })));
      rows.sort((a, b) => a.p - b.p);
      return { pathIndex: rows.map((r) => r.p), values: Array.from({ length: dim }, (_, j) => Float64Array.from(rows, (r) => r.v[j])) };
    };
    // Blocks thinned by a threshold (gaps inside each range), one of them empty, in shuffled order.
    const thinned = blockSets(rng, 10, 30, dim).map((k, b) => {
      const keep = k.pathIndex.map(() => b !== 3 && rng() < 0.6);
      return { pathIndex: k.pathIndex.filter((_, r) => keep[r]), hash: k.hash.filter((_, r) => keep[r]), values: k.values.filter((_, i) => keep[Math.floor(i / dim)]) };
    });
    expect(keptToSample(typedAll(thinned), dim)).toEqual(reference(thinned));
    // Interleaved sets (even and odd paths): the ranges overlap, so the rows must be sorted.
    const interleaved: PlainKept[] = [0, 1].map((parity) => {
      const pathIndex = Array.from({ length: 40 }, (_, i) => 2 * i + parity);
      return { pathIndex, hash: pathIndex.map((p) => pathHash(7, p)), values: pathIndex.flatMap(() => [rng(), rng(), rng()]) };
    });
    const got = keptToSample(typedAll(interleaved), dim);
    expect(got).toEqual(reference(interleaved));
    expect(got.pathIndex).toEqual(Array.from({ length: 80 }, (_, i) => i));
    // Sparse indexes (span far beyond 4x the rows) and a repeated index (ties keep input order).
    const sparse: PlainKept[] = [[5e9, 3, 7e12], [12, 3, 1e6]].map((pathIndex) => ({ pathIndex, hash: pathIndex.map(() => 0), values: pathIndex.flatMap(() => [rng(), rng(), rng()]) }));
    expect(keptToSample(typedAll(sparse), dim)).toEqual(reference(sparse));
    expect(keptToSample(typedAll(sparse), dim).pathIndex).toEqual([3, 3, 12, 1e6, 5e9, 7e12]);
    const repeated: PlainKept[] = [[0, 1, 2], [2, 3]].map((pathIndex) => ({ pathIndex, hash: pathIndex.map(() => 0), values: pathIndex.flatMap(() => [rng(), rng(), rng()]) }));
    expect(keptToSample(typedAll(repeated), dim)).toEqual(reference(repeated));
  });
});
