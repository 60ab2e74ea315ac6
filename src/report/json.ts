// The JSON report: the contract read by scripts (`results` rows, `checks`, ...). Add fields, never rename.

import { createHash } from "node:crypto";
import { readFileSync } from "node:fs";
import { cpus } from "node:os";
import { execFileSync } from "node:child_process";
import { PROJECT_ROOT, toolVersion } from "../version.js";
import type { SimulationResult, BlockStats, ResultRecord } from "../run/types.js";
import type { Prediction } from "../theory/types.js";
import type { LoadedSuite } from "../suite/schema.js";
import { mergeBlockComoments } from "../run/blocks.js";
import { covarianceMatrix } from "../stats/moments.js";
import { seriesIndex } from "../run/series.js";

export const REPORT_FORMAT = "walkhull-report/1";

export interface Provenance {
  tool: "walkhull";
  version: string;
  gitCommit: string | null;
  node: string;
  wasmSha256: string | null;
  cpu: string;
  cpuCount: number;
  workers: number;
  seed: number;
  suiteHash: string;
  startedAt: string;
  wallSeconds: number;
}

import type { LinearisationReport, VerdictReport } from "../verdict/types.js";
import type { PointEstimate } from "../verdict/estimates.js";

export interface Report {
  format: string;
  suite: ReturnType<typeof suiteForReport>;
  seed: number;
  version: string;
  timing: { wallSeconds: number; pathsPerSecond: number; workers: number };
  provenance: Provenance;
  results: ResultRecord[];
  predictions?: Prediction;
  checks?: unknown[];
  limits?: unknown[];
  /**
   * Plain and control-variate estimates of E M_n and Var M_n per measure and n, with jackknife SEs
   * and the variance-reduction factors (plain SE^2 / control-variate SE^2).
   */
  controlVariates?: PointEstimate[];
  /** Claimed and predicted linearisations as checked (docs/theory.md sec. 6.1). */
  linearisations?: LinearisationReport[];
  /** KS distances by n to predicted "gaussian-maximum" laws (docs/theory.md sec. 7.1). */
  tieLaws?: VerdictReport["tieLaws"];
  /** What decided the exit code: failures, user claims left undecided, Holm family sizes, tolerance. */
  verdictSummary?: { failed: number; undecidedClaims: { id: string; pathsToDecide: number | null | undefined }[]; familySizes: { claims: number; predictions: number } | null; tolerance: number | null; alpha: number };
  /** Covariance between measures at each n (over the kept measures of the suite). */
  covariance: { n: number; measures: string[]; matrix: number[][] }[];
  /** Per-block moment sums, for jackknife re-analysis and exact combines of parts. */
  blocks: BlockStats[];
  blockCount: number;
  /** The part of the run this report holds (null: all of it; reports are written for whole runs only). */
  shard?: { index: number; count: number } | null;
  exitCode?: number;
}


function gitCommit(): string | null {
  try {
    return execFileSync("git", ["rev-parse", "HEAD"], { cwd: PROJECT_ROOT, stdio: ["ignore", "pipe", "ignore"] }).toString().trim();
  } catch {
    return null;
  }
}

function wasmHash(): string | null {
  try {
    return createHash("sha256").update(readFileSync(PROJECT_ROOT + "build/walkhull.wasm")).digest("hex");
  } catch {
    return null;
  }
}

/** The suite as recorded in a report: empirical increments are summarised, not copied. */
export function suiteForReport(suite: LoadedSuite) {
  return {
    ...suite,
    walks: suite.walks.map((w) => (w.law === "empirical" ? { law: w.law, file: w.file, increments: w.steps?.length ?? 0 } : w)),
  };
}

export function provenance(sim: SimulationResult, startedAt: Date): Provenance {
  const cpu = cpus();
  return {
    tool: "walkhull",
    version: toolVersion(),
    gitCommit: gitCommit(),
    node: process.version,
    wasmSha256: wasmHash(),
    cpu: cpu[0]?.model ?? "unknown",
    cpuCount: cpu.length,
    workers: sim.workers,
    seed: sim.suite.seed,
    suiteHash: sim.suite.hash,
    startedAt: startedAt.toISOString(),
    wallSeconds: sim.wallSeconds,
  };
}

export function measureCovariance(sim: SimulationResult): Report["covariance"] {
  if (sim.blocks.length === 0) return [];
  const comoments = mergeBlockComoments(sim.blocks);
  const cov = covarianceMatrix(comoments);
  const dim = comoments.dim;
  return sim.suite.n.map((n, g) => {
    const idx = sim.suite.measure.map((m) => seriesIndex(sim, m, g));
    return { n, measures: [...sim.suite.measure], matrix: idx.map((a) => idx.map((b) => cov[a * dim + b])) };
  });
}

export function buildReport(
  sim: SimulationResult,
  startedAt: Date,
  extra: { predictions?: Prediction; verdicts?: VerdictReport; shard?: Report["shard"] } = {},
): Report {
  const prov = provenance(sim, startedAt);
  const paths = sim.blocks.reduce((s, b) => s + b.paths, 0);
  return {
    format: REPORT_FORMAT,
    suite: suiteForReport(sim.suite),
    seed: sim.suite.seed,
    version: prov.version,
    timing: { wallSeconds: sim.wallSeconds, pathsPerSecond: paths / Math.max(sim.wallSeconds, 1e-9), workers: sim.workers },
    provenance: prov,
    results: sim.results,
    ...(extra.predictions ? { predictions: extra.predictions } : {}),
    ...(extra.verdicts ? { checks: extra.verdicts.checks, limits: extra.verdicts.limits } : {}),
    ...(extra.verdicts?.estimates ? { controlVariates: extra.verdicts.estimates } : {}),
    ...(extra.verdicts?.linearisations ? { linearisations: extra.verdicts.linearisations } : {}),
    ...(extra.verdicts?.tieLaws ? { tieLaws: extra.verdicts.tieLaws } : {}),
    ...(extra.verdicts
      ? {
          verdictSummary: {
            failed: extra.verdicts.failed, undecidedClaims: extra.verdicts.undecidedClaims ?? [], familySizes: extra.verdicts.familySizes ?? null,
            tolerance: extra.verdicts.tolerance ?? null, alpha: extra.verdicts.alpha,
          },
        }
      : {}),
    covariance: measureCovariance(sim),
    blocks: sim.blocks,
    blockCount: sim.blockCount,
    shard: extra.shard ?? null,
  };
}

/** JSON with typed arrays as plain arrays and non-finite numbers as null. */
export function toJson(v: unknown): string {
  return JSON.stringify(
    v,
    (_k, x) => {
      if (ArrayBuffer.isView(x) && !(x instanceof DataView)) return Array.from(x as unknown as ArrayLike<number>);
      if (typeof x === "number" && !Number.isFinite(x)) return null;
      return x;
    },
    1,
  );
}

