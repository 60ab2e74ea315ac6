// Part results for clusters (`run --part K --parts N --out F`) and `combine`, which joins them into
// one run. Combining adds the parts' blocks and kept candidates; statistics are then merged in block
// order, so the combined results carry the same bits as one uninterrupted run.

import { readFileSync } from "node:fs";
import { recordLayout } from "../engine/types.js";
import { blockCount } from "../suite/load.js";
import type { LoadedSuite } from "../suite/schema.js";
import { toolVersion } from "../version.js";
import { mergeKept } from "./blocks.js";
import type { PartSpec } from "./checkpoint.js";
import { partBlocks } from "./run.js";
import { BlockCollector } from "./simulate.js";
import { runStateFromJson, runStateToJson, type RunState, type RunStateJson } from "./state.js";
import type { ResultRecord, SimulationResult } from "./types.js";

export const PART_FORMAT = "walkhull-part/1";

export interface PartFileJson extends RunStateJson {
  format: string;
  version: string;
  suite: LoadedSuite;
  seed: number;
  suiteHash: string;
  blockCount: number;
  part: PartSpec;
  startedAt: string;
  wallSeconds: number;
  workers: number;
  /** The part's own results (partial: only its blocks). */
  results: ResultRecord[];
}

export class CombineError extends Error {}

export function partFile(sim: SimulationResult, collector: BlockCollector, part: PartSpec, startedAt: Date): PartFileJson {
  return {
    format: PART_FORMAT,
    version: toolVersion(),
    suite: sim.suite,
    seed: sim.suite.seed,
    suiteHash: sim.suite.hash,
    blockCount: sim.blockCount,
    part,
    startedAt: startedAt.toISOString(),
    wallSeconds: sim.wallSeconds,
    workers: sim.workers,
    results: sim.results,
    ...runStateToJson(collector.snapshot()),
  };
}

/** Combine part files; refuses mismatched, duplicated or missing parts, naming them. */
export function combinePartFiles(files: string[], version: string): SimulationResult {
  const parts = files.map((f) => {
    let j: PartFileJson;
    try {
      j = JSON.parse(readFileSync(f, "utf8"));
    } catch (e) {
      throw new CombineError(`${f}: not a readable part result (${(e as Error).message})`);
    }
    if (j?.format !== PART_FORMAT) throw new CombineError(`${f}: not a walkhull part result (format ${JSON.stringify(j?.format)})`);
    const p = j.part;
    if (!p || !Number.isInteger(p.count) || !Number.isInteger(p.index) || p.count < 1 || p.index < 0 || p.index >= p.count) {
      throw new CombineError(`${f}: part: expected { index, count } with 0 <= index < count (got ${JSON.stringify(p)})`);
    }
    if (typeof j.suiteHash !== "string" || !Number.isInteger(j.blockCount)) throw new CombineError(`${f}: malformed part result (suiteHash, blockCount)`);
    return { file: f, j };
  });
  const first = parts[0];
  for (const s of parts.slice(1)) {
    const diff = (what: string, a: unknown, b: unknown) =>
      new CombineError(`${s.file} does not match ${first.file}: ${what} ${JSON.stringify(b)} vs ${JSON.stringify(a)}`);
    if (s.j.suiteHash !== first.j.suiteHash) throw diff("suite hash", first.j.suiteHash.slice(0, 12), s.j.suiteHash.slice(0, 12));
    if (s.j.seed !== first.j.seed) throw diff("seed", first.j.seed, s.j.seed);
    if (s.j.version !== first.j.version) throw diff("walkhull version", first.j.version, s.j.version);
    if (s.j.part.count !== first.j.part.count) throw diff("number of parts", first.j.part.count, s.j.part.count);
    if (s.j.blockCount !== first.j.blockCount) throw diff("block count", first.j.blockCount, s.j.blockCount);
  }
  if (first.j.version !== version) {
    throw new CombineError(`${first.file} was written by walkhull ${first.j.version}; this is ${version}: combine with the same version`);
  }
  const count = first.j.part.count;
  const byIndex = new Map<number, string>();
  for (const s of parts) {
    const prev = byIndex.get(s.j.part.index);
    if (prev) throw new CombineError(`part ${s.j.part.index} of ${count} given twice: ${prev} and ${s.file}`);
    byIndex.set(s.j.part.index, s.file);
  }
  const missing = Array.from({ length: count }, (_, i) => i).filter((i) => !byIndex.has(i));
  if (missing.length > 0) throw new CombineError(`missing part(s) ${missing.join(", ")} of ${count} (have ${[...byIndex.keys()].sort((a, b) => a - b).join(", ")})`);

  const suite = first.j.suite;
  if (blockCount(suite) !== first.j.blockCount) throw new CombineError(`${first.file}: block count does not match its suite`);
  const dim = recordLayout(suite.n.length).width;
  const collector = new BlockCollector(suite);
  const keptSets = [];
  const min = new Array<number>(dim).fill(Infinity);
  const max = new Array<number>(dim).fill(-Infinity);
  const blocks = [];
  let wall = 0;
  let workers = 0;
  for (const s of parts) {
    const where = s.file;
    let st: RunState;
    try {
      st = runStateFromJson(s.j, dim, where);
    } catch (e) {
      throw new CombineError(`${where}: malformed part result (${(e as Error).message})`);
    }
    const own = new Set(partBlocks(s.j.blockCount, s.j.part));
    if (st.blocks.length !== own.size || st.blocks.some((b) => !own.has(b.block))) {
      throw new CombineError(`${where}: holds blocks [${st.blocks.map((b) => b.block).join(", ")}] but part ${s.j.part.index} of ${count} must hold [${[...own].join(", ")}] (incomplete part?)`);
    }
    blocks.push(...st.blocks);
    keptSets.push(st.kept);
    st.min.forEach((x, i) => (min[i] = Math.min(min[i], x)));
    st.max.forEach((x, i) => (max[i] = Math.max(max[i], x)));
    wall = Math.max(wall, s.j.wallSeconds);
    workers += s.j.workers;
  }
  collector.restore({ blocks, kept: mergeKept(keptSets, dim), min, max });
  return collector.result(wall, workers);
}
