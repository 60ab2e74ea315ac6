// Plain-text rendering of a verdict report: one row per check, then the estimated limits.

import type { VerdictReport } from "./types.js";
import { coefficientPower } from "./linearisation.js";

const num = (x: number | null | undefined): string =>
  x === null || x === undefined || Number.isNaN(x) ? "-" : !Number.isFinite(x) ? (x > 0 ? "inf" : "-inf") : Number(x.toPrecision(6)).toString();
const pv = (p: number | null): string => (p === null || Number.isNaN(p) ? "-" : p < 1e-4 ? p.toExponential(1) : p.toFixed(4));

function table(header: string[], rows: string[][]): string {
  const widths = header.map((h, c) => Math.max(h.length, ...rows.map((r) => r[c].length)));
  const line = (r: string[]) => r.map((x, c) => x.padEnd(widths[c])).join("  ").trimEnd();
  return [line(header), line(widths.map((w) => "-".repeat(w))), ...rows.map(line)].join("\n");
}

/**
 * The checks as a terminal table. Sources are listed once and referred to by number; details are
 * printed for every check that did not simply pass (the report files carry all of them).
 */
export function renderChecks(r: VerdictReport): string {
  const sources: string[] = [];
  const sourceRef = (s: string) => {
    let i = sources.indexOf(s);
    if (i < 0) i = sources.push(s) - 1;
    return `[${i + 1}]`;
  };
  const rows = r.checks.map((c) => [
    c.id,
    c.verdict,
    c.gated ? "yes" : "no",
    num(c.estimate),
    typeof c.expected === "number" ? num(c.expected) : (c.expected ?? "-"),
    c.ci ? `[${num(c.ci[0])}, ${num(c.ci[1])}]` : "-",
    pv(c.pValue),
    pv(c.adjustedPValue),
    sourceRef(c.source),
  ]);
  const out: string[] = [];
  const fam = r.familySizes ? ` (${r.familySizes.claims} claims, ${r.familySizes.predictions} predictions)` : "";
  out.push(`Checks (Holm within each family${fam} at alpha = ${r.alpha}; a pass is decided within value x (1 +- ${r.tolerance ?? 0.01}); ${r.failed} failed)`);
  out.push(table(["check", "verdict", "gated", "estimate", "expected", "95% CI", "p", "p (Holm)", "source"], rows));
  const notable = r.checks.filter((c) => c.verdict !== "pass");
  if (notable.length) {
    out.push("");
    for (const c of notable) out.push(`- ${c.id} (${c.verdict}): ${c.detail}`);
  }
  out.push("");
  out.push("Sources");
  sources.forEach((s, i) => out.push(`[${i + 1}] ${s}`));
  if (r.limits.length) {
    out.push("");
    out.push("Estimated limits (whatever was claimed or predicted; the place a conjecture starts)");
    out.push(
      table(
        ["measure", "quantity", "method", "estimate", "95% CI (stat + syst)", "se_syst", "beta", "misfit p"],
        r.limits.map((l) => [
          l.measure,
          l.quantity === "varianceLimit" ? `Var/n^${l.scaling}` : `mean/n^${l.scaling}`,
          l.method,
          num(l.estimate),
          l.ci ? `[${num(l.ci[0])}, ${num(l.ci[1])}]` : "-",
          l.systematic === undefined ? "-" : l.systematic === null ? (l.method === "none" ? "-" : "n/a") : num(l.systematic),
          l.beta === null ? "-" : l.betaInterval ? `${num(l.beta)} [${num(l.betaInterval[0])}, ${num(l.betaInterval[1])}]` : `${num(l.beta)} (assumed)`,
          pv(l.misfitPValue),
        ]),
      ),
    );
  }
  for (const l of r.linearisations ?? []) {
    out.push("");
    out.push(`Linearisation ${l.id} (coefficients divided by n^${coefficientPower("endpoint", l.scaling)}; limits by extrapolation)`);
    if (l.coefficients.length)
      out.push(
        table(
          ["coefficient", "claimed", ...l.coefficients[0].perN.map((p) => `n = ${p.n}`), "limit", "95% CI"],
          l.coefficients.map((c, i) => [c.label, num(c.claimed), ...c.perN.map((p) => num(p.value)), num(l.coefficientLimits[i]?.estimate), l.coefficientLimits[i]?.ci ? `[${num(l.coefficientLimits[i].ci![0])}, ${num(l.coefficientLimits[i].ci![1])}]` : "-"]),
        ),
      );
    if (l.remainder.length) out.push(`Var(R_n)/n^${l.scaling}: ${l.remainder.map((p) => `${num(p.value)} (n = ${p.n})`).join(", ")}`);
    out.push(l.unavailable ? `Not estimable: ${l.unavailable}.` : (l.remainderDecision?.why ?? ""));
  }
  for (const t of r.tieLaws ?? []) {
    out.push("", `KS distance of the ${t.measure} to its predicted gaussian-maximum law (state: ${t.state})`);
    out.push(table(["n", "kept paths", "KS distance", `${Math.round(100 * (1 - r.alpha))}% bound`, "resolution"], t.points.map((p) => [String(p.n), String(p.size), num(p.distance), num(p.distance + p.radius), num(p.resolution)])));
  }
  return out.join("\n");
}
