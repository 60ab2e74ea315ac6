// Seeded fuzz test of the suite loader and the CLI: random mutations of every shipped suite (wrong
// types, flipped signs, sizes, NaN and Infinity, missing and extra keys, huge grids) must end in a
// result or a field-named one-line error (exit 0, 1, 2 or 3), never an internal error, and nothing
// half-written.
//
// In process (fast, many cases): validateSuite, then for a valid suite the same stages as `run`
// (predict with a short budget, a small simulation, the checks, the report renderers); any error
// other than SuiteError is an internal error. Through the built CLI (fewer cases, each a process):
// exit code, stderr and the output folder. Deterministic: seedrandom with fixed seeds.

import { describe, expect, it } from "vitest";
import seedrandom from "seedrandom";
import { spawnSync } from "node:child_process";
import { mkdtempSync, readdirSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { SuiteError, validateSuite } from "../../src/suite/load.js";
import { simulateInProcess } from "../../src/run/simulate.js";
import { predict } from "../../src/theory/predict.js";
import { evaluateChecks } from "../../src/verdict/checks.js";
import { buildReport } from "../../src/report/json.js";
import { renderMarkdown } from "../../src/report/markdown.js";
import { renderHtml } from "../../src/report/html.js";

const ROOT = new URL("../../", import.meta.url).pathname;
const VALIDATION = join(ROOT, "validation");
const CLI = join(ROOT, "dist/cli.js");
const SHIPPED = readdirSync(VALIDATION).filter((f) => f.endsWith(".json")).sort();

type Json = unknown;
type Rng = () => number;

const WEIRD: Json[] = [null, true, false, "", "x", "1", 0, -0, -1, 1, 0.5, -2.5, 3, 31, 1e-300, 1e15, -1e308, 1e308, 2 ** 53, NaN, Infinity, -Infinity, [], [1], [[1, 0], [0, 1]], {}, { law: "gaussian" }];
const pick = <T>(rng: Rng, xs: readonly T[]): T => xs[Math.floor(rng() * xs.length)];

/** Every path (list of keys/indices) to a value inside `v`, the root excluded. */
function paths(v: Json, at: (string | number)[] = []): (string | number)[][] {
  if (Array.isArray(v)) return v.flatMap((x, i) => [[...at, i], ...paths(x, [...at, i])]);
  if (v && typeof v === "object") return Object.entries(v).flatMap(([k, x]) => [[...at, k], ...paths(x, [...at, k])]);
  return [];
}
function parentOf(root: Json, path: (string | number)[]): { parent: Record<string | number, Json>; key: string | number } {
  let p = root as Record<string | number, Json>;
  for (const k of path.slice(0, -1)) p = p[k] as Record<string | number, Json>;
  return { parent: p, key: path[path.length - 1] };
}

/** One random mutation in place; returns what it did. */
function mutate(suite: Record<string, Json>, rng: Rng): string {
  const all = paths(suite);
  const path = pick(rng, all);
  const { parent, key } = parentOf(suite, path);
  const where = path.join(".");
  const kind = pick(rng, ["value", "value", "delete", "extra", "sign", "string", "huge-grid", "size", "swap"] as const);
  switch (kind) {
    case "value": {
      const v = pick(rng, WEIRD);
      parent[key] = v;
      return `${where} = ${String(JSON.stringify(v) ?? v)}`;
    }
    case "delete":
      if (Array.isArray(parent)) parent.splice(key as number, 1);
      else delete parent[key];
      return `delete ${where}`;
    case "extra": {
      const target = Array.isArray(parent) ? suite : parent;
      const name = pick(rng, ["measures", "paht", "covariance", "extra", "__proto__", "constructor", "mean2"]);
      target[name] = pick(rng, WEIRD);
      return `extra key ${name}`;
    }
    case "sign":
      if (typeof parent[key] === "number") parent[key] = -(parent[key] as number);
      return `negate ${where}`;
    case "string":
      parent[key] = JSON.stringify(parent[key]) ?? "undefined";
      return `stringify ${where}`;
    case "huge-grid": {
      const g = pick(rng, [[1e9], [10, 2e9], Array.from({ length: 5000 }, (_, i) => i + 1), [2 ** 31], [3, 2, 1], [0], [1.5, 2]]);
      suite.n = g;
      return `n = ${g.length > 5 ? `[${g.length} values]` : JSON.stringify(g)}`;
    }
    case "size": {
      const arr = Array.isArray(parent[key]) ? (parent[key] as Json[]) : Array.isArray(parent) ? (parent as unknown as Json[]) : null;
      if (!arr) return "size (no array)";
      if (rng() < 0.5) arr.length = Math.floor(arr.length / 2);
      else while (arr.length < 70) arr.push(JSON.parse(JSON.stringify(arr[0] ?? 1)));
      return `resize near ${where} to ${arr.length}`;
    }
    case "swap": {
      const other = pick(rng, all);
      const o = parentOf(suite, other);
      if (path.length >= other.length && other.every((k, i) => path[i] === k)) return "swap (nested)";
      if (path.length < other.length && path.every((k, i) => other[i] === k)) return "swap (nested)";
      [parent[key], o.parent[o.key]] = [o.parent[o.key], parent[key]];
      return `swap ${where} <-> ${other.join(".")}`;
    }
  }
}

/** The stages of `run` on a small budget; throws only what `run` would throw. */
function pipeline(raw: Json): "valid" | "bad input" {
  let suite;
  try {
    suite = validateSuite(raw, { baseDir: VALIDATION, overrides: { paths: 64 } });
  } catch (e) {
    if (e instanceof SuiteError) {
      expect(e.message, "one line").not.toMatch(/\n/);
      expect(e.message, "names a field").toMatch(/^[A-Za-z_$][\w$]*(\[\d+\])?([.[][\w$\]]*)*: \S/);
      return "bad input";
    }
    throw e;
  }
  const prediction = predict(suite, { budgetSeconds: 0.2 });
  const small = suite.walks.length * suite.n[suite.n.length - 1] <= 4e5;
  if (small) {
    const sim = simulateInProcess(suite);
    const verdicts = evaluateChecks(sim, prediction);
    const report = buildReport(sim, new Date(0), { predictions: prediction, verdicts });
    renderMarkdown(report);
    renderHtml(report, { sample: sim.sample });
  }
  return "valid";
}

describe("fuzz: the suite loader and the run stages, in process", () => {
  for (const file of SHIPPED) {
    it(`${file}: 25 seeded mutations end in a result or a SuiteError naming the field`, () => {
      const rng = seedrandom(`fuzz ${file}`);
      const original = JSON.parse(readFileSync(join(VALIDATION, file), "utf8"));
      const seen = { valid: 0, "bad input": 0 };
      for (let i = 0; i < 25; i++) {
        const suite = JSON.parse(JSON.stringify(original));
        const did = Array.from({ length: 1 + Math.floor(rng() * 3) }, () => mutate(suite, rng));
        let outcome;
        try {
          outcome = pipeline(suite);
        } catch (e) {
          throw new Error(`${file} case ${i} (${did.join("; ")}): internal error ${(e as Error).stack}`, { cause: e });
        }
        seen[outcome]++;
      }
      expect(seen["bad input"]).toBeGreaterThan(0);
    }, 120_000);
  }
});

describe("fuzz: the CLI", () => {
  const cli = (args: string[]) => spawnSync("node", [CLI, ...args], { encoding: "utf8", timeout: 120_000 });

  it("mutated suites (and NaN / Infinity / broken JSON text) exit 0-3 with a one-line error, nothing half-written", () => {
    const rng = seedrandom("fuzz cli");
    const texts: { what: string; text: string }[] = [];
    for (const file of SHIPPED) {
      const suite = JSON.parse(readFileSync(join(VALIDATION, file), "utf8"));
      const did = mutate(suite, rng);
      texts.push({ what: `${file}: ${did}`, text: JSON.stringify(suite) });
    }
    const base = readFileSync(join(VALIDATION, "two-walks-right-angle.json"), "utf8");
    texts.push({ what: "NaN seed", text: base.replace('"seed": 42', '"seed": NaN') });
    texts.push({ what: "Infinity paths", text: base.replace('"paths": 131072', '"paths": Infinity') });
    texts.push({ what: "truncated JSON", text: base.slice(0, base.length / 2) });
    texts.push({ what: "empty file", text: "" });
    for (const { what, text } of texts) {
      const dir = mkdtempSync(join(tmpdir(), "walkhull-fuzz-"));
      const file = join(dir, "suite.json");
      writeFileSync(file, text);
      // Relative `file` fields of empirical laws resolve against the suite's folder: give it the data.
      writeFileSync(join(dir, "forager-steps.csv"), readFileSync(join(VALIDATION, "data/forager-steps.csv")));
      const out = join(dir, "out.json");
      const r = cli(["run", file, "--paths", "64", "--workers", "1", "--quiet", "--predict-budget", "0.5", "--out", out]);
      const label = `${what}: exit ${r.status}, stderr ${JSON.stringify(r.stderr.slice(0, 300))}`;
      expect([0, 1, 2, 3], label).toContain(r.status);
      expect(r.stderr, label).not.toMatch(/internal error/);
      const files = readdirSync(dir).sort();
      if (r.status === 2) {
        expect(r.stderr, label).toMatch(/^walkhull: [^\n]+\n$/);
        expect(files, label).toEqual(["forager-steps.csv", "suite.json"]);
      } else {
        expect(files, label).toEqual(["forager-steps.csv", "out.json", "suite.json"]);
        JSON.parse(readFileSync(out, "utf8"));
      }
    }
  }, 300_000);
});
