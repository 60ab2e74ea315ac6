// What the verdict stage hands to the report stage. Field names of Check are a contract read by
// users' scripts: add, never rename.

import type { Measure } from "../suite/schema.js";
import type { PointEstimate } from "./estimates.js";
import type { LinearisationEvidence, RemainderDecision } from "./linearisation.js";
import type { Linearisation } from "../suite/schema.js";
import type { TieLawPoint } from "./tie-law.js";

export type CheckKind = "mean" | "varianceLimit" | "meanGrowth" | "limitLaw" | "linearisation";
export type Verdict = "pass" | "fail" | "inconclusive" | "confirmed" | "not-yet-visible";

export interface Check {
  /** Stable id, e.g. "perimeter.varianceLimit.prediction", "area.mean.n100.claims[3]". */
  id: string;
  measure: Measure;
  /** The step count of a finite-n check, null for limits and laws. */
  n: number | null;
  kind: CheckKind;
  /** "claim" or "claim: <label>" for user claims, "prediction: <citations>" for built-in ones. */
  source: string;
  /** The simulated value compared (a mean, an extrapolated limit, a KS distance). */
  estimate: number | null;
  /** The claimed or predicted value ("normal", "non-normal" for laws; "<= tol" as a string for distances). */
  expected: number | string | null;
  /** The test statistic (z, likelihood-ratio chi-square, or distance), null when none. */
  statistic: number | null;
  /** Unadjusted p-value of the gated test, null when none. */
  pValue: number | null;
  /** Holm-adjusted p-value (gated checks only). */
  adjustedPValue: number | null;
  /** Confidence interval of the estimate (level in `detail`), null when none. */
  ci: [number, number] | null;
  verdict: Verdict;
  /** Whether the check takes part in the Holm family (can fail). */
  gated: boolean;
  /** One or two sentences: the method, the assumptions, why this verdict. */
  detail: string;
  /** The Holm family of a gated check ("claims" or "predictions"); null when not gated. */
  family?: "claims" | "predictions" | null;
  /** Relative tolerance of a pass (constants only), else null. */
  tolerance?: number | null;
  /** The (1 - alpha) interval (statistical + systematic) that decides a pass (constants only). */
  decisionInterval?: [number, number] | null;
  /** For an inconclusive constant: paths that would decide it (estimate and systematic assumed unchanged); null when more paths cannot. */
  pathsToDecide?: number | null;
}

/** A limit estimated from the grid whatever was claimed (shown with its interval). */
export interface LimitEstimate {
  measure: Measure;
  quantity: "varianceLimit" | "meanGrowth";
  /** The power of n: Var(X_n)/n^p or E X_n / n^q. */
  scaling: number;
  /** "profile": beta estimated; "fixed": beta assumed; "log": E X_n/n = g + (a ln n + b)/n;
   * "none": ratio at the largest n only (no extrapolation). */
  method: "profile" | "fixed" | "log" | "none";
  estimate: number;
  standardError: number;
  ci: [number, number] | null;
  level: number;
  beta: number | null;
  betaInterval: [number, number] | null;
  /** Misfit p-value of the model (null when no degrees of freedom remain). */
  misfitPValue: number | null;
  /** Estimates under other assumed rates (fixed method only). */
  sensitivity: { beta: number; estimate: number; ci: [number, number] }[];
  /** Statistical interval alone (the profile or GLS interval before the systematic is added); `ci` is the total. */
  statisticalCi?: [number, number] | null;
  /**
   * Model (systematic) uncertainty of the extrapolated limit: the largest |alternative - estimate|
   * over the alternative fits below; null when no alternative could be fitted (then nothing is gated).
   */
  systematic?: number | null;
  /** S = sqrt(chi2/df) when the model misfits (p < 0.05) and its statistical errors were scaled by it; else null. */
  misfitScale?: number | null;
  /** The alternative fits behind `systematic` (refit without the smallest n, alternative correction model). */
  alternatives?: { label: string; estimate: number }[];
  /** Ratio and its jackknife SE at each grid point. */
  ratios: { n: number; value: number; standardError: number }[];
  note: string;
}

export interface VerdictReport {
  checks: Check[];
  limits: LimitEstimate[];
  alpha: number;
  /** Number of checks with verdict "fail". */
  failed: number;
  /** Default relative tolerance of a pass. */
  tolerance?: number;
  /** User claims left inconclusive (exit code 3 when nothing failed), with the paths that would decide. */
  undecidedClaims?: { id: string; pathsToDecide: number | null | undefined }[];
  /** Number of gated checks in each Holm family. */
  familySizes?: { claims: number; predictions: number };
  /** Plain and control-variate estimates of E M_n and Var M_n per measure and n. */
  estimates?: PointEstimate[];
  /** Every claimed or predicted linearisation: coefficients per n and their limits, the remainder's decay. */
  linearisations?: LinearisationReport[];
  /** Measures predicted "gaussian-maximum": KS distance to the predicted law by n (src/verdict/tie-law.ts). */
  tieLaws?: { measure: Measure; state: "agrees" | "disagrees" | "undecided"; points: TieLawPoint[]; cdfError: number }[];
}

/** One linearisation (a claim or a built-in prediction) as checked; its checks carry ids `${id}.<label>` and `${id}.remainder`. */
export interface LinearisationReport extends LinearisationEvidence {
  /** e.g. "perimeter.linearisation.claims[2]" or "perimeter.linearisation.prediction". */
  id: string;
  source: string;
  family: "claims" | "predictions";
  tolerance: number;
  claimed: Linearisation;
  /** Extrapolated limit of each coefficient (same order as `coefficients`), with its total interval at the LEVEL of `limits`. */
  coefficientLimits: { label: string; estimate: number; ci: [number, number] | null; note: string }[];
  remainderDecision: RemainderDecision | null;
}
