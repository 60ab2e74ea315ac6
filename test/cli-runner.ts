// Running the built CLI (dist/cli.js, as `npm test` builds first) from the tests.
import { spawnSync } from "node:child_process";
import { join } from "node:path";

export const ROOT = new URL("../", import.meta.url).pathname;
export const CLI = join(ROOT, "dist/cli.js");

/** Runs `walkhull ...args` to completion; stdout and stderr as text. */
export function cli(args: string[], timeout = 120_000) {
  return spawnSync("node", [CLI, ...args], { encoding: "utf8", timeout });
}
