// Writes the engine's random stream to stdout as raw 32-bit little-endian words, for an external
// test battery (test/engine/prng-battery.test.ts pipes it into Debian's dieharder, `-g 200`).
// The words interleave several substreams as a run consumes them: the (path, walk) substreams of
// two neighbouring blocks, round-robin, one 64-bit output (low word, then high word) from each in
// turn. The generator is the TypeScript twin of the WASM kernel's stream (bit-identical, see
// test/engine/kernel.test.ts). Usage: node --import tsx scripts/prng-stream.ts [seed] [max MiB]
// (no limit: runs until the reader closes the pipe).

import { Rng } from "../src/engine/prng.js";

/** Substreams of blocks b and b + 1: `paths` paths x `walks` walks each, in the engine's order. */
export function interleavedStreams(seed: number, block: number, paths: number, walks: number): Rng[] {
  const out: Rng[] = [];
  for (const b of [block, block + 1]) {
    const blockRng = new Rng();
    blockRng.seedBlock(seed, b);
    for (let p = 0; p < paths; p++) {
      for (let w = 0; w < walks; w++) {
        blockRng.nextSubstream();
        const r = new Rng();
        r.a0 = blockRng.a0; r.a1 = blockRng.a1; r.b0 = blockRng.b0; r.b1 = blockRng.b1;
        r.c0 = blockRng.c0; r.c1 = blockRng.c1; r.d0 = blockRng.d0; r.d1 = blockRng.d1;
        out.push(r);
      }
    }
  }
  return out;
}

/** Fills `words` with the round-robin interleaving of the streams' 64-bit outputs (low, high). */
export function fillInterleaved(streams: Rng[], words: Uint32Array): void {
  let k = 0;
  for (let i = 0; i + 1 < words.length; i += 2) {
    const r = streams[k];
    r.next();
    words[i] = r.rL;
    words[i + 1] = r.rH;
    k = k + 1 === streams.length ? 0 : k + 1;
  }
}

async function main(): Promise<void> {
  const seed = Number(process.argv[2] ?? 2026);
  const maxMiB = Number(process.argv[3] ?? Infinity);
  const streams = interleavedStreams(seed, 0, 4, 2);
  const chunk = new Uint32Array(1 << 18);
  let written = 0;
  process.stdout.on("error", () => process.exit(0)); // the reader closed the pipe
  while (written < maxMiB * 2 ** 20) {
    fillInterleaved(streams, chunk);
    const buf = Buffer.from(chunk.buffer.slice(0));
    written += buf.length;
    if (!process.stdout.write(buf)) await new Promise((r) => process.stdout.once("drain", r));
  }
}

if (process.argv[1] && import.meta.url.endsWith(process.argv[1].split("/").pop()!)) void main();
