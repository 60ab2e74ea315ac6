// The decision rule for a claimed or predicted constant, and how many paths would decide it.
//
// pass: the value is not rejected and the whole (1 - alpha) decision interval (statistical +
//       systematic) lies inside value x (1 +- tolerance): the constant is right to that precision.
// fail: the value is rejected (Holm, within its family).
// else: inconclusive, with the paths that would decide if the estimate and the model systematic
//       stay as they are: the statistical part shrinks like 1/sqrt(paths), the systematic does not
//       (it is a property of the grid), so some checks cannot be decided by more paths at all.
// This is an equivalence-style rule (the interval inside a tolerance band, as in two one-sided
// tests; common practice in bioequivalence and method comparison) combined with the usual test.

export interface DecisionBasis {
  value: number;
  /** Relative tolerance of a pass. */
  tolerance: number;
  /** What the tolerance is relative to (default |value|; a coefficient uses the norm of its vector). */
  scale?: number;
  estimate: number;
  /** Statistical standard error (after any misfit scaling) on the side facing the value (for a fail), and systematic (model) standard error. */
  seStat: number;
  /** Statistical standard error on the wider side of an asymmetric interval (for a pass: the whole interval must fit); default seStat. */
  seStatWide?: number;
  seSyst: number;
  /** Paths behind seStat. */
  paths: number;
  /** z of a pass interval (two-sided 1 - alpha) and of a rejection that survives Holm in the worst case. */
  zPass: number;
  zFail: number;
}

/** The band a pass interval must lie in: value +- tolerance x scale (default scale |value|). */
export function toleranceBand(value: number, tolerance: number, scale = Math.abs(value)): [number, number] {
  const w = tolerance * scale;
  return [value - w, value + w];
}

export function insideBand(interval: [number, number], band: [number, number]): boolean {
  return interval[0] >= band[0] && interval[1] <= band[1];
}

/**
 * Paths that would decide the check (pass or fail, whichever comes first), or null with the reason
 * when no number of paths can (the systematic alone is too wide, or the statistical SE is unknown).
 */
export function pathsToDecide(b: DecisionBasis): { paths: number | null; why: string } {
  const d = Math.abs(b.estimate - b.value);
  const halfBand = b.tolerance * (b.scale ?? Math.abs(b.value));
  const s2 = b.seSyst * b.seSyst;
  if (!(b.seStat > 0) || !Number.isFinite(b.seStat)) return { paths: null, why: "the statistical standard error is unknown" };
  const need: number[] = [];
  // fail: d > zFail * sqrt(seStat^2 N0/N + syst^2)
  const f = (d / b.zFail) ** 2 - s2;
  if (f > 0) need.push((b.paths * b.seStat * b.seStat) / f);
  // pass: d + zPass * sqrt(seWide^2 N0/N + syst^2) <= halfBand
  const wide = Math.max(b.seStat, b.seStatWide ?? b.seStat);
  const room = halfBand - d;
  const p = room > 0 ? (room / b.zPass) ** 2 - s2 : -1;
  if (p > 0) need.push((b.paths * wide * wide) / p);
  if (need.length === 0) {
    return {
      paths: null,
      why: `more paths cannot decide: the model systematic se_syst = ${b.seSyst.toPrecision(3)} alone keeps the interval wider than the tolerance band ` +
        `(+-${halfBand.toPrecision(3)}) and does not exclude the value; a grid reaching larger n (or a grid on which the correction model fits) would`,
    };
  }
  const N = Math.ceil(Math.min(...need));
  return { paths: N, why: `about ${N} paths would decide (the estimate and the model systematic assumed to stay as they are)` };
}
