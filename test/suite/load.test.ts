import { describe, expect, it } from "vitest";
import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { blockRange, loadSuite, SuiteError, validateSuite } from "../../src/suite/load.js";

const here = new URL(".", import.meta.url).pathname;
const base = {
  title: "t",
  seed: 1,
  walks: [{ law: "gaussian", mean: [1, 0], cov: [[1, 0], [0, 1]] }],
  measure: ["perimeter"],
  n: [10, 20],
  paths: 100,
};
function withChange(change: (s: any) => void): unknown {
  const s = JSON.parse(JSON.stringify(base));
  change(s);
  return s;
}
function errorOf(raw: unknown): string {
  try {
    validateSuite(raw, { baseDir: here });
  } catch (e) {
    expect(e).toBeInstanceOf(SuiteError);
    return (e as Error).message;
  }
  throw new Error("expected a SuiteError");
}

describe("suite validation", () => {
  it("accepts the reference example and hashes it canonically", () => {
    const a = validateSuite(base);
    const b = validateSuite(JSON.parse(JSON.stringify({ ...base, paths: 100 })));
    expect(a.hash).toBe(b.hash);
    expect(validateSuite(withChange((s) => (s.seed = 2))).hash).not.toBe(a.hash);
  });

  it("accepts singular PSD covariances and every law", () => {
    const s = validateSuite(
      withChange((s) => {
        s.walks = [
          { law: "gaussian", mean: [0, 0], cov: [[1, 1], [1, 1]] },
          { law: "discrete", atoms: [[1, 0], [0, 1], [-1, 0], [0, -1]], weights: [0.4, 0.3, 0.2, 0.1] },
          { law: "circle", mean: [0.6, 0.2], radius: 1 },
          { law: "student", mean: [0, 1], scale: [[1, 0], [0, 2]], dof: 5 },
          { law: "empirical", file: "steps-ok.csv" },
        ];
      }),
      { baseDir: here },
    );
    expect(s.walks).toHaveLength(5);
    const emp = s.walks[4];
    expect(emp.law === "empirical" && emp.steps).toEqual([
      [0.12, 0.4],
      [-0.31, 0.22],
      [0.05, -0.11],
      [0.44, 0.18],
    ]);
  });

  const cases: [string, (s: any) => void, RegExp][] = [
    ["unknown law", (s) => (s.walks[0].law = "levy"), /^walks\[0\]\.law: unknown law "levy"/],
    ["non-PSD covariance", (s) => (s.walks[0].cov = [[1, 2], [2, 1]]), /^walks\[0\]\.cov: not positive semi-definite/],
    ["asymmetric covariance", (s) => (s.walks[0].cov = [[1, 0.5], [0, 1]]), /^walks\[0\]\.cov: must be symmetric/],
    [
      "weights not summing to 1",
      (s) => (s.walks[0] = { law: "discrete", atoms: [[1, 0], [0, 1]], weights: [0.5, 0.6] }),
      /^walks\[0\]\.weights: must sum to 1/,
    ],
    [
      "negative weight",
      (s) => (s.walks[0] = { law: "discrete", atoms: [[1, 0], [0, 1]], weights: [1.5, -0.5] }),
      /^walks\[0\]\.weights\[1\]: must be >= 0/,
    ],
    [
      "dof <= 2",
      (s) => (s.walks[0] = { law: "student", mean: [0, 0], scale: [[1, 0], [0, 1]], dof: 2 }),
      /^walks\[0\]\.dof: must be > 2/,
    ],
    ["empty CSV", (s) => (s.walks[0] = { law: "empirical", file: "steps-empty.csv" }), /^walks\[0\]\.file: .*at least 2/],
    ["garbage CSV", (s) => (s.walks[0] = { law: "empirical", file: "steps-garbage.csv" }), /^walks\[0\]\.file: .*line 2/],
    ["missing CSV", (s) => (s.walks[0] = { law: "empirical", file: "nope.csv" }), /^walks\[0\]\.file: cannot read/],
    ["n not increasing", (s) => (s.n = [10, 10]), /^n\[1\]: must be larger than n\[0\]/],
    ["n not integer", (s) => (s.n = [10.5]), /^n\[0\]: must be an integer/],
    ["paths <= 0", (s) => (s.paths = 0), /^paths: must be >= 32/],
    ["one path (the block jackknife needs 32 blocks)", (s) => (s.paths = 1), /^paths: must be >= 32 \(got 1\)/],
    ["31 paths", (s) => (s.paths = 31), /^paths: must be >= 32 \(got 31\)/],
    ["sizes that do not fit in memory", (s) => (s.n = [10, 1e9]), /^n: largest n = 1000000000 .* GiB per worker/],
    ["absurd paths", (s) => (s.paths = 1e15), /^paths: must be <= /],
    ["a grid too long for the per-block co-moments (found by the fuzz test: 5000 n ran out of memory)", (s) => (s.n = Array.from({ length: 5000 }, (_, i) => i + 1)), /^n: 5000 step counts .* use at most \d+ step counts$/],
    ["too many blocks for the grid", (s) => { s.blocks = 65536; s.paths = 1e6; s.n = [1, 2, 3, 4, 5, 6]; }, /^blocks: .* use at most \d+ blocks with this grid$/],
    ["an absurd drift (found by the fuzz test: 1e308 overflowed the quadrature)", (s) => (s.walks[0].mean = [1e308, 0]), /^walks\[0\]\.mean\[0\]: must be <= 1000000000000 /],
    ["unknown measure", (s) => (s.measure = ["hull-width"]), /^measure\[0\]: unknown measure/],
    ["unknown top-level field", (s) => (s.measures = ["area"]), /^measures: unknown field \(did you mean `measure`\?\)/],
    ["unknown law field", (s) => (s.walks[0].covariance = 1), /^walks\[0\]\.covariance: not a field of the gaussian law/],
    ["claim on a missing n", (s) => (s.claims = [{ measure: "perimeter", n: 30, mean: 1 }]), /^claims\[0\]\.n: 30 is not on the suite's grid/],
    ["empty claim", (s) => (s.claims = [{ measure: "perimeter" }]), /^claims\[0\]: claims nothing/],
    ["empty walks", (s) => (s.walks = []), /^walks: must be a non-empty array/],
  ];
  for (const [name, change, pattern] of cases) {
    it(`rejects ${name} naming the field`, () => {
      expect(errorOf(withChange(change))).toMatch(pattern);
    });
  }

  it("rejects malformed JSON files naming the file", () => {
    const dir = mkdtempSync(join(tmpdir(), "walkhull-"));
    const f = join(dir, "bad.json");
    writeFileSync(f, "{ \"walks\": [ }");
    expect(() => loadSuite(f)).toThrow(/^suite: .*bad\.json is not valid JSON/);
  });

  it("splits paths into near-equal contiguous blocks", () => {
    const ranges = Array.from({ length: 7 }, (_, b) => blockRange(100, 7, b));
    expect(ranges.map((r) => r.count)).toEqual([15, 15, 14, 14, 14, 14, 14]);
    ranges.forEach((r, b) => b > 0 && expect(r.first).toBe(ranges[b - 1].first + ranges[b - 1].count));
    expect(ranges[6].first + ranges[6].count).toBe(100);
  });
});
