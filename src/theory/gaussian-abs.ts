// E|X| for a planar Gaussian X ~ N(m, C), the building block of the Spitzer–Widom formula.
//
// Formula [derived, docs/theory.md sec. 2.1]: for any x in R^2, |x| = (1/4) int_0^{2pi} |<x, e_t>| dt, so
//   E|X| = (1/4) int_0^{2pi} E|N(m_t, s_t^2)| dt,  m_t = <m, e_t>, s_t^2 = e_t' C e_t,
// and E|N(mu, s^2)| = s sqrt(2/pi) exp(-mu^2 / (2 s^2)) + mu erf(mu / (s sqrt 2)).
// The integrand is periodic and analytic when C is non-singular, so the trapezoid rule converges
// exponentially; we double the number of nodes until two successive rules agree and report that
// difference as the error bound. Cost: O(N) erf calls, N ~ 64 + 40 |m| / min_t s_t.

import type { Mat2, Vec2 } from "../suite/schema.js";
import { foldedNormalMean, gaussLegendre, INV_SQRT_2PI } from "./special.js";

export interface ValueWithError {
  value: number;
  error: number;
}

/**
 * Rank-one covariance C = lambda v v': X = m + sqrt(lambda) Z v, so with a = <m, v>, b = |<m, v_perp>|,
 * E|X| = int sqrt(y^2 + b^2) phi((y - a)/s)/s dy (s^2 = lambda), by Gauss–Legendre panels graded
 * geometrically away from y = 0, where the integrand bends on the scale b [derived]. b = 0: folded normal.
 */
function rankOneAbsMean(m: Vec2, c: Mat2): ValueWithError {
  const lambda = c[0][0] + c[1][1];
  if (lambda <= 0) return { value: Math.hypot(m[0], m[1]), error: 0 };
  const v: Vec2 = c[0][0] >= c[1][1] ? [c[0][0], c[0][1]] : [c[0][1], c[1][1]];
  const lv = Math.hypot(v[0], v[1]);
  const u: Vec2 = [v[0] / lv, v[1] / lv];
  const a = m[0] * u[0] + m[1] * u[1], b = Math.abs(-m[0] * u[1] + m[1] * u[0]), s = Math.sqrt(lambda);
  if (b <= 1e-15 * Math.max(Math.abs(a), s)) return { value: foldedNormalMean(a, s), error: 1e-15 * (Math.abs(a) + s) };
  const gl = gaussLegendre(20);
  const lo = a - 12 * s, hi = a + 12 * s;
  const f = (y: number) => Math.sqrt(y * y + b * b) * INV_SQRT_2PI * Math.exp(-0.5 * ((y - a) / s) ** 2) / s;
  const pts = new Set<number>([lo, hi]);
  for (const sign of [-1, 1]) {
    for (let d = b; d < 24 * s + Math.abs(a); d *= 2) {
      const y = sign * d;
      if (y > lo && y < hi) pts.add(y);
    }
  }
  if (0 > lo && 0 < hi) pts.add(0);
  const sorted = [...pts].sort((x, y) => x - y);
  let total = 0;
  for (let i = 0; i + 1 < sorted.length; i++) {
    const A = sorted[i], B = sorted[i + 1];
    const parts = Math.max(1, Math.ceil((B - A) / s));
    for (let q = 0; q < parts; q++) {
      const x0 = A + ((B - A) * q) / parts, x1 = A + ((B - A) * (q + 1)) / parts;
      let acc = 0;
      for (let j = 0; j < gl.x.length; j++) acc += gl.w[j] * f((x0 + x1) / 2 + ((x1 - x0) / 2) * gl.x[j]);
      total += (acc * (x1 - x0)) / 2;
    }
  }
  return { value: total, error: 1e-13 * total };
}

export function gaussianAbsMean(m: Vec2, c: Mat2, relTol = 1e-14): ValueWithError {
  const tr = c[0][0] + c[1][1];
  const det = c[0][0] * c[1][1] - c[0][1] * c[0][1];
  if (det <= 1e-13 * tr * tr) return rankOneAbsMean(m, c);
  const lamMin = Math.max(0, tr / 2 - Math.sqrt(Math.max(0, (tr * tr) / 4 - det)));
  const mm = Math.hypot(m[0], m[1]);
  const f = (t: number) => {
    const ct = Math.cos(t), st = Math.sin(t);
    const mu = m[0] * ct + m[1] * st;
    const s2 = c[0][0] * ct * ct + 2 * c[0][1] * ct * st + c[1][1] * st * st;
    return foldedNormalMean(mu, Math.sqrt(Math.max(0, s2)));
  };
  // A singular covariance gives kinks in t: fall back to many nodes and a looser bound.
  const ratio = lamMin > 0 ? mm / Math.sqrt(lamMin) : Infinity;
  let n = Math.min(1 << 16, 2 ** Math.ceil(Math.log2(64 + 40 * Math.min(ratio, 1e4))));
  let sum = 0;
  for (let i = 0; i < n; i++) sum += f((2 * Math.PI * i) / n);
  let prev = (sum * 2 * Math.PI) / n / 4;
  for (;;) {
    let mid = 0;
    for (let i = 0; i < n; i++) mid += f((2 * Math.PI * (i + 0.5)) / n);
    sum += mid;
    n *= 2;
    const cur = (sum * 2 * Math.PI) / n / 4;
    const err = Math.abs(cur - prev);
    if (err <= relTol * Math.abs(cur) + 1e-300 || n >= 1 << 18) {
      return { value: cur, error: Math.max(err, 4e-16 * Math.abs(cur)) };
    }
    prev = cur;
  }
}
