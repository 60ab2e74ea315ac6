import { mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { predictCached, predictionCacheDir, predictionKey } from "../../src/theory/cache.js";
import { validateSuite } from "../../src/suite/load.js";

// Two Gaussian walks, a small grid: the k-walk Cauchy quadrature runs (a fraction of a second).
const suite = validateSuite({
  title: "cache test", seed: 1, paths: 100, measure: ["perimeter", "area"], n: [10, 20],
  walks: [
    { law: "gaussian", mean: [1, 0], cov: [[1, 0], [0, 1]] },
    { law: "gaussian", mean: [0, 1], cov: [[1, 0], [0, 1]] },
  ],
});
const opts = { budgetSeconds: 60, meanTargets: { relative: 1e-6 } };

describe("prediction cache (XDG_CACHE_HOME pointed at a temporary folder)", () => {
  let dir: string;
  let env: NodeJS.ProcessEnv;
  beforeEach(() => {
    dir = mkdtempSync(join(tmpdir(), "walkhull-cache-test-"));
    env = { ...process.env, XDG_CACHE_HOME: dir };
  });
  afterEach(() => rmSync(dir, { recursive: true, force: true }));
  const entries = () => readdirSync(predictionCacheDir(env));

  it("lives under $XDG_CACHE_HOME, else ~/.cache", () => {
    expect(predictionCacheDir(env)).toBe(join(dir, "walkhull", "predictions"));
    expect(predictionCacheDir({ HOME: "/home/someone" })).toBe("/home/someone/.cache/walkhull/predictions");
    expect(predictionCacheDir({ HOME: "/home/someone", XDG_CACHE_HOME: "relative/path" })).toBe("/home/someone/.cache/walkhull/predictions");
  });

  it("miss, then hit with the same values; a new accuracy or version is a miss", () => {
    const first = predictCached(suite, opts, { env, version: "1.0.0" });
    expect(first.cache?.status).toBe("miss");
    expect(entries()).toHaveLength(1);
    const second = predictCached(suite, opts, { env, version: "1.0.0" });
    expect(second.cache?.status).toBe("hit");
    expect(second.cache?.file).toBe(first.cache?.file);
    const per = (p: typeof first) => p.measures.find((m) => m.measure === "perimeter")!;
    expect(per(second).exactMeans).toEqual(per(first).exactMeans);
    expect(per(second).exactMeansError).toEqual(per(first).exactMeansError);
    expect(per(second).exactMeansTarget).toEqual(per(first).exactMeansTarget);
    // Another requested accuracy: another key.
    expect(predictCached(suite, { ...opts, meanTargets: { relative: 1e-5 } }, { env, version: "1.0.0" }).cache?.status).toBe("miss");
    // Another tool version: the old entry is not used.
    expect(predictionKey(suite, opts, "1.0.1")).not.toBe(predictionKey(suite, opts, "1.0.0"));
    expect(predictCached(suite, opts, { env, version: "1.0.1" }).cache?.status).toBe("miss");
    expect(entries()).toHaveLength(3);
  });

  it("a corrupt, tampered or foreign entry is ignored and rewritten", () => {
    const first = predictCached(suite, opts, { env, version: "1.0.0" });
    const file = first.cache!.file!;
    const good = readFileSync(file, "utf8");
    const means = (p: typeof first) => p.measures.find((m) => m.measure === "perimeter")!.exactMeans;
    // Rewritten: the next call reads a valid entry with the same values (the reasons' timings may differ).
    const rewritten = () => {
      const next = predictCached(suite, opts, { env, version: "1.0.0" });
      expect(next.cache?.status).toBe("hit");
      expect(means(next)).toEqual(means(first));
    };
    // Truncated file.
    writeFileSync(file, good.slice(0, good.length / 2));
    expect(predictCached(suite, opts, { env, version: "1.0.0" }).cache?.status).toBe("miss");
    rewritten();
    // A value changed without updating the checksum.
    const entry = JSON.parse(good);
    const per = entry.prediction.measures.find((m: { measure: string }) => m.measure === "perimeter");
    per.exactMeans["20"] += 1;
    writeFileSync(file, JSON.stringify(entry));
    const again = predictCached(suite, opts, { env, version: "1.0.0" });
    expect(again.cache?.status).toBe("miss");
    expect(means(again)["20"]).toBe(per.exactMeans["20"] - 1);
    rewritten();
    // An entry of another version (right checksum) under this key's file name.
    const foreign = JSON.parse(good);
    foreign.version = "0.0.1";
    writeFileSync(file, JSON.stringify(foreign));
    expect(predictCached(suite, opts, { env, version: "1.0.0" }).cache?.status).toBe("miss");
    rewritten();
  });

  it("--no-cache (use: false) neither reads nor writes", () => {
    expect(predictCached(suite, opts, { env, use: false }).cache).toEqual({ status: "off", file: null });
    expect(() => entries()).toThrow();
  });
});
