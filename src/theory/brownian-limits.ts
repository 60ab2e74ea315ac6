// Prediction: zero-drift Brownian limits (docs/theory.md sec. 8).
//
// Perimeter [derived, docs/theory.md sec. 8.1]: n^{-1/2} L_n -> perimeter of the hull of k Sigma_j^{1/2}-Brownian
// paths (Donsker + continuity of the hull), and by Cauchy's formula and the reflection principle
// (max_{s<=1} B(s) ~ |N|):  lim n^{-1/2} E L_n = int_0^{2pi} E[max_j s_j(t) |N_j|] dt,
//   E[max_j s_j |N_j|] = int_0^inf (1 - prod_j erf(x / (s_j sqrt 2))) dx,  s_j(t)^2 = e_t' Sigma_j e_t.
// Isotropic identical walks reproduce alpha_k of "Convex hull of N planar Brownian motions: exact
// results and an application to ecology", PRL 103, 140602 (2009), arXiv:0907.0921 (alpha_1 = sqrt(8 pi), alpha_2 = 4 sqrt(pi), alpha_3 = 24 atan(1/sqrt 2)/sqrt(pi)).
// Area: one walk lim n^{-1} E A_n = (pi/2) sqrt(det Sigma) (beta_1 = pi/2, same paper; affine image of
// the isotropic case); k = 2, 3 identical isotropic walks: beta_2 = pi, beta_3 = pi + 3 - sqrt 3
// [derived, docs/theory.md sec. 8.3]. Variance constants u_0 ~ 1.08 (perimeter, Var/n -> u_0 s^2) and
// v_0 ~ 0.305 (area, Var/n^2 -> v_0 det Sigma) are simulation estimates ("Convex hulls of random walks
// and their scaling limits", SPA 125 (2015), arXiv:1408.4560 [memory for the id]; docs/theory.md
// sec. 8.4): shown, never gating.
// Quadrature: trapezoid in t (periodic, analytic) with doubling; composite Gauss–Legendre in x.

import type { Mat2 } from "../suite/schema.js";
import { erf, gaussLegendre, SQRT2 } from "./special.js";

export const RMC_SOURCE =
  "Convex hull of N planar Brownian motions: exact results and an application to ecology, PRL 103, 140602 (2009), arXiv:0907.0921 (docs/theory.md sec. 8)";
export const SCALING_LIMIT_SOURCE =
  "Convex hulls of random walks and their scaling limits, Stoch. Proc. Appl. 125 (2015), arXiv:1408.4560 [memory for the id] (docs/theory.md sec. 8)";

export const ALPHA = [Math.sqrt(8 * Math.PI), 4 * Math.sqrt(Math.PI), (24 * Math.atan(1 / Math.SQRT2)) / Math.sqrt(Math.PI)];
export const BETA_ISOTROPIC = [Math.PI / 2, Math.PI, Math.PI + 3 - Math.sqrt(3)];
/** Simulation estimates (docs/theory.md sec. 8.4): perimeter u_0, area v_0 (zero drift, one walk). */
export const U0_ESTIMATE = 1.08;
export const V0_ESTIMATE = 0.305;

/** E[max_j s_j |N_j|] for independent standard normals N_j. */
export function expectedMaxHalfNormals(s: number[]): number {
  const sMin = Math.min(...s), sMax = Math.max(...s);
  if (s.length === 1) return s[0] * Math.sqrt(2 / Math.PI);
  const gl = gaussLegendre(20);
  const X = 10 * sMax;
  const m = Math.ceil(X / (0.5 * sMin));
  const len = X / m;
  let total = 0;
  for (let q = 0; q < m; q++) {
    const c = (q + 0.5) * len;
    for (let i = 0; i < gl.x.length; i++) {
      const x = c + 0.5 * len * gl.x[i];
      let p = 1;
      for (const sj of s) p *= erf(x / (sj * SQRT2));
      total += gl.w[i] * (1 - p);
    }
  }
  return (total * len) / 2;
}

/** lim n^{-1/2} E L_n for k zero-drift walks with covariances `covs`. */
export function brownianPerimeterConstant(covs: Mat2[]): { value: number; error: number } {
  const f = (t: number) => {
    const c = Math.cos(t), s = Math.sin(t);
    return expectedMaxHalfNormals(covs.map((C) => Math.sqrt(Math.max(0, C[0][0] * c * c + 2 * C[0][1] * c * s + C[1][1] * s * s))));
  };
  let n = 16, sum = 0;
  for (let i = 0; i < n; i++) sum += f((2 * Math.PI * i) / n);
  let prev = (sum * 2 * Math.PI) / n;
  for (;;) {
    let mid = 0;
    for (let i = 0; i < n; i++) mid += f((2 * Math.PI * (i + 0.5)) / n);
    sum += mid;
    n *= 2;
    const cur = (sum * 2 * Math.PI) / n;
    if (Math.abs(cur - prev) <= 1e-13 * cur || n >= 4096) return { value: cur, error: Math.max(Math.abs(cur - prev), 1e-15 * cur) };
    prev = cur;
  }
}

/** lim n^{-1} E A_n for one zero-drift walk. */
export function brownianAreaOneWalk(cov: Mat2): number {
  return (Math.PI / 2) * Math.sqrt(Math.max(0, cov[0][0] * cov[1][1] - cov[0][1] * cov[1][0]));
}
