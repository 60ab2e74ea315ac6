// The README's Slurm job-array recipe, run for real on a single-node Slurm started by the script
// (scripts/slurm-array-check.sh). Without slurm-wlm/munge or root it prints a SKIPPED line.

import { describe, expect, it } from "vitest";
import { spawnSync } from "node:child_process";
import { join } from "node:path";

const ROOT = new URL("../../", import.meta.url).pathname;

describe("Slurm job array of parts, then a combine job (afterok)", () => {
  it("combines 4 array tasks into the bits of one run, or says why it is skipped", () => {
    const r = spawnSync("bash", [join(ROOT, "scripts/slurm-array-check.sh")], { encoding: "utf8", timeout: 240_000 });
    if (r.status === 77) {
      console.log(r.stdout.trim());
      expect(r.stdout).toMatch(/^SKIPPED: slurm array check: /m);
      return;
    }
    expect(r.status, r.stdout + r.stderr).toBe(0);
    expect(r.stdout).toMatch(/slurm array of 4 parts \+ combine: same bits as one run/);
  });
});
