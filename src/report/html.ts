// report.html: one self-contained file (inline CSS and SVG, no script, no network) with the same
// content as report.md plus plots: Var/n^p vs n with the predicted limit, the fitted curve and the
// interval of the limit; QQ plot and histogram at the largest n; KS distance vs n (log-log) with
// its fitted rate; the hull of one sample path. Plot data: src/report/plots.ts.

import { measureSample } from "../run/series.js";
import type { Measure } from "../suite/schema.js";
import type { KeptSample } from "../run/types.js";
import type { LimitEstimate } from "../verdict/types.js";
import type { Report } from "./json.js";
import { reportSections, type Table } from "./markdown.js";
import { histogramData, histogramSvg, hullSvg, ksSeries, ksSvg, qqData, qqSvg, varianceRatioSvg, varianceSeries, type PathGeometry } from "./plots.js";
import { escapeXml as esc } from "./svg.js";

export interface HtmlExtras {
  /** The kept per-path sample (from the simulation; not stored in report.json). */
  sample?: KeptSample | null;
  /** One sample path (Kernel.samplePath) for the geometry plot. */
  geometry?: PathGeometry | null;
  /** Why the geometry is missing, shown instead of the plot. */
  geometryNote?: string;
}

const CSS = `
body{font:14px/1.45 system-ui,-apple-system,"Segoe UI",Roboto,sans-serif;color:#1d232a;max-width:1180px;margin:0 auto;padding:18px 22px;background:#fff}
h1{font-size:22px;margin:0 0 6px}h2{font-size:18px;margin:26px 0 8px;border-bottom:1px solid #d8dee4;padding-bottom:3px}h3{font-size:15px;margin:16px 0 6px}
.summary{padding:8px 12px;border-radius:6px;background:#eef6ee;border:1px solid #b7d8b7}.summary.failed{background:#fbeeee;border-color:#e3b1b1}
table{border-collapse:collapse;margin:6px 0 10px;font-size:13px}th,td{border:1px solid #d8dee4;padding:3px 7px;text-align:left;vertical-align:top}th{background:#f4f6f8}
td.num{text-align:right;font-variant-numeric:tabular-nums}.v-pass,.v-confirmed{color:#176f2c;font-weight:600}.v-fail{color:#b3261e;font-weight:700}.v-inconclusive,.v-not-yet-visible{color:#8a6100}
.plots{display:flex;flex-wrap:wrap;gap:10px}figure{margin:0 0 8px;border:1px solid #e3e7eb;border-radius:6px;padding:6px}figcaption{font-size:12px;color:#4a535c;max-width:460px}
svg.plot{display:block;font:11px system-ui,sans-serif}svg .grid line{stroke:#eceff2}svg .axis line{stroke:#59636e}svg .axis text{fill:#3b434b}svg .label{font-size:12px;fill:#1d232a}
svg circle.pt{fill:#1f5fbf;stroke:#fff;stroke-width:.6}svg rect.pt{fill:#1f5fbf}svg .err{stroke:#1f5fbf;stroke-width:1}svg .band{fill:#f2b233;fill-opacity:.25;stroke:none}
svg .fit{fill:none;stroke:#d1495b;stroke-width:1.8}svg .predicted{fill:none;stroke:#222;stroke-width:1.4;stroke-dasharray:6 4}svg .floor{fill:none;stroke:#888;stroke-dasharray:2 3}
svg .bar{fill:#8fb3e8;stroke:none}svg .legend text{fill:#1d232a}svg .walk{fill:none;stroke-width:.9;stroke-opacity:.85}svg .hull{fill:#f2b233;fill-opacity:.12;stroke:#b36b00;stroke-width:1.6}
svg circle.vertex{fill:#b36b00}svg rect.vertex{fill:#b36b00}svg .origin{fill:#000}
svg .walk0{stroke:#1f5fbf}svg .walk1{stroke:#2a9d8f}svg .walk2{stroke:#9b5de5}svg .walk3{stroke:#e76f51}svg .walk4{stroke:#6a994e}svg .walk5{stroke:#8d6e63}
.note{color:#4a535c;font-size:13px}ul.details li{margin:2px 0}code{background:#f4f6f8;padding:0 3px;border-radius:3px}
`;

const NUMERIC = /^[-+]?[0-9.,e±()\[\] %-]+$|^-$/i;

function htmlTable(t: Table, verdictColumn = -1): string {
  const head = `<tr>${t.header.map((h) => `<th>${esc(h)}</th>`).join("")}</tr>`;
  const body = t.rows
    .map(
      (r) =>
        `<tr>${r
          .map((c, i) => {
            const cls = i === verdictColumn ? ` class="v-${esc(c)}"` : NUMERIC.test(c) && i > 0 ? ` class="num"` : "";
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
    `<title>walkhull report: ${esc(s.title)}</title><style>${CSS}</style></head><body>`,
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
  out.push(`<h2>Results</h2>`, htmlTable(s.results));
  out.push(`<h2>Covariance between measures</h2>`);
  if (!s.covariance.length) out.push(`<p class="note">Not available.</p>`);
  for (const c of s.covariance) out.push(`<h3>n = ${c.n}</h3><div class="plots"><div><p>Covariance</p>${htmlTable(c.covariance)}</div><div><p>Correlation</p>${htmlTable(c.correlation)}</div></div>`);
  out.push(`<h2>Provenance</h2>`, htmlTable(s.provenance));
  out.push(`<h2>Caveats</h2><ul>${s.caveats.map((x) => `<li>${esc(x)}</li>`).join("")}</ul>`);
  out.push(`</body></html>`);
  return out.join("\n") + "\n";
}
