// report.md: the verdicts, the predictions with their sources, the fitted limits and rates, the
// results, the covariance between measures, the provenance and the caveats, as Markdown.
// Rows shared with the HTML report are built here (`reportSections`).

import { coefficientTable, remainderSummary, remainderTable } from "./linearisation-view.js";
import type { Report } from "./json.js";
import type { Check, LimitEstimate } from "../verdict/types.js";
import type { PointEstimate } from "../verdict/estimates.js";
import type { MeasurePrediction } from "../theory/types.js";
import { sig } from "./table.js";

export const CAVEATS = [
  "A passing suite is numerical evidence under the stated model (the step laws, the finite n of the grid, the number of paths), not a proof.",
  "Finite-n laws are never exactly normal: normality is judged by an effect size (the KS distance to the normal family), not by a p-value that a large budget drives to zero.",
  "Variance limits are extrapolated from finite n under a stated model of the finite-n correction (s2 + c n^-beta); when the grid cannot identify the rate, the rate is assumed and the sensitivity to it is shown.",
  "Constants known only from simulation (kind `estimate`) are shown but never decide a verdict.",
  "Gated checks are one family controlled by Holm's procedure at the suite's alpha; inconclusive checks are not gated.",
];

const num = (x: unknown, d = 6): string => (typeof x === "number" ? sig(x, d) : x === null || x === undefined ? "-" : String(x));
const pv = (p: number | null | undefined): string => (p === null || p === undefined || Number.isNaN(p) ? "-" : p < 1e-4 ? p.toExponential(1) : p.toFixed(4));
const ci = (c: [number, number] | null | undefined): string => (c ? `[${sig(c[0], 5)}, ${sig(c[1], 5)}]` : "-");

export interface Table {
  header: string[];
  rows: string[][];
}

export const CONTROL_VARIATE_NOTE =
  "Estimates regressed on the walks' centred endpoints and integrated paths (mean 0, known covariance): " +
  "\"reduction\" = plain SE^2 / control-variate SE^2 (jackknife SEs, the regression refitted in every replicate); " +
  "the control-variate estimate (*) is used where it lowers the SE, else the plain one (\"-\" in the CV columns).";

export interface Sections {
  title: string;
  summary: string;
  checks: Table;
  checkDetails: { id: string; source: string; detail: string }[];
  predictions: { measure: string; table: Table; reasons: string[]; sources: string[] }[];
  limits: Table;
  limitNotes: string[];
  results: Table;
  /** Plain and control-variate estimates side by side (empty when the report has none). */
  controlVariates: Table;
  covariance: { n: number; covariance: Table; correlation: Table }[];
  provenance: Table;
  caveats: string[];
}

/**
 * Plain and control-variate estimates side by side: the estimate used (marked *) and both jackknife
 * SEs, with the variance-reduction factor plain SE^2 / control-variate SE^2.
 */
export function controlVariateTable(rows: PointEstimate[]): Table {
  const mark = (uses: boolean) => (uses ? "*" : "");
  return {
    header: ["measure", "n", "controls", "mean (CV)", "SE (CV)", "mean (plain)", "SE (plain)", "reduction", "variance (CV)", "SE (CV)", "variance (plain)", "SE (plain)", "reduction"],
    rows: rows.map((e) => [
      e.measure, String(e.n), String(e.controls),
      `${sig(e.meanUsesControls ? e.mean : NaN, 8)}${mark(e.meanUsesControls)}`, sig(e.meanUsesControls ? e.meanSE : NaN, 3), sig(e.meanPlain, 8), sig(e.meanPlainSE, 3), sig(e.meanReduction, 3),
      `${sig(e.varianceUsesControls ? e.variance : NaN, 6)}${mark(e.varianceUsesControls)}`, sig(e.varianceUsesControls ? e.varianceSE : NaN, 3), sig(e.variancePlain, 6), sig(e.variancePlainSE, 3), sig(e.varianceReduction, 3),
    ]),
  };
}

function predictionTable(p: MeasurePrediction): Table {
  const rows: string[][] = [
    ["limit law", p.limitLaw],
    [`lim Var/n^${sig(p.varianceScaling, 3)}`, `${num(p.varianceLimit, 8)}${p.varianceLimitKind ? ` (${p.varianceLimitKind})` : ""}`],
    [`lim E/n^${sig(p.meanScaling, 3)}`, `${num(p.meanGrowth, 8)}${p.meanGrowthKind ? ` (${p.meanGrowthKind})` : ""}`],
  ];
  const exact = Object.keys(p.exactMeans ?? {});
  if (exact.length) {
    // The error bound beside each value, and the bound it had to reach (1/10 of the run's SE) when one was set.
    const target = (k: string) => (p.exactMeansTarget?.[k] === undefined ? "" : ` (target ${num(p.exactMeansTarget[k], 2)}${p.exactMeansError[k] <= p.exactMeansTarget[k] ? "" : ", not reached: not gated"})`);
    rows.push(["exact means", exact.map((k) => `n = ${k}: ${num(p.exactMeans[k], 10)} ± ${num(p.exactMeansError?.[k], 2)}${target(k)}`).join("; ")]);
  }
  if (p.varianceUncalibrated) rows.push(["variance checks", "uncalibrated (see reasons)"]);
  return { header: ["quantity", "value"], rows };
}

export function reportSections(r: Report): Sections {
  const checks = (r.checks ?? []) as Check[];
  const limits = (r.limits ?? []) as LimitEstimate[];
  const failed = checks.filter((c) => c.verdict === "fail").length;
  const paths = r.results[0]?.paths ?? 0;
  const counts = ["pass", "fail", "inconclusive", "confirmed", "not-yet-visible"]
    .map((v) => [v, checks.filter((c) => c.verdict === v).length] as const)
    .filter(([, k]) => k > 0)
    .map(([v, k]) => `${k} ${v}`)
    .join(", ");
  const undecided = r.verdictSummary?.undecidedClaims ?? [];
  const undecidedText = undecided.length
    ? ` Undecided claims: ${undecided.map((u) => `${u.id} (${u.pathsToDecide ? `about ${u.pathsToDecide} paths would decide` : "more paths cannot decide; see its detail"})`).join("; ")}.`
    : "";
  const summary = r.checks
    ? `${failed === 0 ? "No check failed" : `${failed} check(s) FAILED`}: ${checks.length} checks (${counts || "none"}); exit code ${r.exitCode ?? (failed ? 1 : 0)}. ${paths} paths, seed ${r.seed}, n = ${r.suite.n.join(", ")}.${undecidedText}`
    : `Moments only (no checks were run). ${paths} paths, seed ${r.seed}, n = ${r.suite.n.join(", ")}.`;
  const measures = r.suite.measure;
  const covariance = r.covariance.map((c) => {
    const sd = c.matrix.map((row, i) => Math.sqrt(row[i]));
    return {
      n: c.n,
      covariance: { header: ["", ...c.measures], rows: c.matrix.map((row, i) => [c.measures[i], ...row.map((v) => sig(v, 5))]) },
      correlation: { header: ["", ...c.measures], rows: c.matrix.map((row, i) => [c.measures[i], ...row.map((v, j) => (sd[i] > 0 && sd[j] > 0 ? (v / (sd[i] * sd[j])).toFixed(4) : "-"))]) },
    };
  });
  const p = r.provenance;
  return {
    title: r.suite.title,
    summary,
    checks: {
      header: ["check", "verdict", "gated", "estimate", "expected", "95% CI", "statistic", "p", "p (Holm)"],
      rows: checks.map((c) => [c.id, c.verdict, c.gated ? "yes" : "no", num(c.estimate), num(c.expected), ci(c.ci), num(c.statistic, 4), pv(c.pValue), pv(c.adjustedPValue)]),
    },
    checkDetails: checks.map((c) => ({ id: c.id, source: c.source, detail: c.detail })),
    predictions: (r.predictions?.measures ?? [])
      .filter((m) => measures.includes(m.measure))
      .map((m) => ({ measure: m.measure, table: predictionTable(m), reasons: m.reasons ?? [], sources: m.sources ?? [] })),
    limits: {
      header: ["measure", "quantity", "method", "estimate", "SE", "se_syst", "CI", "rate beta", "beta interval", "misfit p"],
      rows: limits.map((l) => [
        l.measure,
        l.quantity === "varianceLimit" ? `lim Var/n^${sig(l.scaling, 3)}` : `lim E/n^${sig(l.scaling, 3)}`,
        l.method,
        num(l.estimate, 7),
        num(l.standardError, 3),
        l.systematic == null ? "-" : num(l.systematic, 3),
        l.ci ? `${ci(l.ci)} (${Math.round(100 * l.level)}%)` : "-",
        num(l.beta, 3),
        ci(l.betaInterval),
        pv(l.misfitPValue),
      ]),
    },
    limitNotes: limits.map((l) => `${l.measure} ${l.quantity}: ${l.note}${l.sensitivity?.length ? ` Sensitivity to the assumed rate: ${l.sensitivity.map((s) => `beta = ${s.beta}: ${sig(s.estimate, 6)} ${ci(s.ci)}`).join("; ")}.` : ""}`),
    results: {
      header: ["measure", "n", "paths", "mean", "± SE", "variance", "± SE", "skewness", "ex. kurtosis", "min", "max"],
      rows: r.results.map((x) => [x.measure, String(x.n), String(x.paths), sig(x.mean, 8), sig(x.meanSE, 3), sig(x.variance, 6), sig(x.varianceSE, 3), sig(x.skewness, 3), sig(x.excessKurtosis, 3), sig(x.min, 6), sig(x.max, 6)]),
    },
    controlVariates: controlVariateTable(r.controlVariates ?? []),
    covariance,
    provenance: {
      header: ["field", "value"],
      rows: [
        ["tool version", `${p.tool} ${p.version}`],
        ["git commit", p.gitCommit ?? "unknown"],
        ["Node", p.node],
        ["WASM sha256", p.wasmSha256 ?? "unknown"],
        ["CPU", `${p.cpu} (${p.cpuCount} logical cores)`],
        ["workers", String(p.workers)],
        ["seed", String(p.seed)],
        ["suite sha256", p.suiteHash],
        ["blocks", `${r.blocks.length} of ${r.blockCount}${r.shard ? ` (part ${r.shard.index} of ${r.shard.count})` : ""}`],
        ["started", p.startedAt],
        ["wall time", `${p.wallSeconds.toFixed(2)} s (${sig(r.timing.pathsPerSecond, 4)} paths/s)`],
      ],
    },
    caveats: CAVEATS,
  };
}

export const LINEARISATION_NOTE =
  "M_n - E M_n = n^s sum_j g_j . X_n^j (+ path terms) + R_n, X_n^j = S_n^j - n mu_j: per n the least-squares coefficients of M_n on the claimed controls divided by n^s (jackknife SE), extrapolated to n -> infinity; the remainder's Var(R_n)/n^p, its share of Var(M_n)/n^p and corr(M_n, claimed functional); the decay rate gamma of Var(R_n)/n^p ~ C n^-gamma (docs/theory.md sec. 6.1).";

const cell = (s: string): string => s.replace(/\|/g, "\\|").replace(/\r?\n/g, " ");

export function markdownTable(t: Table): string {
  return [`| ${t.header.map(cell).join(" | ")} |`, `|${t.header.map(() => "---").join("|")}|`, ...t.rows.map((r) => `| ${r.map(cell).join(" | ")} |`)].join("\n");
}

/** The linearisations section (claims and built-in predictions), empty when there is none. */
function linearisationMarkdown(r: Report): string[] {
  const ls = r.linearisations ?? [];
  if (!ls.length) return [];
  const out = ["", "## Linearisations", "", LINEARISATION_NOTE, ""];
  for (const l of ls) {
    out.push(`### ${l.id}`, "", `Source: ${l.source}; tolerance ${l.tolerance} (of the norm of each walk's vector).`, "");
    if (l.coefficients.length) out.push(markdownTable(coefficientTable(l)), "", markdownTable(remainderTable(l)), "");
    out.push(remainderSummary(l), "");
    if (l.unidentified.length) out.push(`Not identifiable: ${l.unidentified.join("; ")}.`, "");
  }
  return out;
}

/** KS distance of the standardised sample to a predicted "gaussian-maximum" law by n (src/verdict/tie-law.ts); null when none. */
export function tieLawTable(r: Report, measure: string): Table | null {
  const t = (r.tieLaws ?? []).find((x) => x.measure === measure);
  if (!t) return null;
  return {
    header: ["n", "kept paths", "KS distance", `${Math.round(100 * (1 - (r.verdictSummary?.alpha ?? 0.01)))}% bound (simultaneous)`, "resolution 3 x 0.87/sqrt(m)"],
    rows: t.points.map((p) => [String(p.n), String(p.size), sig(p.distance, 3), sig(p.distance + p.radius, 3), sig(p.resolution, 3)]),
  };
}

/** report.md */
export function renderMarkdown(r: Report): string {
  const s = reportSections(r);
  const out: string[] = [`# walkhull report: ${s.title}`, "", s.summary, ""];
  if (r.suite.description) out.push(`> ${r.suite.description.replace(/\n/g, " ")}`, "");
  out.push("## Verdicts", "");
  if (s.checks.rows.length) {
    out.push(markdownTable(s.checks), "");
    for (const d of s.checkDetails) out.push(`- **${d.id}** (source: ${d.source}): ${d.detail}`);
  } else out.push("No checks (run without predictions, or nothing to check).");
  out.push("", "## Predictions and their sources", "");
  if (!s.predictions.length) out.push("No predictions in this report.");
  for (const p of s.predictions) {
    out.push(`### ${p.measure}`, "", markdownTable(p.table), "");
    if (p.reasons.length) out.push("Hypotheses and caveats:", "", ...p.reasons.map((x) => `- ${x}`), "");
    out.push("Sources:", "", ...(p.sources.length ? p.sources.map((x) => `- ${x}`) : ["- none given"]), "");
  }
  out.push("## Fitted limits and rates", "");
  if (s.limits.rows.length) out.push(markdownTable(s.limits), "", ...s.limitNotes.map((x) => `- ${x}`));
  else out.push("No limits were estimated.");
  out.push(...linearisationMarkdown(r));
  for (const m of r.suite.measure) {
    const t = tieLawTable(r, m);
    if (t) out.push("", `## ${m}: KS distance to the predicted gaussian-maximum law`, "", markdownTable(t), "", `State: ${(r.tieLaws ?? []).find((x) => x.measure === m)!.state} (the verdict is the ${m}.limitLaw.prediction check).`);
  }
  out.push("", "## Results", "", markdownTable(s.results), "");
  if (s.controlVariates.rows.length) {
    out.push("## Control variates", "", CONTROL_VARIATE_NOTE, "", markdownTable(s.controlVariates), "");
  }
  out.push("## Covariance between measures", "");
  if (!s.covariance.length) out.push("Not available.");
  for (const c of s.covariance) out.push(`### n = ${c.n}`, "", "Covariance:", "", markdownTable(c.covariance), "", "Correlation:", "", markdownTable(c.correlation), "");
  out.push("## Provenance", "", markdownTable(s.provenance), "");
  out.push("## Caveats", "", ...s.caveats.map((x) => `- ${x}`), "");
  return out.join("\n");
}
