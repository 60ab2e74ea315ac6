// Special functions and small numerical helpers (stdlib erf/erfc: accurate to ~1e-15).

import erfImpl from "@stdlib/math-base-special-erf";
import erfcImpl from "@stdlib/math-base-special-erfc";
import { normalCdf } from "../stats/normal.js";

export const erf: (x: number) => number = erfImpl;
export const erfc: (x: number) => number = erfcImpl;
export const SQRT2 = Math.SQRT2;
export const SQRT_2_OVER_PI = Math.sqrt(2 / Math.PI);
export const INV_SQRT_2PI = 1 / Math.sqrt(2 * Math.PI);

/** E|Y| for Y ~ N(mu, sigma^2) (folded normal mean; common practice). */
export function foldedNormalMean(mu: number, sigma: number): number {
  if (sigma <= 0) return Math.abs(mu);
  return sigma * SQRT_2_OVER_PI * Math.exp((-mu * mu) / (2 * sigma * sigma)) + mu * erf(mu / (sigma * SQRT2));
}

/** E[Y^+] for Y ~ N(mu, sigma^2). */
export function positivePartMean(mu: number, sigma: number): number {
  if (sigma <= 0) return Math.max(mu, 0);
  const z = mu / sigma;
  return sigma * INV_SQRT_2PI * Math.exp(-0.5 * z * z) + mu * normalCdf(z);
}

/** Compensated (Neumaier) summation. */
export class KahanSum {
  private s = 0;
  private c = 0;
  add(x: number): void {
    const t = this.s + x;
    if (Math.abs(this.s) >= Math.abs(x)) this.c += this.s - t + x;
    else this.c += x - t + this.s;
    this.s = t;
  }
  get value(): number {
    return this.s + this.c;
  }
}

/** Gauss–Legendre nodes and weights on [-1, 1] (Newton on the Legendre recurrence; common practice). */
const glCache = new Map<number, { x: Float64Array; w: Float64Array }>();
export function gaussLegendre(q: number): { x: Float64Array; w: Float64Array } {
  const hit = glCache.get(q);
  if (hit) return hit;
  const x = new Float64Array(q), w = new Float64Array(q);
  for (let i = 0; i < q; i++) {
    let z = Math.cos((Math.PI * (i + 0.75)) / (q + 0.5));
    let dp = 0;
    for (let it = 0; it < 100; it++) {
      let p0 = 1, p1 = z;
      for (let n = 2; n <= q; n++) {
        const p2 = ((2 * n - 1) * z * p1 - (n - 1) * p0) / n;
        p0 = p1; p1 = p2;
      }
      if (q === 1) { p1 = z; p0 = 1; }
      dp = (q * (z * p1 - p0)) / (z * z - 1);
      const dz = p1 / dp;
      z -= dz;
      if (Math.abs(dz) < 1e-16) break;
    }
    x[i] = z;
    w[i] = 2 / ((1 - z * z) * dp * dp);
  }
  const r = { x, w };
  glCache.set(q, r);
  return r;
}

/** A clock measured in seconds since `start`. */
export function secondsSince(start: number): number {
  return (performance.now() - start) / 1000;
}
