// Step-law helpers shared by the predictions: validated moments, atoms of discrete laws.
// Errors name the offending field (house rule), e.g. `walks[0].cov: not positive semi-definite`.

import type { Mat2, StepLaw, Vec2 } from "../suite/schema.js";

export interface StepMoments {
  /** Drift E[Z]. */
  mean: Vec2;
  /** Covariance of Z (NaN entries when the second moment is infinite). */
  cov: Mat2;
  /** Whether the second moment is finite. */
  secondMomentFinite: boolean;
  /** Whether E|Z|^4 is finite (needed for calibrated variance checks). */
  fourthMomentFinite: boolean;
}

const isNum = (x: unknown): x is number => typeof x === "number" && Number.isFinite(x);

function checkVec(v: unknown, path: string): Vec2 {
  if (!Array.isArray(v) || v.length !== 2 || !isNum(v[0]) || !isNum(v[1])) {
    throw new Error(`${path}: expected [x, y] with two finite numbers`);
  }
  return [v[0], v[1]];
}

function checkPsd(m: unknown, path: string): Mat2 {
  if (!Array.isArray(m) || m.length !== 2) throw new Error(`${path}: expected a 2x2 matrix`);
  const a = checkVec(m[0], `${path}[0]`);
  const b = checkVec(m[1], `${path}[1]`);
  const scale = Math.max(Math.abs(a[0]), Math.abs(b[1]), Math.abs(a[1]), 1e-300);
  if (Math.abs(a[1] - b[0]) > 1e-9 * scale) throw new Error(`${path}: not symmetric`);
  const det = a[0] * b[1] - a[1] * b[0];
  if (a[0] < 0 || b[1] < 0 || det < -1e-12 * scale * scale) {
    throw new Error(`${path}: not positive semi-definite`);
  }
  return [[a[0], a[1]], [a[1], b[1]]];
}

/** Atoms and weights of a discrete or empirical law (empirical: equal weights on its rows). */
export function lawAtoms(law: StepLaw, path = "walk"): { atoms: Vec2[]; weights: number[] } {
  if (law.law === "discrete") {
    if (!Array.isArray(law.atoms) || law.atoms.length === 0) throw new Error(`${path}.atoms: expected a non-empty array`);
    if (!Array.isArray(law.weights) || law.weights.length !== law.atoms.length) {
      throw new Error(`${path}.weights: expected one weight per atom`);
    }
    const atoms = law.atoms.map((a, i) => checkVec(a, `${path}.atoms[${i}]`));
    let total = 0;
    law.weights.forEach((w, i) => {
      if (!isNum(w) || w < 0) throw new Error(`${path}.weights[${i}]: expected a non-negative number`);
      total += w;
    });
    if (Math.abs(total - 1) > 1e-9) throw new Error(`${path}.weights: sum to ${total}, not 1`);
    return { atoms, weights: law.weights.map((w) => w / total) };
  }
  if (law.law === "empirical") {
    if (!Array.isArray(law.steps) || law.steps.length === 0) {
      throw new Error(`${path}.steps: empirical law has no steps (the loader fills them in from \`file\`)`);
    }
    const atoms = law.steps.map((a, i) => checkVec(a, `${path}.steps[${i}]`));
    return { atoms, weights: atoms.map(() => 1 / atoms.length) };
  }
  throw new Error(`${path}.law: ${law.law} has no atoms`);
}

/**
 * Mean, covariance and moment finiteness of one step law.
 * Student: covariance = scale * dof / (dof - 2) for dof > 2 (infinite otherwise); E|Z|^4 < inf iff dof > 4.
 * Circle: mean + radius * (cos U, sin U), covariance radius^2 / 2 * I. (common practice)
 */
export function stepMoments(law: StepLaw, path = "walk"): StepMoments {
  if (law === null || typeof law !== "object") throw new Error(`${path}: expected a step law object`);
  switch (law.law) {
    case "gaussian": {
      const mean = checkVec(law.mean, `${path}.mean`);
      const cov = checkPsd(law.cov, `${path}.cov`);
      return { mean, cov, secondMomentFinite: true, fourthMomentFinite: true };
    }
    case "circle": {
      const mean = checkVec(law.mean, `${path}.mean`);
      if (!isNum(law.radius) || law.radius < 0) throw new Error(`${path}.radius: expected a non-negative number`);
      const v = (law.radius * law.radius) / 2;
      return { mean, cov: [[v, 0], [0, v]], secondMomentFinite: true, fourthMomentFinite: true };
    }
    case "student": {
      const mean = checkVec(law.mean, `${path}.mean`);
      const scale = checkPsd(law.scale, `${path}.scale`);
      if (!isNum(law.dof) || law.dof <= 0) throw new Error(`${path}.dof: expected a positive number`);
      const finite2 = law.dof > 2;
      const f = finite2 ? law.dof / (law.dof - 2) : NaN;
      return {
        mean,
        cov: [[scale[0][0] * f, scale[0][1] * f], [scale[1][0] * f, scale[1][1] * f]],
        secondMomentFinite: finite2,
        fourthMomentFinite: law.dof > 4,
      };
    }
    case "discrete":
    case "empirical": {
      const { atoms, weights } = lawAtoms(law, path);
      let mx = 0, my = 0;
      atoms.forEach((a, i) => { mx += weights[i] * a[0]; my += weights[i] * a[1]; });
      let cxx = 0, cxy = 0, cyy = 0;
      atoms.forEach((a, i) => {
        const dx = a[0] - mx, dy = a[1] - my;
        cxx += weights[i] * dx * dx; cxy += weights[i] * dx * dy; cyy += weights[i] * dy * dy;
      });
      return { mean: [mx, my], cov: [[cxx, cxy], [cxy, cyy]], secondMomentFinite: true, fourthMomentFinite: true };
    }
    default:
      throw new Error(`${path}.law: unknown law ${(law as { law: unknown }).law}`);
  }
}

/** True when every step law is absolutely continuous or otherwise puts no mass on lines through atoms. */
export function isContinuousLaw(law: StepLaw): boolean {
  if (law.law === "gaussian") {
    const c = law.cov;
    return c[0][0] * c[1][1] - c[0][1] * c[1][0] > 1e-12 * Math.max(c[0][0], c[1][1]) ** 2;
  }
  if (law.law === "student") {
    const c = law.scale;
    return c[0][0] * c[1][1] - c[0][1] * c[1][0] > 1e-12 * Math.max(c[0][0], c[1][1]) ** 2;
  }
  if (law.law === "circle") return law.radius > 0;
  return false;
}

/** Quadratic form g' C g. */
export function quad(c: Mat2, g: Vec2): number {
  return g[0] * g[0] * c[0][0] + 2 * g[0] * g[1] * c[0][1] + g[1] * g[1] * c[1][1];
}
