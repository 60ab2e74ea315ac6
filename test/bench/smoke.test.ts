// The bench in smoke mode: it runs, prints its tables and writes valid JSON. No timing assertions.
import { spawnSync } from "node:child_process";
import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";

const ROOT = new URL("../../", import.meta.url).pathname;
const hasGcc = spawnSync("gcc", ["--version"]).status === 0;

describe("bench --smoke", () => {
  it("prints the tables and writes valid JSON; the native build reproduces WASM bit for bit", () => {
    const dir = mkdtempSync(join(tmpdir(), "walkhull-bench-test-"));
    try {
      const file = join(dir, "bench.json");
      const r = spawnSync(process.execPath, ["--import", "tsx", "bench/pipeline.ts", "--smoke", "--json", file], { cwd: ROOT, encoding: "utf8" });
      expect(r.stderr).toBe("");
      expect(r.status).toBe(0);
      for (const heading of ["| walks | n | WASM | TS twin | native C | numpy+scipy |", "WASM stages", "Draws, ns per draw", "Parallel:", "Targets"]) {
        expect(r.stdout).toContain(heading);
      }
      const j = JSON.parse(readFileSync(file, "utf8"));
      expect(j.env.smoke).toBe(true);
      expect(j.pipeline).toHaveLength(4); // k in {1, 2} x n in {100, 1000}
      for (const row of j.pipeline) {
        expect(row.wasm).toBeGreaterThan(0);
        expect(row.twin).toBeGreaterThan(0);
        expect(row.survival).toBeGreaterThan(0);
        expect(row.survival).toBeLessThanOrEqual(1);
      }
      expect(j.stages).toHaveLength(4);
      expect(j.draws.map((d: { what: string }) => d.what)).toContain("step law: student (dof 5)");
      expect(j.parallel.runs.map((p: { workers: number }) => p.workers)).toEqual([1, 2]);
      expect(r.stdout).toContain("Checks' share of a run");
      for (const kind of ["noChecks", "cold", "warm"]) expect(j.checksShare[kind]).toBeGreaterThan(0);
      expect(j.checksShare.coldRatio).toBeCloseTo(j.checksShare.cold / j.checksShare.noChecks, 12);
      // One round in the smoke run: its own ratios are the medians' ratios.
      expect(j.checksShare.warmRatioRounds).toHaveLength(1);
      expect(j.checksShare.warmRatioRounds[0]).toBeCloseTo(j.checksShare.warmRatio, 12);
      expect(j.checksShare.coldRatioRounds[0]).toBeCloseTo(j.checksShare.coldRatio, 12);
      expect(j.targets.length).toBeGreaterThanOrEqual(6);
      // The efficiency is the median of per-round ratios t1 / (2 t2) (one round in --smoke).
      const round = j.parallel.nativeRounds[0] as { twoWorkers: number; twoWorkersNewThreads: number; oneWorker: number };
      expect(j.parallel.efficiencyRounds).toHaveLength(1);
      expect(j.parallel.efficiency).toBeCloseTo(round.oneWorker / (2 * round.twoWorkers), 12);
      expect(j.parallel.freshEfficiency).toBeCloseTo(round.oneWorker / (2 * round.twoWorkersNewThreads), 12);
      if (hasGcc) {
        expect(j.nativeCheck.compared).toBeGreaterThan(0);
        expect(j.nativeCheck.identical).toBe(true);
        expect(j.pipeline.every((row: { native: number | null }) => row.native !== null && row.native > 0)).toBe(true);
        // The 2-worker / native ratio is the median of per-round ratios (one round in --smoke).
        const rounds = j.parallel.nativeRounds as { twoWorkers: number; native: number }[];
        expect(rounds.length).toBeGreaterThanOrEqual(1);
        expect(j.parallel.twoWorkersOverNative).toBeCloseTo(rounds[0].twoWorkers / rounds[0].native, 12);
      } else {
        expect(j.nativeNote).toMatch(/gcc/);
      }
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  }, 180_000);
});
