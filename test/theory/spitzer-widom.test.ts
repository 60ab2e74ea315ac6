import { describe, expect, it } from "vitest";
import { gaussianAbsMean } from "../../src/theory/gaussian-abs.js";
import { spitzerWidomMeans } from "../../src/theory/spitzer-widom.js";
import type { StepLaw, Vec2 } from "../../src/suite/schema.js";
import { hullOf } from "./theory-helpers.js";

const I: [[number, number], [number, number]] = [[1, 0], [0, 1]];

describe("Spitzer–Widom exact mean perimeter ('The circumference of a convex polygon', Proc. AMS 12 (1961); docs/theory.md sec. 2)", () => {
  it("reproduces the check values to 1e-8 (Gaussian, drift (1,0), Sigma = I) [derived values, docs/theory.md sec. 2]", () => {
    const r = spitzerWidomMeans({ law: "gaussian", mean: [1, 0], cov: I }, [10, 100, 1000], 20);
    expect(Math.abs(r.means["10"] - 23.19253541)).toBeLessThan(1e-8);
    expect(Math.abs(r.means["100"] - 205.47449805)).toBeLessThan(1e-8);
    expect(Math.abs(r.means["1000"] - 2007.77484783)).toBeLessThan(1e-8);
  });
  it("reproduces the zero-drift check values to 1e-8 [derived values, docs/theory.md sec. 2]", () => {
    const r = spitzerWidomMeans({ law: "gaussian", mean: [0, 0], cov: I }, [1, 10, 100, 1000], 20);
    expect(Math.abs(r.means["1"] - 2.50662827)).toBeLessThan(1e-8);
    expect(Math.abs(r.means["10"] - 12.5857753)).toBeLessThan(1e-8);
    expect(Math.abs(r.means["100"] - 46.59722656)).toBeLessThan(1e-8);
    expect(Math.abs(r.means["1000"] - 154.91215597)).toBeLessThan(1e-8);
  });
});

// Rice distribution: |X| for X ~ N(nu, s^2 I) has mean s sqrt(pi/2) L_{1/2}(-nu^2/(2 s^2)),
// L_{1/2}(-q) = e^{-q/2} [(1 + q) I_0(q/2) + q I_1(q/2)] (Rice, "Mathematical analysis of random noise",
// Bell Syst. Tech. J. 24 (1945); Bessel series from Abramowitz & Stegun 9.6.10). Rayleigh: nu = 0.
function besselI(nu: number, z: number): number {
  let term = (z / 2) ** nu / (nu === 0 ? 1 : 1), s = 0;
  for (let k = 0; k < 200; k++) {
    if (k > 0) term *= (z / 2) ** 2 / (k * (k + nu));
    s += term;
    if (term < 1e-18 * s) break;
  }
  return s;
}
function riceMean(nu: number, s: number): number {
  const q = (nu * nu) / (2 * s * s);
  return s * Math.sqrt(Math.PI / 2) * Math.exp(-q / 2) * ((1 + q) * besselI(0, q / 2) + q * besselI(1, q / 2));
}

describe("E|N(m, C)| by the 1-D integral [derived] vs the Rice / Rayleigh closed forms", () => {
  it("singular covariance (rank-one formula [derived]) is the limit of non-singular ones (internal consistency)", () => {
    const m: Vec2 = [1, 0.5];
    const r = gaussianAbsMean(m, [[1, 0], [0, 0]]);
    const near = gaussianAbsMean(m, [[1 + 1e-9, 0], [0, 1e-9]], 1e-12);
    // E|X| moves by O(eps) when eps I is added to the covariance.
    expect(Math.abs(r.value - near.value)).toBeLessThan(1e-8);
    expect(Math.abs(gaussianAbsMean([2, 0], [[1, 0], [0, 0]]).value - (Math.sqrt(2 / Math.PI) * Math.exp(-2) + 2 * 0.9544997361036416))).toBeLessThan(1e-12);
  });
  it("Rayleigh mean s sqrt(pi/2)", () => {
    for (const s of [0.3, 1, 2.5]) {
      const r = gaussianAbsMean([0, 0], [[s * s, 0], [0, s * s]]);
      expect(Math.abs(r.value - s * Math.sqrt(Math.PI / 2))).toBeLessThan(1e-13 * s);
    }
  });
  it("Rice mean for several offsets", () => {
    for (const [m, s] of [[[1, 0], 1], [[0.3, -2], 0.7], [[3, 4], 2], [[10, 0], 1]] as [Vec2, number][]) {
      const r = gaussianAbsMean(m, [[s * s, 0], [0, s * s]]);
      const exact = riceMean(Math.hypot(m[0], m[1]), s);
      expect(Math.abs(r.value - exact)).toBeLessThan(1e-12 * exact);
    }
  });
});

/** Exact E L_n by enumerating every path of a discrete law (brute force). */
function bruteForceMean(atoms: Vec2[], weights: number[], n: number): number {
  let total = 0;
  const xs = new Array(n + 1).fill(0), ys = new Array(n + 1).fill(0);
  const rec = (i: number, p: number) => {
    if (i === n) {
      total += p * hullOf(xs, ys).perimeter;
      return;
    }
    for (let a = 0; a < atoms.length; a++) {
      xs[i + 1] = xs[i] + atoms[a][0];
      ys[i + 1] = ys[i] + atoms[a][1];
      rec(i + 1, p * weights[a]);
    }
  };
  rec(0, 1);
  return total;
}

describe("exact law of S_k for discrete steps vs brute-force enumeration of all paths", () => {
  it("simple random walk on Z^2: all 4^n paths, n <= 8", () => {
    const atoms: Vec2[] = [[1, 0], [-1, 0], [0, 1], [0, -1]], weights = [0.25, 0.25, 0.25, 0.25];
    const r = spitzerWidomMeans({ law: "discrete", atoms, weights }, [1, 2, 3, 5, 8], 5);
    for (const n of [1, 2, 3, 5, 8]) {
      expect(Math.abs(r.means[String(n)] - bruteForceMean(atoms, weights, n))).toBeLessThan(1e-11);
    }
  });
  it("biased lattice law with rational atoms (lattice path) and an empirical law (equal weights)", () => {
    const atoms: Vec2[] = [[1, 0], [0.5, 1], [-1, -0.5]], weights = [0.5, 0.3, 0.2];
    const r = spitzerWidomMeans({ law: "discrete", atoms, weights }, [4, 7], 5);
    expect(Math.abs(r.means["7"] - bruteForceMean(atoms, weights, 7))).toBeLessThan(1e-11);
    const steps: Vec2[] = [[1, 0], [1, 0], [0, 1], [-1, 1]];
    const e = spitzerWidomMeans({ law: "empirical", file: "x.csv", steps } as StepLaw, [6], 5);
    expect(Math.abs(e.means["6"] - bruteForceMean(steps, [0.25, 0.25, 0.25, 0.25], 6))).toBeLessThan(1e-11);
  });
  it("irrational atoms (support map, stated error bound)", () => {
    const atoms: Vec2[] = [[1, 0], [Math.SQRT2, Math.PI / 3], [-Math.E / 2, 0.1]], weights = [0.4, 0.35, 0.25];
    const r = spitzerWidomMeans({ law: "discrete", atoms, weights }, [6], 5);
    const err = Math.max(r.errors["6"], 1e-12);
    expect(Math.abs(r.means["6"] - bruteForceMean(atoms, weights, 6))).toBeLessThan(err + 1e-11);
  });
  it("caps n when the exact law grows too large, and says so", () => {
    const r = spitzerWidomMeans(
      { law: "discrete", atoms: [[1, 0], [-1, 0], [0, 1], [0, -1]], weights: [0.25, 0.25, 0.25, 0.25] },
      [10, 5000], 0.001,
    );
    expect(r.means["10"]).toBeGreaterThan(0);
    expect(r.means["5000"]).toBeUndefined();
    expect(r.reasons.join(" ")).toMatch(/capped at k = \d+/);
  });
  it("circle and student laws: no prediction, with the reason", () => {
    const r = spitzerWidomMeans({ law: "circle", mean: [0, 0], radius: 1 }, [10], 5);
    expect(Object.keys(r.means)).toHaveLength(0);
    expect(r.reasons[0]).toMatch(/no exact mean perimeter for circle/);
  });
});
