// plan --detect plans from the total error the verdicts will see (control variates, statistical +
// systematic, Holm threshold): a run at the planned paths decides as planned in >= 8 of 10 seeds.
// Truth: one Gaussian walk with drift (1, 0), covariance I: sigma^2 = lim Var(L_n)/n = 4
// (4 E[((Z - mu).mu/|mu|)^2], arXiv:1301.4059; docs/theory.md). The claim is 2% too high.
import { describe, expect, it } from "vitest";
import { validateSuite } from "../../src/suite/load.js";
import { planSuite } from "../../src/plan/plan.js";
import { simulateInProcess } from "../../src/run/simulate.js";
import { evaluateChecks } from "../../src/verdict/checks.js";
import type { Suite } from "../../src/suite/schema.js";

const REL = 0.02;
const base: Suite = {
  title: "detection plan", seed: 3, walks: [{ law: "gaussian", mean: [1, 0], cov: [[1, 0], [0, 1]] }],
  measure: ["perimeter"], n: [25, 50, 100, 200, 400, 800], paths: 10000,
  claims: [{ measure: "perimeter", varianceLimit: 4 * (1 + REL), label: "2% too high" }],
};

describe("plan --detect", () => {
  it("a run at the planned paths fails the planted 2% error in >= 8 of 10 seeds", () => {
    const plan = planSuite(validateSuite(base), { goal: { kind: "detect", rel: REL } });
    const m = plan.measures[0];
    expect(m.detection, m.note).toBeTruthy();
    const N = m.limitPaths!;
    expect(N, m.note).toBeGreaterThan(0);
    expect(m.detection!.systematic).toBeGreaterThan(0);
    let fails = 0;
    for (let s = 0; s < 10; s++) {
      const sim = simulateInProcess(validateSuite({ ...base, seed: 100 + s, paths: N }));
      const c = evaluateChecks(sim, { measures: [] }).checks.find((x) => x.source.startsWith("claim"))!;
      if (c.verdict === "fail") fails++;
    }
    expect(fails, `planned ${N} paths: ${m.note}`).toBeGreaterThanOrEqual(8);
  });

  it("says so when the grid's model systematic alone prevents detection", () => {
    const plan = planSuite(validateSuite({ ...base, n: [25, 50, 100, 200, 400] }), { goal: { kind: "detect", rel: 0.0005 } });
    const m = plan.measures[0];
    expect(m.limitPaths).toBeNull();
    expect(m.note).toMatch(/no number of paths detects|not testable/);
  });
});
