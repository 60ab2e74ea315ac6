import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { recordLayout } from "../../src/engine/types.js";
import { MEASURE_COUNT, MEASURE_REGISTRY, MEASURES, measureSpec } from "../../src/geometry/measure-registry.js";

const ROOT = join(import.meta.dirname, "../..");

/** Every `measure` enum of a JSON Schema document, wherever it sits. */
function measureEnums(node: unknown, out: unknown[][] = []): unknown[][] {
  if (Array.isArray(node)) node.forEach((x) => measureEnums(x, out));
  else if (node && typeof node === "object") {
    for (const [k, v] of Object.entries(node)) {
      if (k === "measure" && v && typeof v === "object" && Array.isArray((v as { enum?: unknown[] }).enum)) out.push((v as { enum: unknown[] }).enum);
      measureEnums(v, out);
    }
  }
  return out;
}

describe("measure registry", () => {
  it("slots are 0..count-1 in registry order, names unique", () => {
    expect(MEASURE_REGISTRY.map((m) => m.slot)).toEqual(MEASURE_REGISTRY.map((_, i) => i));
    expect(new Set(MEASURES).size).toBe(MEASURE_COUNT);
    for (const m of MEASURES) expect(measureSpec(m).name).toBe(m);
    expect(() => measureSpec("girth")).toThrow(/^measure: unknown measure "girth"/);
  });

  it.each(["schema/suite.schema.json", "schema/report.schema.json"])("%s lists exactly the registry's measures", (file) => {
    const enums = measureEnums(JSON.parse(readFileSync(join(ROOT, file), "utf8")));
    expect(enums.length).toBeGreaterThan(0);
    for (const e of enums) expect(e).toEqual([...MEASURES]);
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
