// `walkhull diff`: is a current report statistically different from a baseline report?
//
// Two modes.
// - exact: when both reports have the same seed, suite hash and tool version, the simulation is
//   deterministic (same bits for any worker count or split into parts), so any difference in a
//   `results` number is a regression: every row is compared bit for bit (Object.is).
// - statistical (otherwise): for every (measure, n) in both reports, two-sample z-tests of the mean
//   and of the variance, z = (current - baseline) / sqrt(SE_b^2 + SE_c^2), SEs from the reports
//   (meanSE, varianceSE: fourth-moment standard error of the variance), two-sided normal p-values,
//   Holm's step-down procedure over the whole family at level alpha (Holm, Scand. J. Statist. 6
//   (1979) 65-70; valid under any dependence, and rows at different n share paths). The z-test
//   assumes the two runs are independent (different seeds); with the same seed and a changed tool
//   the runs are positively correlated and the test is conservative.
// Rows present in only one report are listed, not compared; the caller treats that as bad input.

import type { ResultRecord } from "../run/types.js";
import { holm } from "../stats/holm.js";
import { twoSidedNormalP } from "../stats/normal.js";
import { sig, textTable } from "./table.js";
import { FieldError } from "../suite/load.js";

export const DEFAULT_DIFF_ALPHA = 0.01;

/** A report that cannot be compared: the message starts with the field path. */
export class DiffInputError extends FieldError {}

/** The part of a report that diff reads (checked by `readDiffInput`). */
export type DiffRow = Pick<ResultRecord, "n" | "paths" | "mean" | "meanSE" | "variance" | "varianceSE"> & {
  /** A string here: a report from another version may name a measure this one does not know. */
  measure: string;
  [k: string]: unknown;
};
export interface DiffInput {
  seed: number | null;
  suiteHash: string | null;
  version: string | null;
  wasmSha256: string | null;
  title: string;
  results: DiffRow[];
}

export interface DiffTest {
  measure: string;
  n: number;
  quantity: "mean" | "variance";
  baseline: number;
  baselineSE: number;
  current: number;
  currentSE: number;
  /** (current - baseline) / |baseline|, NaN when the baseline is 0. */
  relativeChange: number;
  z: number;
  pValue: number;
  adjustedPValue: number;
  /** Holm rejects: a significant change. */
  moved: boolean;
}

export interface ExactMismatch {
  measure: string;
  n: number;
  field: string;
  baseline: unknown;
  current: unknown;
}

export interface DiffResult {
  mode: "exact" | "statistical";
  alpha: number;
  tests: DiffTest[];
  /** Exact mode: every results field whose bits differ. */
  mismatches: ExactMismatch[];
  onlyInBaseline: string[];
  onlyInCurrent: string[];
  notes: string[];
  /** Number of significant changes (statistical) or differing rows (exact). */
  changed: number;
  /** 0 no significant change, 1 significant change, 2 the reports do not cover the same rows. */
  exitCode: 0 | 1 | 2;
}

const isObj = (v: unknown): v is Record<string, unknown> => typeof v === "object" && v !== null && !Array.isArray(v);

/** Check the fields diff needs; errors name the field, prefixed by `label` (baseline or current). */
export function readDiffInput(raw: unknown, label: string): DiffInput {
  if (!isObj(raw)) throw new DiffInputError(label, "must be a JSON object (a walkhull report)");
  if (typeof raw.format !== "string" || !raw.format.startsWith("walkhull-report/")) {
    throw new DiffInputError(`${label}.format`, `expected "walkhull-report/<version>", got ${JSON.stringify(raw.format)} (is this a walkhull report?)`);
  }
  if (!Array.isArray(raw.results)) throw new DiffInputError(`${label}.results`, "must be an array of result rows");
  const seen = new Set<string>();
  const results = raw.results.map((r, i) => {
    const at = `${label}.results[${i}]`;
    if (!isObj(r)) throw new DiffInputError(at, "must be an object");
    if (typeof r.measure !== "string") throw new DiffInputError(`${at}.measure`, "must be a string");
    for (const k of ["n", "paths", "mean", "meanSE", "variance", "varianceSE"]) {
      // Non-finite numbers are written as null by toJson: accepted (the row is then untestable).
      if (!(typeof r[k] === "number" || r[k] === null)) throw new DiffInputError(`${at}.${k}`, `must be a number (got ${JSON.stringify(r[k])})`);
    }
    const key = `${r.measure}@${r.n}`;
    if (seen.has(key)) throw new DiffInputError(at, `${key} appears twice`);
    seen.add(key);
    const num = (v: unknown) => (typeof v === "number" ? v : NaN);
    return { ...r, measure: r.measure, n: num(r.n), paths: num(r.paths), mean: num(r.mean), meanSE: num(r.meanSE), variance: num(r.variance), varianceSE: num(r.varianceSE) } as DiffRow;
  });
  const prov = isObj(raw.provenance) ? raw.provenance : {};
  const str = (v: unknown) => (typeof v === "string" ? v : null);
  return {
    seed: typeof raw.seed === "number" ? raw.seed : typeof prov.seed === "number" ? prov.seed : null,
    suiteHash: str(prov.suiteHash) ?? (isObj(raw.suite) ? str(raw.suite.hash) : null),
    version: str(raw.version) ?? str(prov.version),
    wasmSha256: str(prov.wasmSha256),
    title: isObj(raw.suite) && typeof raw.suite.title === "string" ? raw.suite.title : "(untitled)",
    results,
  };
}

/** Whether the two reports come from the same deterministic computation (seed, suite, version). */
export function exactComparable(a: DiffInput, b: DiffInput): boolean {
  return a.seed !== null && a.seed === b.seed && a.suiteHash !== null && a.suiteHash === b.suiteHash && a.version !== null && a.version === b.version;
}

/** Two-sided z-test of a difference of two independent estimates with standard errors. */
export function twoSampleZ(a: number, seA: number, b: number, seB: number): { z: number; pValue: number } {
  if (![a, seA, b, seB].every(Number.isFinite) || seA < 0 || seB < 0) return { z: NaN, pValue: NaN };
  const se = Math.sqrt(seA * seA + seB * seB);
  if (se === 0) return a === b ? { z: 0, pValue: 1 } : { z: Math.sign(b - a) * Infinity, pValue: 0 };
  const z = (b - a) / se;
  return { z, pValue: twoSidedNormalP(z) };
}

const COMPARED_FIELDS = ["paths", "mean", "meanSE", "variance", "varianceSE", "skewness", "excessKurtosis", "skewnessSE", "excessKurtosisSE", "min", "max"];

export interface DiffOptions {
  alpha?: number;
  /** Force the statistical mode even when the reports are exactly comparable. */
  statistical?: boolean;
}

export function diffReports(baseline: DiffInput, current: DiffInput, opts: DiffOptions = {}): DiffResult {
  const alpha = opts.alpha ?? DEFAULT_DIFF_ALPHA;
  if (!(alpha > 0 && alpha < 1)) throw new DiffInputError("alpha", `must be in (0, 1), got ${alpha}`);
  const key = (r: DiffRow) => `${r.measure}@${r.n}`;
  const cur = new Map(current.results.map((r) => [key(r), r]));
  const base = new Map(baseline.results.map((r) => [key(r), r]));
  const onlyInBaseline = baseline.results.filter((r) => !cur.has(key(r))).map(key);
  const onlyInCurrent = current.results.filter((r) => !base.has(key(r))).map(key);
  const pairs = baseline.results.filter((r) => cur.has(key(r))).map((r) => [r, cur.get(key(r))!] as const);
  const notes: string[] = [];
  const exact = !opts.statistical && exactComparable(baseline, current);
  if (baseline.suiteHash !== current.suiteHash) notes.push(`the suites differ (hash ${short(baseline.suiteHash)} vs ${short(current.suiteHash)}): only rows present in both are compared`);
  if (baseline.seed === current.seed && !exact) notes.push(`same seed ${baseline.seed}: the runs share random numbers, so the independent-samples z-test is conservative`);
  if (exact && baseline.wasmSha256 !== current.wasmSha256) notes.push(`same seed, suite and version but different WASM builds (${short(baseline.wasmSha256)} vs ${short(current.wasmSha256)})`);

  // The statistical tests are computed in both modes (exact mode shows them as context).
  const raw: Omit<DiffTest, "adjustedPValue" | "moved">[] = [];
  for (const [b, c] of pairs) {
    for (const quantity of ["mean", "variance"] as const) {
      const se = quantity === "mean" ? "meanSE" : "varianceSE";
      const t = twoSampleZ(b[quantity], b[se], c[quantity], c[se]);
      raw.push({
        measure: b.measure,
        n: b.n,
        quantity,
        baseline: b[quantity],
        baselineSE: b[se],
        current: c[quantity],
        currentSE: c[se],
        relativeChange: b[quantity] !== 0 ? (c[quantity] - b[quantity]) / Math.abs(b[quantity]) : NaN,
        ...t,
      });
    }
  }
  const h = holm(raw.map((t) => t.pValue), alpha);
  const tests: DiffTest[] = raw.map((t, i) => ({ ...t, adjustedPValue: h.adjusted[i], moved: !exact && h.rejected[i] }));
  const untestable = tests.filter((t) => Number.isNaN(t.pValue)).length;
  if (untestable) notes.push(`${untestable} test(s) without a finite estimate or standard error were not tested`);

  const mismatches: ExactMismatch[] = [];
  if (exact) {
    for (const [b, c] of pairs) {
      for (const f of COMPARED_FIELDS) {
        const x = b[f] ?? null;
        const y = c[f] ?? null;
        if (!Object.is(x, y)) mismatches.push({ measure: b.measure, n: b.n, field: f, baseline: x, current: y });
      }
    }
  }
  const changed = exact ? new Set(mismatches.map((m) => `${m.measure}@${m.n}`)).size : tests.filter((t) => t.moved).length;
  const mismatch = onlyInBaseline.length > 0 || onlyInCurrent.length > 0;
  return {
    mode: exact ? "exact" : "statistical",
    alpha,
    tests,
    mismatches,
    onlyInBaseline,
    onlyInCurrent,
    notes,
    changed,
    exitCode: mismatch ? 2 : changed > 0 ? 1 : 0,
  };
}

function short(h: string | null): string {
  return h ? h.slice(0, 12) : "none";
}

const pv = (p: number): string => (Number.isNaN(p) ? "-" : p < 1e-4 ? p.toExponential(1) : p.toFixed(4));
const pct = (x: number): string => (Number.isFinite(x) ? `${x >= 0 ? "+" : ""}${(100 * x).toPrecision(3)}%` : "-");

/** The diff as text: the mode, a table of every compared quantity, what moved, and the notes. */
export function renderDiff(r: DiffResult): string {
  const out: string[] = [];
  if (r.mode === "exact") {
    out.push("Mode: exact (same seed, suite hash and version: the results must agree bit for bit)");
    if (r.mismatches.length === 0) out.push(`All ${r.tests.length / 2} compared rows are bit-identical.`);
    else {
      out.push(`${r.changed} row(s) differ:`);
      out.push(textTable(["measure", "n", "field", "baseline", "current"], r.mismatches.map((m) => [m.measure, String(m.n), m.field, String(m.baseline), String(m.current)])));
    }
  } else {
    out.push(`Mode: statistical (two-sample z-tests of each mean and variance, Holm over ${r.tests.filter((t) => !Number.isNaN(t.pValue)).length} tests at alpha = ${r.alpha})`);
    const rows = r.tests.map((t) => [
      t.measure,
      String(t.n),
      t.quantity,
      `${sig(t.baseline, 8)} ± ${sig(t.baselineSE, 3)}`,
      `${sig(t.current, 8)} ± ${sig(t.currentSE, 3)}`,
      pct(t.relativeChange),
      Number.isFinite(t.z) ? t.z.toFixed(2) : Number.isNaN(t.z) ? "-" : t.z > 0 ? "inf" : "-inf",
      pv(t.pValue),
      pv(t.adjustedPValue),
      t.moved ? "MOVED" : "",
    ]);
    out.push(textTable(["measure", "n", "quantity", "baseline ± SE", "current ± SE", "change", "z", "p", "p (Holm)", ""], rows));
    const moved = r.tests.filter((t) => t.moved);
    out.push("");
    out.push(
      moved.length === 0
        ? "No significant change."
        : `Significant changes (${moved.length}): ` + moved.map((t) => `${t.quantity} of ${t.measure} at n = ${t.n} (${pct(t.relativeChange)}, z = ${t.z.toFixed(2)})`).join("; "),
    );
  }
  if (r.onlyInBaseline.length) out.push(`Only in the baseline (not compared): ${r.onlyInBaseline.join(", ")}`);
  if (r.onlyInCurrent.length) out.push(`Only in the current report (not compared): ${r.onlyInCurrent.join(", ")}`);
  for (const n of r.notes) out.push(`Note: ${n}`);
  return out.join("\n");
}

/** JUnit test cases of a diff: one per compared quantity (statistical) or per row (exact). */
export function diffCases(r: DiffResult): { name: string; classname: string; failure?: { message: string; type: string; text: string }; skipped?: { message: string } }[] {
  const cases: ReturnType<typeof diffCases> = [];
  if (r.mode === "exact") {
    const rows = new Map<string, ExactMismatch[]>();
    for (const t of r.tests) if (t.quantity === "mean") rows.set(`${t.measure}@${t.n}`, []);
    for (const m of r.mismatches) rows.get(`${m.measure}@${m.n}`)?.push(m);
    for (const [k, ms] of rows) {
      const tc: (typeof cases)[number] = { name: `${k} bit-identical`, classname: "walkhull.diff.exact" };
      if (ms.length) tc.failure = { message: `${k}: ${ms.map((m) => m.field).join(", ")} differ`, type: "bits-differ", text: ms.map((m) => `${m.field}: ${m.baseline} -> ${m.current}`).join("\n") };
      cases.push(tc);
    }
  } else {
    for (const t of r.tests) {
      const tc: (typeof cases)[number] = { name: `${t.quantity} of ${t.measure}@${t.n}`, classname: `walkhull.diff.${t.measure}` };
      const msg = `${t.baseline} ± ${t.baselineSE} -> ${t.current} ± ${t.currentSE} (${pct(t.relativeChange)}), z = ${t.z}, p = ${pv(t.pValue)}, Holm-adjusted p = ${pv(t.adjustedPValue)}, alpha = ${r.alpha}`;
      if (t.moved) tc.failure = { message: msg, type: "significant-change", text: msg };
      else if (Number.isNaN(t.pValue)) tc.skipped = { message: `not tested: no finite estimate or standard error (${msg})` };
      cases.push(tc);
    }
  }
  for (const k of r.onlyInBaseline) cases.push({ name: `${k} present in both`, classname: "walkhull.diff.coverage", failure: { message: `${k} is only in the baseline`, type: "rows-differ", text: "" } });
  for (const k of r.onlyInCurrent) cases.push({ name: `${k} present in both`, classname: "walkhull.diff.coverage", failure: { message: `${k} is only in the current report`, type: "rows-differ", text: "" } });
  return cases;
}
