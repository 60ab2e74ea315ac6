import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { recordLayout } from "../../src/engine/types.js";
import { MEASURE_COUNT, MEASURE_REGISTRY, MEASURES, measureSpec } from "../../src/geometry/measure-registry.js";

const ROOT = join(import.meta.dirname, "../..");


describe("measure registry", () => {
  it("slots are 0..count-1 in registry order, names unique", () => {
    expect(MEASURE_REGISTRY.map((m) => m.slot)).toEqual(MEASURE_REGISTRY.map((_, i) => i));
    expect(new Set(MEASURES).size).toBe(MEASURE_COUNT);
    for (const m of MEASURES) expect(measureSpec(m).name).toBe(m);
    expect(() => measureSpec("girth")).toThrow(/^measure: unknown measure "girth"/);
  });

  it("schema/suite.schema.json lists exactly the registry's measures, in one place", () => {
    const text = readFileSync(join(ROOT, "schema/suite.schema.json"), "utf8");
    expect((JSON.parse(text) as { $defs: { measure: { enum: unknown[] } } }).$defs.measure.enum).toEqual([...MEASURES]);
    expect(text.split(`"${MEASURES[0]}"`)).toHaveLength(2);
  });

  it("schema/report.schema.json takes its measures from the suite schema", () => {
    const text = readFileSync(join(ROOT, "schema/report.schema.json"), "utf8");
    expect((JSON.parse(text) as { $defs: { measure: unknown } }).$defs.measure).toEqual({ $ref: "suite.schema.json#/$defs/measure" });
    // No enum of its own lists a measure (a property that happens to share a measure's name, such
    // as the vertices of a Gaussian form, is not a list of measures).
    const enums = [...text.matchAll(/"enum"\s*:\s*\[([^\]]*)\]/g)].map((e) => e[1]);
    for (const m of MEASURES) for (const e of enums) expect(e).not.toContain(`"${m}"`);
  });

  it("the record layout puts measure m of grid point g at g * perPoint + slot", () => {
    const layout = recordLayout(3);
    expect(layout.width).toBe(3 * layout.perPoint);
    expect(layout.perPoint).toBeGreaterThanOrEqual(MEASURE_COUNT);
    const seen = new Set<number>();
    for (let g = 0; g < 3; g++) for (const m of MEASURES) seen.add(layout.index(g, m));
    expect(seen.size).toBe(3 * MEASURE_COUNT);
    expect(Math.max(...seen)).toBeLessThan(layout.width);
    expect(layout.index(2, MEASURES[1])).toBe(2 * layout.perPoint + 1);
  });
});
