// z-scores of sample skewness and excess kurtosis against the normal law.
//
// Method: z1 = g1 / SE(g1), z2 = (g2 - E g2) / SE(g2) with the exact normal-theory moments
// E g2 = -6/(m+1), Var g1 = 6(m-2)/((m+1)(m+3)), Var g2 = 24 m (m-2)(m-3)/((m+1)^2 (m+3)(m+5))
// ("A suggestion for using powerful and informative tests of normality", Am. Stat. 44 (1990) 316). These are plain standardised
// scores (no normalising transformation), adequate for the large samples this tool sees; reported,
// never gated. Cost O(1) from a MomentSummary.
// Example: m = 1000, g1 = 0.1 -> z1 = 0.1 / 0.07723 = 1.2948.

import type { MomentSummary } from "./types.js";

export function skewnessZ(s: MomentSummary): number {
  return s.skewness / s.skewnessSE;
}

export function excessKurtosisZ(s: MomentSummary): number {
  return (s.excessKurtosis + 6 / (s.count + 1)) / s.excessKurtosisSE;
}
