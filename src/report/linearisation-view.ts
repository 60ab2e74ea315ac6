// The report's view of linearisations (src/verdict/linearisation.ts): one table of coefficients and
// one of the remainder per claim or prediction, and a log-log plot of the remainder's decay.
//
// Plot: Var(R_n)/n^p at each n with 95% error bars (jackknife SEs; a bar reaching 0 is cut at the
// bottom of the log axis), the fitted line C n^-gamma over the points the rate used, and the
// materiality threshold (tolerance x Var(M_n)/n^p at the largest n) dashed.

import type { LinearisationReport } from "../verdict/types.js";
import { axes, bottomMargin, clip, errorBars, fmt, legend, LEGEND_ROW, padDomain, pathD, points, scales, svgPlot, type Frame } from "./svg.js";

const Z95 = 1.959963984540054;

export interface ViewTable {
  header: string[];
  rows: string[][];
}

const num = (x: number | null | undefined, d = 5): string => (x === null || x === undefined || !Number.isFinite(x) ? "-" : Number(x.toPrecision(d)).toString());
const iv = (c: [number, number] | null | undefined): string => (c ? `[${num(c[0])}, ${num(c[1])}]` : "-");

/** Coefficients: claimed, b_n/n^s at each n (± SE), extrapolated limit and interval. */
export function coefficientTable(l: LinearisationReport): ViewTable {
  const grid = l.coefficients[0]?.perN.map((p) => p.n) ?? [];
  return {
    header: ["coefficient", "claimed", ...grid.map((n) => `n = ${n}`), "limit", "95% CI"],
    rows: l.coefficients.map((c, i) => [
      c.label, num(c.claimed), ...c.perN.map((p) => `${num(p.value)} ± ${num(p.standardError, 2)}`),
      num(l.coefficientLimits[i]?.estimate), iv(l.coefficientLimits[i]?.ci),
    ]),
  };
}

/** Remainder: Var(R_n)/n^p ± SE, its share of Var(M_n)/n^p, corr(M_n, claimed functional). */
export function remainderTable(l: LinearisationReport): ViewTable {
  return {
    header: ["n", `Var(R_n)/n^${l.scaling}`, "± SE", `share of Var(M_n)/n^${l.scaling}`, "corr(M_n, g'Z_n)"],
    rows: l.remainder.map((p) => [String(p.n), num(p.value), num(p.standardError, 2), p.measureVariance > 0 ? `${num((100 * p.value) / p.measureVariance, 3)}%` : "-", num(p.correlation, 6)]),
  };
}

/** One sentence: the decay rate, the extrapolated limit, the decision. */
export function remainderSummary(l: LinearisationReport): string {
  if (l.unavailable) return `Not estimable: ${l.unavailable}.`;
  return l.remainderDecision ? l.remainderDecision.why : "No decision.";
}

export function remainderSvg(l: LinearisationReport): string {
  const pts = l.remainder.filter((p) => Number.isFinite(p.value) && p.value > 0);
  const threshold = l.remainderDecision?.threshold ?? null;
  const ys = pts.flatMap((p) => [p.value + Z95 * p.standardError, Math.max(p.value - Z95 * p.standardError, p.value / 10)]);
  if (threshold !== null && threshold > 0) ys.push(threshold);
  const xdom = padDomain(l.remainder.map((p) => p.n), 0.08, "log");
  const ydom = padDomain(ys, 0.1, "log");
  const rows = 1 + (l.rate ? 1 : 0) + (threshold !== null ? 1 : 0);
  const f: Frame = {
    width: 460, height: 300 + LEGEND_ROW * rows, margin: { top: 14, right: 14, bottom: bottomMargin(rows), left: 62 },
    x: { kind: "log", domain: xdom, label: "n (log scale)" }, y: { kind: "log", domain: ydom, label: `Var(R_n) / n^${l.scaling}` },
  };
  const sc = scales(f);
  const id = `clip-rem-${l.id.replace(/[^A-Za-z0-9_-]/g, "_")}`;
  const body = [`<defs>${clip(id, f)}</defs>`, axes(sc), `<g clip-path="url(#${id})">`];
  const lg: Parameters<typeof legend>[1] = [];
  if (l.rate) {
    const r = l.rate;
    const used = [Math.min(...r.points), Math.max(...r.points)];
    body.push(`<path class="fit" d="${pathD(sc, used, used.map((n) => Math.exp(r.logC) * Math.pow(n, -r.estimate)))}"/>`);
    lg.push({ cls: "fit", kind: "line", text: `fitted C n^-gamma, gamma = ${fmt(r.estimate, 3)} [${fmt(r.ci[0], 3)}, ${fmt(r.ci[1], 3)}]` });
  }
  if (threshold !== null && threshold > 0) {
    body.push(`<path class="predicted" d="${pathD(sc, xdom, [threshold, threshold])}"/>`);
    lg.push({ cls: "predicted", kind: "line", text: `materiality threshold ${fmt(threshold, 3)} (tolerance ${l.tolerance} x Var(M_n)/n^${l.scaling})` });
  }
  body.push(errorBars(sc, pts.map((p) => ({ x: p.n, lo: Math.max(p.value - Z95 * p.standardError, ydom[0]), hi: p.value + Z95 * p.standardError }))));
  body.push(points(sc, pts.map((p) => ({ x: p.n, y: p.value, title: `n = ${p.n}: ${fmt(p.value, 5)} ± ${fmt(p.standardError, 3)} (SE)` }))));
  body.push(`</g>`);
  lg.push({ cls: "pt", kind: "dot", text: "Var(R_n)/n^p, 95% error bars" });
  body.push(legend(f, lg));
  return svgPlot({ "data-plot": "remainder-decay", "data-measure": l.measure, "data-points": pts.length }, f, `Remainder decay of ${l.id}`, body.join(""));
}
