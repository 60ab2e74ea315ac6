// The tool's version (from package.json) and the project root, for provenance and checkpoints.
import { readFileSync } from "node:fs";
import { PROJECT_ROOT } from "./paths.js";

export { PROJECT_ROOT };

export function toolVersion(): string {
  try {
    return JSON.parse(readFileSync(PROJECT_ROOT + "package.json", "utf8")).version as string;
  } catch {
    return "unknown";
  }
}
