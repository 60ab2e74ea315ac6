// Prediction: mean number of hull vertices of one walk (docs/theory.md sec. 4).
//
// Formula: E V_n = 2 * sum_{k=1..n} 1/k for steps in general position (a.s. no three of the points
// S_0..S_n collinear), any drift ("A combinatorial lemma for complex numbers", Ann. Math.
// Statist. 32 (1961) [memory for the attribution]; confirmed by our simulation at n = 10, 20, 40,
// test/engine/expectations.test.ts). Counting convention: V_n counts the extreme points of the hull of S_0..S_n.
// Hypotheses: one walk; a law without atoms and without mass on lines (Gaussian or student with a
// non-singular matrix, circle with radius > 0). Discrete and empirical laws have atoms: collinear
// points occur with positive probability, so no prediction. k >= 2 walks: no prediction.

export const BAXTER_SOURCE =
  "A combinatorial lemma for complex numbers, Ann. Math. Statist. 32 (1961): E V_n = 2 sum_{k<=n} 1/k [memory for the attribution; docs/theory.md sec. 4]";

export function meanVertexCount(n: number): number {
  let s = 0;
  for (let k = n; k >= 1; k--) s += 1 / k;
  return 2 * s;
}
