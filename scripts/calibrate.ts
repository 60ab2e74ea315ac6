// Calibration of the verdicts (`npm run calibrate`): are correct suites passed at the stated level,
// are the gated p-values uniform, and is a planted 2% error in a claimed sigma^2 detected?
//
//   npm run calibrate                      # the full study (>= 200 runs; minutes)
//   npm run calibrate -- --smoke           # a few runs, for CI: exercises the code, claims nothing
//   npm run calibrate -- --runs 300 --json calibration.json
//   npm run calibrate -- --power-only --budgets 1280000,2560000 --power-runs 10 --save-sims power.v8
//   npm run calibrate -- --power-only --from-sims power.v8   # re-evaluate saved simulations only
//
// --budgets a,b,c: the power budgets (paths per run), each with --power-runs runs (default 30);
// without it: paths x 1, 4, 16, 64 with fewer runs at the costly budgets (see below).
// --save-sims FILE: keep each power run's simulation (block moments; the kept sample of the
// measured series only) in FILE (v8 serialization); --from-sims FILE re-evaluates the verdicts of
// those simulations with the current verdict code, without simulating (the same seeds give the same
// bits, so this equals a re-run; used to compare verdict methods on identical data).
//
// Runs are sequential; each uses --workers (default 2). Power budgets: paths x 1, 4, 16, 64 with
// 30, 15, 8, 8 runs by default (fewer at the costly budgets; the Wilson interval says how few).
//
// The suite: one Gaussian walk, drift (1, 0), covariance I, perimeter and diameter on a 6-point grid
// n = 32..1024 (1.5 decades). Its predictions are theorems: Spitzer-Widom exact means, sigma^2 = 4
// for the perimeter (arXiv:1301.4059) and 1 for the diameter (arXiv:1803.08293), normal limits.

import { readFileSync, writeFileSync } from "node:fs";
import { deserialize, serialize } from "node:v8";
import { parseArgs } from "node:util";
import { validateSuite } from "../src/suite/load.js";
import type { Suite } from "../src/suite/schema.js";
import { seriesIndex } from "../src/run/series.js";
import type { SimulationResult } from "../src/run/types.js";
import { runSuite } from "../src/run/run.js";
import { predict } from "../src/theory/predict.js";
import { evaluateChecks } from "../src/verdict/checks.js";
import { wilsonInterval } from "../src/stats/binomial.js";
import { ksUniformPValue } from "./uniformity.js";

const { values: flags } = parseArgs({
  options: {
    smoke: { type: "boolean" },
    runs: { type: "string" },
    paths: { type: "string" },
    "power-runs": { type: "string" },
    workers: { type: "string" },
    json: { type: "string" },
    "power-only": { type: "boolean" },
    budgets: { type: "string" },
    "save-sims": { type: "string" },
    "from-sims": { type: "string" },
  },
});
const smoke = Boolean(flags.smoke);
const runs = Number(flags.runs ?? (smoke ? 4 : 200));
const paths = Number(flags.paths ?? (smoke ? 2000 : 10000));
const powerRuns = Number(flags["power-runs"] ?? (smoke ? 2 : 30));
const workers = Number(flags.workers ?? 2);
const powerOnly = Boolean(flags["power-only"]) || Boolean(flags["from-sims"]);
const budgetList = flags.budgets === undefined ? null : flags.budgets.split(",").map((x) => Number(x.trim()));
if (budgetList && !budgetList.every((b) => Number.isInteger(b) && b > 0)) throw new Error(`--budgets: expected positive integers separated by commas, got ${JSON.stringify(flags.budgets)}`);
for (const [name, v] of [["--runs", runs], ["--paths", paths], ["--power-runs", powerRuns], ["--workers", workers]] as const) {
  if (!(Number.isInteger(v) && v > 0)) throw new Error(`${name}: expected a positive integer, got ${v}`);
}

const base: Suite = {
  title: "calibration: one Gaussian walk with drift (1, 0)",
  seed: 0,
  walks: [{ law: "gaussian", mean: [1, 0], cov: [[1, 0], [0, 1]] }],
  measure: ["perimeter", "diameter"],
  n: [32, 64, 128, 256, 512, 1024],
  paths,
};
const TRUE_SIGMA2 = 4; // arXiv:1301.4059: 4 E[((Z-mu).mu_hat)^2] with Z ~ N((1,0), I)

interface SavedSim {
  budget: number;
  seed: number;
  sim: SimulationResult;
}
const saved: SavedSim[] = [];
const fromSims: SavedSim[] | null = flags["from-sims"] ? (deserialize(readFileSync(flags["from-sims"])) as SavedSim[]) : null;

/** Only the kept sample of the measured series (the others are never read by the verdicts). */
function slim(sim: SimulationResult): SimulationResult {
  const used = new Set(sim.suite.measure.flatMap((m) => sim.suite.n.map((_, g) => seriesIndex(sim, m, g))));
  return { ...sim, sample: { pathIndex: sim.sample.pathIndex, values: sim.sample.values.map((v, i) => (used.has(i) ? v : new Float64Array(0))) } };
}

async function once(suite: Suite, seed: number, save = false) {
  const loaded = validateSuite({ ...suite, seed });
  if (fromSims) {
    const hit = fromSims.find((x) => x.budget === suite.paths && x.seed === seed);
    if (!hit) throw new Error(`--from-sims: no saved simulation for ${suite.paths} paths, seed ${seed}`);
    return evaluateChecks(hit.sim, predict(loaded));
  }
  const outcome = await runSuite(loaded, { workers, checkpoint: null, log: () => {} });
  if (outcome.status !== "done") throw new Error("calibration run stopped");
  if (save) saved.push({ budget: suite.paths, seed, sim: slim(outcome.sim) });
  return evaluateChecks(outcome.sim, predict(loaded));
}

async function main() {
  const t0 = performance.now();
  // 1. False failures of a correct suite.
  let failedRuns = 0;
  const pByCheck = new Map<string, number[]>();
  const verdictCounts = new Map<string, Record<string, number>>();
  for (let r = 0; r < (powerOnly ? 0 : runs); r++) {
    const v = await once(base, 1_000_003 + r);
    if (v.failed > 0) failedRuns++;
    for (const c of v.checks) {
      const counts = verdictCounts.get(c.id) ?? {};
      counts[c.verdict] = (counts[c.verdict] ?? 0) + 1;
      verdictCounts.set(c.id, counts);
      if (c.gated && c.pValue !== null) pByCheck.set(c.id, [...(pByCheck.get(c.id) ?? []), c.pValue]);
    }
    if (!smoke && (r + 1) % 20 === 0) process.stderr.write(`correct suite: ${r + 1}/${runs} runs\n`);
  }
  const alpha = 0.01;
  const ffInterval = wilsonInterval(failedRuns, runs, 0.95);

  // 2. Power: a claimed sigma^2 2% too high, at the default budget and larger ones.
  const budgets = budgetList ?? (smoke ? [paths] : [paths, paths * 4, paths * 16, paths * 64]);
  const power = [];
  for (const budget of budgets) {
    const claimSuite: Suite = {
      ...base,
      paths: budget,
      measure: ["perimeter"],
      claims: [{ measure: "perimeter", varianceLimit: TRUE_SIGMA2 * 1.02, label: "planted +2% error" }],
    };
    // Fewer runs at the larger budgets (each costs 4x more); the Wilson interval says how few.
    const nRuns = budgetList ? powerRuns : Math.max(2, Math.round(powerRuns / Math.min(4, Math.sqrt(budget / paths))));
    let detected = 0;
    const tb = performance.now();
    const perRun = [];
    for (let r = 0; r < nRuns; r++) {
      const v = await once(claimSuite, 2_000_003 + r, Boolean(flags["save-sims"]));
      const c = v.checks.find((x) => x.kind === "varianceLimit" && x.source.startsWith("claim"));
      const lim = v.limits.find((l) => l.measure === "perimeter" && l.quantity === "varianceLimit");
      if (c?.verdict === "fail") detected++;
      perRun.push({ seed: 2_000_003 + r, verdict: c?.verdict ?? null, z: c?.statistic ?? null, pValue: c?.pValue ?? null, estimate: lim?.estimate ?? null, seStat: lim?.standardError ?? null, systematic: lim?.systematic ?? null });
    }
    const secs = (performance.now() - tb) / 1000;
    power.push({ paths: budget, runs: nRuns, detected, rate: detected / nRuns, interval: wilsonInterval(detected, nRuns, 0.95), seconds: secs, perRun });
    if (!smoke) process.stderr.write(`power at ${budget} paths: ${detected}/${nRuns} (${secs.toFixed(0)} s)\n`);
  }
  if (flags["save-sims"]) writeFileSync(flags["save-sims"], serialize(saved));

  const uniformity = [...pByCheck.entries()].map(([id, ps]) => ({ id, count: ps.length, ksPValue: ksUniformPValue(ps) }));
  const result = {
    suite: base.title,
    runs,
    pathsPerRun: paths,
    alpha,
    falseFailures: failedRuns,
    falseFailureRate: failedRuns / runs,
    falseFailureInterval95: ffInterval,
    verdicts: Object.fromEntries(verdictCounts),
    uniformity,
    power,
    seconds: (performance.now() - t0) / 1000,
    smoke,
  };
  const pct = (x: number) => `${(100 * x).toFixed(1)}%`;
  const zs = (p: (typeof power)[number]) => p.perRun.map((x) => (x.z === null ? "-" : x.z.toFixed(2))).join(" ");
  const lines = powerOnly ? [
    `calibration (power only${fromSims ? `, verdicts re-evaluated on saved simulations from ${flags["from-sims"]}` : ""})`,
    "detection of a claimed sigma^2 2% too high (4.08 instead of 4):",
    ...power.map((p) => `  ${String(p.paths).padStart(8)} paths: ${p.detected}/${p.runs} = ${pct(p.rate)}, 95% Wilson [${pct(p.interval[0])}, ${pct(p.interval[1])}]; z = ${zs(p)}`),
    `smallest budget tried with >= 90% detection: ${power.find((p) => p.rate >= 0.9)?.paths ?? "none of those tried"} paths`,
    `(${result.seconds.toFixed(0)} s)`,
  ] : [
    `calibration (${smoke ? "SMOKE: too few runs to claim anything" : "full"}): ${runs} runs of a correct suite, ${paths} paths each, alpha = ${alpha}`,
    `false-failure rate: ${failedRuns}/${runs} = ${pct(failedRuns / runs)}, 95% Wilson interval [${pct(ffInterval[0])}, ${pct(ffInterval[1])}] (target <= ${pct(alpha)})`,
    "uniformity of each gated check's p-values (one-sample KS against U(0,1)):",
    ...uniformity.map((u) => `  ${u.id.padEnd(44)} ${String(u.count).padStart(4)} p-values, KS p = ${u.ksPValue.toFixed(3)}`),
    "detection of a claimed sigma^2 2% too high (4.08 instead of 4):",
    ...power.map((p) => `  ${String(p.paths).padStart(8)} paths: ${p.detected}/${p.runs} = ${pct(p.rate)}, 95% Wilson [${pct(p.interval[0])}, ${pct(p.interval[1])}]`),
    `smallest budget tried with >= 90% detection: ${power.find((p) => p.rate >= 0.9)?.paths ?? "none of those tried"} paths`,
    "(limit-law checks are conservative by design: their gated p-value is 1 unless the distance bound nears the tolerance, so a uniformity KS p near 0 is expected there)",
    `(${result.seconds.toFixed(0)} s)`,
  ];
  process.stdout.write(lines.join("\n") + "\n");
  if (flags.json) writeFileSync(flags.json, JSON.stringify(result, null, 1));
}

main().catch((e) => {
  process.stderr.write(`calibrate: ${(e as Error).stack ?? e}\n`);
  process.exitCode = 2;
});
