// Test helpers: a brute-force convex hull (for oracles) and a seeded normal generator.
import seedrandom from "seedrandom";

/** Perimeter and area of the convex hull of points (monotone chain; exact on integer inputs). */
export function hullOf(xs: number[], ys: number[]): { perimeter: number; area: number } {
  const idx = xs.map((_, i) => i).sort((a, b) => xs[a] - xs[b] || ys[a] - ys[b]);
  const cross = (o: number, a: number, b: number) => (xs[a] - xs[o]) * (ys[b] - ys[o]) - (ys[a] - ys[o]) * (xs[b] - xs[o]);
  const chain = (order: number[]) => {
    const h: number[] = [];
    for (const i of order) {
      while (h.length >= 2 && cross(h[h.length - 2], h[h.length - 1], i) <= 0) h.pop();
      h.push(i);
    }
    return h;
  };
  const lower = chain(idx), upper = chain([...idx].reverse());
  const hull = lower.slice(0, -1).concat(upper.slice(0, -1));
  if (hull.length === 1) return { perimeter: 0, area: 0 };
  let perimeter = 0, area = 0;
  for (let i = 0; i < hull.length; i++) {
    const a = hull[i], b = hull[(i + 1) % hull.length];
    perimeter += Math.hypot(xs[b] - xs[a], ys[b] - ys[a]);
    area += (xs[a] * ys[b] - xs[b] * ys[a]) / 2;
  }
  return { perimeter, area };
}

export function normalSource(seed: string): () => number {
  const rng = seedrandom(seed);
  let spare: number | null = null;
  return () => {
    if (spare !== null) { const s = spare; spare = null; return s; }
    let u = 0;
    while (u === 0) u = rng();
    const v = rng();
    const r = Math.sqrt(-2 * Math.log(u));
    spare = r * Math.sin(2 * Math.PI * v);
    return r * Math.cos(2 * Math.PI * v);
  };
}

/** Mean and standard error of a sample. */
export function meanSE(xs: number[]): { mean: number; se: number } {
  const n = xs.length;
  const mean = xs.reduce((s, x) => s + x, 0) / n;
  const v = xs.reduce((s, x) => s + (x - mean) ** 2, 0) / (n - 1);
  return { mean, se: Math.sqrt(v / n) };
}
