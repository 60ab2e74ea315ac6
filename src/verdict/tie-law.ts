// The check of a predicted "gaussian-maximum" limit law (a farthest-pair tie of the diameter,
// docs/theory.md sec. 7.1): (X_n - n d)/sqrt(n) -> M = max of Gaussian forms, a law with no free
// parameter, so the kept sample is compared with the predicted CDF itself.
//
// Distance: at each grid n, the Kolmogorov distance D_n = sup_x |F_m(x) - F(x)| of the kept
// per-path sample standardised as (X_n - n d)/sqrt(n) to the predicted CDF F (tabulated, with its
// numerical error bound e_F; src/theory/gaussian-maximum.ts). By the Dvoretzky-Kiefer-Wolfowitz
// inequality with Massart's constant (as in src/stats/normal-distance.ts), with probability
// >= 1 - alpha the true finite-n distance d_n lies in [D_n - r_n, D_n + r_n] at EVERY grid point
// simultaneously, r_n = sqrt(ln(2G/alpha)/(2m)) + e_F (Bonferroni over the G points).
// Decision (one state, judged on the trend as src/verdict/normality.ts lawDecision does, so that a
// slowly converging right law does not fail at finite n):
// - agrees: the upper bound D_N + r_N at the largest n is below the tolerance (normalityTolerance);
// - disagrees: the LIMIT of the distance is shown above the tolerance: d_n = d_inf + c n^-beta is
//   extrapolated from the smallest and the largest n with the bounds that favour a small d_inf,
//   d_inf >= (q (D_N - r_N) - (D_1 + r_1))/(q - 1), q = (n_N/n_1)^beta, for beta = 1/2 (the first
//   correction order of a law with O(1) finite-n terms; common practice) and beta = 1/4 (a slower
//   rate, as lawDecision allows), and also d_inf >= D_N - r_N when nothing decays; the smallest of
//   these lower bounds must exceed the tolerance;
// - otherwise undecided, with what is missing.
// The mean's sqrt(n) constant: (E X_n - n d)/sqrt(n) -> E M, the series of the estimates chosen in
// src/verdict/estimates.ts (control variates where they help) with its jackknife covariance,
// extrapolated like any limit (src/verdict/extrapolate.ts) and decided like any constant
// (src/verdict/decide.ts). Var(X_n)/n -> Var M is the prediction's ordinary variance check.

import { gaussianMaximum, ksDistanceToCdf, tabulatedCdf, type TabulatedCdf } from "../theory/gaussian-maximum.js";
import type { GaussianMaximumPrediction } from "../theory/types.js";
import type { Measure } from "../suite/schema.js";
import type { Verdict } from "./types.js";
import { scaledSeries, type MeasureEstimates } from "./estimates.js";
import { extrapolate, type Extrapolation } from "./extrapolate.js";

export interface TieLawPoint {
  n: number;
  /** Kept paths at this n. */
  size: number;
  /** KS distance of the standardised sample to the predicted CDF. */
  distance: number;
  /** DKW radius (Bonferroni over the grid) plus the CDF's numerical error. */
  radius: number;
  /** 3 x 0.87/sqrt(m): below it a distance is not resolved (as in src/verdict/normality.ts). */
  resolution: number;
}

export interface TieLawEvidence {
  points: TieLawPoint[];
  /** Numerical error bound of the tabulated CDF. */
  cdfError: number;
  /** Lower bounds of the limiting distance under each decay model (beta null: no decay). */
  limitLowerBounds: { beta: number | null; bound: number }[];
  trend: string;
}

export interface TieLawDecision {
  state: "agrees" | "disagrees" | "undecided";
  why: string;
}

/** The predicted law's CDF, tabulated once per covariance (a run reads it at every n). */
const tables = new Map<string, TabulatedCdf>();
export function predictedCdf(law: GaussianMaximumPrediction): TabulatedCdf {
  const key = JSON.stringify(law.covariance);
  let t = tables.get(key);
  if (!t) {
    t = tabulatedCdf(gaussianMaximum(law.covariance), law.covariance);
    tables.set(key, t);
  }
  return t;
}

const fmt = (x: number, d = 3) => (Number.isFinite(x) ? Number(x.toPrecision(d)).toString() : String(x));

/** KS distances by n of the standardised kept samples to the predicted law, with their DKW radii and the trend. */
export function tieLawEvidence(grid: number[], samples: ArrayLike<number>[], law: GaussianMaximumPrediction, alpha: number): TieLawEvidence {
  const F = predictedCdf(law);
  const G = grid.length;
  const points: TieLawPoint[] = [];
  grid.forEach((n, g) => {
    const x = samples[g];
    const m = x.length;
    if (m < 5) return;
    const s = Float64Array.from(x, (v) => (v - n * law.centre) / Math.sqrt(n)).sort();
    points.push({
      n, size: m, distance: ksDistanceToCdf(s, F.cdf, F.cdfLeft),
      radius: Math.sqrt(Math.log((2 * G) / alpha) / (2 * m)) + F.error, resolution: 3 * (0.87 / Math.sqrt(m)),
    });
  });
  const limitLowerBounds: TieLawEvidence["limitLowerBounds"] = [];
  if (points.length >= 1) {
    const last = points[points.length - 1];
    limitLowerBounds.push({ beta: null, bound: last.distance - last.radius });
    if (points.length >= 2) {
      const first = points[0];
      for (const beta of [0.5, 0.25]) {
        const q = Math.pow(last.n / first.n, beta);
        limitLowerBounds.push({ beta, bound: (q * (last.distance - last.radius) - (first.distance + first.radius)) / (q - 1) });
      }
    }
  }
  const above = points.filter((p) => p.distance > p.resolution);
  let trend: string;
  if (above.length >= 2) {
    const xs = above.map((p) => Math.log(p.n)), ys = above.map((p) => Math.log(p.distance));
    const mx = xs.reduce((a, b) => a + b, 0) / xs.length, my = ys.reduce((a, b) => a + b, 0) / ys.length;
    let sxy = 0, sxx = 0;
    xs.forEach((x, i) => {
      sxy += (x - mx) * (ys[i] - my);
      sxx += (x - mx) ** 2;
    });
    trend = `KS distance to the predicted law ~ n^${(sxy / sxx).toFixed(2)} over n = ${above.map((p) => p.n).join(", ")} (least squares on log-log; a right law with O(1) finite-n terms decays like n^-1/2)`;
  } else {
    trend = `KS distance to the predicted law below resolution (3 x 0.87/sqrt(m)) at ${above.length === 1 ? `all n but ${above[0].n}` : "every n"}`;
  }
  return { points, cdfError: F.error, limitLowerBounds, trend };
}

export function tieLawDecision(ev: TieLawEvidence, tol: number): TieLawDecision {
  if (ev.points.length === 0) return { state: "undecided", why: "no kept sample (at least 5 paths per n are needed)" };
  const last = ev.points[ev.points.length - 1];
  const upper = last.distance + last.radius;
  if (upper < tol) return { state: "agrees", why: `the distance bound ${fmt(upper)} at n = ${last.n} is below the tolerance ${tol}` };
  const lower = Math.min(...ev.limitLowerBounds.map((b) => b.bound));
  const models = ev.limitLowerBounds.map((b) => `${b.beta === null ? "no decay" : `n^-${b.beta}`}: ${fmt(b.bound)}`).join(", ");
  if (lower > tol && ev.limitLowerBounds.length >= 3) {
    return { state: "disagrees", why: `the limiting distance is at least ${fmt(lower)} > tolerance ${tol} under every decay model (lower bounds ${models})` };
  }
  const missing = [`the distance bound ${fmt(upper)} at n = ${last.n} is not below the tolerance ${tol}`];
  if (ev.limitLowerBounds.length < 3) missing.push("one grid point cannot show a trend");
  else missing.push(`a limiting distance above the tolerance is not shown (lower bounds ${models})`);
  if (last.radius >= tol) missing.push(`the kept sample (m = ${last.size}) cannot resolve the tolerance: keep more paths`);
  return { state: "undecided", why: `neither shown: ${missing.join("; ")}` };
}

/** The KS distances by n as text (reports and check details). */
export function tieLawText(ev: TieLawEvidence, alpha: number): string {
  const rows = ev.points.map((p) => `n = ${p.n}: ${fmt(p.distance)} (bound ${fmt(p.distance + p.radius)})`).join("; ");
  return `KS distance of (X_n - n d)/sqrt(n) to the predicted CDF, with the ${(100 * (1 - alpha)).toFixed(0)}% simultaneous DKW bound over the grid (CDF error <= ${ev.cdfError.toExponential(1)}): ${rows}; ${ev.trend}.`;
}

/** (E X_n - n d)/sqrt(n) over the grid, extrapolated to n -> infinity (the limit is E M). */
export function sqrtMeanConstant(measure: Measure, est: MeasureEstimates, centre: number, grid: number[], blocks: number, expectedRate: number): Extrapolation {
  // mean/sqrt(n) - d sqrt(n): a deterministic shift per point leaves the covariance unchanged.
  const s = scaledSeries(est, "mean", 0.5, grid);
  const y = s.y.map((v, g) => v - centre * Math.sqrt(grid[g]));
  const ex = extrapolate({ measure, quantity: "meanGrowth", scaling: 0.5, n: grid, y, cov: s.cov, blocks, expectedRate });
  return { ...ex, limit: { ...ex.limit, note: `series (E X_n - n d)/sqrt(n), d = ${fmt(centre, 10)} (its terms "mean/n^0.5" below are this series): ${ex.limit.note}` } };
}

/** The law check's fields: the distance at the largest n, its bound, the verdict and the detail. */
export function tieLawCheck(grid: number[], samples: ArrayLike<number>[], law: GaussianMaximumPrediction, tol: number, alpha: number): {
  fields: { estimate: number | null; statistic: number | null; ci: [number, number] | null; verdict: Verdict; detail: string };
  evidence: TieLawEvidence;
  state: TieLawDecision["state"];
} {
  const ev = tieLawEvidence(grid, samples, law, alpha);
  const decision = tieLawDecision(ev, tol);
  const last = ev.points[ev.points.length - 1];
  const verdict: Verdict = decision.state === "agrees" ? "pass" : decision.state === "disagrees" ? "fail" : "inconclusive";
  const rule = `Predicted law: M = max of ${law.forms.length} Gaussian forms (E M = ${fmt(law.mean, 6)}, Var M = ${fmt(law.variance, 6)}), no free parameter; ` +
    `pass when the distance bound at the largest n is below the tolerance, fail when the limiting distance is shown above it (level alpha = ${alpha}, not in a Holm family): ${decision.why}.`;
  return {
    fields: {
      estimate: last ? last.distance : null, statistic: last ? last.distance : null,
      ci: last ? [Math.max(0, last.distance - last.radius), last.distance + last.radius] : null,
      verdict, detail: `${rule} ${tieLawText(ev, alpha)}`,
    },
    evidence: ev,
    state: decision.state,
  };
}
