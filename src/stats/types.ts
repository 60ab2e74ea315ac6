// Mergeable statistics of a stream of numbers; pure data, no knowledge of hulls.

/**
 * Central moment sums of a sample (Pebay 2008 one-pass/merge formulas):
 * count, mean, m2 = sum (x - mean)^2, m3 = sum (x - mean)^3, m4 = sum (x - mean)^4.
 * Merging two states in a fixed order is deterministic; blocks are merged in block order.
 */
export interface MomentState {
  count: number;
  mean: number;
  m2: number;
  m3: number;
  m4: number;
}

/** Co-moment sums of a vector stream: c[a*d+b] = sum (x_a - mean_a)(x_b - mean_b). */
export interface CoMomentState {
  count: number;
  dim: number;
  mean: Float64Array;
  c: Float64Array;
}

/** Summary of one sample, with standard errors. */
export interface MomentSummary {
  count: number;
  mean: number;
  meanSE: number;
  /** Unbiased sample variance. */
  variance: number;
  /** SE of the variance from the 4th moment: sqrt((m4/n - (n-3)/(n-1) s^4) / n). */
  varianceSE: number;
  /** Sample skewness g1 = (m3/n) / (m2/n)^(3/2). */
  skewness: number;
  skewnessSE: number;
  /** Sample excess kurtosis g2 = (m4/n)/(m2/n)^2 - 3. */
  excessKurtosis: number;
  excessKurtosisSE: number;
}
