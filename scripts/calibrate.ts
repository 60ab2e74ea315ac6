// Calibration of the verdicts (`npm run calibrate`): are correct suites passed at the stated level,
// are the gated p-values uniform, and is a planted 2% error in a claimed sigma^2 detected?
//
//   npm run calibrate                      # the full study (>= 200 runs; minutes)
//   npm run calibrate -- --smoke           # a few runs, for CI: exercises the code, claims nothing
//   npm run calibrate -- --runs 300 --json calibration.json
//
// Runs are sequential; each uses --workers (default 2). Power budgets: paths x 1, 4, 16, 64 with
// 30, 15, 8, 8 runs by default (fewer at the costly budgets; the Wilson interval says how few).
//
// The suite: one Gaussian walk, drift (1, 0), covariance I, perimeter and diameter on a 6-point grid
// n = 32..1024 (1.5 decades). Its predictions are theorems: Spitzer-Widom exact means, sigma^2 = 4
// for the perimeter (arXiv:1301.4059) and 1 for the diameter (arXiv:1803.08293), normal limits.

import { writeFileSync } from "node:fs";
import { parseArgs } from "node:util";
import { validateSuite } from "../src/suite/load.js";
import type { Suite } from "../src/suite/schema.js";
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
  },
});
const smoke = Boolean(flags.smoke);
const runs = Number(flags.runs ?? (smoke ? 4 : 200));
const paths = Number(flags.paths ?? (smoke ? 2000 : 10000));
const powerRuns = Number(flags["power-runs"] ?? (smoke ? 2 : 30));
const workers = Number(flags.workers ?? 2);

const base: Suite = {
  title: "calibration: one Gaussian walk with drift (1, 0)",
  seed: 0,
  walks: [{ law: "gaussian", mean: [1, 0], cov: [[1, 0], [0, 1]] }],
  measure: ["perimeter", "diameter"],
  n: [32, 64, 128, 256, 512, 1024],
  paths,
};
const TRUE_SIGMA2 = 4; // arXiv:1301.4059: 4 E[((Z-mu).mu_hat)^2] with Z ~ N((1,0), I)

async function once(suite: Suite, seed: number) {
  const loaded = validateSuite({ ...suite, seed });
  const outcome = await runSuite(loaded, { workers, checkpoint: null, log: () => {} });
  if (outcome.status !== "done") throw new Error("calibration run stopped");
  return evaluateChecks(outcome.sim, predict(loaded));
}

async function main() {
  const t0 = performance.now();
  // 1. False failures of a correct suite.
  let failedRuns = 0;
  const pByCheck = new Map<string, number[]>();
  const verdictCounts = new Map<string, Record<string, number>>();
  for (let r = 0; r < runs; r++) {
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
  const budgets = smoke ? [paths] : [paths, paths * 4, paths * 16, paths * 64];
  const power = [];
  for (const budget of budgets) {
    const claimSuite: Suite = {
      ...base,
      paths: budget,
      measure: ["perimeter"],
      claims: [{ measure: "perimeter", varianceLimit: TRUE_SIGMA2 * 1.02, label: "planted +2% error" }],
    };
    // Fewer runs at the larger budgets (each costs 4x more); the Wilson interval says how few.
    const nRuns = Math.max(2, Math.round(powerRuns / Math.min(4, Math.sqrt(budget / paths))));
    let detected = 0;
    for (let r = 0; r < nRuns; r++) {
      const v = await once(claimSuite, 2_000_003 + r);
      const c = v.checks.find((x) => x.kind === "varianceLimit" && x.source.startsWith("claim"));
      if (c?.verdict === "fail") detected++;
    }
    power.push({ paths: budget, runs: nRuns, detected, rate: detected / nRuns, interval: wilsonInterval(detected, nRuns, 0.95) });
    if (!smoke) process.stderr.write(`power at ${budget} paths: ${detected}/${nRuns}\n`);
  }

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
  const lines = [
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
