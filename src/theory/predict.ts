// The prediction stage entry point: predict(suite) -> one MeasurePrediction per measure of the suite
// (same order), with exact finite-n means where a formula applies, and renderPredictionTable.
// Accuracy: each finite-n mean is computed to the error bound PredictOptions.meanTargets asks for
// (a run asks for 1/10 of its own standard error) and carries that target in exactMeansTarget; a
// mean that does not reach it says so in `reasons` and is not gated. PredictOptions.budgetSeconds
// (default 20 s) only caps the numerical quadratures: the cheap exact formulas run first, the k-walk
// Cauchy quadrature gets what remains and drops the largest n whose first pass would not fit.

import type { Suite } from "../suite/schema.js";
import { gaussianAreaMeans, BNB_SOURCE } from "./area-mean.js";
import { cauchyMeanPerimeter, CAUCHY_SOURCE } from "./cauchy-quadrature.js";
import { diagnose, type Diagnosis } from "./diagnose.js";
import { isContinuousLaw, stepMoments as lawMoments } from "./step-moments.js";
import { secondsSince } from "./special.js";
import { spitzerWidomMeans } from "./spitzer-widom.js";
import type { MeanTargets, MeasurePrediction, Prediction, PredictionRow, PredictOptions } from "./types.js";
import type { Measure } from "../suite/schema.js";
import { meanVertexCount } from "./vertices.js";
import type { StepLaw, Vec2, Mat2 } from "../suite/schema.js";

/** Mean, covariance and 4th-moment finiteness of a step law (throws naming the bad field). */
export function stepMoments(law: StepLaw): { mean: Vec2; cov: Mat2; fourthMomentFinite: boolean; secondMomentFinite: boolean } {
  return lawMoments(law, "walk");
}

function checkSuite(suite: Suite): number[] {
  if (!suite || typeof suite !== "object") throw new Error("suite: expected an object");
  if (!Array.isArray(suite.n) || suite.n.length === 0) throw new Error("n: expected a non-empty array of step counts");
  suite.n.forEach((n, i) => {
    if (!Number.isInteger(n) || n < 1) throw new Error(`n[${i}]: expected a positive integer, got ${JSON.stringify(n)}`);
    if (i > 0 && n <= suite.n[i - 1]) throw new Error(`n[${i}]: must be strictly increasing`);
  });
  return suite.n;
}

function fmt(x: number): string {
  if (!Number.isFinite(x)) return String(x);
  if (x === 0) return "0";
  return Math.abs(x) >= 1e6 || Math.abs(x) < 1e-3 ? x.toExponential(6) : x.toPrecision(10).replace(/\.?0+$/, "");
}

function rowsFor(p: MeasurePrediction): PredictionRow[] {
  const src = p.sources.length ? p.sources.join("; ") : "-";
  const hyp = p.reasons.join("; ") || "-";

  const rows: PredictionRow[] = [{ quantity: "limit law", value: p.limitLaw, hypotheses: hyp, verdict: p.limitLaw, source: src }];
  rows.push({
    quantity: `lim Var/n^${p.varianceScaling}`,
    value: p.varianceLimit === null ? "none" : fmt(p.varianceLimit),
    hypotheses: p.varianceUncalibrated ? "variance checks uncalibrated" : "-",
    verdict: p.varianceLimitKind ?? "no prediction",
    source: src,
  });
  rows.push({
    quantity: `lim E/n^${p.meanScaling}`,
    value: p.meanGrowth === null ? "none" : fmt(p.meanGrowth),
    hypotheses: "-",
    verdict: p.meanGrowthKind ?? "no prediction",
    source: src,
  });
  if (p.linearisation) {
    const s = (p.varianceScaling - 1) / 2;
    rows.push({
      quantity: "linearisation",
      value: p.linearisation.endpoint.map((g, j) => `g_${j + 1} = (${fmt(g[0])}, ${fmt(g[1])})`).join(", "),
      hypotheses: `M_n - E M_n = ${s === 0 ? "" : `n^${s} `}sum_j g_j . (S_n^j - n mu_j) + o(n^${p.varianceScaling / 2}) (docs/theory.md sec. 6.1)`,
      verdict: p.varianceLimitKind ?? "derived",
      source: src,
    });
  }
  const gm = p.gaussianMaximum;
  if (gm) {
    rows.push({
      quantity: "lim (E - n d)/sqrt(n)",
      value: `${fmt(gm.mean)} +- ${gm.meanError.toExponential(1)}`,
      hypotheses: `d = ${fmt(gm.centre)}; E M of ${gm.forms.length} Gaussian forms`,
      verdict: "derived",
      source: src,
    });
  }
  for (const key of Object.keys(p.exactMeans)) {
    const target = p.exactMeansTarget?.[key];
    const reached = target === undefined || p.exactMeansError[key] <= target;
    rows.push({
      quantity: `E at n = ${key}`,
      value: `${fmt(p.exactMeans[key])} +- ${p.exactMeansError[key].toExponential(1)}`,
      hypotheses: target === undefined ? "-" : `error bound target ${target.toExponential(1)}${reached ? "" : " not reached"}`,
      verdict: reached ? "exact" : "not gated",
      source: src,
    });
  }
  return rows;
}

/** Default relative accuracy of the finite-n means when no target is given. */
export const DEFAULT_RELATIVE_TARGET = 1e-6;

/** The absolute error bound asked of the mean of `measure` at n, given (an estimate of) the mean. */
export function meanTarget(targets: MeanTargets | undefined, measure: Measure, n: number, estimate: number): number {
  const abs = targets?.absolute?.[measure]?.[String(n)];
  if (abs !== undefined) return abs;
  return (targets?.relative ?? DEFAULT_RELATIVE_TARGET) * Math.abs(estimate);
}

function checkTargets(t: MeanTargets | undefined): void {
  if (!t) return;
  if (t.relative !== undefined && !(t.relative > 0 && Number.isFinite(t.relative))) throw new Error(`meanTargets.relative: expected a positive number, got ${t.relative}`);
  for (const [m, byN] of Object.entries(t.absolute ?? {})) {
    for (const [n, v] of Object.entries(byN ?? {})) {
      if (!(v > 0 && Number.isFinite(v))) throw new Error(`meanTargets.absolute.${m}.${n}: expected a positive number, got ${v}`);
    }
  }
}

/** Record each mean's target; say so for a mean whose bound did not reach it (unless already said). */
function recordTargets(p: MeasurePrediction, targets: MeanTargets | undefined, given?: Record<string, number>): void {
  p.exactMeansTarget = {};
  for (const key of Object.keys(p.exactMeans)) {
    const target = given?.[key] ?? meanTarget(targets, p.measure, Number(key), p.exactMeans[key]);
    p.exactMeansTarget[key] = target;
    const err = p.exactMeansError[key];
    if (!(err <= target) && !given) {
      p.reasons.push(`${p.measure} at n = ${key}: error bound ${err.toExponential(1)} did not reach the target ${target.toExponential(1)}: shown, not gated`);
    }
  }
}

export function predict(suite: Suite, opts: PredictOptions = {}): Prediction {
  const start = performance.now();
  const ns = checkSuite(suite);
  const budget = opts.budgetSeconds ?? 20;
  if (!(budget > 0)) throw new Error("budgetSeconds: expected a positive number");
  const tol = { tie: opts.tieTolerance ?? 1e-9, nearTie: opts.nearTieTolerance ?? 1e-2 };
  if (!(tol.tie > 0 && tol.nearTie >= tol.tie)) throw new Error("tieTolerance: expected 0 < tieTolerance <= nearTieTolerance");
  checkTargets(opts.meanTargets);
  const diags = diagnose(suite, tol);
  const k = suite.walks.length;
  const remaining = () => Math.max(0.05, budget - secondsSince(start));
  const deferred: (() => void)[] = [];
  const measures: MeasurePrediction[] = diags.map((d: Diagnosis) => {
    const p: MeasurePrediction = { ...d, exactMeans: {}, exactMeansError: {} };
    const deferredBefore = deferred.length;
    const infinite = suite.walks.some((w) => w.law === "student" && w.dof <= 2);
    if (d.measure === "perimeter") {
      if (k === 1 && !infinite) {
        const r = spitzerWidomMeans(suite.walks[0], ns, Math.min(remaining() / 4, 4), "walks[0]");
        Object.assign(p.exactMeans, r.means);
        Object.assign(p.exactMeansError, r.errors);
        p.reasons.push(...r.reasons);
        if (Object.keys(r.means).length) p.sources.push(...r.sources);
      } else if (k >= 2) {
        const gaussian = suite.walks.every((w) => w.law === "gaussian" && isContinuousLaw(w));
        // The quadrature's grid for the running maximum grows like n |mu| / sigma_min: beyond this
        // drift-to-noise ratio (at its timing probe, n <= 50) it would take minutes and gigabytes.
        const ratio = Math.max(...suite.walks.map((w) => {
          if (w.law !== "gaussian") return 0;
          const [[a, b], [, d]] = w.cov;
          const lambdaMin = (a + d) / 2 - Math.sqrt(((a - d) / 2) ** 2 + b * b);
          return Math.hypot(w.mean[0], w.mean[1]) / Math.sqrt(Math.max(lambdaMin, 0));
        }));
        if (!gaussian) {
          p.reasons.push("no exact mean perimeter for k >= 2 walks: the Cauchy quadrature is implemented for Gaussian steps with non-singular covariances");
        } else if (!(Math.min(ns[0], 50) * ratio <= 1e4)) {
          p.reasons.push(`no exact mean perimeter: drift-to-noise ratio ${ratio.toPrecision(3)} (|mu| / smallest step SD) is too large for the Cauchy quadrature's grid`);
        } else {
          // Heavy: run after the cheap predictions so it gets the rest of the budget.
          deferred.push(() => {
            let r;
            try {
              r = cauchyMeanPerimeter(suite.walks.map((w) => w.law === "gaussian" ? { mean: w.mean, cov: w.cov } : null!), ns, {
                budgetSeconds: remaining(),
                tolerance: (n, estimate) => meanTarget(opts.meanTargets, "perimeter", n, estimate),
              });
            } catch (e) {
              // Extreme drift-to-noise ratios or scales defeat the quadrature's grids: no prediction, said why.
              p.reasons.push(`no exact mean perimeter: the Cauchy quadrature failed for these walks (${(e as Error).message})`);
              return;
            }
            Object.assign(p.exactMeans, r.means);
            Object.assign(p.exactMeansError, r.errors);
            p.reasons.push(...r.reasons);
            if (Object.keys(r.means).length) p.sources.push(CAUCHY_SOURCE);
            recordTargets(p, opts.meanTargets, r.targets);
          });
        }
      }
    } else if (d.measure === "area") {
      const w = suite.walks[0];
      if (k === 1 && w.law === "gaussian") {
        const r = gaussianAreaMeans(w.mean, w.cov, ns, Math.min(remaining() / 4, 5));
        Object.assign(p.exactMeans, r.means);
        Object.assign(p.exactMeansError, r.errors);
        p.reasons.push(...r.reasons);
        if (Object.keys(r.means).length) p.sources.push(BNB_SOURCE, "E|det(S_a, S'_b)| for Gaussian steps by a 1-D integral [derived]");
      } else if (k === 1) {
        p.reasons.push(`no exact mean area for ${w.law} steps (implemented for Gaussian steps)`);
      } else {
        p.reasons.push("no exact finite-n mean area for k >= 2 walks");
      }
    } else if (d.measure === "vertices") {
      if (k === 1 && isContinuousLaw(suite.walks[0])) {
        for (const n of ns) {
          p.exactMeans[String(n)] = meanVertexCount(n);
          p.exactMeansError[String(n)] = 1e-15 * n;
        }
      }
    } else {
      p.reasons.push(`no finite-n formula for the mean ${d.measure}`);
    }
    // The deferred Cauchy quadrature records its own targets.
    if (deferred.length === deferredBefore) recordTargets(p, opts.meanTargets);
    return p;
  });
  for (const run of deferred) run();
  for (const p of measures) p.rows = rowsFor(p);
  return { measures };
}

/** Plain-text table: measure, quantity, value, hypotheses, verdict, source (sources as footnotes). */
export function renderPredictionTable(p: Prediction): string {
  const notes: string[] = [];
  const note = (s: string) => {
    if (s === "-") return "-";
    let i = notes.indexOf(s);
    if (i < 0) { notes.push(s); i = notes.length - 1; }
    return `[${i + 1}]`;
  };
  const header = ["measure", "quantity", "value", "hypotheses", "verdict", "source"];
  const short = (h: string) => (h.length > 56 ? `${h.slice(0, 55)}…` : h);
  const body: string[][] = [];
  const hyps: string[] = [];
  for (const m of p.measures) {
    for (const r of m.rows ?? rowsFor(m)) body.push([m.measure, r.quantity, r.value, short(r.hypotheses), r.verdict, note(r.source)]);
    hyps.push(`${m.measure}: ${m.limitLaw}${m.varianceUncalibrated ? " (variance checks uncalibrated)" : ""}`);
    for (const reason of m.reasons) hyps.push(`  - ${reason}`);
  }
  const widths = header.map((h, i) => Math.max(h.length, ...body.map((r) => r[i].length)));
  const line = (cells: string[]) => cells.map((c, i) => c.padEnd(widths[i])).join("  ").trimEnd();
  const out = [line(header), widths.map((w) => "-".repeat(w)).join("  "), ...body.map(line), "", "Hypotheses and diagnosis (in full):", ...hyps, "", "Sources:"];
  notes.forEach((s, i) => out.push(`[${i + 1}] ${s}`));
  return out.join("\n") + "\n";
}
