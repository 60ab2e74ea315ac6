// Citations stay inside the repository: no file cites a notes file or a folder outside it, every
// "docs/theory.md sec. N" names a section that exists, and the sources printed by `predict` cite
// papers by title (checked here: they carry no "A & B," author lists).

import { describe, expect, it } from "vitest";
import { execFileSync } from "node:child_process";
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { predict } from "../../src/theory/predict.js";
import { validateSuite } from "../../src/suite/load.js";

const ROOT = new URL("../../", import.meta.url).pathname;
const tracked = execFileSync("git", ["ls-files"], { cwd: ROOT, encoding: "utf8" })
  .split("\n")
  .filter((f) => f && !f.endsWith("package-lock.json") && !f.startsWith("validation/data/"));
const read = (f: string) => {
  try {
    return readFileSync(join(ROOT, f), "utf8");
  } catch {
    return "";
  }
};
// Built from pieces so that this file does not match itself.
const NOTES = ["MATH", "md"].join(".");
const OUTSIDE = ["/work", "/shared/"].join("");

describe("citations", () => {
  it("no tracked file cites the team's notes or a path outside the repository", () => {
    const hits = tracked.filter((f) => read(f).includes(NOTES) || read(f).includes(OUTSIDE));
    expect(hits).toEqual([]);
  });

  it("every 'docs/theory.md sec. N' names an existing section", () => {
    const theory = read("docs/theory.md");
    const sections = new Set([...theory.matchAll(/^## (\d+)\. /gm)].map((m) => m[1]));
    const subsections = new Set([...theory.matchAll(/^(?:- |### )(\d+\.\d+) /gm)].map((m) => m[1]));
    expect(sections.size).toBeGreaterThanOrEqual(10);
    const bad: string[] = [];
    for (const f of tracked) {
      for (const m of read(f).matchAll(/docs\/theory\.md sec\. ((?:\d+(?:\.\d+)?)(?:(?:, | and )\d+(?:\.\d+)?)*)/g)) {
        for (const ref of m[1].split(/, | and /)) {
          if (!(ref.includes(".") ? subsections.has(ref) : sections.has(ref))) bad.push(`${f}: sec. ${ref}`);
        }
      }
    }
    expect(bad).toEqual([]);
  });

  it("printed sources name papers by title, not by author lists", () => {
    const files = ["two-walks-right-angle.json", "one-walk-zero-drift.json", "one-walk-drift-gaussian.json", "nonnormal-area-drift.json"];
    for (const f of files) {
      const suite = validateSuite(JSON.parse(read(join("validation", f))));
      const sources = predict(suite, { budgetSeconds: 0.5 }).measures.flatMap((m) => m.sources);
      expect(sources.length, f).toBeGreaterThan(0);
      for (const s of sources) expect(s, f).not.toMatch(/\b[A-Z][a-z]+(-[A-Z][a-z]+)? & [A-Z][a-z]+/);
    }
  });
});
