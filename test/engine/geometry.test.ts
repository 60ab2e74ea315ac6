import { describe, expect, it } from "vitest";
import { convexHull, hullMeasures, orient, crossSign } from "../../src/engine/twin.js";
import { MEASURE_REGISTRY, measureSpec, type Measure } from "../../src/geometry/measure-registry.js";
import { bruteMeasures, exactPoints, fixtureRandom, kernels, pointSets, relErr, GAUSS_ISO } from "./engine-helpers.js";

const sets = pointSets();
// Kernels whose buffers hold any fixture (capacity k * (nMax + 1) >= 80).
const { twin, wasm } = kernels([GAUSS_ISO], [100], 1);

type HullFn = (xs: number[], ys: number[]) => { x: ArrayLike<number>; y: ArrayLike<number>; measures: ArrayLike<number> };
const implementations: Record<string, HullFn> = {
  "twin convexHull": (xs, ys) => {
    const h = convexHull(xs, ys);
    const m = hullMeasures(xs, ys);
    return { ...h, measures: MEASURE_REGISTRY.map((spec) => m[spec.name]) };
  },
  "twin kernel, filter": (xs, ys) => twin.hullOfPoints(xs, ys, true),
  "twin kernel, no filter": (xs, ys) => twin.hullOfPoints(xs, ys, false),
  "wasm kernel, filter": (xs, ys) => wasm.hullOfPoints(xs, ys, true),
  "wasm kernel, no filter": (xs, ys) => wasm.hullOfPoints(xs, ys, false),
};

/** How each measure must agree with its oracle (rounding of the oracle's own floating-point sums). */
const AGREES: Record<Measure, (got: number, oracle: ReturnType<typeof bruteMeasures>) => void> = {
  perimeter: (got, o) => expect(relErr(got, o.perimeter)).toBeLessThan(1e-12),
  diameter: (got, o) => expect(relErr(got, o.diameter)).toBeLessThan(1e-15),
  // Area: relative to the hull's own size (area can be 0 for degenerate sets).
  area: (got, o) => expect(Math.abs(got - o.area)).toBeLessThanOrEqual(1e-12 * Math.max(o.area, o.diameter ** 2 * 1e-3)),
  vertices: (got, o) => expect(got).toBe(o.vertices),
  // Width: the calipers' distance rounds to within 8u (D + w) (u = 2^-53, D the diameter: the
  // numerator's terms are at most |edge| D), the oracle's to 3u w; the bound doubles their sum.
  width: (got, o) => expect(Math.abs(got - o.width)).toBeLessThanOrEqual(16 * 2 ** -53 * (o.diameter + o.width)),
};

describe.each(Object.entries(implementations))("%s vs brute-force oracles", (_name, hull) => {
  it.each(sets.map((s) => [s.name, s] as const))("%s", (_n, s) => {
    const oracle = bruteMeasures(s.xs, s.ys);
    const got = hull(s.xs, s.ys);
    const h = got.x.length;
    // Same vertex set (as exact coordinates).
    const a = Array.from({ length: h }, (_, i) => `${got.x[i]},${got.y[i]}`).sort();
    const b = oracle.vx.map((x, i) => `${x},${oracle.vy[i]}`).sort();
    expect(a).toEqual(b);
    // Counter-clockwise strict convexity, starting at the smallest (x, y).
    for (let i = 0; i < h && h >= 3; i++) {
      const j = (i + 1) % h, k = (i + 2) % h;
      expect(orient(got.x[i], got.y[i], got.x[j], got.y[j], got.x[k], got.y[k])).toBe(1);
    }
    for (let i = 1; i < h; i++) {
      expect(got.x[0] < got.x[i] || (got.x[0] === got.x[i] && got.y[0] < got.y[i])).toBe(true);
    }
    for (const spec of MEASURE_REGISTRY) AGREES[spec.name](got.measures[spec.slot], oracle);
  });
});

describe("special cases", () => {
  it("single point: 1 vertex, perimeter/diameter/area/width 0", () => {
    for (const f of Object.values(implementations)) {
      expect(Array.from(f([2.5], [-1]).measures)).toEqual([0, 0, 0, 1, 0]);
      expect(Array.from(f([2.5, 2.5, 2.5], [-1, -1, -1]).measures)).toEqual([0, 0, 0, 1, 0]);
    }
  });
  it("segment: 2 vertices, perimeter twice its length, area and width 0", () => {
    for (const f of Object.values(implementations)) {
      expect(Array.from(f([0, 3, 1.5, 0], [0, 4, 2, 0]).measures)).toEqual([10, 5, 0, 2, 0]);
    }
  });
  it("unit square with edge midpoints and centre: 4 vertices", () => {
    const xs = [0, 1, 1, 0, 0.5, 1, 0.5, 0, 0.5], ys = [0, 0, 1, 1, 0, 0.5, 1, 0.5, 0.5];
    for (const f of Object.values(implementations)) {
      expect(Array.from(f(xs, ys).measures)).toEqual([4, Math.SQRT2, 1, 4, 1]);
    }
  });
});

describe("minimal width", () => {
  it("known shapes: right isoceles triangle 1/sqrt 2 (its smallest altitude), 3x1 rectangle 1, regular hexagon of side 1 sqrt 3", () => {
    const hex = Array.from({ length: 6 }, (_, i) => [Math.cos((i * Math.PI) / 3), Math.sin((i * Math.PI) / 3)]);
    const cases: [number[], number[], number][] = [
      [[0, 1, 0], [0, 0, 1], Math.SQRT1_2],
      [[0, 3, 3, 0, 1.5], [0, 0, 1, 1, 0.5], 1],
      [hex.map((p) => p[0]), hex.map((p) => p[1]), Math.sqrt(3)],
    ];
    for (const [xs, ys, w] of cases) {
      for (const f of Object.values(implementations)) {
        const got = f(xs, ys).measures[measureSpec("width").slot];
        // Rounding bound as in AGREES.width (diameter <= 3.2 here).
        expect(Math.abs(got - w)).toBeLessThanOrEqual(16 * 2 ** -53 * (3.2 + w));
      }
    }
  });
});

describe("exact orientation", () => {
  it("agrees with BigInt orientation on near-degenerate triples", () => {
    const rnd = fixtureRandom(77);
    let uncertain = 0;
    for (let t = 0; t < 2000; t++) {
      // c on the line through a and b up to rounding: the fast determinant is unreliable here.
      const ax = rnd() * 1e3, ay = rnd() * 1e3, bx = rnd() * 1e3, by = rnd() * 1e3;
      const s = rnd() * 3 - 1;
      const cx = ax + s * (bx - ax), cy = ay + s * (by - ay);
      const { X, Y } = exactPoints([ax, bx, cx], [ay, by, cy]);
      const exact = (X[1] - X[0]) * (Y[2] - Y[0]) - (Y[1] - Y[0]) * (X[2] - X[0]);
      const want = exact > 0n ? 1 : exact < 0n ? -1 : 0;
      const fast = Math.sign((bx - ax) * (cy - ay) - (by - ay) * (cx - ax));
      if (fast !== want) uncertain++;
      expect(orient(ax, ay, bx, by, cx, cy)).toBe(want);
    }
    // The fixture does reach the exact fallback (the fast sign is wrong on some triples).
    expect(uncertain).toBeGreaterThan(0);
  });
  it("crossSign(a - b, c - d) is exact", () => {
    // Products far below the fast filter's reach (exact while products stay above ~1e-290:
    // Dekker's two-product needs its error term not to underflow).
    expect(crossSign(1e-100, 0, 0, 0, 0, 1e-100, 0, 0)).toBe(1);
    expect(crossSign(1e100, 1e100 + 2 ** 280, 0, 0, 1e100, 1e100, 0, 0)).toBe(-1);
    const { X, Y } = exactPoints([0.1, 0.3], [0.1, 0.3]);
    const exact = X[0] * Y[1] - Y[0] * X[1];
    expect(crossSign(0.1, 0.1, 0, 0, 0.3, 0.3, 0, 0)).toBe(exact === 0n ? 0 : exact > 0n ? 1 : -1);
  });
});

describe("larger random sets through the filter", () => {
  it.each([
    ["gaussian cloud", 0],
    ["needle (drifting walk)", 1],
  ] as const)("%s: WASM and twin hulls equal the unfiltered hull", (_n, kind) => {
    const rnd = fixtureRandom(5 + kind);
    const xs: number[] = [], ys: number[] = [];
    let x = 0, y = 0;
    for (let i = 0; i < 100; i++) {
      const u = rnd() - 0.5, v = rnd() - 0.5;
      if (kind === 1) { x += 1 + u; y += v; } else { x = u; y = v; }
      xs.push(x); ys.push(y);
    }
    const ref = convexHull(xs, ys);
    for (const got of [wasm.hullOfPoints(xs, ys, true), twin.hullOfPoints(xs, ys, true)]) {
      expect(Array.from(got.x)).toEqual(Array.from(ref.x));
      expect(Array.from(got.y)).toEqual(Array.from(ref.y));
    }
  });
});
