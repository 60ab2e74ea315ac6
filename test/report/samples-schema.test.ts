// The samples CSV and the JSON Schemas (suite and report), validated with Ajv (draft 2020-12).

import { describe, expect, it } from "vitest";
import { readdirSync, readFileSync } from "node:fs";
import { join } from "node:path";
import Ajv2020Module from "ajv/dist/2020.js";
import { sampleColumns, samplesCsv } from "../../src/report/samples.js";
import { buildReport, toJson } from "../../src/report/json.js";
import { renderHtml } from "../../src/report/html.js";
import { renderMarkdown } from "../../src/report/markdown.js";
import { simulateInProcess } from "../../src/run/simulate.js";
import { validateSuite } from "../../src/suite/load.js";
import { predict } from "../../src/theory/predict.js";
import { evaluateChecks } from "../../src/verdict/checks.js";
import { measureSample } from "../../src/run/series.js";
import { buildOneWalk } from "./fixtures.js";

const ROOT = new URL("../../", import.meta.url).pathname;
const Ajv2020 = (Ajv2020Module as unknown as { default?: typeof Ajv2020Module.default }).default ?? Ajv2020Module.default;
// RFC 3339 date-time (the only format keyword the schemas use).
const ajv = new Ajv2020({ allErrors: true, strict: true, strictRequired: false, allowUnionTypes: true, formats: { "date-time": /^\d{4}-\d\d-\d\dT\d\d:\d\d:\d\d(\.\d+)?(Z|[+-]\d\d:\d\d)$/ } });
const suiteSchema = ajv.compile(JSON.parse(readFileSync(join(ROOT, "schema/suite.schema.json"), "utf8")));
const reportSchema = ajv.compile(JSON.parse(readFileSync(join(ROOT, "schema/report.schema.json"), "utf8")));

describe("samples CSV", () => {
  it("one row per kept path, columns path and <measure>@<n>, values round-trip exactly", () => {
    const { suite, sim } = buildOneWalk({ paths: 1280, n: [10, 20, 40], measure: ["area", "perimeter"] }, false);
    const csv = samplesCsv(suite, sim.sample);
    const lines = csv.trimEnd().split("\n");
    expect(lines[0]).toBe("path,area@10,area@20,area@40,perimeter@10,perimeter@20,perimeter@40");
    expect(sampleColumns(suite)).toEqual(lines[0].split(","));
    expect(lines).toHaveLength(1 + sim.sample.pathIndex.length);
    expect(sim.sample.pathIndex.length).toBe(1280); // fewer paths than the kept maximum: all are kept
    const row = 17;
    const cells = lines[1 + row].split(",").map(Number);
    expect(cells[0]).toBe(sim.sample.pathIndex[row]);
    expect(cells[6]).toBe(measureSample(sim, "perimeter")[2][row]);
    expect(cells[1]).toBe(measureSample(sim, "area")[0][row]);
    // The column means agree with the report's means when every path is kept.
    const col = lines.slice(1).map((l) => Number(l.split(",")[6]));
    const mean = col.reduce((a, b) => a + b, 0) / col.length;
    const rec = sim.results.find((r) => r.measure === "perimeter" && r.n === 40)!;
    expect(Math.abs(mean - rec.mean)).toBeLessThanOrEqual(1e-9 * rec.mean);
  });

  it("a sample that does not match the grid is refused, naming the field", () => {
    const { suite, sim } = buildOneWalk({ paths: 64, n: [10, 20] }, false);
    expect(() => samplesCsv(suite, { ...sim.sample, values: sim.sample.values.slice(1) })).toThrow(/^sample\.values: /);
  });
});

describe("JSON Schemas", () => {
  const files = readdirSync(join(ROOT, "validation")).filter((f) => f.endsWith(".json"));

  it("every shipped validation suite is valid", () => {
    expect(files.length).toBeGreaterThanOrEqual(5);
    for (const f of files) {
      const ok = suiteSchema(JSON.parse(readFileSync(join(ROOT, "validation", f), "utf8")));
      expect({ file: f, errors: ok ? null : suiteSchema.errors }).toEqual({ file: f, errors: null });
    }
  });

  it("the suite schema rejects what the loader rejects: unknown fields, missing law fields, bad claims", () => {
    const good = { seed: 1, walks: [{ law: "gaussian", mean: [1, 0], cov: [[1, 0], [0, 1]] }], measure: ["perimeter"], n: [10], paths: 32 };
    expect(suiteSchema(good)).toBe(true);
    expect(suiteSchema({ ...good, pathz: 3 })).toBe(false);
    expect(suiteSchema({ ...good, walks: [{ law: "gaussian", mean: [1, 0] }] })).toBe(false);
    expect(suiteSchema({ ...good, walks: [{ law: "circle", mean: [1, 0], radius: 1, cov: [[1, 0], [0, 1]] }] })).toBe(false);
    expect(suiteSchema({ ...good, measure: ["perimeter", "perimeter"] })).toBe(false);
    expect(suiteSchema({ ...good, claims: [{ measure: "perimeter" }] })).toBe(false);
    expect(suiteSchema({ ...good, claims: [{ measure: "perimeter", n: 10 }] })).toBe(false);
    expect(suiteSchema({ ...good, claims: [{ measure: "perimeter", n: 10, mean: 3 }] })).toBe(true);
    expect(suiteSchema({ ...good, claims: [{ measure: "perimeter", linearisation: { endpoint: [[2, 0]] } }] })).toBe(true);
    expect(suiteSchema({ ...good, claims: [{ measure: "perimeter", linearisation: { path: [[2, 0]] } }] })).toBe(false);
    expect(suiteSchema({ ...good, blocks: 8 })).toBe(false);
    expect(suiteSchema({ ...good, paths: 31 })).toBe(false);
  });

  it("a real report (with checks, limits and predictions) is valid; a renamed contract field is not", () => {
    const { json } = buildOneWalk({ paths: 3200 });
    expect(json.checks?.length).toBeGreaterThan(0);
    const ok = reportSchema(json);
    expect(ok ? null : reportSchema.errors).toBeNull();
    const renamed = JSON.parse(JSON.stringify(json));
    renamed.results[0].standardError = renamed.results[0].meanSE;
    delete renamed.results[0].meanSE;
    expect(reportSchema(renamed)).toBe(false);
    const badVerdict = JSON.parse(JSON.stringify(json));
    badVerdict.checks[0].verdict = "ok";
    expect(reportSchema(badVerdict)).toBe(false);
  });
});

describe("the width measure end to end (no prediction: an estimate with its CI)", () => {
  it("appears in results, limits, the samples CSV, report.md, report.html, and the report is schema-valid", () => {
    const suite = validateSuite({ seed: 3, walks: [{ law: "gaussian", mean: [1, 0], cov: [[1, 0], [0, 1]] }], measure: ["width"], n: [50, 200], paths: 1280 });
    const sim = simulateInProcess(suite);
    const predictions = predict(suite);
    const verdicts = evaluateChecks(sim, predictions);
    const report = buildReport(sim, new Date(Date.UTC(2026, 11, 2)), { predictions, verdicts });
    const json = JSON.parse(toJson(report));
    expect(reportSchema(json) ? null : reportSchema.errors).toBeNull();
    expect(json.results.map((r: { measure: string; n: number }) => `${r.measure}@${r.n}`)).toEqual(["width@50", "width@200"]);
    const limits = verdicts.limits.filter((l) => l.measure === "width");
    expect(limits.map((l) => l.quantity).sort()).toEqual(["meanGrowth", "varianceLimit"]);
    for (const l of limits) expect(Number.isFinite(l.ci?.[0]) && Number.isFinite(l.ci?.[1])).toBe(true);
    expect(verdicts.checks.filter((c) => c.measure === "width").every((c) => !c.gated)).toBe(true);
    expect(samplesCsv(suite, sim.sample).split("\n")[0]).toBe("path,width@50,width@200");
    expect(renderMarkdown(report)).toMatch(/^\| width \| 200 \|/m);
    const html = renderHtml(report, { sample: sim.sample });
    expect(html).toContain('data-measure="width"');
  });
});
