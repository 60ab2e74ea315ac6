// The CLI's contract: --help, exit codes (0 ok, 2 bad input or usage), nothing written on bad input.

import { describe, expect, it } from "vitest";
import { existsSync, mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { cli } from "../cli-runner.js";


const good = {
  title: "cli test",
  seed: 9,
  walks: [{ law: "gaussian", mean: [1, 0], cov: [[1, 0], [0, 1]] }],
  measure: ["perimeter", "vertices"],
  n: [10, 20],
  paths: 640,
};

function suiteFile(over: object | string): { dir: string; file: string } {
  const dir = mkdtempSync(join(tmpdir(), "walkhull-cli-"));
  const file = join(dir, "suite.json");
  writeFileSync(file, typeof over === "string" ? over : JSON.stringify({ ...good, ...over }));
  return { dir, file };
}

describe("walkhull CLI", () => {
  it("prints help with exit 0 and names the commands", () => {
    const r = cli(["--help"]);
    expect(r.status).toBe(0);
    expect(r.stdout).toMatch(/walkhull run <suite\.json>/);
    expect(r.stdout).toMatch(/Exit codes: 0 ok \(nothing failed and every claim of the suite decided\), 1 a check failed,\n2 bad input or usage, 3 nothing failed but a claim is undecided/);
  });

  it("runs a suite: a table on stdout and a JSON report with the contract fields", () => {
    const { dir, file } = suiteFile({});
    const out = join(dir, "r.json");
    const r = cli(["run", file, "--out", out, "--quiet", "--workers", "1"]);
    expect([0, 1]).toContain(r.status);
    expect(r.stdout).toMatch(/perimeter\s+10\s+640/);
    const rep = JSON.parse(readFileSync(out, "utf8"));
    expect(rep.results).toHaveLength(4);
    for (const k of ["measure", "n", "paths", "mean", "meanSE", "variance", "varianceSE", "skewness", "excessKurtosis"]) {
      expect(rep.results[0]).toHaveProperty(k);
    }
    expect(rep.seed).toBe(9);
    expect(rep.version).toMatch(/^\d+\.\d+\.\d+/);
    expect(rep.timing.wallSeconds).toBeGreaterThan(0);
    expect(rep.blocks).toHaveLength(64); // default block count (64) for 640 paths
  });

  it("--paths and --seed override the suite", () => {
    const { dir, file } = suiteFile({});
    const out = join(dir, "r.json");
    expect(cli(["run", file, "--paths", "100", "--seed", "3", "--no-checks", "--quiet", "--out", out]).status).toBe(0);
    const rep = JSON.parse(readFileSync(out, "utf8"));
    expect(rep.results[0].paths).toBe(100);
    expect(rep.seed).toBe(3);
  });

  const bad: [string, object | string, RegExp][] = [
    ["malformed JSON", "{ nope", /not valid JSON/],
    ["unknown law", { walks: [{ law: "cauchy" }] }, /walks\[0\]\.law: unknown law/],
    ["non-PSD covariance", { walks: [{ law: "gaussian", mean: [0, 0], cov: [[1, 2], [2, 1]] }] }, /walks\[0\]\.cov: not positive semi-definite/],
    ["weights not summing to 1", { walks: [{ law: "discrete", atoms: [[1, 0]], weights: [0.9] }] }, /walks\[0\]\.weights: must sum to 1/],
    ["dof <= 2", { walks: [{ law: "student", mean: [0, 0], scale: [[1, 0], [0, 1]], dof: 1.5 }] }, /walks\[0\]\.dof: must be > 2/],
    ["n not increasing", { n: [20, 10] }, /n\[1\]: must be larger/],
    ["paths <= 0", { paths: -5 }, /paths: must be >= 32/],
    ["one path (used to end in an internal error, exit 70)", { paths: 1 }, /^walkhull: paths: must be >= 32 \(got 1\)/],
    ["absurd sizes", { n: [10, 500000000] }, /n: largest n = 500000000 .*GiB per worker/],
  ];
  for (const [name, suite, pattern] of bad) {
    it(`bad input (${name}): exit 2, a message naming the field, nothing written`, () => {
      const { dir, file } = suiteFile(suite);
      const out = join(dir, "r.json");
      const r = cli(["run", file, "--out", out]);
      expect(r.status).toBe(2);
      expect(r.stderr).toMatch(pattern);
      expect(existsSync(out)).toBe(false);
    });
  }

  it("predict and plan reach the same clear errors as run (exit 2, same message)", () => {
    for (const [, suite, pattern] of bad) {
      const { file } = suiteFile(suite);
      const run = cli(["run", file]);
      expect(run.stderr).toMatch(pattern);
      for (const args of [["predict", file], ["predict", file, "--json"], ["plan", file, "--target-se", "0.1"]]) {
        const r = cli(args);
        expect(r.status, args.join(" ")).toBe(2);
        expect(r.stderr).toBe(run.stderr);
      }
    }
  });

  it("one n and two circle-step walks: the law checks run (no internal error on a single-n grid)", () => {
    // Regression: the non-normal law check read the skewness-persistence test, which needs two n.
    const { dir, file } = suiteFile({
      walks: [{ law: "circle", mean: [1, 0], radius: 1 }, { law: "circle", mean: [0, 1], radius: 1 }],
      measure: ["perimeter", "diameter", "area", "vertices"],
      n: [100],
      paths: 256,
    });
    const out = join(dir, "r.json");
    const r = cli(["run", file, "--out", out, "--quiet", "--workers", "1"]);
    expect(r.stderr).not.toMatch(/internal error/);
    expect([0, 1]).toContain(r.status);
    const rep = JSON.parse(readFileSync(out, "utf8"));
    const law = rep.checks.find((c: { id: string }) => c.id === "area.limitLaw.prediction");
    expect(law.expected).toBe("non-normal");
    expect(law.detail).toMatch(/skewness trend not assessable with one n/);
  });

  it("usage errors exit 2", () => {
    expect(cli(["frobnicate"]).status).toBe(2);
    expect(cli(["run"]).status).toBe(2);
    const { file } = suiteFile({});
    const r = cli(["run", file, "--workers", "two"]);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/--workers: expected a non-negative integer/);
    expect(cli(["run", file, "--bogus"]).status).toBe(2);
  });
});
