// Atomic file writes: a temp file beside the target, then a rename, so a reader never sees a
// half-written file and an interrupted write leaves the old file (or none). A pure helper at the
// bottom of the house: every floor that writes files (run, theory's cache, report) uses this one.

import { closeSync, mkdirSync, openSync, renameSync, rmSync, writeFileSync, writeSync } from "node:fs";
import { dirname } from "node:path";
import { threadId } from "node:worker_threads";

let serial = 0;

/**
 * Write `text` to `path` atomically, creating its folder; the temp file is removed on failure. An
 * array is written piece after piece (the file holds their concatenation, never built as one string:
 * a checkpoint's 30 MB of base64 need not be joined, escaped and converted again).
 */
export function writeAtomic(path: string, text: string | readonly string[]): void {
  mkdirSync(dirname(path) || ".", { recursive: true });
  // Unique per process, thread and call: concurrent writers of one path never share a temp file.
  const tmp = `${path}.tmp-${process.pid}-${threadId}-${serial++}`;
  try {
    if (typeof text === "string") writeFileSync(tmp, text);
    else {
      const fd = openSync(tmp, "w");
      try {
        for (const piece of text) {
          // writeSync may write less than asked (writeFileSync loops the same way).
          const bytes = Buffer.from(piece, "utf8");
          for (let done = 0; done < bytes.length; ) done += writeSync(fd, bytes, done, bytes.length - done);
        }
      } finally {
        closeSync(fd);
      }
    }
    renameSync(tmp, path);
  } catch (err) {
    rmSync(tmp, { force: true });
    throw err;
  }
}
