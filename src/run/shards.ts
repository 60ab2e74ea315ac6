// Shard results for clusters (`run --shard i/N --out F`) and their merge into one run.
// A merge adds the shards' blocks and kept candidates; statistics are then merged in block order,
// so the merged results carry the same bits as one uninterrupted run.

import { readFileSync } from "node:fs";
import { recordLayout } from "../engine/types.js";
import { blockCount } from "../suite/load.js";
import type { LoadedSuite } from "../suite/schema.js";
import { toolVersion } from "../version.js";
import { mergeKept } from "./blocks.js";
import type { ShardSpec } from "./checkpoint.js";
import { shardBlocks } from "./run.js";
import { BlockCollector } from "./simulate.js";
import { runStateFromJson, runStateToJson, type RunState, type RunStateJson } from "./state.js";
import type { ResultRecord, SimulationResult } from "./types.js";

export const SHARD_FORMAT = "walkhull-shard/1";

export interface ShardFileJson extends RunStateJson {
  format: string;
  version: string;
  suite: LoadedSuite;
  seed: number;
  suiteHash: string;
  blockCount: number;
  shard: ShardSpec;
  startedAt: string;
  wallSeconds: number;
  workers: number;
  /** The shard's own results (partial: only its blocks). */
  results: ResultRecord[];
}

export class MergeError extends Error {}

export function shardFile(sim: SimulationResult, collector: BlockCollector, shard: ShardSpec, startedAt: Date): ShardFileJson {
  return {
    format: SHARD_FORMAT,
    version: toolVersion(),
    suite: sim.suite,
    seed: sim.suite.seed,
    suiteHash: sim.suite.hash,
    blockCount: sim.blockCount,
    shard,
    startedAt: startedAt.toISOString(),
    wallSeconds: sim.wallSeconds,
    workers: sim.workers,
    results: sim.results,
    ...runStateToJson(collector.snapshot()),
  };
}

/** Merge shard files; refuses mismatched, duplicated or missing shards, naming them. */
export function mergeShardFiles(files: string[], version: string): SimulationResult {
  const shards = files.map((f) => {
    let j: ShardFileJson;
    try {
      j = JSON.parse(readFileSync(f, "utf8"));
    } catch (e) {
      throw new MergeError(`${f}: not a readable shard result (${(e as Error).message})`);
    }
    if (j?.format !== SHARD_FORMAT) throw new MergeError(`${f}: not a walkhull shard result (format ${JSON.stringify(j?.format)})`);
    return { file: f, j };
  });
  const first = shards[0];
  for (const s of shards.slice(1)) {
    const diff = (what: string, a: unknown, b: unknown) =>
      new MergeError(`${s.file} does not match ${first.file}: ${what} ${JSON.stringify(b)} vs ${JSON.stringify(a)}`);
    if (s.j.suiteHash !== first.j.suiteHash) throw diff("suite hash", first.j.suiteHash.slice(0, 12), s.j.suiteHash.slice(0, 12));
    if (s.j.seed !== first.j.seed) throw diff("seed", first.j.seed, s.j.seed);
    if (s.j.version !== first.j.version) throw diff("walkhull version", first.j.version, s.j.version);
    if (s.j.shard.count !== first.j.shard.count) throw diff("shard count", first.j.shard.count, s.j.shard.count);
    if (s.j.blockCount !== first.j.blockCount) throw diff("block count", first.j.blockCount, s.j.blockCount);
  }
  if (first.j.version !== version) {
    throw new MergeError(`${first.file} was written by walkhull ${first.j.version}; this is ${version}: merge with the same version`);
  }
  const count = first.j.shard.count;
  const byIndex = new Map<number, string>();
  for (const s of shards) {
    const prev = byIndex.get(s.j.shard.index);
    if (prev) throw new MergeError(`shard ${s.j.shard.index}/${count} given twice: ${prev} and ${s.file}`);
    byIndex.set(s.j.shard.index, s.file);
  }
  const missing = Array.from({ length: count }, (_, i) => i).filter((i) => !byIndex.has(i));
  if (missing.length > 0) throw new MergeError(`missing shard(s) ${missing.map((i) => `${i}/${count}`).join(", ")} (have ${[...byIndex.keys()].sort((a, b) => a - b).map((i) => `${i}/${count}`).join(", ")})`);

  const suite = first.j.suite;
  if (blockCount(suite) !== first.j.blockCount) throw new MergeError(`${first.file}: block count does not match its suite`);
  const dim = recordLayout(suite.n.length).width;
  const collector = new BlockCollector(suite);
  const keptSets = [];
  const min = new Array<number>(dim).fill(Infinity);
  const max = new Array<number>(dim).fill(-Infinity);
  const blocks = [];
  let wall = 0;
  let workers = 0;
  for (const s of shards) {
    const where = s.file;
    let st: RunState;
    try {
      st = runStateFromJson(s.j, dim, where);
    } catch (e) {
      throw new MergeError(`${where}: malformed shard result (${(e as Error).message})`);
    }
    const own = new Set(shardBlocks(s.j.blockCount, s.j.shard));
    if (st.blocks.length !== own.size || st.blocks.some((b) => !own.has(b.block))) {
      throw new MergeError(`${where}: holds blocks [${st.blocks.map((b) => b.block).join(", ")}] but shard ${s.j.shard.index}/${count} must hold [${[...own].join(", ")}] (incomplete shard?)`);
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
