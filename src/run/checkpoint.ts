// Checkpoints: the blocks done and their partial results, written atomically (temp file + rename),
// so a run can resume and end with the same bits as an uninterrupted one.

import { existsSync, readFileSync } from "node:fs";
import { writeAtomic } from "../io/write-atomic.js";
import type { LoadedSuite } from "../suite/schema.js";
import { recordLayout } from "../engine/types.js";
import { runStateFromJson, runStateToJson, type RunState, type RunStateJson } from "./state.js";

export const CHECKPOINT_FORMAT = "walkhull-checkpoint/1";

/** Part K of N of a run (`--part K --parts N`): blocks K, K+N, K+2N, ... */
export interface PartSpec {
  index: number;
  count: number;
}

interface CheckpointJson extends RunStateJson {
  format: string;
  version: string;
  suiteHash: string;
  seed: number;
  paths: number;
  blockCount: number;
  part: PartSpec | null;
  writtenAt: string;
}

export class CheckpointError extends Error {}

export function writeCheckpoint(
  path: string,
  suite: LoadedSuite,
  version: string,
  blockCount: number,
  part: PartSpec | null,
  state: RunState,
): void {
  writeAtomic(path, checkpointPieces(suite, version, blockCount, part, state, new Date()));
}

/**
 * The checkpoint's JSON text in pieces whose concatenation is JSON.stringify of the checkpoint
 * object (the same bytes): the kept sample's base64 columns (most of the file: ~30 MB at 10^5 paths
 * of a 6-point grid) go out as they are, not copied into one string and scanned for escapes
 * (base64 has no character JSON escapes).
 */
export function checkpointPieces(suite: LoadedSuite, version: string, blockCount: number, part: PartSpec | null, state: RunState, writtenAt: Date): string[] {
  const { kept, min, max, blocks } = runStateToJson(state);
  const head = JSON.stringify({ format: CHECKPOINT_FORMAT, version, suiteHash: suite.hash, seed: suite.seed, paths: suite.paths, blockCount, part, blocks });
  const tail = JSON.stringify({ min, max, writtenAt: writtenAt.toISOString() });
  return [
    `${head.slice(0, -1)},"kept":{"count":${JSON.stringify(kept.count)},"pathIndex":"`, kept.pathIndex, '","hash":"', kept.hash, '","values":"', kept.values,
    `"},${tail.slice(1)}`,
  ];
}

/** Read a checkpoint and refuse it unless it belongs to this suite, seed, version and part. */
export function readCheckpoint(
  path: string,
  suite: LoadedSuite,
  version: string,
  blockCount: number,
  part: PartSpec | null,
): RunState {
  if (!existsSync(path)) throw new CheckpointError(`--resume: no checkpoint at ${path}`);
  let j: CheckpointJson;
  try {
    j = JSON.parse(readFileSync(path, "utf8"));
  } catch (e) {
    throw new CheckpointError(`checkpoint ${path} is corrupted or partial (not valid JSON: ${(e as Error).message}); delete it to start afresh`);
  }
  const refuse = (why: string) => new CheckpointError(`checkpoint ${path} ${why}; refusing to resume (delete it to start afresh)`);
  if (!j || j.format !== CHECKPOINT_FORMAT) throw refuse(`is not a walkhull checkpoint (format ${JSON.stringify(j?.format)})`);
  if (j.version !== version) throw refuse(`was written by walkhull ${j.version}, this is ${version}`);
  if (j.seed !== suite.seed) throw refuse(`is for seed ${j.seed}, this run has seed ${suite.seed}`);
  if (j.suiteHash !== suite.hash) throw refuse(`is for another suite (hash ${String(j.suiteHash).slice(0, 12)}, this suite ${suite.hash.slice(0, 12)})`);
  if (j.blockCount !== blockCount) throw refuse(`has ${j.blockCount} blocks, this run ${blockCount}`);
  const jp = j.part ?? null;
  const samePart = (jp === null && part === null) || (jp && part && jp.index === part.index && jp.count === part.count);
  if (!samePart) throw refuse(`is for part ${jp ? `${jp.index} of ${jp.count}` : "none"}, this run ${part ? `${part.index} of ${part.count}` : "none"}`);
  const dim = recordLayout(suite.n.length).width;
  try {
    const state = runStateFromJson(j, dim, `checkpoint ${path}`);
    const seen = new Set<number>();
    for (const b of state.blocks) {
      if (b.block < 0 || b.block >= blockCount || seen.has(b.block)) throw new Error(`bad or repeated block index ${b.block}`);
      seen.add(b.block);
    }
    return state;
  } catch (e) {
    throw new CheckpointError(`checkpoint ${path} is corrupted or partial (${(e as Error).message}); delete it to start afresh`);
  }
}
