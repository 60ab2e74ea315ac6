// report.html: one self-contained file (inline CSS and SVG, no script, no network) with the same
// content as report.md plus plots: Var/n^p vs n with the predicted limit, the fitted curve and the
// interval of the limit; QQ plot and histogram at the largest n; KS distance vs n (log-log) with
// its fitted rate; the hull of one sample path. Plot data: src/report/plots.ts.

import { coefficientTable, remainderSummary, remainderSvg, remainderTable } from "./linearisation-view.js";
import { measureSample } from "../run/series.js";
import type { Measure } from "../suite/schema.js";
import type { KeptSample } from "../run/types.js";
import type { LimitEstimate } from "../verdict/types.js";
import type { Report } from "./json.js";
import { CONTROL_VARIATE_NOTE, LINEARISATION_NOTE, reportSections, type Table } from "./markdown.js";
import { histogramData, histogramSvg, hullSvg, ksSeries, ksSvg, qqData, qqSvg, tieCdfData, tieCdfSvg, varianceRatioSvg, varianceSeries, type PathGeometry } from "./plots.js";
import { tieLawTable } from "./markdown.js";
import { reportCss, VERDICT_MARK, type VerdictWord } from "./palette.js";
import { escapeXml as esc } from "./svg.js";

export interface HtmlExtras {
  /** The kept per-path sample (from the simulation; not stored in report.json). */
  sample?: KeptSample | null;
  /** One sample path (Kernel.samplePath) for the geometry plot. */
  geometry?: PathGeometry | null;
  /** Why the geometry is missing, shown instead of the plot. */
  geometryNote?: string;
}


const NUMERIC = /^[-+]?[0-9.,e±()[\] %-]+$|^-$/i;

function htmlTable(t: Table, verdictColumn = -1): string {
  const head = `<tr>${t.header.map((h) => `<th>${esc(h)}</th>`).join("")}</tr>`;
  const body = t.rows
    .map(
      (r) =>
        `<tr>${r
          .map((c, i) => {
            if (i === verdictColumn) {
              const mark = VERDICT_MARK[c as VerdictWord];
              return `<td class="v-${esc(c)}">${mark ? `<span class="mark" aria-hidden="true">${mark}</span>` : ""}${esc(c)}</td>`;
            }
            const cls = NUMERIC.test(c) && i > 0 ? ` class="num"` : "";
            return `<td${cls}>${esc(c)}</td>`;
          })
          .join("")}</tr>`,
    )
    .join("");
  return `<table>${head}${body}</table>`;
}

const figure = (svg: string, caption: string) => `<figure>${svg}<figcaption>${esc(caption)}</figcaption></figure>`;

/** The plots of one measure. */
function measurePlots(r: Report, measure: Measure, extras: HtmlExtras): string {
  const parts: string[] = [];
  const pred = r.predictions?.measures.find((m) => m.measure === measure);
  const vs = varianceSeries(measure, r.results, pred, (r.limits ?? []) as LimitEstimate[]);
  if (vs) {
    parts.push(
      figure(
        varianceRatioSvg(vs),
        `Var(X_n)/n^${vs.scaling} at each n with 95% error bars${vs.limit?.ratios.length ? " (block-jackknife SEs)" : " (fourth-moment SEs)"}; dashed: the predicted limit; red: the fitted curve s2 + c n^-beta (c by weighted least squares given the reported s2 and beta); band: the interval of the extrapolated limit.`,
      ),
    );
  } else parts.push(`<p class="note">No variance scaling is known for the ${esc(measure)}: no Var/n^p plot.</p>`);
  const sample = extras.sample;
  const G = r.suite.n.length;
  if (sample && sample.pathIndex.length >= 2) {
    const columns = measureSample({ suite: r.suite, sample }, measure);
    const last = columns[G - 1];
    const nMax = r.suite.n[G - 1];
    parts.push(figure(qqSvg(measure, nMax, qqData(last)), `Quantiles of the kept sample at n = ${nMax}, standardised by its mean and SD, against the standard normal law (dashed).`));
    parts.push(figure(histogramSvg(measure, nMax, histogramData(last)), `Histogram of the standardised kept sample at n = ${nMax} and the standard normal density.`));
    if (pred?.limitLaw === "gaussian-maximum" && pred.gaussianMaximum) {
      parts.push(
        figure(
          tieCdfSvg(measure, tieCdfData(r.suite.n, columns, pred.gaussianMaximum)),
          `Empirical CDF of (${measure} - n d)/sqrt(n) at the smallest and the largest n against the predicted law, the maximum of the tied pairs' Gaussian forms (docs/theory.md sec. 7.1).`,
        ),
      );
      const t = tieLawTable(r, measure);
      if (t) parts.push(`<div><p>KS distance to the predicted law by n</p>${htmlTable(t)}</div>`);
    }
    const ks = ksSeries(r.suite.n, columns);
    parts.push(
      figure(
        ksSvg(measure, ks),
        `Kolmogorov distance of the kept sample to the moment-fitted normal law at each n (log-log). The rate is fitted by least squares on log-log over the points above 3x the resolution floor${ks.fit ? "" : " (fewer than two such points: no rate)"}; the points share paths, so its SE is indicative.`,
      ),
    );
  } else parts.push(`<p class="note">No kept per-path sample was available to this report: no QQ plot, histogram or KS distance.</p>`);
  return `<h3>${esc(measure)}</h3><div class="plots">${parts.join("")}</div>`;
}

/** report.html */
export function renderHtml(r: Report, extras: HtmlExtras = {}): string {
  const s = reportSections(r);
  const failed = ((r.checks ?? []) as { verdict: string }[]).some((c) => c.verdict === "fail");
  const out: string[] = [
    "<!DOCTYPE html>",
    `<html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1">`,
    `<meta http-equiv="Content-Security-Policy" content="default-src 'none'; style-src 'unsafe-inline'; img-src data:">`,
    `<title>walkhull report: ${esc(s.title)}</title><style>${reportCss()}</style></head><body>`,
    `<h1>walkhull report: ${esc(s.title)}</h1>`,
    `<p class="summary${failed ? " failed" : ""}">${esc(s.summary)}</p>`,
  ];
  if (r.suite.description) out.push(`<p class="note">${esc(r.suite.description)}</p>`);
  out.push(`<h2>Geometry: one sample path</h2>`);
  if (extras.geometry) {
    out.push(`<div class="plots">${figure(hullSvg(extras.geometry), `The first path of block 0 at the largest n = ${r.suite.n[r.suite.n.length - 1]}: each walk from the origin (black square) and the convex hull of all of them (vertices marked).`)}</div>`);
  } else out.push(`<p class="note">${esc(extras.geometryNote ?? "No sample path was available to this report.")}</p>`);
  out.push(`<h2>Verdicts</h2>`);
  if (s.checks.rows.length) {
    out.push(htmlTable(s.checks, 1));
    out.push(`<ul class="details">${s.checkDetails.map((d) => `<li><b>${esc(d.id)}</b> (source: ${esc(d.source)}): ${esc(d.detail)}</li>`).join("")}</ul>`);
  } else out.push(`<p class="note">No checks in this report.</p>`);
  out.push(`<h2>Plots</h2>`);
  for (const m of r.suite.measure) out.push(measurePlots(r, m, extras));
  out.push(`<h2>Predictions and their sources</h2>`);
  if (!s.predictions.length) out.push(`<p class="note">No predictions in this report.</p>`);
  for (const p of s.predictions) {
    out.push(`<h3>${esc(p.measure)}</h3>${htmlTable(p.table)}`);
    if (p.reasons.length) out.push(`<p>Hypotheses and caveats:</p><ul>${p.reasons.map((x) => `<li>${esc(x)}</li>`).join("")}</ul>`);
    out.push(`<p>Sources:</p><ul>${(p.sources.length ? p.sources : ["none given"]).map((x) => `<li>${esc(x)}</li>`).join("")}</ul>`);
  }
  out.push(`<h2>Fitted limits and rates</h2>`);
  if (s.limits.rows.length) out.push(htmlTable(s.limits), `<ul class="details">${s.limitNotes.map((x) => `<li>${esc(x)}</li>`).join("")}</ul>`);
  else out.push(`<p class="note">No limits were estimated.</p>`);
  const lin = r.linearisations ?? [];
  if (lin.length) {
    out.push(`<h2>Linearisations</h2>`, `<p class="note">${esc(LINEARISATION_NOTE)}</p>`);
    for (const l of lin) {
      out.push(`<h3>${esc(l.id)}</h3><p class="note">Source: ${esc(l.source)}; tolerance ${l.tolerance} (of the norm of each walk's vector).</p>`);
      if (l.coefficients.length) out.push(htmlTable(coefficientTable(l)), `<div class="plots">${figure(remainderSvg(l), "Var(R_n)/n^p of the remainder R_n = M_n - E M_n - (claimed functional), log-log, 95% error bars (block jackknife); the fitted power law and the materiality threshold.")}<div>${htmlTable(remainderTable(l))}</div></div>`);
      out.push(`<p>${esc(remainderSummary(l))}</p>`);
    }
  }
  out.push(`<h2>Results</h2>`, htmlTable(s.results));
  if (s.controlVariates.rows.length) out.push(`<h2>Control variates</h2>`, `<p class="note">${esc(CONTROL_VARIATE_NOTE)}</p>`, htmlTable(s.controlVariates));
  out.push(`<h2>Covariance between measures</h2>`);
  if (!s.covariance.length) out.push(`<p class="note">Not available.</p>`);
  for (const c of s.covariance) out.push(`<h3>n = ${c.n}</h3><div class="plots"><div><p>Covariance</p>${htmlTable(c.covariance)}</div><div><p>Correlation</p>${htmlTable(c.correlation)}</div></div>`);
  out.push(`<h2>Provenance</h2>`, htmlTable(s.provenance));
  out.push(`<h2>Caveats</h2><ul>${s.caveats.map((x) => `<li>${esc(x)}</li>`).join("")}</ul>`);
  out.push(`</body></html>`);
  return out.join("\n") + "\n";
}
