// Checkpoint writing: the pieces written one after another are the bytes of JSON.stringify of the
// checkpoint object, and a snapshot that keeps every candidate in arrival order (no hash-order
// merge) resumes to the bits of an uninterrupted run.

import { describe, expect, it } from "vitest";
import { mkdtempSync, readdirSync, readFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { validateSuite } from "../../src/suite/load.js";
import { checkpointDue, runSuite } from "../../src/run/run.js";
import { CHECKPOINT_FORMAT, checkpointPieces, readCheckpoint, writeCheckpoint } from "../../src/run/checkpoint.js";
import { runStateToJson } from "../../src/run/state.js";
import { mergeKept } from "../../src/run/blocks.js";
import { writeAtomic } from "../../src/io/write-atomic.js";
import { recordLayout } from "../../src/engine/types.js";

const suite = validateSuite({
  title: "checkpoint test: two drifting walks",
  seed: 2718,
  walks: [
    { law: "gaussian", mean: [0.5, 0], cov: [[1, 0.3], [0.3, 0.8]] },
    { law: "discrete", atoms: [[1, 0], [0, 1], [-1, 0], [0, -1]], weights: [0.4, 0.3, 0.2, 0.1] },
  ],
  measure: ["perimeter", "area", "vertices"],
  n: [8, 30, 90],
  paths: 1600,
  blocks: 32,
});
const dim = recordLayout(suite.n.length).width;
const quiet = { workers: 1, log: () => {} };

describe("checkpoints", () => {
  it("the written pieces join to JSON.stringify of the checkpoint object, and read back to the snapshot", async () => {
    const dir = mkdtempSync(join(tmpdir(), "walkhull-ckpt-"));
    const out = await runSuite(suite, { ...quiet, checkpoint: null });
    if (out.status !== "done") throw new Error("run stopped");
    const state = out.collector.snapshot();
    const at = new Date(Date.UTC(2026, 0, 2, 3, 4, 5));
    const part = { index: 1, count: 3 };
    const object = { format: CHECKPOINT_FORMAT, version: "9.9.9", suiteHash: suite.hash, seed: suite.seed, paths: suite.paths, blockCount: 32, part, ...runStateToJson(state), writtenAt: at.toISOString() };
    const pieces = checkpointPieces(suite, "9.9.9", 32, part, state, at);
    expect(pieces.length).toBeGreaterThan(1);
    expect(pieces.join("")).toBe(JSON.stringify(object));
    const file = join(dir, "c.json");
    writeCheckpoint(file, suite, "9.9.9", 32, null, state);
    expect(JSON.parse(readFileSync(file, "utf8")).kept).toEqual(object.kept);
    expect(readCheckpoint(file, suite, "9.9.9", 32, null)).toEqual(state);
  });

  it("a snapshot of every candidate in arrival order holds the rows the hash-order merge holds", async () => {
    const out = await runSuite(suite, { ...quiet, checkpoint: null });
    if (out.status !== "done") throw new Error("run stopped");
    const kept = out.collector.snapshot().kept;
    expect(kept.pathIndex.length).toBe(suite.paths);
    // The same rows: merged (hash order, the old snapshot) from the arrival-order set.
    const merged = mergeKept([kept], dim);
    const rows = (k: typeof kept) => Array.from(k.pathIndex, (p, r) => [p, k.hash[r], ...k.values.slice(r * dim, (r + 1) * dim)]).sort((a, b) => a[0] - b[0]);
    expect(rows(kept)).toEqual(rows(merged));
  });

  it("stopped after 5 blocks with a checkpoint and resumed on 2 workers: the bits of an uninterrupted run", async () => {
    const dir = mkdtempSync(join(tmpdir(), "walkhull-ckpt-"));
    const file = join(dir, "run.ckpt");
    const whole = await runSuite(suite, { ...quiet, checkpoint: null });
    const stopped = await runSuite(suite, { ...quiet, checkpoint: file, stopAfterBlocks: 5 });
    expect(stopped.status).toBe("stopped");
    const state = readCheckpoint(file, suite, (await import("../../src/version.js")).toolVersion(), 32, null);
    expect(state.blocks.length).toBe(5);
    const resumed = await runSuite(suite, { workers: 2, log: () => {}, checkpoint: file, resume: true });
    if (whole.status !== "done" || resumed.status !== "done") throw new Error("run stopped");
    expect(resumed.sim.sample).toEqual(whole.sim.sample);
    expect(resumed.sim.results).toEqual(whole.sim.results);
    expect(resumed.sim.blocks).toEqual(whole.sim.blocks);
  });
});

describe("when a periodic checkpoint is due", () => {
  it("every few seconds, at most ~2% of the time, never once every block is merged", () => {
    expect(checkpointDue(3, 10, 5000, 5000, 0)).toBe(true);
    expect(checkpointDue(3, 10, 4999, 5000, 0)).toBe(false);
    // A save that cost 200 ms waits 10 s for the next.
    expect(checkpointDue(3, 10, 9999, 5000, 200)).toBe(false);
    expect(checkpointDue(3, 10, 10_000, 5000, 200)).toBe(true);
    // The last block merged: the run is complete, no save.
    expect(checkpointDue(10, 10, 60_000, 5000, 0)).toBe(false);
    expect(checkpointDue(9, 10, 60_000, 5000, 0)).toBe(true);
  });
});

describe("writeAtomic in pieces", () => {
  it("the file holds the pieces' concatenation (UTF-8), no temp file is left", () => {
    const dir = mkdtempSync(join(tmpdir(), "walkhull-atomic-"));
    const file = join(dir, "sub", "x.json");
    const pieces = ['{"a":"', "x".repeat(70_000), "é→", '"}'];
    writeAtomic(file, pieces);
    expect(readFileSync(file, "utf8")).toBe(pieces.join(""));
    writeAtomic(file, "plain");
    expect(readFileSync(file, "utf8")).toBe("plain");
    expect(readdirSync(join(dir, "sub"))).toEqual(["x.json"]);
  });
});
