// The tool's version (from package.json) and the project root, for provenance and checkpoints.
import { readFileSync } from "node:fs";
import { fileURLToPath } from "node:url";

/** The project root: this file is src/version.ts or dist/version.js, one level below it. */
export const PROJECT_ROOT = fileURLToPath(new URL("../", import.meta.url));

export function toolVersion(): string {
  try {
    return JSON.parse(readFileSync(PROJECT_ROOT + "package.json", "utf8")).version as string;
  } catch {
    return "unknown";
  }
}
