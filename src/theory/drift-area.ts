// Prediction: area of the hull of drifting walks (docs/theory.md sec. 9 and 10).
//
// One walk, mu != 0 [derived, docs/theory.md sec. 9]: A_n / n^{3/2} -> |mu| sigma_perp * (area of the hull of the
// graph of a 1-D Brownian motion on [0, 1]); E of that area = sqrt(2 pi)/3, so
// lim E A_n / n^{3/2} = sqrt(2 pi)/3 |mu| sigma_perp, sigma_perp^2 = e_perp' Sigma e_perp. Not normal.
// Var A_n / n^3 -> v_+ |mu|^2 sigma_perp^2 with v_+ ~ 0.019 (simulation estimate, docs/theory.md sec. 9).
// (Scaling limit: "Convex hulls of random walks and their scaling limits", SPA 125 (2015),
// arXiv:1408.4560 [memory for the id].)
// k >= 2 walks, 0 interior to P [derived; docs/theory.md sec. 10]: A_n ~ area(conv{0, S^j_n}), linearised
// at S^j_n = n mu_j: Var(A_n)/n^3 -> sum_j grad_j' Sigma_j grad_j, grad_j = (1/2) J(v_next - v_prev) at the
// vertex mu_j of P; normal; E A_n / n^2 -> area(P). 0 on the boundary of P: walks running along the
// edges through 0 bulge outward by order sqrt(n) over length n, a non-Gaussian term: not normal.

import type { Mat2, Vec2 } from "../suite/schema.js";
import { quad } from "./step-moments.js";

export const DRIFT_AREA_MEAN_CONSTANT = Math.sqrt(2 * Math.PI) / 3;
export const V_PLUS_ESTIMATE = 0.019;

export function oneWalkDriftArea(mean: Vec2, cov: Mat2): { meanGrowth: number; varianceEstimate: number; sigmaPerp2: number } {
  const m = Math.hypot(mean[0], mean[1]);
  const perp: Vec2 = [-mean[1] / m, mean[0] / m];
  const sigmaPerp2 = quad(cov, perp);
  return {
    meanGrowth: DRIFT_AREA_MEAN_CONSTANT * m * Math.sqrt(sigmaPerp2),
    varianceEstimate: V_PLUS_ESTIMATE * m * m * sigmaPerp2,
    sigmaPerp2,
  };
}
