// Prediction: exact finite-n mean perimeter of the hull of ONE walk (docs/theory.md sec. 2).
//
// Formula (Spitzer-Widom formula: "The circumference of a convex polygon", Proc. AMS 12 (1961)):
//   E L_n = 2 * sum_{k=1..n} E|S_k| / k.
// Hypotheses: one walk (k = 1), E|Z| < infinity, any drift, any law.
// E|S_k|: Gaussian steps exactly by the exponentially convergent 1-D integral (gaussian-abs.ts,
// [derived]); discrete and empirical steps by the exact law of S_k (discrete-law.ts); circle and
// student steps: no prediction (no exact law of S_k implemented), said in `reasons`.

import type { StepLaw } from "../suite/schema.js";
import { discreteAbsMeans } from "./discrete-law.js";
import { gaussianAbsMean } from "./gaussian-abs.js";
import { lawAtoms } from "./step-moments.js";
import { KahanSum, secondsSince } from "./special.js";

export const SPITZER_WIDOM_SOURCE =
  "Spitzer-Widom formula (The circumference of a convex polygon, Proc. AMS 12 (1961); docs/theory.md sec. 2): E L_n = 2 sum_{k<=n} E|S_k|/k";

export interface ExactMeans {
  /** Means keyed by n (decimal string). */
  means: Record<string, number>;
  errors: Record<string, number>;
  reasons: string[];
  sources: string[];
}

/** E|S_k| for k = 1..n, with error bounds; stops early (fewer k) when the budget runs out. */
export function absMeansOfSums(
  law: StepLaw,
  n: number,
  budgetSeconds: number,
  path = "walk",
): { absMeans: number[]; errors: number[]; reasons: string[] } | null {
  const reasons: string[] = [];
  if (law.law === "gaussian") {
    const start = performance.now();
    const absMeans: number[] = [], errors: number[] = [];
    for (let k = 1; k <= n; k++) {
      const r = gaussianAbsMean([k * law.mean[0], k * law.mean[1]], [
        [k * law.cov[0][0], k * law.cov[0][1]],
        [k * law.cov[1][0], k * law.cov[1][1]],
      ]);
      absMeans.push(r.value);
      errors.push(r.error);
      if (k % 64 === 0 && secondsSince(start) > budgetSeconds && k < n) {
        reasons.push(`${path}: E|S_k| computed for k <= ${k} only (time budget ${budgetSeconds.toFixed(1)} s)`);
        break;
      }
    }
    return { absMeans, errors, reasons };
  }
  if (law.law === "discrete" || law.law === "empirical") {
    const { atoms, weights } = lawAtoms(law, path);
    const r = discreteAbsMeans(atoms, weights, n, Math.max(1e6, budgetSeconds * 5e7)); // ~5e7 cell updates per second measured
    if (r.reached < n) {
      reasons.push(
        `${path}: exact law of S_k (${r.method}) capped at k = ${r.reached}: its support grows too large for the time budget`,
      );
    }
    return { absMeans: r.absMeans, errors: r.errors, reasons };
  }
  return null;
}

/** Exact E L_n of one walk at every n of `ns` reachable within the budget. */
export function spitzerWidomMeans(law: StepLaw, ns: number[], budgetSeconds: number, path = "walk"): ExactMeans {
  const out: ExactMeans = { means: {}, errors: {}, reasons: [], sources: [SPITZER_WIDOM_SOURCE] };
  const nMax = Math.max(...ns);
  const r = absMeansOfSums(law, nMax, budgetSeconds, path);
  if (r === null) {
    out.reasons.push(
      `${path}: no exact mean perimeter for ${law.law} steps (the law of S_k has no exact form here; ` +
        "only Gaussian, discrete and empirical laws are computed)",
    );
    return out;
  }
  out.reasons.push(...r.reasons);
  const s = new KahanSum();
  let e = 0;
  const want = new Set(ns);
  for (let k = 1; k <= r.absMeans.length; k++) {
    s.add(r.absMeans[k - 1] / k);
    e += r.errors[k - 1] / k;
    if (want.has(k)) {
      out.means[String(k)] = 2 * s.value;
      out.errors[String(k)] = 2 * e + 4e-16 * 2 * s.value * Math.log2(k + 1);
    }
  }
  if (law.law === "gaussian") out.sources.push("E|N(m, C)| by the 1-D integral of E|<X, e_t>| over t [derived, docs/theory.md sec. 2.1]");
  if (law.law === "discrete" || law.law === "empirical") out.sources.push("exact law of S_k by convolution (common practice)");
  return out;
}
