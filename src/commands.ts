// Commands only: parse arguments, call the library, print, choose the exit code.
// Exit codes: 0 ok (nothing failed, every user claim decided), 1 a check failed, 2 bad input or
// usage, 3 nothing failed but a user claim is undecided; a stopped run: 130 (SIGINT),
// 143 (SIGTERM), 75 (--stop-after-blocks), each after writing a checkpoint.

import { parseArgs, type ParseArgsConfig } from "node:util";
import { existsSync, readFileSync, rmSync, statSync } from "node:fs";
import { dirname, join } from "node:path";
import { blockCount, loadSuite, SuiteError } from "./suite/load.js";
import type { LoadedSuite } from "./suite/schema.js";
import { renderPredictionTable } from "./theory/predict.js";
import { predictCached } from "./theory/cache.js";
import type { Prediction } from "./theory/types.js";
import { evaluateChecks, prepareVerdictCache, renderChecks, type VerdictCache } from "./verdict/checks.js";
import { runSuite } from "./run/run.js";
import type { EarlyWorkers } from "./run/prestart.js";
import { EarlyPrediction, predictionTargets } from "./verdict/early-prediction.js";
import { LawEvidenceThreads } from "./verdict/law-evidence.js";
import { defaultWorkers } from "./run/pool.js";
import { CheckpointError, type PartSpec } from "./run/checkpoint.js";
import { combinePartFiles, CombineError, partFile } from "./run/parts.js";
import type { SimulationResult } from "./run/types.js";
import { toolVersion } from "./version.js";
import { buildReport, toJson } from "./report/json.js";
import { writeAtomic } from "./io/write-atomic.js";
import { resultsTable, textTable } from "./report/table.js";
import { controlVariateTable, renderMarkdown } from "./report/markdown.js";
import { renderHtml, type HtmlExtras } from "./report/html.js";
import { renderJunit, reportJunit } from "./report/junit.js";
import { DEFAULT_DIFF_ALPHA, DiffInputError, diffCases, diffReports, readDiffInput, renderDiff } from "./report/diff.js";
import { samplesCsv } from "./report/samples.js";
import { createKernel } from "./run/simulate.js";
import { planSuite, renderPlan, type PlanGoal } from "./plan/plan.js";

export const EXIT_OK = 0;
export const EXIT_CHECK_FAILED = 1;
/** No failure, but some user claim is inconclusive (the summary names it and the paths that would decide). */
export const EXIT_UNDECIDED = 3;
export const EXIT_BAD_INPUT = 2;
/** A run stopped by --stop-after-blocks (checkpoint written; continue with --resume). */
export const EXIT_STOPPED = 75;
export const EXIT_SIGINT = 130;
export const EXIT_SIGTERM = 143;

class UsageError extends Error {}

const HELP = `walkhull: simulate convex hulls of planar random walks and check limit theorems

Usage:
  walkhull run <suite.json> [options]      simulate a suite, check claims and predictions, report
  walkhull predict <suite.json> [--json] [--tolerance REL]
                                           analytic predictions and hypothesis diagnosis
  walkhull plan <suite.json> (--target-se X | --detect REL) [--workers N] [--pilot-paths N]
                                           paths and wall time for a target SE on Var/n^p at the largest n
  walkhull combine <part.json>... --out F  join the parts of a run into one report (same bits as one run)
  walkhull diff <baseline.json> <current.json> [--alpha A] [--junit FILE] [--statistical]
                                           regression check of two reports (exit 1 on a significant change)
  walkhull help                            this text

run options:
  --paths N        override the suite's number of paths
  --seed S         override the suite's seed (non-negative integer)
  --out FILE       write the JSON report to FILE (atomically)
  --workers N      worker threads (default: all cores); results are identical for any N
  --quiet          no live progress (a one-line summary is still printed on stderr)
  --no-checks      simulate and report moments only (no predictions, no verdicts)
  --part K --parts N  run only part K (0 <= K < N) of N: blocks K, K+N, ...; writes a part result to --out
  --checkpoint F   checkpoint file (default: <out>.checkpoint, or .walkhull-checkpoint-<hash>.json)
  --resume         continue from the checkpoint; ends with the same bits as an uninterrupted run
  --stop-after-blocks K   stop after K blocks with a checkpoint (exit 75), for tests
  --kernel K       wasm (default) or twin (the plain-TypeScript twin; slow, for cross-checks)
  --report DIR     also write DIR/report.json, DIR/report.md and DIR/report.html (run and combine)
  --junit FILE     JUnit XML, one testcase per check (run, combine and diff)
  --samples FILE   CSV of the kept per-path values: path, <measure>@<n>... (run and combine)
  --predict-budget S  time cap of the numerical predictions (default 60 s); finite-n means are
                   computed to 1/10 of the run's standard error of each mean (predict: --tolerance,
                   relative, default 1e-6); one that cannot reach its bound is shown, not gated
  --no-cache       neither read nor write the prediction cache ($XDG_CACHE_HOME or ~/.cache/walkhull)

diff: exact bit comparison when seed, suite hash and version match; otherwise two-sample z-tests
of every mean and variance, Holm over the family at --alpha (default 0.01); --statistical forces
the z-tests. Exit 0 no significant change, 1 a significant change, 2 unreadable or mismatched files.

Exit codes: 0 ok (nothing failed and every claim of the suite decided), 1 a check failed,
2 bad input or usage, 3 nothing failed but a claim is undecided (the summary names it and the
paths that would decide); a stopped run: 130 (SIGINT),
143 (SIGTERM), 75 (--stop-after-blocks), each after writing a checkpoint.
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

/** Default time caps of the numerical predictions (a guard: their accuracy is set by a target). */
const RUN_PREDICT_BUDGET = 60;
const PREDICT_BUDGET = 60;

function secondsFlag(flags: Flags, name: string, fallback: number): number {
  const v = flags[name];
  if (v === undefined) return fallback;
  const x = typeof v === "string" ? Number(v) : NaN;
  if (!(x > 0) || !Number.isFinite(x)) throw new UsageError(`--${name}: expected a positive number of seconds, got ${JSON.stringify(v)}`);
  return x;
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

function parsePart(flags: Flags): PartSpec | null {
  const index = intFlag(flags, "part");
  const count = intFlag(flags, "parts");
  if (index === undefined && count === undefined) return null;
  if (count === undefined) throw new UsageError("--part: give the number of parts with --parts N");
  if (index === undefined) throw new UsageError("--parts: give this run's part with --part K (0 <= K < N)");
  if (count < 1) throw new UsageError("--parts: must be >= 1");
  if (index >= count) throw new UsageError(`--part: need 0 <= K < N (got --part ${index} --parts ${count})`);
  return { index, count };
}

interface FinishOptions {
  out?: string;
  quiet: boolean;
  withChecks: boolean;
  startedAt: Date;
  /** Seconds the numerical predictions may take (--predict-budget). */
  predictBudget: number;
  /** Read and write the prediction cache (not --no-cache). */
  cache: boolean;
  /** Predictions already computed (run: overlapped with the simulation, src/verdict/early-prediction.ts). */
  prediction?: Prediction;
  /** What the checks compute from the simulation, already computed (run: while helper threads compute the limit-law evidence). */
  verdictCache?: VerdictCache;
  /** --report DIR, --junit FILE, --samples FILE */
  reportDir?: string;
  junit?: string;
  samples?: string;
}

/** --report/--junit/--samples: checked before any work, so bad paths write nothing. */
function outputFlags(flags: Flags): { reportDir?: string; junit?: string; samples?: string } {
  const reportDir = flags.report as string | undefined;
  if (reportDir !== undefined && existsSync(reportDir) && !statSync(reportDir).isDirectory()) throw new UsageError(`--report: ${reportDir} exists and is not a directory`);
  const junit = flags.junit as string | undefined;
  checkOutPath(junit, "junit");
  const samples = flags.samples as string | undefined;
  checkOutPath(samples, "samples");
  return { reportDir, junit, samples };
}

/** One sample path for the HTML report's geometry plot (the note says why when there is none). */
function sampleGeometry(sim: SimulationResult): HtmlExtras {
  try {
    return { sample: sim.sample, geometry: createKernel(sim.suite).samplePath(0) };
  } catch (e) {
    return { sample: sim.sample, geometry: null, geometryNote: `No sample path: ${(e as Error).message}` };
  }
}

/** Predictions, verdicts, the tables on stdout and the report file: shared by run and combine. */
function finish(sim: SimulationResult, opts: FinishOptions): number {
  const suite = sim.suite;
  const prediction = opts.withChecks
    ? opts.prediction ?? predictCached(suite, { budgetSeconds: opts.predictBudget, meanTargets: predictionTargets(sim) }, { use: opts.cache })
    : undefined;
  const verdicts = prediction ? evaluateChecks(sim, prediction, opts.verdictCache) : undefined;
  const report = buildReport(sim, opts.startedAt, { predictions: prediction, verdicts });
  report.exitCode = verdicts && verdicts.failed > 0 ? EXIT_CHECK_FAILED : verdicts && (verdicts.undecidedClaims?.length ?? 0) > 0 ? EXIT_UNDECIDED : EXIT_OK;
  const scaling = (m: string) => prediction?.measures.find((p) => p.measure === m)?.varianceScaling ?? null;
  const paths = sim.blocks.reduce((s, b) => s + b.paths, 0);
  const lines = [
    `${suite.title}  (seed ${suite.seed}, ${paths} paths, ${suite.walks.length} walk(s), ${sim.wallSeconds.toFixed(2)} s on ${sim.workers} worker(s))`,
    "",
    resultsTable(sim.results, scaling),
  ];
  if (verdicts?.estimates?.length) {
    const cv = controlVariateTable(verdicts.estimates);
    lines.push("", "Control variates (the walks' centred endpoints and integrated paths; * = the estimate used; reduction = plain SE^2 / CV SE^2)", textTable(cv.header, cv.rows));
  }
  if (verdicts) lines.push("", renderChecks(verdicts));
  const undecided = verdicts?.undecidedClaims ?? [];
  if (verdicts && verdicts.failed === 0 && undecided.length)
    lines.push("", `Undecided claims (exit ${EXIT_UNDECIDED}): ${undecided.map((u) => `${u.id}: ${u.pathsToDecide ? `about ${u.pathsToDecide} paths would decide` : "more paths cannot decide (see its detail)"}`).join("; ")}`);
  if (opts.out) writeAtomic(opts.out, toJson(report));
  if (opts.reportDir) {
    writeAtomic(join(opts.reportDir, "report.json"), toJson(report));
    writeAtomic(join(opts.reportDir, "report.md"), renderMarkdown(report));
    writeAtomic(join(opts.reportDir, "report.html"), renderHtml(report, sampleGeometry(sim)));
  }
  if (opts.junit) writeAtomic(opts.junit, reportJunit(report));
  if (opts.samples) writeAtomic(opts.samples, samplesCsv(suite, sim.sample));
  process.stdout.write(lines.join("\n") + "\n");
  if (opts.out) process.stdout.write(`report: ${opts.out}\n`);
  if (opts.reportDir) process.stdout.write(`report files: ${join(opts.reportDir, "report.{json,md,html}")}\n`);
  return report.exitCode;
}

function defaultCheckpoint(suite: LoadedSuite, out: string | undefined, part: PartSpec | null): string {
  if (out) return `${out}.checkpoint`;
  const tag = part ? `-part-${part.index}-of-${part.count}` : "";
  return `.walkhull-checkpoint-${suite.hash.slice(0, 12)}${tag}.json`;
}

async function cmdRun(args: string[], early: EarlyWorkers | null): Promise<number> {
  const { flags, positionals } = parse(args, {
    paths: { type: "string" },
    seed: { type: "string" },
    out: { type: "string" },
    kernel: { type: "string" },
    workers: { type: "string" },
    quiet: { type: "boolean" },
    "no-checks": { type: "boolean" },
    part: { type: "string" },
    parts: { type: "string" },
    checkpoint: { type: "string" },
    resume: { type: "boolean" },
    "stop-after-blocks": { type: "string" },
    "predict-budget": { type: "string" },
    "no-cache": { type: "boolean" },
    report: { type: "string" },
    junit: { type: "string" },
    samples: { type: "string" },
  });
  const file = onePositional(positionals, "run");
  const out = flags.out as string | undefined;
  checkOutPath(out, "out");
  const kernel = (flags.kernel as string | undefined) ?? "wasm";
  if (kernel !== "wasm" && kernel !== "twin") throw new UsageError(`--kernel: expected wasm or twin, got ${kernel}`);
  const paths = intFlag(flags, "paths");
  if (paths === 0) throw new UsageError("--paths: must be >= 1");
  const workers = intFlag(flags, "workers");
  if (workers === 0) throw new UsageError("--workers: must be >= 1");
  const part = parsePart(flags);
  if (part && !out) throw new UsageError("--part: give --out FILE for the part result (join the parts with walkhull combine)");
  const stopAfter = intFlag(flags, "stop-after-blocks");
  const predictBudget = secondsFlag(flags, "predict-budget", RUN_PREDICT_BUDGET);
  const outputs = outputFlags(flags);
  if (part && (outputs.reportDir || outputs.junit || outputs.samples)) throw new UsageError("--report, --junit and --samples apply to whole runs; combine the parts, then report");
  const suite = loadSuite(file, { paths, seed: intFlag(flags, "seed") });
  const checkpoint = (flags.checkpoint as string | undefined) ?? defaultCheckpoint(suite, out, part);
  checkOutPath(checkpoint, "checkpoint");
  const quiet = Boolean(flags.quiet);
  const startedAt = new Date();
  const withChecks = !flags["no-checks"];
  const earlyPrediction = withChecks && !part ? new EarlyPrediction(suite, predictBudget, !flags["no-cache"]) : null;
  // Law-evidence helper threads start once half of the blocks are merged (at the latest with the
  // last blocks): loading their code takes 0.1-0.3 s of CPU, which while blocks run costs the
  // simulation about half that on a busy machine and is over when the checks need the helpers
  // (started only with the last blocks, the load outlasted the simulation by up to 0.3 s).
  const lawThreads = withChecks && !part ? new LawEvidenceThreads() : null;
  const helpersFrom = Math.min(blockCount(suite) - (workers ?? defaultWorkers()), Math.ceil(blockCount(suite) / 2));
  let outcome;
  try {
    outcome = await runSuite(suite, {
      workers,
      kernel,
      part,
      checkpoint,
      resume: Boolean(flags.resume),
      stopAfterBlocks: stopAfter,
      progress: !quiet && Boolean(process.stderr.isTTY),
      handleSignals: true,
      early,
      onBlockMerged: (blocks) => {
        earlyPrediction?.offer(blocks);
        if (blocks.size >= helpersFrom) lawThreads?.start(suite.measure.length);
      },
      onSimulated: (collector) => lawThreads?.dispatchEarly(collector),
    });
  } catch (e) {
    earlyPrediction?.dispose();
    lawThreads?.dispose();
    if (e instanceof CheckpointError) throw new UsageError(e.message);
    throw e;
  }
  if (outcome.status === "stopped") {
    earlyPrediction?.dispose();
    lawThreads?.dispose();
    return outcome.reason === "SIGINT" ? EXIT_SIGINT : outcome.reason === "SIGTERM" ? EXIT_SIGTERM : EXIT_STOPPED;
  }
  const { sim, collector } = outcome;
  let code: number;
  if (part) {
    writeAtomic(out!, toJson(partFile(sim, collector, part, startedAt)));
    process.stdout.write(`part ${part.index} of ${part.count}: ${sim.blocks.length} blocks, ${sim.blocks.reduce((s, b) => s + b.paths, 0)} paths -> ${out}\n`);
    code = EXIT_OK;
  } else {
    // The helpers compute the law evidence (sent at onSimulated, or now) while this thread settles
    // the predictions (and the estimates they are sized by) and everything else the checks compute
    // from the simulation; this thread computes a measure only without a helper or for one that failed.
    lawThreads?.dispatch(sim);
    let prediction: Prediction | undefined;
    const verdictCache: VerdictCache = {};
    try {
      prediction = earlyPrediction ? await earlyPrediction.resolve(sim) : undefined;
      if (prediction) prepareVerdictCache(sim, prediction, verdictCache);
      verdictCache.evidence = await lawThreads?.collect();
    } finally {
      lawThreads?.dispose();
    }
    code = finish(sim, { out, quiet, withChecks, startedAt, predictBudget, cache: !flags["no-cache"], prediction, verdictCache, ...outputs });
  }
  rmSync(checkpoint, { force: true });
  return code;
}

async function cmdCombine(args: string[]): Promise<number> {
  const { flags, positionals } = parse(args, {
    out: { type: "string" },
    quiet: { type: "boolean" },
    "no-checks": { type: "boolean" },
    "predict-budget": { type: "string" },
    "no-cache": { type: "boolean" },
    report: { type: "string" },
    junit: { type: "string" },
    samples: { type: "string" },
  });
  if (positionals.length === 0) throw new UsageError("combine: give the part result files (walkhull combine part-0.json part-1.json ... --out report.json)");
  const out = flags.out as string | undefined;
  checkOutPath(out, "out");
  const outputs = outputFlags(flags);
  let sim: SimulationResult;
  try {
    sim = combinePartFiles(positionals, toolVersion());
  } catch (e) {
    if (e instanceof CombineError) throw new UsageError(e.message);
    throw e;
  }
  return finish(sim, { out, quiet: Boolean(flags.quiet), withChecks: !flags["no-checks"], startedAt: new Date(), predictBudget: secondsFlag(flags, "predict-budget", RUN_PREDICT_BUDGET), cache: !flags["no-cache"], ...outputs });
}

function readReportFile(path: string, label: string): unknown {
  let text: string;
  try {
    text = readFileSync(path, "utf8");
  } catch (e) {
    throw new UsageError(`${label}: cannot read ${path}: ${(e as Error).message}`);
  }
  try {
    return JSON.parse(text);
  } catch (e) {
    throw new UsageError(`${label}: ${path} is not valid JSON (${(e as Error).message})`);
  }
}

async function cmdDiff(args: string[]): Promise<number> {
  const { flags, positionals } = parse(args, { alpha: { type: "string" }, junit: { type: "string" }, statistical: { type: "boolean" } });
  if (positionals.length !== 2) throw new UsageError(`diff: expected two report files, baseline and current (got ${positionals.length})`);
  const a = flags.alpha === undefined ? DEFAULT_DIFF_ALPHA : Number(flags.alpha);
  if (!(a > 0 && a < 1)) throw new UsageError(`--alpha: expected a number in (0, 1), got ${JSON.stringify(flags.alpha)}`);
  const junit = flags.junit as string | undefined;
  checkOutPath(junit, "junit");
  let result;
  try {
    const baseline = readDiffInput(readReportFile(positionals[0], "baseline"), "baseline");
    const current = readDiffInput(readReportFile(positionals[1], "current"), "current");
    result = diffReports(baseline, current, { alpha: a, statistical: Boolean(flags.statistical) });
  } catch (e) {
    if (e instanceof DiffInputError) throw new UsageError(e.message);
    throw e;
  }
  process.stdout.write(renderDiff(result) + "\n");
  if (junit) writeAtomic(junit, renderJunit("walkhull diff", [{ name: `diff ${positionals[0]} ${positionals[1]}`, cases: diffCases(result) }]));
  if (result.exitCode === 2) process.stderr.write("walkhull: diff: the reports do not cover the same measures and n (listed above)\n");
  return result.exitCode;
}

async function cmdPredict(args: string[]): Promise<number> {
  const { flags, positionals } = parse(args, { json: { type: "boolean" }, "predict-budget": { type: "string" }, tolerance: { type: "string" }, "no-cache": { type: "boolean" } });
  const budgetSeconds = secondsFlag(flags, "predict-budget", PREDICT_BUDGET);
  const relative = flags.tolerance === undefined ? undefined : Number(flags.tolerance);
  if (relative !== undefined && !(relative > 0 && relative < 1)) throw new UsageError(`--tolerance: expected a relative error bound in (0, 1), got ${JSON.stringify(flags.tolerance)}`);
  const suite = loadSuite(onePositional(positionals, "predict"));
  const p = predictCached(suite, { budgetSeconds, meanTargets: relative === undefined ? undefined : { relative } }, { use: !flags["no-cache"] });
  process.stdout.write(flags.json ? JSON.stringify(p, null, 1) + "\n" : renderPredictionTable(p) + "\n");
  return EXIT_OK;
}

async function cmdPlan(args: string[]): Promise<number> {
  const { flags, positionals } = parse(args, { "target-se": { type: "string" }, detect: { type: "string" }, workers: { type: "string" }, "pilot-paths": { type: "string" } });
  const file = onePositional(positionals, "plan");
  const se = flags["target-se"], rel = flags.detect;
  if ((se === undefined) === (rel === undefined)) throw new UsageError("plan: give exactly one of --target-se X or --detect REL");
  const positive = (v: string | boolean | undefined, name: string): number => {
    const x = typeof v === "string" && v.trim() !== "" ? Number(v) : NaN;
    if (!(x > 0) || !Number.isFinite(x)) throw new UsageError(`--${name}: expected a positive number, got ${JSON.stringify(v)}`);
    return x;
  };
  const goal: PlanGoal = se !== undefined ? { kind: "target-se", se: positive(se, "target-se") } : { kind: "detect", rel: positive(rel, "detect") };
  const workers = intFlag(flags, "workers");
  if (workers === 0) throw new UsageError("--workers: must be >= 1");
  const pilotPaths = intFlag(flags, "pilot-paths");
  if (pilotPaths !== undefined && pilotPaths < 200) throw new UsageError("--pilot-paths: must be >= 200");
  const suite = loadSuite(file);
  process.stdout.write(renderPlan(planSuite(suite, { goal, workers: workers ?? 1, pilotPaths })) + "\n");
  return EXIT_OK;
}

/** `early`: workers started ahead by src/cli.ts (prestartWorkers), for `run`. */
export async function main(argv: string[], early: EarlyWorkers | null = null): Promise<number> {
  const [cmd, ...rest] = argv;
  try {
    switch (cmd) {
      case "run":
        return await cmdRun(rest, early);
      case "predict":
        return await cmdPredict(rest);
      case "combine":
        return await cmdCombine(rest);
      case "diff":
        return await cmdDiff(rest);
      case "plan":
        return await cmdPlan(rest);
      case undefined:
      case "help":
      case "--help":
      case "-h":
        process.stdout.write(HELP + "\n");
        return cmd === undefined ? EXIT_BAD_INPUT : EXIT_OK;
      default:
        throw new UsageError(`unknown command ${JSON.stringify(cmd)} (commands: run, predict, plan, combine, diff, help)`);
    }
  } catch (e) {
    if (e instanceof SuiteError || e instanceof UsageError) {
      // One line: messages quoting a parser's error (JSON, CSV) may carry line breaks.
      process.stderr.write(`walkhull: ${e.message.replace(/\s*\n\s*/g, " ")}\n`);
      return EXIT_BAD_INPUT;
    }
    throw e;
  }
}
