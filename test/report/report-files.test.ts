// The report options of the CLI (built dist/cli.js, as `npm test` builds first): run and combine
// with --report DIR, --junit FILE, --samples FILE; walkhull diff with its exit codes.

import { describe, expect, it } from "vitest";
import { existsSync, mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { cli as runCli } from "../cli-runner.js";
import { validateJunit } from "./junit-structure.js";

const cli = (args: string[]) => runCli(args, 180_000);

const SUITE = {
  title: "cli report test",
  seed: 31,
  walks: [{ law: "gaussian", mean: [1, 0], cov: [[1, 0], [0, 1]] }],
  measure: ["perimeter", "diameter"],
  n: [10, 20, 40],
  paths: 1280,
};

function setup(over: object = {}): { dir: string; suite: string } {
  const dir = mkdtempSync(join(tmpdir(), "walkhull-report-cli-"));
  const suite = join(dir, "suite.json");
  writeFileSync(suite, JSON.stringify({ ...SUITE, ...over }));
  return { dir, suite };
}

describe("walkhull run/combine --report --junit --samples", () => {
  it("run writes report.json (same as --out), report.md, report.html, the JUnit file and the samples CSV", () => {
    const { dir, suite } = setup();
    const rep = join(dir, "rep");
    const r = cli(["run", suite, "--quiet", "--workers", "1", "--out", join(dir, "out.json"), "--report", rep, "--junit", join(dir, "j.xml"), "--samples", join(dir, "s.csv")]);
    expect(r.stderr).not.toMatch(/internal error/);
    expect([0, 1]).toContain(r.status);
    const json = JSON.parse(readFileSync(join(rep, "report.json"), "utf8"));
    expect(readFileSync(join(rep, "report.json"), "utf8")).toBe(readFileSync(join(dir, "out.json"), "utf8"));
    expect(json.exitCode).toBe(r.status);
    expect(readFileSync(join(rep, "report.md"), "utf8")).toMatch(/not a proof/);
    const html = readFileSync(join(rep, "report.html"), "utf8");
    expect(html.match(/data-plot="variance-ratio"/g)).toHaveLength(2);
    expect(html).toMatch(/data-plot="hull"/);
    const info = validateJunit(readFileSync(join(dir, "j.xml"), "utf8"));
    expect(info.tests).toBe(json.checks.length);
    expect(info.failures).toBe(json.checks.filter((c: { verdict: string }) => c.verdict === "fail").length);
    const csv = readFileSync(join(dir, "s.csv"), "utf8").trimEnd().split("\n");
    expect(csv[0]).toBe("path,perimeter@10,perimeter@20,perimeter@40,diameter@10,diameter@20,diameter@40");
    expect(csv).toHaveLength(1 + 1280);
    expect(r.stdout).toMatch(/report files: /);
  });

  it("bad output paths exit 2 before any work and write nothing", () => {
    const { dir, suite } = setup();
    writeFileSync(join(dir, "afile"), "x");
    const r = cli(["run", suite, "--quiet", "--report", join(dir, "afile"), "--junit", join(dir, "j.xml")]);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/--report: .* is not a directory/);
    expect(existsSync(join(dir, "j.xml"))).toBe(false);
    const s = cli(["run", suite, "--quiet", "--part", "0", "--parts", "2", "--out", join(dir, "s0.json"), "--report", join(dir, "r")]);
    expect(s.status).toBe(2);
    expect(existsSync(join(dir, "s0.json"))).toBe(false);
  });

  it("combine of two parts accepts --report and --junit", () => {
    const { dir, suite } = setup();
    for (const i of [0, 1]) expect(cli(["run", suite, "--quiet", "--workers", "1", "--part", String(i), "--parts", "2", "--out", join(dir, `s${i}.json`)]).status).toBe(0);
    const m = cli(["combine", join(dir, "s0.json"), join(dir, "s1.json"), "--report", join(dir, "m"), "--junit", join(dir, "m.xml"), "--samples", join(dir, "m.csv")]);
    expect([0, 1]).toContain(m.status);
    expect(existsSync(join(dir, "m", "report.html"))).toBe(true);
    expect(validateJunit(readFileSync(join(dir, "m.xml"), "utf8")).tests).toBeGreaterThan(0);
    expect(readFileSync(join(dir, "m.csv"), "utf8").trimEnd().split("\n")).toHaveLength(1 + 1280);
  });
});

describe("walkhull diff", () => {
  it("re-run with another seed: exit 0; identical re-run: exact mode, exit 0; a planted change: exit 1", () => {
    const { dir, suite } = setup();
    const a = join(dir, "a.json");
    const b = join(dir, "b.json");
    const c = join(dir, "c.json");
    expect([0, 1]).toContain(cli(["run", suite, "--quiet", "--workers", "1", "--out", a]).status);
    expect([0, 1]).toContain(cli(["run", suite, "--quiet", "--workers", "1", "--seed", "32", "--out", b]).status);
    expect([0, 1]).toContain(cli(["run", suite, "--quiet", "--workers", "2", "--out", c]).status);
    const d1 = cli(["diff", a, b, "--junit", join(dir, "d.xml")]);
    expect(d1.stdout).toMatch(/Mode: statistical/);
    expect(d1.stdout).toMatch(/No significant change/);
    expect(d1.status).toBe(0);
    expect(validateJunit(readFileSync(join(dir, "d.xml"), "utf8"))).toMatchObject({ tests: 12, failures: 0 });
    const d2 = cli(["diff", a, c]);
    expect(d2.stdout).toMatch(/Mode: exact/);
    expect(d2.status).toBe(0);
    const planted = JSON.parse(readFileSync(c, "utf8"));
    planted.results[2].variance *= 1.5;
    writeFileSync(join(dir, "p.json"), JSON.stringify(planted));
    const d3 = cli(["diff", a, join(dir, "p.json")]);
    expect(d3.status).toBe(1);
    expect(d3.stdout).toMatch(/1 row\(s\) differ/);
    const d4 = cli(["diff", b, join(dir, "p.json"), "--alpha", "0.05"]);
    expect(d4.stdout).toMatch(/MOVED/);
    expect(d4.status).toBe(1);
  });

  it("unreadable or mismatched reports exit 2 with a message naming the problem", () => {
    const { dir, suite } = setup();
    const a = join(dir, "a.json");
    expect([0, 1]).toContain(cli(["run", suite, "--quiet", "--workers", "1", "--out", a]).status);
    const missing = cli(["diff", join(dir, "nope.json"), a]);
    expect(missing.status).toBe(2);
    expect(missing.stderr).toMatch(/baseline: cannot read/);
    writeFileSync(join(dir, "bad.json"), "{");
    expect(cli(["diff", a, join(dir, "bad.json")]).stderr).toMatch(/current: .* is not valid JSON/);
    const other = setup({ n: [10, 20, 80] });
    const o = join(other.dir, "o.json");
    expect([0, 1]).toContain(cli(["run", other.suite, "--quiet", "--workers", "1", "--out", o]).status);
    const mm = cli(["diff", a, o]);
    expect(mm.status).toBe(2);
    expect(mm.stdout).toMatch(/Only in the baseline \(not compared\): perimeter@40, diameter@40/);
    expect(mm.stdout).toMatch(/Only in the current report \(not compared\): perimeter@80, diameter@80/);
    expect(cli(["diff", a]).status).toBe(2);
    expect(cli(["diff", a, a, "--alpha", "2"]).stderr).toMatch(/--alpha: /);
  });
});
