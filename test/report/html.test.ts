// report.md and report.html from a real (small) run, then report.html in a real browser
// (Debian's chromium through playwright-core): plots present with the right number of points,
// no console errors, no network request, a screenshot in test-artifacts/report.png.

import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { existsSync, mkdirSync, mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { pathToFileURL } from "node:url";
import { renderHtml } from "../../src/report/html.js";
import { renderMarkdown } from "../../src/report/markdown.js";
import type { Check } from "../../src/verdict/types.js";
import { buildOneWalk, geometryOf, type Built } from "./fixtures.js";

const ROOT = new URL("../../", import.meta.url).pathname;
const CHROMIUM = "/usr/bin/chromium";
const hasChromium = existsSync(CHROMIUM);
if (!hasChromium) console.log(`SKIPPED: chromium not installed (${CHROMIUM} is missing; .ci/run installs the Debian package) - the browser test of report.html is skipped`);

let built: Built;
let html: string;
let geometry: ReturnType<typeof geometryOf>;
const QQ_POINTS = 400;

beforeAll(() => {
  built = buildOneWalk({ paths: 6400 });
  geometry = geometryOf(built.suite);
  html = renderHtml(built.json, { sample: built.sim.sample, geometry });
});

/** Elements inside each <svg data-plot=...> of the HTML text. */
function plots(text: string): { plot: string; measure: string | null; points: number; circles: number }[] {
  return [...text.matchAll(/<svg [^>]*data-plot="([^"]+)"[^>]*>([\s\S]*?)<\/svg>/g)].map((m) => ({
    plot: m[1],
    measure: /data-measure="([^"]+)"/.exec(m[0])?.[1] ?? null,
    points: Number(/data-points="(\d+)"/.exec(m[0])?.[1] ?? NaN),
    circles: (m[2].match(/<circle /g) ?? []).length,
  }));
}

describe("report.md", () => {
  it("has the verdict table, predictions with sources, fitted limits, covariance, provenance and caveats", () => {
    const md = renderMarkdown(built.json);
    const checks = built.json.checks as Check[];
    expect(md).toMatch(/^# walkhull report: report test: one drifting Gaussian walk/);
    expect(md).toMatch(/\| check \| verdict \| gated \| estimate \| expected \| 95% CI \|/);
    for (const c of checks) expect(md).toContain(`| ${c.id} | ${c.verdict} |`);
    expect(md).toContain("arXiv:1301.4059");
    expect(md).toMatch(/## Fitted limits and rates[\s\S]*\| perimeter \| lim Var\/n\^1 \|/);
    expect(md).toMatch(/## Covariance between measures[\s\S]*### n = 256[\s\S]*Correlation:/);
    expect(md).toContain(`| suite sha256 | ${built.json.provenance.suiteHash} |`);
    expect(md).toContain(`| Node | ${process.version} |`);
    expect(md).toMatch(/numerical evidence under the stated model[^\n]*not a proof/);
  });
});

describe("report.html (text)", () => {
  it("is self-contained: no script, no external URL, inline style", () => {
    expect(html).not.toMatch(/<script/i);
    expect(html).not.toMatch(/(src|href)=["']?(https?:)?\/\//i);
    const urls = [...html.matchAll(/https?:\/\/[^\s"'<)]+/g)].map((m) => m[0]);
    expect(urls.every((u) => u === "http://www.w3.org/2000/svg")).toBe(true);
    expect(html).toMatch(/<style>/);
  });

  it("has every plot with one circle per data point", () => {
    const ps = plots(html);
    const G = built.suite.n.length;
    const m = built.sim.sample.pathIndex.length;
    for (const measure of built.suite.measure) {
      const of = (p: string) => ps.filter((x) => x.plot === p && x.measure === measure);
      expect(of("variance-ratio")).toHaveLength(1);
      expect(of("variance-ratio")[0].circles).toBe(G);
      expect(of("qq")[0].circles).toBe(Math.min(m, QQ_POINTS));
      expect(of("ks-distance")[0].circles).toBe(of("ks-distance")[0].points);
      expect(of("ks-distance")[0].circles).toBeGreaterThanOrEqual(G - 1);
      expect(of("histogram")).toHaveLength(1);
      expect(of("histogram")[0].circles).toBe(0);
    }
    const hull = ps.filter((x) => x.plot === "hull");
    expect(hull).toHaveLength(1);
    expect(hull[0].circles).toBe(geometry.hull.length / 2);
    for (const p of ps) if (Number.isFinite(p.points)) expect(p.circles).toBe(p.points);
  });

  it("shows the predicted limit, the fitted curve and the limit band of the perimeter", () => {
    const svg = /<svg [^>]*data-plot="variance-ratio" data-measure="perimeter"[\s\S]*?<\/svg>/.exec(html)![0];
    expect(svg).toMatch(/class="predicted"/);
    expect(svg).toMatch(/predicted 4 \(theorem\)/);
    expect(svg).toMatch(/class="fit"/);
    expect(svg).toMatch(/class="band"/);
  });
});

describe.skipIf(!hasChromium)("report.html in chromium", () => {
  let browser: import("playwright-core").Browser;
  beforeAll(async () => {
    const { chromium } = await import("playwright-core");
    browser = await chromium.launch({
      executablePath: CHROMIUM,
      headless: true,
      args: ["--no-sandbox", "--disable-gpu", "--disable-background-networking", "--disable-component-update", "--no-first-run", "--disable-sync"],
    });
  });
  afterAll(async () => {
    await browser?.close();
  });

  it("renders the plots with the right number of points, no console error, no request, and a screenshot", async () => {
    const dir = mkdtempSync(join(tmpdir(), "walkhull-html-"));
    const file = join(dir, "report.html");
    writeFileSync(file, html);
    const page = await browser.newPage({ viewport: { width: 1240, height: 900 } });
    const errors: string[] = [];
    const requests: string[] = [];
    page.on("console", (msg) => {
      if (msg.type() === "error" || msg.type() === "warning") errors.push(`${msg.type()}: ${msg.text()}`);
    });
    page.on("pageerror", (e) => errors.push(`pageerror: ${e.message}`));
    page.on("request", (r) => {
      if (!r.url().startsWith("file:")) requests.push(r.url());
    });
    await page.goto(pathToFileURL(file).href, { waitUntil: "load" });
    const seen = await page.evaluate(() =>
      [...document.querySelectorAll("svg[data-plot]")].map((svg) => {
        const box = (svg as SVGSVGElement).getBoundingClientRect();
        const circles = [...svg.querySelectorAll("circle")];
        const inside = circles.filter((c) => {
          const b = c.getBoundingClientRect();
          return b.width > 0 && b.left >= box.left - 1 && b.right <= box.right + 1 && b.top >= box.top - 1 && b.bottom <= box.bottom + 1;
        }).length;
        return { plot: svg.getAttribute("data-plot"), measure: svg.getAttribute("data-measure"), points: Number(svg.getAttribute("data-points")), circles: circles.length, inside, width: box.width, height: box.height };
      }),
    );
    const G = built.suite.n.length;
    const varPlots = seen.filter((s) => s.plot === "variance-ratio");
    expect(varPlots.map((s) => s.measure)).toEqual(built.suite.measure);
    for (const s of varPlots) expect(s.circles).toBe(G);
    expect(seen.filter((s) => s.plot === "qq").every((s) => s.circles === Math.min(built.sim.sample.pathIndex.length, QQ_POINTS))).toBe(true);
    expect(seen.filter((s) => s.plot === "histogram")).toHaveLength(built.suite.measure.length);
    expect(seen.filter((s) => s.plot === "ks-distance")).toHaveLength(built.suite.measure.length);
    expect(seen.find((s) => s.plot === "hull")?.circles).toBe(geometry.hull.length / 2);
    for (const s of seen) {
      expect(s.width).toBeGreaterThan(200);
      expect(s.height).toBeGreaterThan(200);
      if (Number.isFinite(s.points)) expect(s.circles).toBe(s.points);
      // Every data point is drawn inside its plot (the axes' domains cover the data).
      expect(s.inside).toBe(s.circles);
    }
    expect(await page.title()).toMatch(/^walkhull report: /);
    expect(errors).toEqual([]);
    expect(requests).toEqual([]);
    mkdirSync(join(ROOT, "test-artifacts"), { recursive: true });
    await page.screenshot({ path: join(ROOT, "test-artifacts/report.png"), fullPage: true });
    await page.close();
    expect(existsSync(join(ROOT, "test-artifacts/report.png"))).toBe(true);
  });
});
