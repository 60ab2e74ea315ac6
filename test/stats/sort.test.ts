import { describe, expect, it } from "vitest";
import seedrandom from "seedrandom";
import { radixSortModule, sortedFloat64, sortFloat64 } from "../../src/stats/sort.js";
import { sortedCopy } from "../../src/stats/lilliefors.js";

describe("radix sort of f64 (build/sort.wasm) = Float64Array.prototype.sort", () => {
  it("the module is built (npm test builds it), so the comparisons below exercise it", () => {
    expect(radixSortModule()).not.toBeNull();
  });

  it("same array, element by element (Object.is: -0 before +0), on fixed-seed samples of every kind", () => {
    const rng = seedrandom("radix");
    const kinds: [string, () => number][] = [
      ["mixed signs", () => (rng() - 0.3) * 1000],
      ["one sign, narrow range (constant top digits)", () => 3000 + 50 * rng()],
      ["small integers (ties)", () => Math.floor(rng() * 30)],
      ["wide exponents", () => (rng() < 0.5 ? -1 : 1) * Math.exp(700 * (rng() - 0.5))],
      ["zeros of both signs and subnormals", () => [0, -0, 5e-324, -5e-324, 1e-310][Math.floor(rng() * 5)]],
    ];
    for (const [name, draw] of kinds) {
      for (const n of [0, 1, 255, 256, 257, 5000, 100000]) {
        const x = Float64Array.from({ length: n }, draw);
        if (n > 10) x.set([Infinity, -Infinity, -0, 0, -0], 3);
        const radix = sortFloat64(Float64Array.from(x));
        const builtin = sortFloat64(Float64Array.from(x), "builtin");
        // The copying entry point, from a typed array (left unchanged) and from a plain array.
        const before = Float64Array.from(x);
        const copies = [sortedFloat64(x), sortedFloat64(Array.from(x))].map((c) => {
          expect(c.firstNaN).toBe(-1);
          return c.sorted;
        });
        expect(radix.length, name).toBe(n);
        let differ = 0;
        for (let i = 0; i < n; i++) if (!Object.is(radix[i], builtin[i]) || copies.some((c) => !Object.is(c[i], builtin[i])) || !Object.is(x[i], before[i])) differ++;
        expect(differ, `${name}, n = ${n}`).toBe(0);
        for (const c of copies) expect(c.length, name).toBe(n);
      }
    }
  });

  it("reports the first NaN of the input order (the radix sort and the small-sample path)", () => {
    const rng = seedrandom("nan");
    for (const n of [10, 255, 256, 5000]) {
      const x = Float64Array.from({ length: n }, () => rng() - 0.5);
      expect(sortedFloat64(x).firstNaN).toBe(-1);
      const first = Math.floor(rng() * n);
      x[first] = NaN;
      if (first + 3 < n) x[first + 3] = -NaN;
      expect(sortedFloat64(x).firstNaN, `n = ${n}`).toBe(first);
      expect(sortedFloat64(Array.from(x)).firstNaN, `n = ${n}`).toBe(first);
      expect(() => sortedCopy(x, "kept")).toThrow(`kept[${first}]: NaN`);
    }
  });
});
