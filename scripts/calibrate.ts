// Calibration of the verdicts (`npm run calibrate`), on settings the method was not tuned on.
//
//   npm run calibrate                       # the full study (~20-30 min on 2 idle cores)
//   npm run calibrate -- --quick            # a smoke test: a few seeds, small budgets; claims nothing
//   npm run calibrate -- --seeds 100 --json calibration.json --markdown calibration.md
//   npm run calibrate -- --study b --b-seeds 10,20   # only the targets (study B), its seed counts
//   npm run calibrate -- --from-json a.json,b.json   # print the table of saved study results
// Each finished study is also written to stderr as one JSON line ("study: {...}"), so a long run
// that is stopped keeps what it measured.
//
// Study A (every configuration, >= 100 seeds): one simulation per seed; on it, claims of the
// perimeter's sigma^2 = lim Var(L_n)/n equal to the true value x (1 + e) for e in 0, +-0.5%, +-1%,
// +-2%, +-5%, each judged ALONE (its own suite with one claim, default tolerance 1%, alpha 0.01):
// claims only change the checks, so the cost is the simulations.
//   false failures: e = 0 claims that fail (target <= alpha, Wilson interval);
//   wrong passes:   claims off by MORE than the tolerance (|e| = 2%, 5%) that pass (target 0);
//   power:          the fail rate per error size; decided-within-tolerance rate of correct claims.
// Study B (targets of the verdict issue): two drifting walks, n = 50..1600: 5% off at 100k paths,
// 1% off and correct claims at 400k paths.
// Truths: sigma^2 from the tool's own predictions (src/theory: one walk, arXiv:1301.4059; k walks
// in general position, the linearisation of docs/theory.md), so a wrong formula shows up here as
// false failures.

import { readFileSync, writeFileSync } from "node:fs";
import { parseArgs } from "node:util";
import { validateSuite } from "../src/suite/load.js";
import type { Claim, Suite } from "../src/suite/schema.js";
import type { SimulationResult } from "../src/run/types.js";
import { runSuite } from "../src/run/run.js";
import { predict } from "../src/theory/predict.js";
import { evaluateChecks, type VerdictCache } from "../src/verdict/checks.js";
import { wilsonInterval } from "../src/stats/binomial.js";

const { values: flags } = parseArgs({
  options: {
    quick: { type: "boolean" },
    seeds: { type: "string" },
    workers: { type: "string" },
    json: { type: "string" },
    markdown: { type: "string" },
    study: { type: "string" },
    "b-seeds": { type: "string" },
    "from-json": { type: "string" },
  },
});
const quick = Boolean(flags.quick);
const which = flags.study ?? "all";
if (!["a", "b", "all"].includes(which)) throw new Error(`--study: expected a, b or all, got ${JSON.stringify(which)}`);
const bSeeds = (flags["b-seeds"] ?? (quick ? "2,2" : "10,20")).split(",").map(Number);
if (bSeeds.length !== 2 || !bSeeds.every((x) => Number.isInteger(x) && x > 0)) throw new Error(`--b-seeds: expected two positive integers "k,m", got ${JSON.stringify(flags["b-seeds"])}`);
const seeds = Number(flags.seeds ?? (quick ? 3 : 100));
const workers = Number(flags.workers ?? 2);
for (const [name, v] of [["--seeds", seeds], ["--workers", workers]] as const) {
  if (!(Number.isInteger(v) && v > 0)) throw new Error(`${name}: expected a positive integer, got ${v}`);
}
const ALPHA = 0.01;
const TOLERANCE = 0.01;
const ERRORS = [0, -0.005, 0.005, -0.01, 0.01, -0.02, 0.02, -0.05, 0.05];
const GRID = [50, 100, 200, 400, 800, 1600];

interface Config {
  name: string;
  suite: Omit<Suite, "seed" | "paths">;
  paths: number;
}

// Configurations of our own (not the shipped suites the method was developed on).
const CONFIGS: Config[] = [
  {
    name: "one drifting walk (Gaussian, correlated)",
    suite: { title: "cal-one", walks: [{ law: "gaussian", mean: [0.6, -0.4], cov: [[1.3, 0.5], [0.5, 0.8]] }], measure: ["perimeter"], n: GRID },
    paths: quick ? 4000 : 40000,
  },
  {
    name: "two drifting walks (Gaussian)",
    suite: {
      title: "cal-two",
      walks: [{ law: "gaussian", mean: [1.1, 0.2], cov: [[0.9, -0.2], [-0.2, 1.2]] }, { law: "gaussian", mean: [-0.3, 0.8], cov: [[0.7, 0.1], [0.1, 0.6]] }],
      measure: ["perimeter"], n: GRID,
    },
    paths: quick ? 4000 : 40000,
  },
  {
    name: "one lattice walk (biased nearest-neighbour steps)",
    suite: {
      title: "cal-lattice",
      walks: [{ law: "discrete", atoms: [[1, 0], [-1, 0], [0, 1], [0, -1]], weights: [0.45, 0.15, 0.25, 0.15] }],
      measure: ["perimeter"], n: GRID,
    },
    paths: quick ? 4000 : 40000,
  },
  {
    name: "three walks, origin inside the drift triangle (circle steps)",
    suite: {
      title: "cal-three",
      walks: [
        { law: "circle", mean: [1, 0.1], radius: 1.2 },
        { law: "circle", mean: [-0.6, 0.9], radius: 0.8 },
        { law: "circle", mean: [-0.4, -0.9], radius: 1 },
      ],
      measure: ["perimeter"], n: GRID,
    },
    paths: quick ? 4000 : 40000,
  },
];

async function simulate(suite: Suite): Promise<SimulationResult> {
  const outcome = await runSuite(validateSuite(suite), { workers, checkpoint: null, log: () => {} });
  if (outcome.status !== "done") throw new Error("calibration run stopped");
  return outcome.sim;
}

/** The verdict of one claim judged alone on a simulation (no predictions: only the claim's family). */
function judge(sim: SimulationResult, claim: Claim, cache: VerdictCache): { verdict: string; z: number | null; pathsToDecide: number | null } {
  const suite = { ...sim.suite, claims: [claim], alpha: ALPHA, tolerance: TOLERANCE };
  const v = evaluateChecks({ ...sim, suite }, { measures: [] }, cache);
  const c = v.checks.find((x) => x.source.startsWith("claim"))!;
  return { verdict: c.verdict, z: c.statistic, pathsToDecide: c.pathsToDecide ?? null };
}

interface Tally {
  runs: number;
  fail: number;
  pass: number;
  inconclusive: number;
}
const emptyTally = (): Tally => ({ runs: 0, fail: 0, pass: 0, inconclusive: 0 });

async function study(name: string, suite: Omit<Suite, "seed" | "paths">, paths: number, nSeeds: number, errors: number[], seed0: number) {
  const sigma2 = predict(validateSuite({ ...suite, seed: 1, paths })).measures.find((m) => m.measure === "perimeter")!.varianceLimit;
  if (sigma2 === null) throw new Error(`${name}: the tool predicts no sigma^2`);
  const tallies = new Map<number, Tally>(errors.map((e) => [e, emptyTally()]));
  const t0 = performance.now();
  for (let s = 0; s < nSeeds; s++) {
    const sim = await simulate({ ...suite, seed: seed0 + s, paths });
    const cache: VerdictCache = {};
    for (const e of errors) {
      const r = judge(sim, { measure: "perimeter", varianceLimit: sigma2 * (1 + e), label: `${(100 * e).toFixed(1)}%` }, cache);
      const t = tallies.get(e)!;
      t.runs++;
      if (r.verdict === "fail") t.fail++;
      else if (r.verdict === "pass") t.pass++;
      else t.inconclusive++;
    }
    if (!quick && (s + 1) % 10 === 0) process.stderr.write(`${name}, ${paths} paths: ${s + 1}/${nSeeds} seeds (${((performance.now() - t0) / 1000).toFixed(0)} s)\n`);
  }
  const result = { name, paths, seeds: nSeeds, sigma2, seconds: (performance.now() - t0) / 1000, tallies: [...tallies.entries()].map(([error, t]) => ({ error, ...t })) };
  process.stderr.write(`study: ${JSON.stringify(result)}\n`);
  return result;
}

type StudyResult = Awaited<ReturnType<typeof study>>;

const pct = (x: number) => `${(100 * x).toFixed(1)}%`;
const wil = (k: number, n: number) => {
  const [a, b] = wilsonInterval(k, n, 0.95);
  return `${k}/${n} [${pct(a)}, ${pct(b)}]`;
};

async function main() {
  let a: StudyResult[] = [];
  let b: StudyResult[] = [];
  if (flags["from-json"]) {
    // Saved results (the JSON of --json, or files of "study:" lines' objects): studies whose name starts with "targets" are study B.
    const all = flags["from-json"].split(",").flatMap((f) => {
      const j = JSON.parse(readFileSync(f, "utf8"));
      return Array.isArray(j) ? j : j.studyA ? [...j.studyA, ...j.studyB] : [j];
    }) as StudyResult[];
    a = all.filter((s) => !s.name.startsWith("targets"));
    b = all.filter((s) => s.name.startsWith("targets"));
  } else {
    if (which !== "b") for (const [i, c] of CONFIGS.entries()) a.push(await study(c.name, c.suite, c.paths, seeds, ERRORS, 10_000 * (i + 1)));
    const two = CONFIGS[1].suite;
    if (which !== "a") {
      b = [
        await study("targets: two drifting walks, 5% off", two, quick ? 8000 : 100_000, bSeeds[0], [-0.05, 0.05], 90_000),
        await study("targets: two drifting walks, 1% off and correct", two, quick ? 16000 : 400_000, bSeeds[1], [0, -0.01, 0.01], 95_000),
      ];
    }
  }
  const lines: string[] = [];
  lines.push(`Calibration${quick ? " (QUICK: too few seeds to claim anything)" : ""}: alpha = ${ALPHA}, tolerance = ${TOLERANCE} (relative), grid n = ${GRID.join(", ")}; each claim judged alone; 95% Wilson intervals.`);
  lines.push("");
  lines.push("| configuration | paths | seeds | sigma^2 (predicted) | false failures (e = 0) | correct decided within 1% | wrong passes (abs(e) >= 2%) |");
  lines.push("|---|---|---|---|---|---|---|");
  for (const s of [...a, ...b]) {
    const zero = s.tallies.find((t) => t.error === 0);
    const far = s.tallies.filter((t) => Math.abs(t.error) > TOLERANCE + 1e-12);
    const wrong = far.reduce((x, t) => x + t.pass, 0);
    const farRuns = far.reduce((x, t) => x + t.runs, 0);
    lines.push(`| ${s.name} | ${s.paths} | ${s.seeds} | ${s.sigma2.toPrecision(6)} | ${zero ? wil(zero.fail, zero.runs) : "-"} | ${zero ? wil(zero.pass, zero.runs) : "-"} | ${farRuns ? `${wrong}/${farRuns}` : "-"} |`);
  }
  lines.push("");
  lines.push("Verdicts per planted error (fail / pass / inconclusive out of the seeds):");
  lines.push("");
  const errs = [...new Set([...a, ...b].flatMap((s) => s.tallies.map((t) => t.error)))].sort((x, y) => x - y);
  lines.push(`| configuration | paths | ${errs.map((e) => `e = ${(100 * e).toFixed(1)}%`).join(" | ")} |`);
  lines.push(`|---|---|${errs.map(() => "---").join("|")}|`);
  for (const s of [...a, ...b]) {
    lines.push(`| ${s.name} | ${s.paths} | ${errs.map((e) => {
      const t = s.tallies.find((x) => x.error === e);
      return t ? `${t.fail}/${t.pass}/${t.inconclusive}` : "";
    }).join(" | ")} |`);
  }
  lines.push("");
  lines.push(`Power (fail rate) per error size: ${[...a, ...b].map((s) => `${s.name} @ ${s.paths}: ${s.tallies.filter((t) => t.error !== 0).map((t) => `${(100 * t.error).toFixed(1)}% -> ${pct(t.fail / t.runs)}`).join(", ")}`).join("; ")}.`);
  lines.push("");
  lines.push(`Wall time per study on ${workers} worker(s): ${[...a, ...b].map((s) => `${s.name} @ ${s.paths}: ${s.seconds.toFixed(0)} s`).join("; ")}.`);
  const text = lines.join("\n") + "\n";
  process.stdout.write(text);
  if (flags.markdown) writeFileSync(flags.markdown, text);
  if (flags.json) writeFileSync(flags.json, JSON.stringify({ alpha: ALPHA, tolerance: TOLERANCE, grid: GRID, quick, studyA: a, studyB: b }, null, 1));
}

main().catch((e) => {
  process.stderr.write(`calibrate: ${(e as Error).stack ?? e}\n`);
  process.exitCode = 2;
});
