// The engine's random stream, tested as a run consumes it: several substreams (the (path, walk)
// substreams of two neighbouring blocks) interleaved round-robin (scripts/prng-stream.ts).
//
// 1. A quick in-repo check (always runs): byte chi-square of the interleaved stream, and the
//    correlation between adjacent substreams, between blocks with neighbouring indices, and at lag 1
//    within a substream: each |z| <= 4 (two-sided 6e-5), chi-square p in [1e-4, 1 - 1e-4].
// 2. Debian's dieharder battery (`apt-get install dieharder`; .ci/run installs it when root): a
//    selection of its tests on the stream piped to `dieharder -g 200` (raw 32-bit words on stdin),
//    with `-Y 1` (a WEAK result is re-tested with more samples until it resolves). No test may
//    end FAILED; the summary line (passed / weak / failed) is printed. Without dieharder: SKIPPED.
// Fixed seed 2026: deterministic input, so deterministic results.

import { describe, expect, it } from "vitest";
import { spawnSync } from "node:child_process";
import { Rng } from "../../src/engine/prng.js";
import { chiSquareSf } from "../../src/stats/chisquare.js";
import { fillInterleaved, interleavedStreams } from "../../scripts/prng-stream.js";

const ROOT = new URL("../../", import.meta.url).pathname;
const Z = 4;

/** First `count` uniforms in [0, 1) (53 bits, as the kernel makes them) of one substream. */
function uniforms(seed: number, block: number, index: number, count: number): Float64Array {
  const rng = new Rng();
  rng.seedBlock(seed, block);
  for (let i = 0; i <= index; i++) rng.nextSubstream();
  const out = new Float64Array(count);
  for (let i = 0; i < count; i++) {
    rng.next();
    // (x >> 11) * 2^-53 with x = rH * 2^32 + rL.
    out[i] = ((rng.rH >>> 0) * 2 ** 21 + (rng.rL >>> 11)) * 2 ** -53;
  }
  return out;
}

/** sqrt(N) times the Pearson correlation of x and y: about N(0, 1) for independent streams. */
function corrZ(x: Float64Array, y: Float64Array): number {
  const n = x.length;
  let mx = 0, my = 0;
  for (let i = 0; i < n; i++) { mx += x[i]; my += y[i]; }
  mx /= n; my /= n;
  let sxy = 0, sxx = 0, syy = 0;
  for (let i = 0; i < n; i++) {
    const a = x[i] - mx, b = y[i] - my;
    sxy += a * b; sxx += a * a; syy += b * b;
  }
  return (sxy / Math.sqrt(sxx * syy)) * Math.sqrt(n);
}

describe("random stream: quick in-repo checks", () => {
  it("bytes of the interleaved stream are uniform (chi-square, 255 df)", () => {
    const words = new Uint32Array(1 << 20);
    fillInterleaved(interleavedStreams(2026, 0, 4, 2), words);
    const bytes = new Uint8Array(words.buffer);
    const counts = new Float64Array(256);
    for (const b of bytes) counts[b]++;
    const e = bytes.length / 256;
    const chi2 = counts.reduce((s, c) => s + (c - e) ** 2 / e, 0);
    const p = chiSquareSf(chi2, 255);
    console.log(`byte chi-square over ${bytes.length} bytes: ${chi2.toFixed(1)} on 255 df, p = ${p.toFixed(4)}`);
    expect(p).toBeGreaterThan(1e-4);
    expect(p).toBeLessThan(1 - 1e-4);
  });

  it("no correlation between adjacent substreams, neighbouring blocks, or successive draws", () => {
    const N = 1 << 18;
    const pairs: [string, Float64Array, Float64Array][] = [];
    for (const [b, i] of [[0, 0], [0, 1], [7, 2], [1023, 0]]) pairs.push([`block ${b}: substreams ${i}, ${i + 1}`, uniforms(2026, b, i, N), uniforms(2026, b, i + 1, N)]);
    for (const b of [0, 1, 63, 1 << 20]) pairs.push([`substream 0 of blocks ${b}, ${b + 1}`, uniforms(2026, b, 0, N), uniforms(2026, b + 1, 0, N)]);
    pairs.push(["seeds 2026, 2027: block 0, substream 0", uniforms(2026, 0, 0, N), uniforms(2027, 0, 0, N)]);
    const own = uniforms(2026, 3, 5, N + 1);
    pairs.push(["lag 1 within a substream", own.subarray(0, N), own.subarray(1)]);
    const zs = pairs.map(([what, x, y]) => ({ what, z: corrZ(x, y) }));
    console.log(zs.map((c) => `${c.what}: z = ${c.z.toFixed(2)}`).join("; "));
    for (const c of zs) expect(Math.abs(c.z), c.what).toBeLessThanOrEqual(Z);
    // Each uniform lies in [0, 1) and their mean is 1/2 within Z standard errors (sd 1/sqrt(12)).
    for (const [, x] of pairs.slice(0, 1)) {
      const m = x.reduce((s, v) => s + v, 0) / N;
      expect(Math.abs(m - 0.5) / (1 / Math.sqrt(12 * N))).toBeLessThanOrEqual(Z);
      expect(x.every((v) => v >= 0 && v < 1)).toBe(true);
    }
  });
});

// A selection that runs in about a minute on one idle core: birthdays, operm5, 6x8 rank,
// bitstream, count-the-1s (stream), parking lot, 2-D and 3-D spheres, runs, craps, monobit.
const DIEHARDER_TESTS = [0, 1, 3, 4, 8, 10, 11, 12, 15, 16, 100];
const hasDieharder = spawnSync("sh", ["-c", "command -v dieharder"], { encoding: "utf8" }).status === 0;
if (!hasDieharder) console.log("SKIPPED: dieharder not installed (Debian package dieharder; .ci/run installs it as root) - the PRNG battery is skipped");

describe("random stream: dieharder battery", () => {
  it.skipIf(!hasDieharder)("no test FAILED; prints passed / weak / failed", () => {
    const counts = { PASSED: 0, WEAK: 0, FAILED: 0 };
    const lines: string[] = [];
    let resolved = 0;
    for (const d of DIEHARDER_TESTS) {
      const r = spawnSync("bash", ["-c", `set -o pipefail; node --import tsx scripts/prng-stream.ts 2026 | dieharder -g 200 -d ${d} -Y 1`], {
        cwd: ROOT, encoding: "utf8", timeout: 120_000, maxBuffer: 1 << 24,
      });
      const results = r.stdout.split("\n").filter((l) => /\|\s*(PASSED|WEAK|FAILED)\s*$/.test(l));
      expect(results.length, `dieharder -d ${d}: ${r.stderr.slice(-300)}`).toBeGreaterThan(0);
      // With -Y 1 a WEAK line is followed by its re-test (same test name): the re-test counts.
      const name = (l: string) => l.split("|")[0].trim();
      const final = results.filter((l, i) => !(/WEAK\s*$/.test(l) && i + 1 < results.length && name(results[i + 1]) === name(l)));
      resolved += results.length - final.length;
      for (const l of final) {
        const verdict = /(PASSED|WEAK|FAILED)\s*$/.exec(l)![1] as keyof typeof counts;
        counts[verdict]++;
        lines.push(l.trim());
      }
    }
    console.log(lines.join("\n"));
    console.log(`dieharder on the interleaved substreams (seed 2026): ${counts.PASSED} passed, ${counts.WEAK} weak, ${counts.FAILED} failed (${resolved} weak result(s) resolved by re-testing)`);
    expect(counts.FAILED).toBe(0);
    expect(counts.PASSED).toBeGreaterThanOrEqual(DIEHARDER_TESTS.length);
  }, 600_000);
});
