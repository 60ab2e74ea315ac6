// Runs every shipped suite through the built CLI and prints README's "Validation suites" table
// (`npm run build && node --import tsx scripts/suite-verdicts.ts [--workers N] [--skip name,...]`).
// Per suite: exit code, verdict counts, and for each check that did not pass, its id and the first
// clause of its reason. The million-path suite is skipped unless named with --only.

import { spawnSync } from "node:child_process";
import { mkdtempSync, readdirSync, readFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { parseArgs } from "node:util";

const { values: flags } = parseArgs({ options: { workers: { type: "string" }, only: { type: "string" }, skip: { type: "string" } } });
const workers = flags.workers ?? "2";
const only = flags.only?.split(",");
const skip = new Set((flags.skip ?? "million-two-walks").split(","));
const dir = mkdtempSync(join(tmpdir(), "walkhull-suites-"));
const suites = readdirSync("validation").filter((f) => f.endsWith(".json")).map((f) => f.replace(/\.json$/, ""))
  .filter((s) => (only ? only.includes(s) : !skip.has(s)));

interface Check { id: string; verdict: string; detail: string }

/** The reason of a check in a few words: the clause after "Not gated:", "INCONCLUSIVE:", "neither shown:", ... */
function reason(c: Check): string {
  const m = c.detail.match(/(?:INCONCLUSIVE|FAIL): (.*?)(?:;|\.$)/) ?? c.detail.match(/(?:Not gated|Not decided|neither shown|non-normal limit confirmed|normal convergence shown): (.*?)(?:;|\. )/);
  return (m ? m[1] : c.detail.slice(0, 80)).slice(0, 120);
}

const rows: string[] = [];
for (const s of suites) {
  const out = join(dir, `${s}.json`);
  const t0 = performance.now();
  const r = spawnSync("node", ["dist/cli.js", "run", `validation/${s}.json`, "--out", out, "--workers", workers, "--quiet", "--checkpoint", join(dir, `${s}.ckpt`)], { encoding: "utf8" });
  const secs = (performance.now() - t0) / 1000;
  let checks: Check[];
  try {
    checks = (JSON.parse(readFileSync(out, "utf8")) as { checks: Check[] }).checks ?? [];
  } catch {
    rows.push(`| ${s} | ${r.status} | (no report: ${r.stderr.trim().split("\n").at(-1)}) | | ${secs.toFixed(1)} |`);
    continue;
  }
  const counts = new Map<string, number>();
  for (const c of checks) counts.set(c.verdict, (counts.get(c.verdict) ?? 0) + 1);
  const verdicts = [...counts.entries()].map(([v, k]) => `${k} ${v}`).join(", ");
  const notPass = checks.filter((c) => c.verdict !== "pass" && c.verdict !== "confirmed").map((c) => `${c.id}: ${reason(c)}`).join("<br>");
  rows.push(`| ${s} | ${r.status} | ${verdicts} | ${notPass || "-"} | ${secs.toFixed(1)} |`);
  process.stderr.write(`${s}: exit ${r.status}, ${verdicts} (${secs.toFixed(1)} s)\n`);
}
process.stdout.write(["| suite | exit | verdicts | not pass (not confirmed), and why | wall (s) |", "|---|---|---|---|---|", ...rows].join("\n") + "\n");
