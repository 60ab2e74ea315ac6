// One-sample Kolmogorov-Smirnov test of p-values against U(0, 1), for the calibration study.
// p-value from the asymptotic Kolmogorov distribution with Stephens' small-sample correction
// ("Use of the Kolmogorov-Smirnov, Cramer-von Mises and related statistics without
// extensive tables", JRSS B 32 (1970)): Q_KS((sqrt(m) + 0.12 + 0.11/sqrt(m)) D).

export function ksUniformPValue(ps: number[]): number {
  const m = ps.length;
  if (m === 0) return NaN;
  const x = [...ps].sort((a, b) => a - b);
  let d = 0;
  x.forEach((v, i) => {
    d = Math.max(d, (i + 1) / m - v, v - i / m);
  });
  const t = (Math.sqrt(m) + 0.12 + 0.11 / Math.sqrt(m)) * d;
  return kolmogorovSurvival(t);
}

/** P(K > t) for the Kolmogorov distribution: 2 sum_{j>=1} (-1)^(j-1) exp(-2 j^2 t^2). */
export function kolmogorovSurvival(t: number): number {
  if (t < 0.2) return 1;
  let s = 0;
  for (let j = 1; j <= 100; j++) {
    const term = 2 * (j % 2 === 1 ? 1 : -1) * Math.exp(-2 * j * j * t * t);
    s += term;
    if (Math.abs(term) < 1e-16) break;
  }
  return Math.min(1, Math.max(0, s));
}
