// Step samplers and walk generation. Draw order per walk (the TS twin follows it exactly):
//  gaussian  per step: z1, z2 (ziggurat)                  step = m + L z
//  discrete  per step: one uniform u; t = u m, column floor(t), kept if t - floor(t) < prob
//  circle    per step: one uniform u; angle 2 pi u        step = m + r (cos, sin)
//  student   per step: z1, z2, then W ~ chi2(dof) = 2 Gamma(dof/2)   step = m + L z sqrt(dof / W)
//  empirical per step: one uniform u; row floor(u m)

import { fillNormals, gammaVariate, normal, uniform } from "./rng";

export const LAW_GAUSSIAN: i32 = 0;
export const LAW_DISCRETE: i32 = 1;
export const LAW_CIRCLE: i32 = 2;
export const LAW_STUDENT: i32 = 3;
export const LAW_EMPIRICAL: i32 = 4;

@inline function p(params: usize, i: i32): f64 {
  return load<f64>(params + (<usize>i << 3));
}

/**
 * Draws `count` steps of a law into sx[0..count), sy[0..count) (f64 pointers).
 * `normals` is scratch for 2 * count f64.
 */
export function drawStepsInto(code: i32, params: usize, count: i32, sx: usize, sy: usize, normals: usize): void {
  if (code == LAW_GAUSSIAN) {
    fillNormals(normals, count << 1);
    const mx = p(params, 0), my = p(params, 1), l11 = p(params, 2), l21 = p(params, 3), l22 = p(params, 4);
    for (let i = 0; i < count; i++) {
      const o = <usize>i << 4;
      const z1 = load<f64>(normals + o);
      const z2 = load<f64>(normals + o + 8);
      store<f64>(sx + (<usize>i << 3), mx + l11 * z1);
      store<f64>(sy + (<usize>i << 3), my + (l21 * z1 + l22 * z2));
    }
  } else if (code == LAW_DISCRETE) {
    const m = <i32>p(params, 0);
    const mf = <f64>m;
    for (let i = 0; i < count; i++) {
      const t = uniform() * mf;
      let col = <i32>Math.floor(t);
      if (col >= m) col = m - 1;
      const frac = t - <f64>col;
      const pick = frac < p(params, 1 + 2 * m + col) ? col : <i32>p(params, 1 + 3 * m + col);
      store<f64>(sx + (<usize>i << 3), p(params, 1 + 2 * pick));
      store<f64>(sy + (<usize>i << 3), p(params, 2 + 2 * pick));
    }
  } else if (code == LAW_CIRCLE) {
    const mx = p(params, 0), my = p(params, 1), r = p(params, 2);
    for (let i = 0; i < count; i++) {
      const th = 6.283185307179586 * uniform();
      store<f64>(sx + (<usize>i << 3), mx + r * Math.cos(th));
      store<f64>(sy + (<usize>i << 3), my + r * Math.sin(th));
    }
  } else if (code == LAW_STUDENT) {
    const mx = p(params, 0), my = p(params, 1), l11 = p(params, 2), l21 = p(params, 3), l22 = p(params, 4);
    const dof = p(params, 5);
    for (let i = 0; i < count; i++) {
      const z1 = normal();
      const z2 = normal();
      const w = 2.0 * gammaVariate(0.5 * dof);
      const s = Math.sqrt(dof / w);
      store<f64>(sx + (<usize>i << 3), mx + s * (l11 * z1));
      store<f64>(sy + (<usize>i << 3), my + s * (l21 * z1 + l22 * z2));
    }
  } else {
    const m = <i32>p(params, 0);
    const mf = <f64>m;
    for (let i = 0; i < count; i++) {
      let row = <i32>Math.floor(uniform() * mf);
      if (row >= m) row = m - 1;
      store<f64>(sx + (<usize>i << 3), p(params, 1 + 2 * row));
      store<f64>(sy + (<usize>i << 3), p(params, 2 + 2 * row));
    }
  }
}
