// Serialisation of partial run state (checkpoints and part files): exact round trips.
// Doubles survive JSON exactly (shortest round-trip form); the large kept-sample columns are
// stored as base64 of their IEEE-754 bytes to stay compact.

import type { CoMomentState, MomentState } from "../stats/types.js";
import type { KeptCandidates } from "./blocks.js";
import type { BlockStats } from "./types.js";

export interface BlockStatsJson {
  block: number;
  firstPath: number;
  paths: number;
  moments: MomentState[];
  comoments: CoMomentsJson;
  controlComoments: CoMomentsJson[];
}

interface CoMomentsJson {
  count: number;
  dim: number;
  mean: number[];
  c: number[];
}

const coMomentsToJson = (s: CoMomentState): CoMomentsJson => ({ count: s.count, dim: s.dim, mean: Array.from(s.mean), c: Array.from(s.c) });

function coMomentsFromJson(c: CoMomentsJson | undefined, what: string): CoMomentState {
  if (!c || !Number.isInteger(c.count) || !Number.isInteger(c.dim) || !Array.isArray(c.mean) || !Array.isArray(c.c) || c.c.length !== c.dim * c.dim || c.mean.length !== c.dim) {
    throw new Error(`malformed ${what}`);
  }
  return { count: c.count, dim: c.dim, mean: Float64Array.from(c.mean), c: Float64Array.from(c.c) };
}

export interface KeptJson {
  count: number;
  pathIndex: string;
  hash: string;
  values: string;
}

export function blockToJson(b: BlockStats): BlockStatsJson {
  return {
    block: b.block,
    firstPath: b.firstPath,
    paths: b.paths,
    moments: b.moments.map((m) => ({ count: m.count, mean: m.mean, m2: m.m2, m3: m.m3, m4: m.m4 })),
    comoments: coMomentsToJson(b.comoments),
    controlComoments: b.controlComoments.map(coMomentsToJson),
  };
}

export function blockFromJson(j: BlockStatsJson, where: string): BlockStats {
  const bad = (what: string) => new Error(`${where}: ${what}`);
  if (!j || typeof j !== "object") throw bad("block record is not an object");
  for (const k of ["block", "firstPath", "paths"] as const) {
    if (!Number.isInteger(j[k])) throw bad(`block record lacks an integer \`${k}\``);
  }
  if (!Array.isArray(j.moments)) throw bad(`block ${j.block} lacks its moments`);
  const moments = j.moments.map((m) => {
    for (const k of ["count", "mean", "m2", "m3", "m4"] as const) {
      if (typeof m?.[k] !== "number") throw bad(`block ${j.block}: a moment record lacks \`${k}\``);
    }
    return { count: m.count, mean: m.mean, m2: m.m2, m3: m.m3, m4: m.m4 };
  });
  let comoments: CoMomentState;
  let controlComoments: CoMomentState[];
  try {
    comoments = coMomentsFromJson(j.comoments, "co-moments");
    if (!Array.isArray(j.controlComoments)) throw new Error("lacks its control co-moments");
    controlComoments = j.controlComoments.map((c) => coMomentsFromJson(c, "control co-moments"));
  } catch (e) {
    throw bad(`block ${j.block}: ${(e as Error).message}`);
  }
  return { block: j.block, firstPath: j.firstPath, paths: j.paths, moments, comoments, controlComoments };
}

function f64ToB64(a: Float64Array): string {
  return Buffer.from(a.buffer, a.byteOffset, a.byteLength).toString("base64");
}
function b64ToF64(s: string, where: string): Float64Array {
  const buf = Buffer.from(s, "base64");
  if (buf.length % 8 !== 0) throw new Error(`${where}: kept-sample column has a truncated length`);
  const copy = new Uint8Array(buf.length);
  copy.set(buf);
  return new Float64Array(copy.buffer);
}

export function keptToJson(k: KeptCandidates): KeptJson {
  return { count: k.pathIndex.length, pathIndex: f64ToB64(k.pathIndex), hash: f64ToB64(k.hash), values: f64ToB64(k.values) };
}

export function keptFromJson(j: KeptJson, dim: number, where: string): KeptCandidates {
  if (!j || typeof j.pathIndex !== "string" || typeof j.hash !== "string" || typeof j.values !== "string") {
    throw new Error(`${where}: kept sample missing or malformed`);
  }
  const k = { pathIndex: b64ToF64(j.pathIndex, where), hash: b64ToF64(j.hash, where), values: b64ToF64(j.values, where) };
  if (k.pathIndex.length !== j.count || k.hash.length !== j.count || k.values.length !== j.count * dim) {
    throw new Error(`${where}: kept sample sizes do not match (${j.count} records of ${dim} values expected)`);
  }
  return k;
}

/** What a checkpoint or a part file holds of a run: its blocks, kept candidates and extremes. */
export interface RunState {
  blocks: BlockStats[];
  kept: KeptCandidates;
  min: number[];
  max: number[];
}

export interface RunStateJson {
  blocks: BlockStatsJson[];
  kept: KeptJson;
  /** Extremes per number of the kernel record; null stands for an infinite (empty) extreme. */
  min: (number | null)[];
  max: (number | null)[];
}

export function runStateToJson(s: RunState): RunStateJson {
  return {
    blocks: s.blocks.map(blockToJson),
    kept: keptToJson(s.kept),
    min: s.min.map((x) => (Number.isFinite(x) ? x : null)),
    max: s.max.map((x) => (Number.isFinite(x) ? x : null)),
  };
}

/** Read a run state of `dim` values per path; errors say what is missing or malformed. */
export function runStateFromJson(j: RunStateJson, dim: number, where: string): RunState {
  if (!Array.isArray(j.blocks) || !Array.isArray(j.min) || !Array.isArray(j.max) || j.min.length !== dim || j.max.length !== dim) {
    throw new Error("missing blocks or extremes");
  }
  const blocks = j.blocks.map((b) => blockFromJson(b, where));
  for (const b of blocks) {
    if (b.moments.length !== dim) throw new Error(`block ${b.block} has ${b.moments.length} moment records, expected ${dim}`);
    if (!b.controlComoments.every((c) => c.dim === b.controlComoments[0].dim)) throw new Error(`block ${b.block} has control co-moment records of different sizes`);
  }
  return {
    blocks,
    kept: keptFromJson(j.kept, dim, where),
    min: j.min.map((x) => (x === null ? Infinity : x)),
    max: j.max.map((x) => (x === null ? -Infinity : x)),
  };
}
