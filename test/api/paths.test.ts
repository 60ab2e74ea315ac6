// The project's files found from src/ (here), dist/ and dist/bundle/ alike, and the bundled CLI
// against the plain modules (both built by `npm test`).

import { describe, expect, it } from "vitest";
import { spawnSync } from "node:child_process";
import { existsSync, readFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { join } from "node:path";
import { PROJECT_ROOT, projectFile, workerEntry } from "../../src/paths.js";

describe("project paths and bundles", () => {
  it("the root holds walkhull's package.json and the built modules", () => {
    expect(JSON.parse(readFileSync(join(PROJECT_ROOT, "package.json"), "utf8")).name).toBe("walkhull");
    expect(existsSync(fileURLToPath(projectFile("build/walkhull.wasm")))).toBe(true);
  });

  it("a worker entry is the bundle when built, else tsc's output", () => {
    expect(fileURLToPath(workerEntry("run-worker", "dist/run/worker.js"))).toBe(join(PROJECT_ROOT, "dist/bundle/run-worker.js"));
    expect(fileURLToPath(workerEntry("no-such-bundle", "dist/run/worker.js"))).toBe(join(PROJECT_ROOT, "dist/run/worker.js"));
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
