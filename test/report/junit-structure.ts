// A structural validator of JUnit XML against the common schema (testsuites > testsuite >
// testcase > failure | error | skipped, with the tests/failures/errors/skipped counters), as
// written in the widely used junit-10.xsd (common practice). Well-formedness: fast-xml-parser.

import { XMLParser, XMLValidator } from "fast-xml-parser";

export interface JunitCaseInfo {
  name: string;
  classname: string;
  failure: { message: string; type?: string; text: string } | null;
  skipped: { message: string } | null;
}
export interface JunitInfo {
  tests: number;
  failures: number;
  skipped: number;
  suites: { name: string; cases: JunitCaseInfo[]; properties: Record<string, string> }[];
}

/** Drop whitespace-only text between child elements (indentation); other text is kept. */
function noBlankText(o: any): any {
  if (typeof o !== "object" || o === null) return o;
  if (typeof o["#text"] === "string" && o["#text"].trim() === "") {
    const { ["#text"]: _drop, ...rest } = o;
    return rest;
  }
  return o;
}

const arr = <T>(x: T | T[] | undefined): T[] => (x === undefined ? [] : Array.isArray(x) ? x : [x]);

/** Parse and check the structure; throws an Error naming the offending element. */
export function validateJunit(xml: string): JunitInfo {
  const ok = XMLValidator.validate(xml);
  if (ok !== true) throw new Error(`xml: not well-formed: ${JSON.stringify(ok.err)}`);
  const doc = new XMLParser({ ignoreAttributes: false, attributeNamePrefix: "@", textNodeName: "#text", parseAttributeValue: false, parseTagValue: false, trimValues: false, processEntities: true, htmlEntities: true }).parse(xml);
  const keys = Object.keys(doc).filter((k) => k !== "?xml");
  if (keys.length !== 1 || keys[0] !== "testsuites") throw new Error(`root: expected <testsuites>, got ${keys.join(", ")}`);
  const root = noBlankText(doc.testsuites);
  const int = (v: unknown, at: string) => {
    if (typeof v !== "string" || !/^\d+$/.test(v)) throw new Error(`${at}: expected a non-negative integer attribute, got ${JSON.stringify(v)}`);
    return Number(v);
  };
  const allowedRoot = new Set(["testsuite", "@name", "@tests", "@failures", "@errors", "@skipped", "@time", "@disabled"]);
  for (const k of Object.keys(root)) if (!allowedRoot.has(k)) throw new Error(`testsuites: unexpected ${k}`);
  const info: JunitInfo = { tests: int(root["@tests"], "testsuites@tests"), failures: int(root["@failures"], "testsuites@failures"), skipped: int(root["@skipped"], "testsuites@skipped"), suites: [] };
  int(root["@errors"], "testsuites@errors");
  let T = 0, F = 0, S = 0;
  arr(root.testsuite).forEach((s0: any, i: number) => {
    const s = noBlankText(s0);
    const at = `testsuite[${i}]`;
    if (typeof s["@name"] !== "string") throw new Error(`${at}@name: missing`);
    const allowed = new Set(["testcase", "properties", "system-out", "system-err", "@name", "@tests", "@failures", "@errors", "@skipped", "@time", "@timestamp", "@hostname", "@id", "@package", "@disabled"]);
    for (const k of Object.keys(s)) if (!allowed.has(k)) throw new Error(`${at}: unexpected ${k}`);
    const properties: Record<string, string> = {};
    for (const p of arr(s.properties?.property)) properties[(p as any)["@name"]] = (p as any)["@value"];
    const cases: JunitCaseInfo[] = arr(s.testcase).map((c0: any, j: number) => {
      const c = noBlankText(c0);
      const cat = `${at}.testcase[${j}]`;
      if (typeof c["@name"] !== "string" || typeof c["@classname"] !== "string") throw new Error(`${cat}: name and classname are required`);
      const okKeys = new Set(["@name", "@classname", "@time", "@assertions", "@file", "@line", "failure", "error", "skipped", "system-out", "system-err", "#text"]);
      for (const k of Object.keys(c)) if (!okKeys.has(k)) throw new Error(`${cat}: unexpected ${k}`);
      if (c["#text"] !== undefined && String(c["#text"]).trim() !== "") throw new Error(`${cat}: text outside elements`);
      const outcomes = ["failure", "error", "skipped"].filter((k) => c[k] !== undefined);
      if (outcomes.length > 1) throw new Error(`${cat}: more than one of failure/error/skipped`);
      if (arr(c.failure).length > 1) throw new Error(`${cat}: more than one failure`);
      const f = c.failure === undefined ? null : typeof c.failure === "string" ? { message: "", text: c.failure } : { message: c.failure["@message"] ?? "", type: c.failure["@type"], text: c.failure["#text"] ?? "" };
      const sk = c.skipped === undefined ? null : { message: typeof c.skipped === "string" ? "" : (c.skipped["@message"] ?? "") };
      return { name: c["@name"], classname: c["@classname"], failure: f, skipped: sk };
    });
    const tests = int(s["@tests"], `${at}@tests`);
    const failures = int(s["@failures"], `${at}@failures`);
    const skipped = int(s["@skipped"], `${at}@skipped`);
    int(s["@errors"], `${at}@errors`);
    if (tests !== cases.length) throw new Error(`${at}@tests: ${tests} but ${cases.length} testcases`);
    if (failures !== cases.filter((c) => c.failure).length) throw new Error(`${at}@failures: does not match the failure elements`);
    if (skipped !== cases.filter((c) => c.skipped).length) throw new Error(`${at}@skipped: does not match the skipped elements`);
    T += tests;
    F += failures;
    S += skipped;
    info.suites.push({ name: s["@name"], cases, properties });
  });
  if (T !== info.tests || F !== info.failures || S !== info.skipped) throw new Error("testsuites: counters are not the sums of the testsuite counters");
  return info;
}
