// The suite contract: what a validation suite file may say, as TypeScript types.
// Field names here are read by users' scripts (see the engine issue): add, never rename.

export type Vec2 = [number, number];
export type Mat2 = [[number, number], [number, number]];

export interface GaussianLaw {
  law: "gaussian";
  mean: Vec2;
  /** 2x2 covariance, symmetric positive semi-definite (singular allowed). */
  cov: Mat2;
}
export interface DiscreteLaw {
  law: "discrete";
  atoms: Vec2[];
  /** Non-negative, summing to 1 (relative tolerance 1e-9). */
  weights: number[];
}
export interface CircleLaw {
  law: "circle";
  mean: Vec2;
  radius: number;
}
export interface StudentLaw {
  law: "student";
  mean: Vec2;
  /** Scale matrix; the covariance is scale * dof / (dof - 2). */
  scale: Mat2;
  dof: number;
}
export interface EmpiricalLaw {
  law: "empirical";
  /** CSV of increments (two numeric columns, header optional), relative to the suite's folder. */
  file: string;
  /** Filled in by the loader: the increments read from `file`. Not part of the file format. */
  steps?: Vec2[];
}
export type StepLaw = GaussianLaw | DiscreteLaw | CircleLaw | StudentLaw | EmpiricalLaw;
export const LAW_NAMES = ["gaussian", "discrete", "circle", "student", "empirical"] as const;

export { MEASURES, type Measure } from "../geometry/measure-registry.js";
import type { Measure } from "../geometry/measure-registry.js";

/** A user's claim about a measure (checked by the verdict stage). */
export interface Claim {
  measure: Measure;
  /** Claimed lim Var(X_n) / n^p (p from the prediction's varianceScaling, or `varianceScaling`). */
  varianceLimit?: number;
  /** Claimed lim E X_n / n^q (q = `meanScaling`, default the prediction's, else 1). */
  meanGrowth?: number;
  limitLaw?: "normal" | "non-normal";
  /** With `mean`: a claimed finite-n mean at this n (must be on the suite's grid). */
  n?: number;
  mean?: number;
  /** Optional override of the power p in Var(X_n)/n^p. */
  varianceScaling?: number;
  /** Optional power q in E X_n / n^q for meanGrowth (default: the prediction's meanScaling, else 1). */
  meanScaling?: number;
  /** Optional free-text label shown in reports. */
  label?: string;
  /** Relative precision a pass of this claim's constants must reach (default: the suite's `tolerance`). */
  tolerance?: number;
  /**
   * A claimed first-order representation M_n - E M_n = n^((p-1)/2) sum_j g_j . X_n^j
   * + n^((p-3)/2) sum_j h_j . Y_n^j + o(n^(p/2)), with X_n^j = S_n^j - n mu_j (centred endpoint),
   * Y_n^j = sum_{i<=n} (S_i^j - i mu_j) (centred integrated path) and p the measure's variance
   * scaling (1 for perimeter and diameter with drift, 3 for the area with drift). `endpoint` holds
   * g_j, one [x, y] per walk; `path` (optional) holds h_j. Checked by src/verdict/linearisation.ts.
   */
  linearisation?: Linearisation;
}

/** The coefficients of a claimed linearisation, one [x, y] per walk. */
export interface Linearisation {
  endpoint: Vec2[];
  path?: Vec2[];
}

export interface Suite {
  title: string;
  seed: number;
  walks: StepLaw[];
  measure: Measure[];
  /** Strictly increasing positive step counts; hulls at every n come from the same paths. */
  n: number[];
  paths: number;
  claims?: Claim[];
  /** Family-wise level for the gated checks (Holm), default 0.01. */
  alpha?: number;
  /** Assumed convergence rate beta of Var/n^p when the grid cannot identify it (default 0.5). */
  expectedRate?: number;
  /**
   * Relative precision of a pass (default 0.01): a constant passes only when its whole interval
   * lies within value x (1 +- tolerance).
   */
  tolerance?: number;
  /** Upper bound on the KS distance to the normal law accepted as "normal" (default 0.01). */
  normalityTolerance?: number;
  /** Number of blocks the paths are split into (default 64, at least 32). */
  blocks?: number;
  /** Free text: what the suite reproduces, and its source. */
  description?: string;
}

/** A suite after loading: validated, with its file location and a canonical hash. */
export interface LoadedSuite extends Suite {
  /** Absolute path of the suite file (null when built in code). */
  path: string | null;
  /** sha256 of the canonical JSON of the validated suite (including empirical steps). */
  hash: string;
}
