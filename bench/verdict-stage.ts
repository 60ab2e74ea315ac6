// Verdict-stage bench: simulates a suite once (2 workers), then times what `walkhull run` does after
// the simulation (the control-variate estimates and evaluateChecks: limits, laws, linearisations),
// on this thread alone and with the law evidence on helper threads (src/verdict/law-evidence.ts),
// alternating, several rounds. Each round uses a fresh copy of the result, so nothing is memoised
// across rounds; round 1 of each kind also pays the JIT's warm-up (as a `walkhull run` process does).
// Reports wall time and this process's CPU time (all its threads), and checks that both kinds give
// the same verdict report.
// Usage: node --import tsx bench/verdict-stage.ts SUITE.json [--paths N] [--rounds R]

import os from "node:os";
import { runSuite } from "../src/run/run.js";
import { loadSuite } from "../src/suite/load.js";
import { evaluateChecks } from "../src/verdict/checks.js";
import { meanEstimates } from "../src/verdict/accuracy.js";
import { predictCached } from "../src/theory/cache.js";
import { predictionTargets } from "../src/verdict/early-prediction.js";
import { LawEvidenceThreads } from "../src/verdict/law-evidence.js";
import type { SimulationResult } from "../src/run/types.js";

const args = process.argv.slice(2);
const file = args.find((a) => !a.startsWith("--") && !/^\d+$/.test(a));
if (!file) throw new Error("usage: verdict-stage.ts SUITE.json [--paths N] [--rounds R]");
const flag = (name: string) => {
  const i = args.indexOf(name);
  return i >= 0 ? Number(args[i + 1]) : undefined;
};
const rounds = flag("--rounds") ?? 4;
const suite = loadSuite(file, { paths: flag("--paths") });
const loadStart = os.loadavg();
const out = await runSuite(suite, { workers: 2, checkpoint: null, log: () => {} });
if (out.status !== "done") throw new Error("simulation stopped");
const simulated = out.sim;
const prediction = predictCached(suite, { budgetSeconds: 60, meanTargets: predictionTargets(simulated) }, { use: true });
const cpuMs = () => {
  const u = process.cpuUsage();
  return (u.user + u.system) / 1000;
};

async function stage(threads: boolean): Promise<{ wall: number; cpu: number; report: string }> {
  const sim: SimulationResult = { ...simulated };
  const t0 = performance.now();
  const c0 = cpuMs();
  let evidence;
  if (threads) {
    const helpers = new LawEvidenceThreads();
    helpers.dispatch(sim);
    meanEstimates(sim);
    evidence = await helpers.collect();
  }
  const report = JSON.stringify(evaluateChecks(sim, prediction, { estimates: meanEstimates(sim), evidence }));
  return { wall: performance.now() - t0, cpu: cpuMs() - c0, report };
}

const rows: { kind: string; round: number; wall: number; cpu: number }[] = [];
let reference: string | null = null;
let same = true;
for (let round = 1; round <= rounds; round++) {
  for (const threads of round % 2 ? [false, true] : [true, false]) {
    const r = await stage(threads);
    reference ??= r.report;
    same &&= r.report === reference;
    rows.push({ kind: threads ? "law evidence on helper threads" : "this thread alone", round, wall: r.wall, cpu: r.cpu });
  }
}
console.log(`verdict stage of ${suite.title} (${suite.paths} paths, ${suite.measure.length} measures, grid ${suite.n.join(", ")}), ms`);
console.log("| kind | round | wall | CPU (all threads) |");
console.log("|---|---|---|---|");
for (const r of rows) console.log(`| ${r.kind} | ${r.round} | ${r.wall.toFixed(0)} | ${r.cpu.toFixed(0)} |`);
console.log(`same verdict report both ways: ${same ? "yes" : "NO"}; ${os.cpus().length} cores; load average ${loadStart.map((x) => x.toFixed(2)).join(" ")} at start, ${os.loadavg().map((x) => x.toFixed(2)).join(" ")} at end`);
if (!same) process.exitCode = 1;
