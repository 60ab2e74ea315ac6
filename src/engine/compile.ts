// Step laws -> packed parameters for the kernels (layouts in ./types.ts).
// Input laws are assumed valid (the suite loader validates them and names bad fields).

import type { Mat2, StepLaw } from "../suite/schema.js";
import { LAW_CODE, type CompiledWalk } from "./types.js";

/**
 * Lower-triangular L with C = L L' for a symmetric positive semi-definite 2x2 matrix, singular
 * matrices included: [[1,1],[1,1]] -> [1, 1, 0]; [[0,0],[0,1]] -> [0, 0, 1].
 * Returns [l11, l21, l22]. Tiny negative round-off on the Schur complement is clamped to 0.
 */
export function choleskyPsd2(c: Mat2): [number, number, number] {
  const a = c[0][0];
  const b = 0.5 * (c[0][1] + c[1][0]);
  const d = c[1][1];
  if (a > 0) {
    const l11 = Math.sqrt(a);
    const l21 = b / l11;
    const schur = d - l21 * l21;
    return [l11, l21, schur > 0 ? Math.sqrt(schur) : 0];
  }
  // a == 0: PSD forces b == 0, so the first coordinate is constant and the second has variance d.
  return [0, 0, d > 0 ? Math.sqrt(d) : 0];
}

/**
 * Vose's alias method (M. D. Vose, "A linear algorithm for generating random numbers with a given
 * distribution", IEEE TSE 17 (1991)): column i is kept with probability prob[i], else alias[i].
 */
export function aliasTable(weights: readonly number[]): { prob: Float64Array; alias: Int32Array } {
  const m = weights.length;
  let total = 0;
  for (const w of weights) total += w;
  const scaled = new Float64Array(m);
  for (let i = 0; i < m; i++) scaled[i] = (weights[i] / total) * m;
  const prob = new Float64Array(m);
  const alias = new Int32Array(m);
  const small: number[] = [];
  const large: number[] = [];
  for (let i = 0; i < m; i++) (scaled[i] < 1 ? small : large).push(i);
  while (small.length > 0 && large.length > 0) {
    const s = small.pop()!;
    const l = large.pop()!;
    prob[s] = scaled[s];
    alias[s] = l;
    scaled[l] = scaled[l] + scaled[s] - 1;
    (scaled[l] < 1 ? small : large).push(l);
  }
  // Leftovers are 1 up to round-off.
  for (const i of large) { prob[i] = 1; alias[i] = i; }
  for (const i of small) { prob[i] = 1; alias[i] = i; }
  return { prob, alias };
}

/**
 * The exact step mean of a law (the controls are centred with it): the given mean for gaussian,
 * circle and student laws (student: NaN when dof <= 1, no mean), sum w_i a_i for a discrete law,
 * the row mean of an empirical law.
 */
export function stepMean(law: StepLaw): [number, number] {
  switch (law.law) {
    case "gaussian":
    case "circle":
      return [law.mean[0], law.mean[1]];
    case "student":
      return law.dof > 1 ? [law.mean[0], law.mean[1]] : [NaN, NaN];
    case "discrete": {
      let mx = 0, my = 0;
      law.atoms.forEach((a, i) => { mx += law.weights[i] * a[0]; my += law.weights[i] * a[1]; });
      return [mx, my];
    }
    case "empirical": {
      const steps = law.steps ?? [];
      let mx = 0, my = 0;
      for (const s of steps) { mx += s[0]; my += s[1]; }
      return [mx / steps.length, my / steps.length];
    }
  }
}

/** Packs one step law for the kernels. */
export function compileWalk(law: StepLaw): CompiledWalk {
  return { ...packLaw(law), mean: stepMean(law) };
}

function packLaw(law: StepLaw): Omit<CompiledWalk, "mean"> {
  switch (law.law) {
    case "gaussian": {
      const [l11, l21, l22] = choleskyPsd2(law.cov);
      return { code: LAW_CODE.gaussian, params: Float64Array.of(law.mean[0], law.mean[1], l11, l21, l22) };
    }
    case "discrete": {
      const m = law.atoms.length;
      const { prob, alias } = aliasTable(law.weights);
      const p = new Float64Array(1 + 4 * m);
      p[0] = m;
      for (let i = 0; i < m; i++) {
        p[1 + 2 * i] = law.atoms[i][0];
        p[2 + 2 * i] = law.atoms[i][1];
        p[1 + 2 * m + i] = prob[i];
        p[1 + 3 * m + i] = alias[i];
      }
      return { code: LAW_CODE.discrete, params: p };
    }
    case "circle":
      return { code: LAW_CODE.circle, params: Float64Array.of(law.mean[0], law.mean[1], law.radius) };
    case "student": {
      const [l11, l21, l22] = choleskyPsd2(law.scale);
      return {
        code: LAW_CODE.student,
        params: Float64Array.of(law.mean[0], law.mean[1], l11, l21, l22, law.dof),
      };
    }
    case "empirical": {
      const steps = law.steps;
      if (!steps || steps.length === 0) {
        throw new Error(`steps: empirical law from ${law.file} has no increments (the loader fills them in)`);
      }
      const p = new Float64Array(1 + 2 * steps.length);
      p[0] = steps.length;
      for (let i = 0; i < steps.length; i++) {
        p[1 + 2 * i] = steps[i][0];
        p[2 + 2 * i] = steps[i][1];
      }
      return { code: LAW_CODE.empirical, params: p };
    }
  }
}

/** Packs all walks; errors name the walk (`walks[i].field: ...`). */
export function compileWalks(laws: readonly StepLaw[]): CompiledWalk[] {
  return laws.map((law, i) => {
    try {
      return compileWalk(law);
    } catch (err) {
      throw new Error(`walks[${i}].${(err as Error).message}`, { cause: err });
    }
  });
}
