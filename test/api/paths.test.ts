// The project's files found from src/ (here), dist/ and dist/bundle/ alike, and the bundled CLI
// against the plain modules (both built by `npm test`).

import { describe, expect, it } from "vitest";
import { spawnSync } from "node:child_process";
import { existsSync, mkdtempSync, readFileSync, utimesSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { fileURLToPath } from "node:url";
import { join } from "node:path";
import { bundleIsCurrent, PROJECT_ROOT, projectFile, workerEntry } from "../../src/paths.js";

describe("project paths and bundles", () => {
  it("the root holds walkhull's package.json and the built modules", () => {
    expect(JSON.parse(readFileSync(join(PROJECT_ROOT, "package.json"), "utf8")).name).toBe("walkhull");
    expect(existsSync(fileURLToPath(projectFile("build/walkhull.wasm")))).toBe(true);
  });

  it("a worker entry is the bundle when built, else tsc's output", () => {
    expect(fileURLToPath(workerEntry("run-worker", "dist/run/worker.js"))).toBe(join(PROJECT_ROOT, "dist/bundle/run-worker.js"));
    expect(fileURLToPath(workerEntry("no-such-bundle", "dist/run/worker.js"))).toBe(join(PROJECT_ROOT, "dist/run/worker.js"));
  });

  it("a bundle older than its module is not used", () => {
    const dir = mkdtempSync(join(tmpdir(), "walkhull-paths-"));
    const [bundle, plain] = [join(dir, "b.js"), join(dir, "p.js")];
    writeFileSync(plain, "");
    writeFileSync(bundle, "");
    utimesSync(plain, 1000, 1000);
    utimesSync(bundle, 2000, 2000);
    expect(bundleIsCurrent(bundle, plain)).toBe(true);
    utimesSync(plain, 3000, 3000);
    expect(bundleIsCurrent(bundle, plain)).toBe(false);
    expect(bundleIsCurrent(join(dir, "none.js"), plain)).toBe(false);
  });

  it("the bundled CLI and the plain modules answer alike (help, a bad suite)", () => {
    const run = (entry: string, args: string[]) => spawnSync(process.execPath, [join(PROJECT_ROOT, entry), ...args], { encoding: "utf8" });
    for (const args of [["help"], ["predict", join(PROJECT_ROOT, "no-such-suite.json")]]) {
      const bundled = run("dist/cli.js", args);
      const plain = run("dist/cli-main.js", args);
      expect(bundled.status).toBe(plain.status);
      expect(bundled.stdout).toBe(plain.stdout);
      expect(bundled.stderr).toBe(plain.stderr);
    }
    expect(run("dist/cli.js", ["help"]).stdout).toMatch(/walkhull run <suite.json>/);
  });
});
