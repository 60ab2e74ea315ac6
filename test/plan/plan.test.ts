import { describe, expect, it } from "vitest";
import { detectionSE, pathsForTargetSE, pathsToDetect, planSuite, renderPlan, varianceOfVariance } from "../../src/plan/plan.js";
import { simulateInProcess } from "../../src/run/simulate.js";
import { validateSuite } from "../../src/suite/load.js";

// Closed form (normal samples): Var(s^2) = 2 sigma^4 / (N - 1) (e.g. Kendall & Stuart, The Advanced
// Theory of Statistics vol. 1; s^2 (N-1)/sigma^2 ~ chi2(N-1)), so N = 1 + 2 sigma^4 / SE^2.
describe("planner core vs the Gaussian closed form", () => {
  it("Var(s^2) with mu4 = 3 sigma^4 equals 2 sigma^4/(N-1)", () => {
    for (const s2 of [0.3, 1, 7.5]) {
      for (const N of [4, 10, 1234, 1e6]) {
        const v = varianceOfVariance(3 * s2 * s2, s2, N);
        expect(Math.abs(v - (2 * s2 * s2) / (N - 1))).toBeLessThanOrEqual(1e-12 * v);
      }
    }
  });

  it("paths for a target SE: N = ceil(1 + 2 sigma^4 / SE^2)", () => {
    const cases: [number, number][] = [[1, 0.013], [4, 0.37], [0.25, 0.0011], [2.5, 0.9]];
    for (const [s2, se] of cases) {
      const exact = 1 + (2 * s2 * s2) / (se * se);
      expect(Number.isInteger(exact)).toBe(false);
      expect(pathsForTargetSE(3 * s2 * s2, s2, se)).toBe(Math.max(4, Math.ceil(exact)));
    }
  });

  it("detection: SE = REL sigma^2 / (z_{1-alpha/2} + z_{0.9})", () => {
    // z_{0.995} = 2.5758293035489, z_{0.9} = 1.2815515655446 (standard normal table values, from memory).
    const z = 2.5758293035489 + 1.2815515655446;
    const s2 = 2.2, rel = 0.03;
    expect(detectionSE(s2, rel, 0.01)).toBeCloseTo((rel * s2) / z, 12);
    const exact = 1 + 2 * (z / rel) ** 2;
    expect(pathsToDetect(3 * s2 * s2, s2, rel, 0.01)).toBe(Math.ceil(exact));
  });

  it("heavier tails need more paths; the returned N is the smallest that meets the target", () => {
    const s2 = 1.7, se = 0.05;
    const mu4 = 6.2 * s2 * s2;
    const N = pathsForTargetSE(mu4, s2, se);
    expect(N).toBeGreaterThan(pathsForTargetSE(3 * s2 * s2, s2, se));
    expect(Math.sqrt(varianceOfVariance(mu4, s2, N))).toBeLessThanOrEqual(se);
    expect(Math.sqrt(varianceOfVariance(mu4, s2, N - 1))).toBeGreaterThan(se);
  });

  it("bad input names the field", () => {
    expect(() => pathsForTargetSE(3, 1, 0)).toThrow(/^targetSE:/);
    expect(() => pathsForTargetSE(3, -1, 0.1)).toThrow(/^sigma2:/);
    expect(() => pathsForTargetSE(0.5, 1, 0.1)).toThrow(/^mu4:/);
    expect(() => detectionSE(1, -0.1, 0.01)).toThrow(/^detect:/);
    expect(() => detectionSE(1, 0.1, 1.5)).toThrow(/^alpha:/);
  });
});

const oneWalk = (n: number[], seed: number) => validateSuite({
  title: "planner check: one drifting Gaussian walk",
  seed,
  walks: [{ law: "gaussian", mean: [1, 0], cov: [[1, 0], [0, 1]] }],
  measure: ["perimeter"],
  n,
  paths: 1000,
});

describe("planner vs a run at the planned N", () => {
  it("the observed varianceSE of Var/n at the largest n is within a factor 1.25 of the target", () => {
    // Pilot 2000 paths, run at the planned N (about 8000) with another seed. For a normal measure
    // the relative SD of an estimated SE of s^2 is about sqrt(56/N)/4 (delta method on m4 - s^4):
    // 4.2% for the pilot, 2.1% for the run, 4.7% combined, so a factor 1.25 (log 0.22) is z ~ 4.7.
    // The pilot's kurtosis is asserted near 3 so that this normal-based bound applies.
    const target = 0.06;
    const plan = planSuite(oneWalk([100], 11), { goal: { kind: "target-se", se: target }, pilotPaths: 2000 });
    const m = plan.measures[0];
    expect(m.measure).toBe("perimeter");
    expect(m.scaling).toBe(1);
    expect(Math.abs(m.kurtosis - 3)).toBeLessThan(0.5);
    expect(m.paths).toBeGreaterThan(2000);
    expect(m.paths).toBeLessThan(40000);
    const sim = simulateInProcess({ ...oneWalk([100], 12), paths: m.paths });
    const rec = sim.results.find((r) => r.measure === "perimeter" && r.n === 100)!;
    const observed = rec.varianceSE / 100;
    expect(observed / target).toBeGreaterThan(1 / 1.25);
    expect(observed / target).toBeLessThan(1.25);
  }, 60_000);

  it("a five-point grid gives an inflation factor; a one-point grid says the limit is not included", () => {
    const five = planSuite(oneWalk([32, 64, 128, 256, 512], 5), { goal: { kind: "target-se", se: 0.05 }, pilotPaths: 1000 });
    expect(five.measures[0].inflation).not.toBeNull();
    expect(five.measures[0].inflation!).toBeGreaterThan(0);
    expect(five.measures[0].limitPaths).toBe(Math.ceil(five.measures[0].paths * Math.max(1, five.measures[0].inflation!) ** 2));
    const one = planSuite(oneWalk([64], 5), { goal: { kind: "target-se", se: 0.05 }, pilotPaths: 500 });
    expect(one.measures[0].inflation).toBeNull();
    const text = renderPlan(one);
    expect(text).toMatch(/LARGEST n/);
    expect(text).toMatch(/not included/);
    expect(one.secondsPerPath).toBeGreaterThan(0);
  }, 60_000);

  it("bad options name the field", () => {
    expect(() => planSuite(oneWalk([64], 5), { goal: { kind: "target-se", se: -1 } })).toThrow(/^target-se:/);
    expect(() => planSuite(oneWalk([64], 5), { goal: { kind: "detect", rel: 0.1 }, workers: 0 })).toThrow(/^workers:/);
    expect(() => planSuite(oneWalk([64], 5), { goal: { kind: "detect", rel: 0.1 }, pilotPaths: 10 })).toThrow(/^pilotPaths:/);
  });
});

describe("walkhull plan: bad input exits 2 with a message naming the option", () => {
  const suite = new URL("../../validation/one-walk-drift-gaussian.json", import.meta.url).pathname;
  const run = async (args: string[]) => {
    const { main } = await import("../../src/commands.js");
    const errors: string[] = [];
    const write = process.stderr.write.bind(process.stderr);
    process.stderr.write = ((chunk: string) => { errors.push(String(chunk)); return true; }) as typeof process.stderr.write;
    try {
      return { code: await main(["plan", suite, ...args]), stderr: errors.join("") };
    } finally {
      process.stderr.write = write;
    }
  };
  it("neither or both goals, non-positive values, zero workers", async () => {
    for (const [args, pattern] of [
      [[], /exactly one of --target-se X or --detect REL/],
      [["--target-se", "0.1", "--detect", "0.1"], /exactly one of/],
      [["--target-se", "0"], /^walkhull: --target-se: expected a positive number/],
      [["--detect=-0.5"], /^walkhull: --detect: expected a positive number/],
      [["--detect", "abc"], /^walkhull: --detect: expected a positive number/],
      [["--detect", "0.1", "--workers", "0"], /^walkhull: --workers: must be >= 1/],
    ] as [string[], RegExp][]) {
      const r = await run(args);
      expect(r.code).toBe(2);
      expect(r.stderr).toMatch(pattern);
    }
  });
});
