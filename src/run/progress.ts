// Progress on stderr: a live line when wanted (a TTY, not --quiet), and a final one-line summary always.

import type { BlockCollector } from "./simulate.js";

export class Progress {
  private readonly t0 = performance.now();
  private readonly startPaths: number;
  private lastDraw = 0;

  constructor(
    private readonly title: string,
    private readonly totalPaths: number,
    private readonly totalBlocks: number,
    private readonly collector: BlockCollector,
    private readonly live: boolean,
    private readonly log: (text: string) => void,
  ) {
    this.startPaths = this.pathsDone();
  }

  private pathsDone(): number {
    let s = 0;
    for (const b of this.collector.blocks.values()) s += b.paths;
    return s;
  }

  update(): void {
    if (!this.live) return;
    const now = performance.now();
    if (now - this.lastDraw < 200) return;
    this.lastDraw = now;
    const done = this.pathsDone();
    const secs = (now - this.t0) / 1000;
    const rate = (done - this.startPaths) / Math.max(secs, 1e-9);
    const blocks = this.collector.blocks.size;
    const remainingBlocks = this.totalBlocks - blocks;
    const remainingPaths = (remainingBlocks * this.totalPaths) / Math.max(this.totalBlocks, 1);
    const eta = rate > 0 ? remainingPaths / rate : NaN;
    this.log(
      `\r${this.title.slice(0, 40)}: ${blocks}/${this.totalBlocks} blocks, ${done} paths, ${fmtRate(rate)} paths/s, ETA ${Number.isFinite(eta) ? `${eta.toFixed(0)} s` : "?"}   `,
    );
  }

  finish(summary: string): void {
    if (this.live) this.log("\r\x1b[K");
    this.log(`walkhull: ${this.title}: ${summary}\n`);
  }
}

function fmtRate(r: number): string {
  return r >= 1e6 ? `${(r / 1e6).toFixed(2)}M` : r >= 1e3 ? `${(r / 1e3).toFixed(1)}k` : r.toFixed(0);
}
