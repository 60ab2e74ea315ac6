// Prediction: exact finite-n mean area of the hull of ONE walk (docs/theory.md sec. 3).
//
// Formula (Barndorff-Nielsen-Baxter formula: "Combinatorial lemmas in higher dimensions",
// Trans. AMS 108 (1963) [memory for the venue]):  E A_n = (1/2) sum_{a,b >= 1, a+b <= n} E|det(S_a, S'_b)| / (a b),
// S' an independent copy of S.  Hypotheses: one walk, finite second moments.
// Gaussian steps N(m, C), C non-singular [derived]: write det(X, Y) = <X, J Y> with J the rotation by
// -90 degrees. Given Y = rho e_theta it is N(rho <a m, J e>, rho^2 a (Je)' C (Je)), so by homogeneity
//   E|det(S_a, S'_b)| = int_0^{2pi} G_a(theta) R_b(theta) d theta,
//   G_a(theta) = E|N(<a m, J e>, a (Je)' C (Je))|,   R_b(theta) = int_0^inf rho^2 p_{S'_b}(rho e) d rho,
// where R_b has a closed form (a truncated second moment of a 1-D normal). The theta-integrand is
// periodic and analytic: trapezoid rule with N nodes; |T_N - T_{N/2}| is the stated error bound.
// Zero drift: E|det| = sqrt(a b det C), so E A_n = (sqrt(det C) / 2) sum_{a+b<=n} (a b)^{-1/2} (docs/theory.md sec. 3).
// Cost with drift: O(n^2 N) multiply-adds (a matrix product), N ~ 64 + 16 sqrt(n) |m| / sqrt(lambda_min).

import type { Mat2, Vec2 } from "../suite/schema.js";
import { foldedNormalMean, KahanSum, secondsSince } from "./special.js";
import { normalCdf } from "../stats/normal.js";
import type { ExactMeans } from "./spitzer-widom.js";

export const BNB_SOURCE =
  "Barndorff-Nielsen-Baxter formula (Combinatorial lemmas in higher dimensions, Trans. AMS 108 (1963); docs/theory.md sec. 3): E A_n = (1/2) sum_{a+b<=n} E|det(S_a,S'_b)|/(ab)";

/** Exact finite-n mean areas: spitzer-widom.ts's record of exact means, without its sources. */
export type AreaMeans = Omit<ExactMeans, "sources">;

export function gaussianAreaMeans(mean: Vec2, cov: Mat2, ns: number[], budgetSeconds: number): AreaMeans {
  const start = performance.now();
  const det = cov[0][0] * cov[1][1] - cov[0][1] * cov[1][0];
  const tr = cov[0][0] + cov[1][1];
  const out: AreaMeans = { means: {}, errors: {}, reasons: [] };
  if (!(det > 1e-12 * tr * tr)) {
    out.reasons.push("no exact mean area: the step covariance is singular");
    return out;
  }
  const sorted = [...ns].sort((a, b) => a - b);
  const nMax = sorted[sorted.length - 1];
  const mm = Math.hypot(mean[0], mean[1]);
  if (mm === 0) {
    // Prefix sums: sum_{a+b<=n} (ab)^{-1/2} = sum_a a^{-1/2} P(n - a), P(j) = sum_{b<=j} b^{-1/2}.
    const P = new Float64Array(nMax + 1);
    for (let j = 1; j <= nMax; j++) P[j] = P[j - 1] + 1 / Math.sqrt(j);
    for (const n of sorted) {
      const s = new KahanSum();
      for (let a = 1; a < n; a++) s.add(P[n - a] / Math.sqrt(a));
      out.means[String(n)] = (Math.sqrt(det) / 2) * s.value;
      out.errors[String(n)] = 1e-15 * n * out.means[String(n)];
    }
    return out;
  }
  const lamMin = tr / 2 - Math.sqrt(Math.max(0, (tr * tr) / 4 - det));
  // Keep the n whose O(n^2 N) cost fits (about 1e9 multiply-adds per second assumed, checked below).
  const nodesFor = (n: number) => 2 ** Math.ceil(Math.log2(64 + (16 * Math.sqrt(n) * mm) / Math.sqrt(lamMin)));
  const kept = sorted.filter((n) => (n * n * nodesFor(n)) / 2 / 3e8 <= budgetSeconds);
  for (const n of sorted) {
    if (!kept.includes(n)) out.reasons.push(`mean area at n = ${n} not computed: O(n^2) pair sum over the time budget`);
  }
  if (kept.length === 0) return out;
  const top = kept[kept.length - 1];
  const N = nodesFor(top);
  const ci = [[cov[1][1], -cov[0][1]], [-cov[1][0], cov[0][0]]].map((r) => r.map((v) => v / det));
  // G[a][i] and R[b][i] on the theta grid.
  const G = new Float64Array((top + 1) * N), R = new Float64Array((top + 1) * N);
  for (let i = 0; i < N; i++) {
    const th = (2 * Math.PI * i) / N;
    const e: Vec2 = [Math.cos(th), Math.sin(th)];
    const je: Vec2 = [e[1], -e[0]];
    const muUnit = mean[0] * je[0] + mean[1] * je[1];
    const varUnit = je[0] * je[0] * cov[0][0] + 2 * je[0] * je[1] * cov[0][1] + je[1] * je[1] * cov[1][1];
    // For Y ~ N(b m, b C): A = e'C^{-1}e / b, B = e'C^{-1} m, Cq = b m'C^{-1}m.
    const eCe = e[0] * (ci[0][0] * e[0] + ci[0][1] * e[1]) + e[1] * (ci[1][0] * e[0] + ci[1][1] * e[1]);
    const eCm = e[0] * (ci[0][0] * mean[0] + ci[0][1] * mean[1]) + e[1] * (ci[1][0] * mean[0] + ci[1][1] * mean[1]);
    const mCm = mean[0] * (ci[0][0] * mean[0] + ci[0][1] * mean[1]) + mean[1] * (ci[1][0] * mean[0] + ci[1][1] * mean[1]);
    for (let k = 1; k <= top; k++) {
      G[k * N + i] = foldedNormalMean(k * muUnit, Math.sqrt(k * varUnit));
      const A = eCe / k, B = eCm, Cq = k * mCm;
      const mu0 = B / A, tau = 1 / Math.sqrt(A), z = mu0 / tau;
      const radial = Math.sqrt(2 * Math.PI) * tau *
        ((mu0 * mu0 + tau * tau) * normalCdf(z) + mu0 * tau * Math.exp(-0.5 * z * z) / Math.sqrt(2 * Math.PI));
      R[k * N + i] = (radial * Math.exp(-0.5 * (Cq - (B * B) / A))) / (2 * Math.PI * k * Math.sqrt(det));
    }
  }
  // D[a][b] = E|det(S_a, S'_b)| / (ab) with N and N/2 nodes; accumulate by anti-diagonals.
  const diag = new Float64Array(top + 1), diagHalf = new Float64Array(top + 1);
  const h = (2 * Math.PI) / N;
  for (let a = 1; a < top; a++) {
    const ga = a * N;
    for (let b = 1; a + b <= top; b++) {
      const rb = b * N;
      let s = 0, sh = 0;
      for (let i = 0; i < N; i += 2) {
        const v = G[ga + i] * R[rb + i];
        sh += v;
        s += v + G[ga + i + 1] * R[rb + i + 1];
      }
      diag[a + b] += (s * h) / (a * b);
      diagHalf[a + b] += (sh * 2 * h) / (a * b);
    }
    if (a % 64 === 0 && secondsSince(start) > 4 * budgetSeconds) break;
  }
  let acc = 0, accHalf = 0;
  for (let s = 2; s <= top; s++) {
    acc += diag[s];
    accHalf += diagHalf[s];
    if (kept.includes(s)) {
      out.means[String(s)] = acc / 2;
      out.errors[String(s)] = Math.abs(acc - accHalf) / 2 + 1e-14 * acc;
    }
  }
  if (kept.includes(1)) { out.means["1"] = 0; out.errors["1"] = 0; }
  return out;
}
