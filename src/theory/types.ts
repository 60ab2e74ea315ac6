// What the prediction stage hands to the verdict stage and to `walkhull predict --json`.
// The field names of MeasurePrediction are a contract (the prediction issue): add, never rename.

import type { Linearisation, Measure, Vec2 } from "../suite/schema.js";

export type LimitLaw = "normal" | "non-normal" | "degenerate" | "unknown" | "gaussian-maximum";
export type ConstantKind = "theorem" | "derived" | "estimate";

export interface MeasurePrediction {
  measure: Measure;
  limitLaw: LimitLaw;
  /** lim Var(X_n) / n^varianceScaling, null if none is known. */
  varianceLimit: number | null;
  /** The power p of n in Var(X_n)/n^p (1 for the perimeter with drift, 3 for area with drift...). */
  varianceScaling: number;
  /** lim E X_n / n^meanScaling, null if none is known. */
  meanGrowth: number | null;
  /** The power q of n in E X_n / n^q (1 with drift, 1/2 for the zero-drift perimeter, ...). */
  meanScaling: number;
  /** Exact (or numerically exact) finite-n means, keyed by n as a decimal string. */
  exactMeans: Record<string, number>;
  /** Absolute numerical error bound of each exact mean, same keys. */
  exactMeansError: Record<string, number>;
  /**
   * The error bound each exact mean was asked to reach (absolute, same keys): in a run, 1/10 of the
   * run's standard error of the simulated mean. A mean whose exactMeansError exceeds it is shown, not gated.
   */
  exactMeansTarget?: Record<string, number>;
  /** Kind of varianceLimit: `estimate` constants are shown, never gate a verdict. */
  varianceLimitKind: ConstantKind | null;
  /** Kind of meanGrowth (same rule). */
  meanGrowthKind: ConstantKind | null;
  /** Hypotheses checked, with their outcome, and any caveats (near-ties, missing moments...). */
  reasons: string[];
  /** Citations of every formula used. */
  sources: string[];
  /** True when variance-based checks are not calibrated (e.g. steps without a 4th moment). */
  varianceUncalibrated?: boolean;
  /**
   * The first-order representation behind varianceLimit, when the theory notes give one
   * (docs/theory.md sec. 6.1): M_n - E M_n = n^((p-1)/2) sum_j g_j . X_n^j + o(n^(p/2)), endpoint[j] = g_j.
   */
  linearisation?: Linearisation | null;
  /** Human-readable rows for the table: quantity, value, hypotheses, verdict, source. */
  rows?: PredictionRow[];
  /** With limitLaw "gaussian-maximum" (a farthest-pair tie of the diameter, docs/theory.md sec. 7.1): the law of M. */
  gaussianMaximum?: GaussianMaximumPrediction;
}

/**
 * (X_n - n centre)/sqrt(n) -> M = max_i W_i, W ~ N(0, covariance), W_i = sum_j gradients[j] . X_j / sqrt(n)
 * (X_j = S_n^j - n mu_j); hence E X_n = n centre + sqrt(n) mean + o(sqrt(n)) and Var(X_n)/n -> variance.
 */
export interface GaussianMaximumPrediction {
  /** The first-order constant (the diameter of P); equals meanGrowth. */
  centre: number;
  /** One entry per form: the tied pair of vertices of P (`ends`), the walk at each end (null: the origin), one gradient per walk. */
  forms: { ends: [Vec2, Vec2]; walks: [number | null, number | null]; gradients: Vec2[] }[];
  /** Covariance of the forms (m x m): sum_j g_ij' Sigma_j g_lj. */
  covariance: number[][];
  /** E M and Var M with absolute error bounds. */
  mean: number;
  meanError: number;
  variance: number;
  varianceError: number;
  /** How the law was computed (closed form or quadrature). */
  method: string;
}

export interface PredictionRow {
  quantity: string;
  value: string;
  hypotheses: string;
  verdict: string;
  source: string;
}

export interface Prediction {
  measures: MeasurePrediction[];
  /** Where the predictions came from: computed now ("miss" or "off" = --no-cache) or the cache ("hit"). */
  cache?: { status: "hit" | "miss" | "off"; file: string | null };
}

/**
 * The accuracy each finite-n mean must reach: absolute bounds per measure and n (a run: SE / 10),
 * else `relative` times the magnitude of the mean (default 1e-6). Part of the prediction cache key.
 */
export interface MeanTargets {
  absolute?: Partial<Record<Measure, Record<string, number>>>;
  relative?: number;
}

export interface PredictOptions {
  /** Time cap in seconds for numerical quadratures (a guard; accuracy is set by meanTargets); default 20. */
  budgetSeconds?: number;
  /** Accuracy of the finite-n means (default: 1e-6 relative). */
  meanTargets?: MeanTargets;
  /** Relative tolerance deciding ties and near-ties (default 1e-9 for ties, 1e-2 for near-ties). */
  tieTolerance?: number;
  nearTieTolerance?: number;
}
