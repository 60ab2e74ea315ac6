// report.html's look: one palette (no colour outside it), text contrast >= 4.5 (WCAG 2 contrast
// ratio, computed here independently of src/report from the WCAG 2.x definitions of relative
// luminance and contrast ratio, an open standard), and verdicts told apart by word and mark.

import { describe, expect, it } from "vitest";
import { renderHtml } from "../../src/report/html.js";
import { PALETTE, reportCss, TEXT_PAIRS, VERDICT_MARK } from "../../src/report/palette.js";
import { buildOneWalk } from "./fixtures.js";

/** WCAG 2 relative luminance of #rrggbb (sRGB linearisation, threshold 0.04045). */
function luminance(hex: string): number {
  const v = [1, 3, 5].map((i) => parseInt(hex.slice(i, i + 2), 16) / 255).map((c) => (c <= 0.04045 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4));
  return 0.2126 * v[0] + 0.7152 * v[1] + 0.0722 * v[2];
}
const contrast = (a: string, b: string) => {
  const [x, y] = [luminance(a), luminance(b)].sort((p, q) => q - p);
  return (x + 0.05) / (y + 0.05);
};

describe("report palette", () => {
  it("the contrast formula reproduces the standard's end points", () => {
    expect(contrast("#000000", "#ffffff")).toBeCloseTo(21, 10);
    expect(contrast("#777777", "#777777")).toBe(1);
    // #767676 on white is the usual example of a grey just above 4.5 (common practice).
    expect(contrast("#767676", "#ffffff")).toBeGreaterThan(4.5);
    expect(contrast("#777777", "#ffffff")).toBeLessThan(4.5);
  });

  it("every text colour reaches a contrast ratio >= 4.5 on each background it is drawn on", () => {
    const low = TEXT_PAIRS.map(([what, fg, bg]) => ({ what, ratio: contrast(fg, bg) })).filter((p) => !(p.ratio >= 4.5));
    expect(low).toEqual([]);
    expect(TEXT_PAIRS.length).toBeGreaterThanOrEqual(10);
  });

  it("the style sheet uses the palette's colours only, and every colour of the palette is #rrggbb", () => {
    const tokens = new Set(Object.values(PALETTE).flat().map((c) => String(c).toLowerCase()));
    for (const c of tokens) expect(c).toMatch(/^#[0-9a-f]{6}$/);
    const used = [...reportCss().matchAll(/#[0-9a-fA-F]{3,8}\b/g)].map((m) => m[0].toLowerCase());
    expect(used.length).toBeGreaterThan(10);
    expect(used.filter((c) => !tokens.has(c))).toEqual([]);
    expect(reportCss()).not.toMatch(/rgb\(|hsl\(/);
    expect(reportCss()).toMatch(/@media print/);
  });

  it("each verdict cell of report.html carries its word and a distinct mark", () => {
    const marks = Object.values(VERDICT_MARK);
    expect(new Set(marks).size).toBe(marks.length);
    const built = buildOneWalk({ paths: 640 });
    const html = renderHtml(built.json);
    const cells = [...html.matchAll(/<td class="v-([a-z-]+)"><span class="mark" aria-hidden="true">([^<]+)<\/span>([a-z-]+)<\/td>/g)];
    expect(cells.length).toBe((built.json.checks ?? []).length);
    for (const [, cls, mark, word] of cells) {
      expect(word).toBe(cls);
      expect(mark).toBe(VERDICT_MARK[word as keyof typeof VERDICT_MARK]);
    }
  });
});
