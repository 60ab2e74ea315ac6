// Reproducibility under scale: worker counts, parts (--part K --parts N + combine), checkpoints, signals, failed workers.
// These run the compiled CLI (dist/cli.js, built by `npm test`) and the library.

import { describe, expect, it } from "vitest";
import { spawn, spawnSync } from "node:child_process";
import { existsSync, mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { validateSuite } from "../../src/suite/load.js";
import { recordLayout } from "../../src/engine/types.js";
import { runSuite } from "../../src/run/run.js";
import { prestartWorkers, releaseEarly } from "../../src/run/prestart.js";

const ROOT = new URL("../../", import.meta.url).pathname;
const CLI = join(ROOT, "dist/cli.js");

const suiteJson = {
  title: "scale test: two drifting walks",
  seed: 31337,
  walks: [
    { law: "gaussian", mean: [1, 0], cov: [[1, 0.2], [0.2, 0.5]] },
    { law: "discrete", atoms: [[1, 0], [0, 1], [-1, 0], [0, -1]], weights: [0.1, 0.5, 0.2, 0.2] },
  ],
  measure: ["perimeter", "diameter", "area", "vertices"],
  n: [10, 40, 160],
  paths: 3200,
  blocks: 32,
};

function tmp(): string {
  return mkdtempSync(join(tmpdir(), "walkhull-scale-"));
}
function writeSuite(dir: string, over: object = {}): string {
  const f = join(dir, "suite.json");
  writeFileSync(f, JSON.stringify({ ...suiteJson, ...over }));
  return f;
}
function cli(args: string[]) {
  return spawnSync("node", [CLI, ...args], { encoding: "utf8", timeout: 120_000 });
}
function statsOf(file: string) {
  const r = JSON.parse(readFileSync(file, "utf8"));
  return { results: r.results, blocks: r.blocks, covariance: r.covariance, checks: r.checks?.map((c: any) => ({ ...c })) };
}

describe("same bits whatever the worker count", () => {
  it("1, 2 and 3 workers give identical block statistics, results and kept samples", async () => {
    const suite = validateSuite(suiteJson);
    const runs = [];
    for (const workers of [1, 2, 3]) {
      const o = await runSuite(suite, { workers, checkpoint: null, log: () => {} });
      expect(o.status).toBe("done");
      if (o.status === "done") runs.push(o.sim);
    }
    for (const r of runs.slice(1)) {
      expect(r.results).toEqual(runs[0].results);
      expect(r.blocks).toEqual(runs[0].blocks);
      expect(r.sample.pathIndex).toEqual(runs[0].sample.pathIndex);
      expect(r.sample.values).toEqual(runs[0].sample.values);
    }
  });

  it("workers started early (before the suite, as `walkhull run` does) give the same bits; unused ones are ended", async () => {
    const suite = validateSuite(suiteJson);
    const plain = await runSuite(suite, { workers: 2, checkpoint: null, log: () => {} });
    const early = prestartWorkers(["run", "suite.json", "--workers", "3"]);
    expect(early?.workers).toHaveLength(3);
    expect(prestartWorkers(["run", "suite.json", "--workers", "1"])).toBeNull();
    expect(prestartWorkers(["predict", "suite.json"])).toBeNull();
    const o = await runSuite(suite, { workers: 2, checkpoint: null, log: () => {}, early });
    expect(early!.workers).toHaveLength(1); // two taken by the pool
    releaseEarly(early);
    expect(early!.workers).toHaveLength(0);
    expect(o.status).toBe("done");
    if (o.status === "done" && plain.status === "done") {
      expect(o.sim.results).toEqual(plain.sim.results);
      expect(o.sim.blocks).toEqual(plain.sim.blocks);
      expect(o.sim.sample.values).toEqual(plain.sim.sample.values);
    }
  });

  it("a worker that fails is reported and its block re-run: same bits", async () => {
    const suite = validateSuite(suiteJson);
    const warnings: string[] = [];
    const a = await runSuite(suite, { workers: 2, checkpoint: null, log: () => {}, failOnceAtBlock: 5, onWarning: (m) => warnings.push(m) });
    const b = await runSuite(suite, { workers: 1, checkpoint: null, log: () => {} });
    expect(warnings.join("\n")).toMatch(/worker failed on block 5 .*re-running/);
    expect(a.status === "done" && b.status === "done").toBe(true);
    if (a.status === "done" && b.status === "done") expect(a.sim.results).toEqual(b.sim.results);
  });
});

/** A fresh folder with the suite, run whole on `workers` workers into `out` there (exit 0). */
function wholeRun(out: string, workers: number): { d: string; suite: string } {
  const d = tmp();
  const suite = writeSuite(d);
  const r = cli(["run", suite, "--workers", String(workers), "--quiet", "--out", join(d, out)]);
  expect(r.status, r.stderr).toBe(0);
  return { d, suite };
}

describe("parts and combine", () => {
  it("parts 0, 1, 2 of 3 combined give the bits of one run; combine refuses duplicates, gaps and bad part options", () => {
    const { d, suite } = wholeRun("one.json", 1);
    for (const i of [0, 1, 2]) {
      const r = cli(["run", suite, "--part", String(i), "--parts", "3", "--workers", "1", "--quiet", "--out", join(d, `s${i}.json`)]);
      expect(r.status, r.stderr).toBe(0);
    }
    const m = cli(["combine", join(d, "s2.json"), join(d, "s0.json"), join(d, "s1.json"), "--out", join(d, "merged.json")]);
    expect(m.status, m.stderr).toBe(0);
    expect(statsOf(join(d, "merged.json"))).toEqual(statsOf(join(d, "one.json")));

    const dup = cli(["combine", join(d, "s0.json"), join(d, "s0.json"), join(d, "s1.json"), "--out", join(d, "x.json")]);
    expect(dup.status).toBe(2);
    expect(dup.stderr).toMatch(/part 0 of 3 given twice/);
    const gap = cli(["combine", join(d, "s0.json"), join(d, "s2.json"), "--out", join(d, "x.json")]);
    expect(gap.status).toBe(2);
    expect(gap.stderr).toMatch(/missing part\(s\) 1 of 3/);
    expect(existsSync(join(d, "x.json"))).toBe(false);

    const other = writeSuite(tmp(), { seed: 1 });
    const o = cli(["run", other, "--part", "1", "--parts", "3", "--quiet", "--out", join(d, "other1.json")]);
    expect(o.status).toBe(0);
    const mix = cli(["combine", join(d, "s0.json"), join(d, "other1.json"), join(d, "s2.json"), "--out", join(d, "x.json")]);
    expect(mix.status).toBe(2);
    expect(mix.stderr).toMatch(/other1\.json does not match .*s0\.json: suite hash/);

    const bad: [string[], RegExp][] = [
      [["--part", "3", "--parts", "3"], /^walkhull: --part: need 0 <= K < N \(got --part 3 --parts 3\)/],
      [["--part", "1"], /^walkhull: --part: give the number of parts with --parts N/],
      [["--parts", "2"], /^walkhull: --parts: give this run's part with --part K/],
      [["--part", "-1", "--parts", "2"], /--part/],
      [["--parts", "0", "--part", "0"], /^walkhull: --parts: must be >= 1/],
    ];
    for (const [args, pattern] of bad) {
      const r = cli(["run", suite, ...args, "--quiet", "--out", join(d, "y.json")]);
      expect(r.status, args.join(" ")).toBe(2);
      expect(r.stderr).toMatch(pattern);
      expect(existsSync(join(d, "y.json"))).toBe(false);
    }
    const notPart = cli(["combine", join(d, "one.json"), "--out", join(d, "x.json")]);
    expect(notPart.status).toBe(2);
    expect(notPart.stderr).toMatch(/one\.json: not a walkhull part result/);
    expect(cli(["merge", join(d, "s0.json"), "--out", join(d, "x.json")]).status).toBe(2);
  });
});

describe("checkpoints", () => {
  it("a deterministic stop then --resume ends with the bits of an uninterrupted run", () => {
    const { d, suite } = wholeRun("full.json", 2);
    const ck = join(d, "ck.json");
    const stop = cli(["run", suite, "--workers", "1", "--quiet", "--checkpoint", ck, "--stop-after-blocks", "11", "--out", join(d, "r.json")]);
    expect(stop.status, stop.stderr).toBe(75);
    expect(existsSync(ck)).toBe(true);
    expect(existsSync(join(d, "r.json"))).toBe(false);
    const res = cli(["run", suite, "--workers", "2", "--quiet", "--checkpoint", ck, "--resume", "--out", join(d, "r.json")]);
    expect(res.status, res.stderr).toBe(0);
    expect(statsOf(join(d, "r.json"))).toEqual(statsOf(join(d, "full.json")));
    expect(existsSync(ck)).toBe(false);
  });

  it("refuses corrupted, partial and foreign checkpoints clearly", () => {
    const d = tmp();
    const suite = writeSuite(d);
    const ck = join(d, "ck.json");
    writeFileSync(ck, '{"format":"walkhull-checkpoint/1","version":');
    let r = cli(["run", suite, "--quiet", "--checkpoint", ck, "--resume", "--out", join(d, "r.json")]);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/checkpoint .* is corrupted or partial/);

    const stop = cli(["run", suite, "--workers", "1", "--quiet", "--checkpoint", ck, "--stop-after-blocks", "3"]);
    expect(stop.status).toBe(75);
    const good = JSON.parse(readFileSync(ck, "utf8"));
    writeFileSync(ck, JSON.stringify({ ...good, blocks: good.blocks.map((b: any) => ({ ...b, moments: b.moments.slice(1) })) }));
    r = cli(["run", suite, "--quiet", "--checkpoint", ck, "--resume"]);
    expect(r.status).toBe(2);
    const width = recordLayout(suiteJson.n.length).width; // numbers per path: one moment record each
    expect(r.stderr).toMatch(new RegExp(`corrupted or partial \\(block \\d+ has ${width - 1} moment records, expected ${width}\\)`));

    writeFileSync(ck, JSON.stringify(good));
    r = cli(["run", suite, "--quiet", "--checkpoint", ck, "--resume", "--seed", "5"]);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/is for seed 31337, this run has seed 5; refusing to resume/);
    writeFileSync(ck, JSON.stringify({ ...good, version: "0.0.0" }));
    r = cli(["run", suite, "--quiet", "--checkpoint", ck, "--resume"]);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/written by walkhull 0\.0\.0/);
    expect(existsSync(join(d, "r.json"))).toBe(false);
  });

  it("a real SIGTERM writes a checkpoint, exits 143, and resuming gives the same bits", async () => {
    const d = tmp();
    const suite = writeSuite(d, { n: [100, 1000, 4000], paths: 64000, blocks: 64 });
    const ck = join(d, "ck.json");
    const child = spawn("node", [CLI, "run", suite, "--workers", "1", "--quiet", "--checkpoint", ck, "--out", join(d, "r.json")]);
    let stderr = "";
    child.stderr.on("data", (b) => (stderr += b));
    // Wait for the run to be under way (the first periodic checkpoint is not needed: SIGTERM writes one).
    await new Promise((r) => setTimeout(r, 1500));
    child.kill("SIGTERM");
    const code = await new Promise<number | null>((r) => child.on("exit", (c) => r(c)));
    expect(code, stderr).toBe(143);
    expect(stderr).toMatch(/stopped \(SIGTERM\)/);
    expect(existsSync(ck)).toBe(true);
    const done = JSON.parse(readFileSync(ck, "utf8")).blocks.length;
    expect(done).toBeLessThan(64);
    const res = cli(["run", suite, "--workers", "2", "--quiet", "--checkpoint", ck, "--resume", "--out", join(d, "r.json")]);
    expect(res.status, res.stderr).toBe(0);
    const full = cli(["run", suite, "--workers", "2", "--quiet", "--out", join(d, "full.json")]);
    expect(full.status).toBe(0);
    expect(statsOf(join(d, "r.json"))).toEqual(statsOf(join(d, "full.json")));
  });
});
