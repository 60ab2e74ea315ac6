// The kept per-path sample as CSV: one row per kept path, a `path` column (global path index) and
// one column per measure and n, named `<measure>@<n>` (e.g. `perimeter@100`), in the suite's order.

import { measureSample, seriesWidth } from "../run/series.js";
import type { KeptSample } from "../run/types.js";
import type { Suite } from "../suite/schema.js";

/** Column names of the samples CSV for a suite: `path`, then `<measure>@<n>` measure-major. */
export function sampleColumns(suite: Pick<Suite, "measure" | "n">): string[] {
  return ["path", ...suite.measure.flatMap((m) => suite.n.map((n) => `${m}@${n}`))];
}

/**
 * Render the kept sample as CSV. Numbers are written in JavaScript's shortest round-trip form, so
 * reading the file back gives the same doubles. Throws `sample.values: ...` when the sample does not
 * match the suite's grid.
 */
export function samplesCsv(suite: Pick<Suite, "measure" | "n">, sample: KeptSample): string {
  const dim = seriesWidth({ suite });
  if (sample.values.length !== dim) {
    throw new Error(`sample.values: ${sample.values.length} columns, expected ${dim} (grid of ${suite.n.length} x record)`);
  }
  const cols = suite.measure.flatMap((m) => measureSample({ suite, sample }, m));
  const rows: string[] = [sampleColumns(suite).join(",")];
  for (let i = 0; i < sample.pathIndex.length; i++) {
    const cells = [String(sample.pathIndex[i])];
    for (const c of cols) cells.push(Number.isFinite(c[i]) ? String(c[i]) : "");
    rows.push(cells.join(","));
  }
  return rows.join("\n") + "\n";
}
