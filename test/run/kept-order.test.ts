import { describe, expect, it } from "vitest";
import seedrandom from "seedrandom";
import { integerOrder, keptToSample, mergeKept, pathHash, type KeptCandidates } from "../../src/run/blocks.js";

// Reference: the definitions, by comparison sorts of row records.
function referenceMerge(sets: KeptCandidates[], dim: number, keep: number): KeptCandidates {
  const rows = sets.flatMap((k) => k.hash.map((h, r) => ({ h, p: k.pathIndex[r], v: k.values.slice(r * dim, (r + 1) * dim) })));
  rows.sort((a, b) => a.h - b.h || a.p - b.p);
  const top = rows.slice(0, keep);
  return { pathIndex: top.map((r) => r.p), hash: top.map((r) => r.h), values: top.flatMap((r) => r.v) };
}

/** Candidate sets of contiguous path ranges (blocks), in a shuffled arrival order. */
function blockSets(rng: () => number, blocks: number, perBlock: number, dim: number, clash = false): KeptCandidates[] {
  const sets: KeptCandidates[] = [];
  for (let b = 0; b < blocks; b++) {
    const k: KeptCandidates = { pathIndex: [], hash: [], values: [] };
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
      for (const keep of [1, 50, 333, 1000]) expect(mergeKept(sets, 3, keep)).toEqual(referenceMerge(sets, 3, keep));
    }
  });

  it("keptToSample of the candidate sets equals keptToSample of their merge when all are kept", () => {
    const rng = seedrandom("kept-sample");
    const sets = blockSets(rng, 12, 25, 4);
    const all = mergeKept(sets, 4, 10_000);
    const direct = keptToSample(sets, 4);
    expect(direct).toEqual(keptToSample(all, 4));
    expect(direct.pathIndex).toEqual(Array.from({ length: 300 }, (_, i) => i));
  });
});
