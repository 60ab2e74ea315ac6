// Atomic file writes: a temp file beside the target, then a rename, so a reader never sees a
// half-written file and an interrupted write leaves the old file (or none). A pure helper at the
// bottom of the house: every floor that writes files (run, theory's cache, report) uses this one.

import { mkdirSync, renameSync, rmSync, writeFileSync } from "node:fs";
import { dirname } from "node:path";
import { threadId } from "node:worker_threads";

let serial = 0;

/** Write `text` to `path` atomically, creating its folder; the temp file is removed on failure. */
export function writeAtomic(path: string, text: string): void {
  mkdirSync(dirname(path) || ".", { recursive: true });
  // Unique per process, thread and call: concurrent writers of one path never share a temp file.
  const tmp = `${path}.tmp-${process.pid}-${threadId}-${serial++}`;
  try {
    writeFileSync(tmp, text);
    renameSync(tmp, path);
  } catch (err) {
    rmSync(tmp, { force: true });
    throw err;
  }
}
