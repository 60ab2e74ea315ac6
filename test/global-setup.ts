// The whole test run uses a fresh prediction cache in a temporary folder (never the user's
// ~/.cache): XDG_CACHE_HOME is set before the test processes and the CLIs they spawn start.
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";

export default function setup(): () => void {
  const dir = mkdtempSync(join(tmpdir(), "walkhull-test-cache-"));
  process.env.XDG_CACHE_HOME = dir;
  return () => rmSync(dir, { recursive: true, force: true });
}
