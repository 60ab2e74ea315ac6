// JUnit XML: structure and counts against the common schema, XML escaping, one testcase per check.

import { describe, expect, it } from "vitest";
import { checkCases, renderJunit, reportJunit, xmlEscape } from "../../src/report/junit.js";
import type { Check } from "../../src/verdict/types.js";
import { buildOneWalk } from "./fixtures.js";
import { validateJunit } from "./junit-structure.js";

function check(id: string, verdict: Check["verdict"], detail = "detail"): Check {
  return { id, measure: "perimeter", n: null, kind: "varianceLimit", source: "claim", estimate: 4.01, expected: 4, statistic: 0.3, pValue: 0.7, adjustedPValue: 1, ci: [3.9, 4.1], verdict, gated: true, detail };
}

describe("JUnit XML", () => {
  it("maps verdicts: fail -> failure, inconclusive and not-yet-visible -> skipped, pass/confirmed -> plain", () => {
    const checks = [check("a", "pass"), check("b", "fail"), check("c", "inconclusive", "grid too coarse"), check("d", "confirmed"), check("e", "not-yet-visible")];
    const xml = renderJunit("walkhull", [{ name: "s", cases: checkCases(checks) }]);
    const info = validateJunit(xml);
    expect(info).toMatchObject({ tests: 5, failures: 1, skipped: 2 });
    const byName = Object.fromEntries(info.suites[0].cases.map((c) => [c.name, c]));
    expect(byName.a.failure).toBeNull();
    expect(byName.a.skipped).toBeNull();
    expect(byName.b.failure?.type).toBe("check-failed");
    expect(byName.c.skipped?.message).toBe("inconclusive: grid too coarse");
    expect(byName.e.skipped?.message).toMatch(/^not-yet-visible: /);
    expect(byName.d.failure).toBeNull();
  });

  it("escapes markup, quotes and control characters so the document stays well-formed", () => {
    const nasty = `a < b && c > "d" 'e' \u0001 end\nline2`;
    const xml = renderJunit("walk<hull>", [{ name: `suite "x" & <y>`, cases: checkCases([check(`id<&>"'`, "fail", nasty), check("z", "inconclusive", nasty)]) }]);
    const info = validateJunit(xml);
    expect(info.suites[0].name).toBe(`suite "x" & <y>`);
    expect(info.suites[0].cases[0].name).toBe(`id<&>"'`);
    expect(info.suites[0].cases[0].failure?.text).toBe(nasty.replace("\u0001", "\uFFFD"));
    expect(info.suites[0].cases[1].skipped?.message).toBe(`inconclusive: ${nasty.replace("\u0001", "\uFFFD")}`);
    expect(xmlEscape("\uD800x")).toBe("\uFFFDx");
  });

  it("the validator rejects broken documents (so the checks above can fail)", () => {
    expect(() => validateJunit("<testsuites><testsuite></testsuites>")).toThrow(/not well-formed/);
    expect(() => validateJunit('<testsuites tests="1" failures="0" errors="0" skipped="0"><testsuite name="s" tests="2" failures="0" errors="0" skipped="0"><testcase name="a" classname="c"/></testsuite></testsuites>')).toThrow(/@tests: 2 but 1/);
    expect(() => validateJunit('<testsuites tests="1" failures="0" errors="0" skipped="0"><testsuite name="s" tests="1" failures="0" errors="0" skipped="0"><testcase name="a"/></testsuite></testsuites>')).toThrow(/classname/);
  });

  it("a real report: one testcase per check, counts match the verdicts, provenance as properties", () => {
    const { json } = buildOneWalk();
    const checks = json.checks as Check[];
    expect(checks.length).toBeGreaterThan(0);
    const info = validateJunit(reportJunit(json));
    expect(info.tests).toBe(checks.length);
    expect(info.failures).toBe(checks.filter((c) => c.verdict === "fail").length);
    expect(info.skipped).toBe(checks.filter((c) => c.verdict === "inconclusive" || c.verdict === "not-yet-visible").length);
    expect(info.suites[0].cases.map((c) => c.name)).toEqual(checks.map((c) => c.id));
    expect(info.suites[0].properties.seed).toBe(String(json.seed));
    expect(info.suites[0].properties.suiteHash).toBe(json.provenance.suiteHash);
  });
});
