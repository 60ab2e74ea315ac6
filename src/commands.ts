// Commands only: parse arguments, call the library, print, choose the exit code.
// Exit codes: 0 ok, 1 a check failed, 2 bad input or usage.

import { parseArgs, type ParseArgsConfig } from "node:util";
import { existsSync, statSync } from "node:fs";
import { dirname } from "node:path";
import { loadSuite, SuiteError } from "./suite/load.js";
import type { LoadedSuite } from "./suite/schema.js";
import { predict, renderPredictionTable } from "./theory/predict.js";
import type { Prediction } from "./theory/types.js";
import { evaluateChecks, renderChecks } from "./verdict/checks.js";
import { simulateInProcess } from "./run/simulate.js";
import { buildReport, toJson, writeAtomic } from "./report/json.js";
import { resultsTable } from "./report/table.js";

export const EXIT_OK = 0;
export const EXIT_CHECK_FAILED = 1;
export const EXIT_BAD_INPUT = 2;

class UsageError extends Error {}

const HELP = `walkhull: simulate convex hulls of planar random walks and check limit theorems

Usage:
  walkhull run <suite.json> [options]      simulate a suite, check claims and predictions, report
  walkhull predict <suite.json> [--json]   analytic predictions and hypothesis diagnosis
  walkhull help [command]                  this text

run options:
  --paths N        override the suite's number of paths
  --seed S         override the suite's seed (non-negative integer)
  --out FILE       write the JSON report to FILE (atomically)
  --kernel K       wasm (default) or twin (the plain-TypeScript twin; slow, for cross-checks)
  --quiet          no progress output
  --no-checks      simulate and report moments only (no predictions, no verdicts)

Exit codes: 0 ok, 1 a check failed, 2 bad input or usage.
Suite format and examples: README.md; shipped suites: validation/.`;

type Flags = Record<string, string | boolean | undefined>;

function parse(args: string[], options: ParseArgsConfig["options"]): { flags: Flags; positionals: string[] } {
  try {
    const { values, positionals } = parseArgs({ args, options, allowPositionals: true, strict: true });
    return { flags: values as Flags, positionals };
  } catch (e) {
    throw new UsageError((e as Error).message);
  }
}

function intFlag(flags: Flags, name: string): number | undefined {
  const v = flags[name];
  if (v === undefined) return undefined;
  if (typeof v !== "string" || !/^\d+$/.test(v.trim())) throw new UsageError(`--${name}: expected a non-negative integer, got ${JSON.stringify(v)}`);
  const x = Number(v);
  if (!Number.isSafeInteger(x)) throw new UsageError(`--${name}: ${v} is too large`);
  return x;
}

function checkOutPath(path: string | undefined, flag: string): void {
  if (path === undefined) return;
  if (existsSync(path) && statSync(path).isDirectory()) throw new UsageError(`--${flag}: ${path} is a directory; give a file name`);
  const dir = dirname(path);
  if (dir && existsSync(dir) && !statSync(dir).isDirectory()) throw new UsageError(`--${flag}: ${dir} is not a directory`);
}

function onePositional(positionals: string[], cmd: string): string {
  if (positionals.length !== 1) throw new UsageError(`${cmd}: expected exactly one suite file (got ${positionals.length}); see walkhull help`);
  return positionals[0];
}

function safePredict(suite: LoadedSuite): Prediction {
  return predict(suite);
}

async function cmdRun(args: string[]): Promise<number> {
  const { flags, positionals } = parse(args, {
    paths: { type: "string" },
    seed: { type: "string" },
    out: { type: "string" },
    kernel: { type: "string" },
    quiet: { type: "boolean" },
    "no-checks": { type: "boolean" },
  });
  const file = onePositional(positionals, "run");
  const out = flags.out as string | undefined;
  checkOutPath(out, "out");
  const kernel = (flags.kernel as string | undefined) ?? "wasm";
  if (kernel !== "wasm" && kernel !== "twin") throw new UsageError(`--kernel: expected wasm or twin, got ${kernel}`);
  const paths = intFlag(flags, "paths");
  if (paths === 0) throw new UsageError("--paths: must be >= 1");
  const suite = loadSuite(file, { paths, seed: intFlag(flags, "seed") });
  const startedAt = new Date();
  const withChecks = !flags["no-checks"];
  const prediction = withChecks ? safePredict(suite) : undefined;
  const quiet = Boolean(flags.quiet) || !process.stderr.isTTY;
  const sim = simulateInProcess(suite, {
    kernel,
    onBlock: quiet ? undefined : (done, total) => process.stderr.write(`\r${done}/${total} blocks`),
  });
  if (!quiet) process.stderr.write("\n");
  const verdicts = prediction ? evaluateChecks(sim, prediction) : undefined;
  const report = buildReport(sim, startedAt, {
    predictions: prediction,
    checks: verdicts?.checks,
    limits: verdicts?.limits,
  });
  const failed = verdicts ? verdicts.failed > 0 : false;
  report.exitCode = failed ? EXIT_CHECK_FAILED : EXIT_OK;

  const scaling = (m: string) => prediction?.measures.find((p) => p.measure === m)?.varianceScaling ?? null;
  const lines = [
    `${suite.title}  (seed ${suite.seed}, ${sim.blocks.reduce((s, b) => s + b.paths, 0)} paths, ${suite.walks.length} walk(s), ${sim.wallSeconds.toFixed(2)} s)`,
    "",
    resultsTable(sim.results, scaling),
  ];
  if (verdicts) lines.push("", renderChecks(verdicts));
  if (out) writeAtomic(out, toJson(report));
  process.stdout.write(lines.join("\n") + "\n");
  if (out) process.stdout.write(`report: ${out}\n`);
  return report.exitCode;
}

async function cmdPredict(args: string[]): Promise<number> {
  const { flags, positionals } = parse(args, { json: { type: "boolean" } });
  const suite = loadSuite(onePositional(positionals, "predict"));
  const p = predict(suite);
  process.stdout.write(flags.json ? JSON.stringify(p, null, 1) + "\n" : renderPredictionTable(p) + "\n");
  return EXIT_OK;
}

export async function main(argv: string[]): Promise<number> {
  const [cmd, ...rest] = argv;
  try {
    switch (cmd) {
      case "run":
        return await cmdRun(rest);
      case "predict":
        return await cmdPredict(rest);
      case undefined:
      case "help":
      case "--help":
      case "-h":
        process.stdout.write(HELP + "\n");
        return cmd === undefined ? EXIT_BAD_INPUT : EXIT_OK;
      default:
        throw new UsageError(`unknown command ${JSON.stringify(cmd)} (commands: run, predict, help)`);
    }
  } catch (e) {
    if (e instanceof SuiteError || e instanceof UsageError) {
      process.stderr.write(`walkhull: ${e.message}\n`);
      return EXIT_BAD_INPUT;
    }
    throw e;
  }
}
