// JUnit XML for CI dashboards: <testsuites><testsuite><testcase> with <failure> or <skipped>, the
// element and attribute names of the widely used JUnit/Ant report format (common practice; the
// Jenkins "junit-10.xsd" schema is its usual written form). One testcase per check.
//
// Mapping of verdicts: fail -> <failure>; inconclusive -> <skipped message=...>; not-yet-visible ->
// <skipped> too (neither a pass nor a failure: the predicted behaviour is not visible at this n);
// pass and confirmed -> a plain testcase. Every attribute and text is XML-escaped and characters
// not allowed in XML 1.0 are replaced by U+FFFD.

import type { Check } from "../verdict/types.js";

export interface JunitCase {
  name: string;
  classname: string;
  /** Seconds; 0 when the case has no time of its own. */
  time?: number;
  failure?: { message: string; type: string; text: string };
  skipped?: { message: string };
  /** Extra text shown by CI tools beside the case. */
  systemOut?: string;
}

export interface JunitSuite {
  name: string;
  cases: JunitCase[];
  time?: number;
  timestamp?: string;
  properties?: Record<string, string | number | null | undefined>;
}

/** Replace characters XML 1.0 forbids (C0 controls except tab/LF/CR, lone surrogates, U+FFFE/F). */
function xmlChars(s: string): string {
  // eslint-disable-next-line no-control-regex -- matching the control characters is the point
  return s.replace(/[\u0000-\u0008\u000B\u000C\u000E-\u001F\uFFFE\uFFFF]|[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/g, "\uFFFD");
}

/** Escape text for an XML attribute value or element content. */
export function xmlEscape(s: string): string {
  return xmlChars(String(s))
    .replace(/&/g, "&amp;")
    .replace(/</g, "&lt;")
    .replace(/>/g, "&gt;")
    .replace(/"/g, "&quot;")
    .replace(/'/g, "&apos;")
    .replace(/\n/g, "&#10;")
    .replace(/\r/g, "&#13;")
    .replace(/\t/g, "&#9;");
}

/** Escape element text (newlines kept as they are). */
function textEscape(s: string): string {
  return xmlChars(String(s)).replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;");
}

const attrs = (o: Record<string, string | number | undefined>): string =>
  Object.entries(o)
    .filter(([, v]) => v !== undefined)
    .map(([k, v]) => ` ${k}="${xmlEscape(String(v))}"`)
    .join("");

const secs = (t: number | undefined): string => (t !== undefined && Number.isFinite(t) && t >= 0 ? t.toFixed(3) : "0.000");

/** Render suites as a JUnit XML document. */
export function renderJunit(name: string, suites: JunitSuite[]): string {
  const count = (s: JunitSuite) => ({
    tests: s.cases.length,
    failures: s.cases.filter((c) => c.failure).length,
    skipped: s.cases.filter((c) => !c.failure && c.skipped).length,
  });
  const total = suites.map(count).reduce((a, b) => ({ tests: a.tests + b.tests, failures: a.failures + b.failures, skipped: a.skipped + b.skipped }), { tests: 0, failures: 0, skipped: 0 });
  const out: string[] = ['<?xml version="1.0" encoding="UTF-8"?>'];
  const totalTime = suites.reduce((s, x) => s + (x.time ?? 0), 0);
  out.push(`<testsuites${attrs({ name, tests: total.tests, failures: total.failures, errors: 0, skipped: total.skipped, time: secs(totalTime) })}>`);
  suites.forEach((s, i) => {
    const c = count(s);
    out.push(`  <testsuite${attrs({ name: s.name, id: i, tests: c.tests, failures: c.failures, errors: 0, skipped: c.skipped, time: secs(s.time), timestamp: s.timestamp })}>`);
    const props = Object.entries(s.properties ?? {}).filter(([, v]) => v !== undefined && v !== null);
    if (props.length) {
      out.push("    <properties>");
      for (const [k, v] of props) out.push(`      <property${attrs({ name: k, value: String(v) })}/>`);
      out.push("    </properties>");
    }
    for (const tc of s.cases) {
      const head = `    <testcase${attrs({ name: tc.name, classname: tc.classname, time: secs(tc.time) })}`;
      const inner: string[] = [];
      if (tc.failure) inner.push(`      <failure${attrs({ message: tc.failure.message, type: tc.failure.type })}>${textEscape(tc.failure.text)}</failure>`);
      else if (tc.skipped) inner.push(`      <skipped${attrs({ message: tc.skipped.message })}/>`);
      if (tc.systemOut) inner.push(`      <system-out>${textEscape(tc.systemOut)}</system-out>`);
      out.push(inner.length ? `${head}>\n${inner.join("\n")}\n    </testcase>` : `${head}/>`);
    }
    out.push("  </testsuite>");
  });
  out.push("</testsuites>");
  return out.join("\n") + "\n";
}

const num = (x: unknown): string => (typeof x === "number" ? (Number.isFinite(x) ? Number(x.toPrecision(6)).toString() : "-") : x === null || x === undefined ? "-" : String(x));

/** One testcase per check: classname `walkhull.<measure>.<kind>`, name the check id. */
export function checkCases(checks: Check[]): JunitCase[] {
  return checks.map((c) => {
    const summary = `estimate ${num(c.estimate)}, expected ${num(c.expected)}, statistic ${num(c.statistic)}, p ${num(c.pValue)}, Holm-adjusted p ${num(c.adjustedPValue)}${c.ci ? `, CI [${num(c.ci[0])}, ${num(c.ci[1])}]` : ""}; source: ${c.source}`;
    const tc: JunitCase = { name: c.id, classname: `walkhull.${c.measure}.${c.kind}`, systemOut: `${c.verdict}: ${summary}\n${c.detail}` };
    if (c.verdict === "fail") tc.failure = { message: `${c.id}: ${summary}`, type: "check-failed", text: c.detail };
    else if (c.verdict === "inconclusive") tc.skipped = { message: `inconclusive: ${c.detail}` };
    else if (c.verdict === "not-yet-visible") tc.skipped = { message: `not-yet-visible: ${c.detail}` };
    return tc;
  });
}

/** The JUnit document of a run or merge report. */
export function reportJunit(report: { suite: { title: string }; checks?: unknown[]; timing?: { wallSeconds: number }; provenance?: { startedAt?: string; seed?: number; suiteHash?: string; version?: string; gitCommit?: string | null } }): string {
  const checks = (report.checks ?? []) as Check[];
  const p = report.provenance;
  return renderJunit("walkhull", [
    {
      name: report.suite.title,
      cases: checkCases(checks),
      time: report.timing?.wallSeconds,
      timestamp: p?.startedAt?.replace(/\.\d+Z$/, ""),
      properties: { seed: p?.seed, suiteHash: p?.suiteHash, version: p?.version, gitCommit: p?.gitCommit ?? undefined },
    },
  ]);
}
