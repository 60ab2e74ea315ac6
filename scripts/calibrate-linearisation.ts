// Calibration of the linearisation checks (docs/verdicts.md sec. 4.1) on configurations the rules
// were not tuned on: for each configuration and seed, one simulation; claims g_1 x (1 + e) for the
// built-in gradients g (docs/theory.md sec. 6.1), e in {0, +2%, -5%}, each judged alone at the
// default tolerance 0.01 and alpha 0.01. Claim-level outcome: fail if any of its checks fails, pass
// if all pass, else inconclusive. A claim with e != 0 is off by |e| |g_1| > tolerance |g_1|, so its
// largest component must not pass: a claim-level pass there is a wrong pass.
//
//   node --import tsx scripts/calibrate-linearisation.ts [--seeds 20] [--paths 20000] [--workers 2] [--markdown FILE]

import { writeFileSync } from "node:fs";
import { parseArgs } from "node:util";
import { predict, simulate, validateSuite } from "../src/index.js";
import { evaluateChecks, type VerdictCache } from "../src/verdict/checks.js";
import type { Claim, Linearisation, Measure, Suite, Vec2 } from "../src/suite/schema.js";

const { values } = parseArgs({ options: { seeds: { type: "string", default: "20" }, paths: { type: "string", default: "20000" }, workers: { type: "string", default: "2" }, markdown: { type: "string" } } });
const SEEDS = Number(values.seeds), PATHS = Number(values.paths), WORKERS = Number(values.workers);
const ERRORS = [0, 0.02, -0.05];
const GRID = [32, 64, 128, 256, 512, 1024];
const I: [[number, number], [number, number]] = [[1, 0], [0, 1]];

interface Config { name: string; measure: Measure; walks: Suite["walks"] }
const CONFIGS: Config[] = [
  { name: "one walk, correlated steps, perimeter", measure: "perimeter", walks: [{ law: "gaussian", mean: [0.5, 0.2], cov: [[1, 0.3], [0.3, 0.5]] }] },
  { name: "two walks at 120 degrees, diameter", measure: "diameter", walks: [{ law: "gaussian", mean: [1, 0], cov: I }, { law: "gaussian", mean: [-0.5, 0.8], cov: [[0.5, 0], [0, 1.5]] }] },
  { name: "three walks, 0 inside P, perimeter", measure: "perimeter", walks: [{ law: "gaussian", mean: [1, 0], cov: I }, { law: "gaussian", mean: [-0.4, 1], cov: I }, { law: "gaussian", mean: [-0.6, -0.9], cov: I }] },
  { name: "three walks, 0 inside P, area", measure: "area", walks: [{ law: "gaussian", mean: [1, 0], cov: I }, { law: "gaussian", mean: [-0.4, 1], cov: I }, { law: "gaussian", mean: [-0.6, -0.9], cov: I }] },
  { name: "lattice walk with drift, perimeter", measure: "perimeter", walks: [{ law: "discrete", atoms: [[1, 0], [-1, 0], [0, 1], [0, -1]], weights: [0.4, 0.2, 0.2, 0.2] }] },
];

type Outcome = "pass" | "fail" | "inconclusive";
const rows: { config: string; e: number; counts: Record<Outcome, number>; remainderFail: number }[] = [];
const t0 = Date.now();
for (const cfg of CONFIGS) {
  const base = validateSuite({ title: cfg.name, seed: 1, walks: cfg.walks, measure: [cfg.measure], n: GRID, paths: PATHS });
  const pred = predict(base, { budgetSeconds: 1 }).measures.find((m) => m.measure === cfg.measure)!;
  if (!pred.linearisation) throw new Error(`${cfg.name}: no built-in linearisation (limit law ${pred.limitLaw})`);
  const g = pred.linearisation.endpoint;
  const tally = ERRORS.map((e) => ({ config: cfg.name, e, counts: { pass: 0, fail: 0, inconclusive: 0 }, remainderFail: 0 }));
  for (let seed = 1; seed <= SEEDS; seed++) {
    const suite = validateSuite({ title: cfg.name, seed: 1000 + seed, walks: cfg.walks, measure: [cfg.measure], n: GRID, paths: PATHS });
    const sim = await simulate(suite, { workers: WORKERS, progress: false });
    const cache: VerdictCache = {};
    ERRORS.forEach((e, k) => {
      const lin: Linearisation = { endpoint: g.map((v, j) => (j === 0 ? ([v[0] * (1 + e), v[1] * (1 + e)] as Vec2) : v)) };
      const claims: Claim[] = [{ measure: cfg.measure, linearisation: lin, varianceScaling: pred.varianceScaling }];
      const r = evaluateChecks({ ...sim, suite: { ...sim.suite, claims } }, { measures: [] }, cache);
      const mine = r.checks.filter((c) => c.kind === "linearisation");
      const outcome: Outcome = mine.some((c) => c.verdict === "fail") ? "fail" : mine.every((c) => c.verdict === "pass") ? "pass" : "inconclusive";
      tally[k].counts[outcome]++;
      if (mine.find((c) => c.id.includes(".remainder."))?.verdict === "fail") tally[k].remainderFail++;
    });
    process.stderr.write(`\r${cfg.name}: seed ${seed}/${SEEDS}   `);
  }
  process.stderr.write("\n");
  rows.push(...tally);
}
const minutes = (Date.now() - t0) / 60000;
const lines = [
  `Linearisation checks, ${SEEDS} seeds x ${PATHS} paths per configuration, n = ${GRID.join(", ")}, tolerance 0.01, alpha 0.01; claims g_1 x (1 + e), each judged alone (${minutes.toFixed(1)} min).`,
  "",
  "| configuration | e | pass | fail | inconclusive | remainder fails |",
  "|---|---|---|---|---|---|",
  ...rows.map((r) => `| ${r.config} | ${r.e >= 0 ? "+" : ""}${(100 * r.e).toFixed(0)}% | ${r.counts.pass} | ${r.counts.fail} | ${r.counts.inconclusive} | ${r.remainderFail} |`),
];
const wrongPasses = rows.filter((r) => r.e !== 0).reduce((a, r) => a + r.counts.pass, 0);
const falseFailures = rows.filter((r) => r.e === 0).reduce((a, r) => a + r.counts.fail, 0);
lines.push("", `Wrong passes (e != 0): ${wrongPasses} of ${rows.filter((r) => r.e !== 0).length * SEEDS}; false failures (e = 0): ${falseFailures} of ${CONFIGS.length * SEEDS}.`);
const text = lines.join("\n");
console.log(text);
if (values.markdown) writeFileSync(values.markdown, text + "\n");
