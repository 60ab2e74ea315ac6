// Plain-text tables for the terminal.

import type { ResultRecord } from "../run/types.js";

/** Format a number with `digits` significant digits, without exponent for moderate magnitudes. */
export function sig(x: number | null | undefined, digits = 5): string {
  if (x === null || x === undefined || !Number.isFinite(x)) return "-";
  if (x === 0) return "0";
  const a = Math.abs(x);
  if (a >= 1e-3 && a < 1e9) return Number(x.toPrecision(digits)).toString();
  return x.toExponential(digits - 1);
}

/** Render rows as an aligned text table. Numeric-looking cells are right-aligned. */
export function textTable(header: string[], rows: string[][]): string {
  const widths = header.map((h, i) => Math.max(h.length, ...rows.map((r) => (r[i] ?? "").length)));
  const numeric = header.map((_, i) => rows.length > 0 && rows.every((r) => /^[-+0-9.e±() ]*$/.test(r[i] ?? "")));
  const line = (cells: string[]) =>
    cells.map((c, i) => (numeric[i] ? c.padStart(widths[i]) : c.padEnd(widths[i]))).join("  ").trimEnd();
  return [line(header), widths.map((w) => "-".repeat(w)).join("  "), ...rows.map(line)].join("\n");
}

/** The `results` rows as a table: mean and variance with their standard errors. */
export function resultsTable(rows: ResultRecord[], varianceScaling: (measure: string) => number | null): string {
  const header = ["measure", "n", "paths", "mean", "± SE", "variance", "± SE", "Var/n^p", "p", "skewness", "ex.kurtosis"];
  const body = rows.map((r) => {
    const p = varianceScaling(r.measure);
    return [
      r.measure,
      String(r.n),
      String(r.paths),
      sig(r.mean, 8),
      sig(r.meanSE, 3),
      sig(r.variance, 6),
      sig(r.varianceSE, 3),
      p === null ? "-" : sig(r.variance / Math.pow(r.n, p), 5),
      p === null ? "-" : sig(p, 3),
      sig(r.skewness, 3),
      sig(r.excessKurtosis, 3),
    ];
  });
  return textTable(header, body);
}
