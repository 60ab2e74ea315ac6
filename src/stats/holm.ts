// Holm's step-down procedure for family-wise error control.
//
// Method: Holm, "A simple sequentially rejective multiple test procedure", Scand. J. Statist. 6
// (1979) 65-70. Sort p ascending, p_(1) <= ... <= p_(k); reject H_(1..j) while
// p_(i) <= alpha / (k - i + 1); adjusted p_(i) = max_{j <= i} min(1, (k - j + 1) p_(j)), so
// H_i is rejected iff adjusted_i <= alpha. NaN p-values are never rejected and do not count in k.
// Ties are broken by input order (stable), which does not change the rejections.
// Cost O(k log k). Example: p = [0.01, 0.04, 0.03, 0.005], alpha 0.05 -> adjusted
// [0.03, 0.06, 0.06, 0.02], rejected [true, false, false, true].

export interface HolmResult {
  adjusted: number[];
  rejected: boolean[];
}

export function holm(pValues: readonly number[], alpha: number): HolmResult {
  if (!(alpha > 0 && alpha < 1)) throw new Error(`alpha: must be in (0, 1), got ${alpha}`);
  const idx = pValues.map((_, i) => i).filter((i) => !Number.isNaN(pValues[i]));
  idx.sort((a, b) => pValues[a] - pValues[b] || a - b);
  const k = idx.length;
  const adjusted = pValues.map(() => NaN);
  const rejected = pValues.map(() => false);
  let running = 0;
  for (let r = 0; r < k; r++) {
    const i = idx[r];
    const p = pValues[i];
    if (p < 0 || p > 1) throw new Error(`pValues[${i}]: must be in [0, 1], got ${p}`);
    running = Math.max(running, Math.min(1, (k - r) * p));
    adjusted[i] = running;
    rejected[i] = running <= alpha;
  }
  return { adjusted, rejected };
}
