import { describe, expect, it } from "vitest";
import seedrandom from "seedrandom";
import { controlFactor, controlVariatePoint, projectControls, type ControlBasis } from "../../src/stats/control-variates.js";
import { emptyCoMoments, pushVector } from "../../src/stats/moments.js";
import type { CoMomentState } from "../../src/stats/types.js";

/** The plain projection (every entry of A visited through a row function): the fast path must equal it bit for bit. */
function projectPlain(s: CoMomentState, q: number, basis: ControlBasis): CoMomentState {
  const { p, c, transform: T } = basis;
  const d = q + p;
  const out = emptyCoMoments(d);
  out.count = s.count;
  const row = (i: number, k: number): number => (i < q ? (k === i ? 1 : 0) : k < q ? 0 : T[(i - q) * c + (k - q)]);
  const D = s.dim;
  for (let i = 0; i < d; i++) {
    let m = 0;
    for (let k = 0; k < D; k++) {
      const a = row(i, k);
      if (a !== 0) m += a * s.mean[k];
    }
    out.mean[i] = m;
  }
  const AC = new Float64Array(d * D);
  for (let i = 0; i < d; i++)
    for (let k = 0; k < D; k++) {
      const a = row(i, k);
      if (a === 0) continue;
      for (let l = 0; l < D; l++) AC[i * D + l] += a * s.c[k * D + l];
    }
  for (let i = 0; i < d; i++)
    for (let j = 0; j < d; j++) {
      let t = 0;
      for (let l = 0; l < D; l++) {
        const a = row(j, l);
        if (a !== 0) t += AC[i * D + l] * a;
      }
      out.c[i * d + j] = t;
    }
  return out;
}

const bits = (s: CoMomentState) => JSON.stringify([s.count, s.dim, Array.from(s.mean, (x) => (Object.is(x, -0) ? "-0" : String(x))), Array.from(s.c, (x) => (Object.is(x, -0) ? "-0" : String(x)))]);

describe("projectControls", () => {
  it("equals the plain projection bit for bit (rotated, axis, -0 and dense directions, NaN in an unused raw control)", () => {
    const rng = seedrandom("project-controls");
    const q = 4;
    const c = 8;
    for (let trial = 0; trial < 12; trial++) {
      const s = emptyCoMoments(q + c);
      const x = new Float64Array(q + c);
      for (let n = 0; n < 50; n++) {
        for (let k = 0; k < q + c; k++) x[k] = (k < q ? 100 : 1) * (rng() - 0.5) + (k === 0 ? 0.3 * x[q] : 0);
        pushVector(s, x, 0);
      }
      // The last raw control unused and without a mean (a law with no mean): NaN must not leak.
      if (trial % 3 === 2) s.mean[q + c - 1] = NaN;
      const angle = trial % 2 ? 2 * Math.PI * rng() : 0;
      const u: [number, number] = [Math.cos(angle), Math.sin(angle)];
      const v: [number, number] = [-u[1], u[0]]; // -0 on the axes
      const rows: number[][] = [];
      for (let w = 0; w < 2; w++)
        for (const t of [0, 1])
          for (const dir of trial % 3 === 2 && w === 1 ? [u] : [u, v]) {
            const r = new Array<number>(c).fill(0);
            r[w * 4 + 2 * t] = dir[0];
            r[w * 4 + 2 * t + 1] = dir[1];
            rows.push(r);
          }
      // Dense rows too (several non-zeros per row: the order of each sum shows).
      if (trial % 4 === 3) rows.push(Array.from({ length: c }, (_, k) => (k % 3 === 1 ? 0 : rng() - 0.5)));
      const p = rows.length;
      const basis: ControlBasis = { p, c, transform: Float64Array.from(rows.flat()), known: new Float64Array(p * p) };
      expect(bits(projectControls(s, q, basis))).toBe(bits(projectPlain(s, q, basis)));
    }
  });
});

describe("controlVariatePoint with a shared control factor", () => {
  it("gives every response the numbers it gets alone (and no regression when the controls have no spread)", () => {
    const rng = seedrandom("control-factor");
    const q = 3;
    const p = 4;
    for (const spread of [true, false]) {
      const s = emptyCoMoments(q + p);
      const x = new Float64Array(q + p);
      for (let n = 0; n < 40; n++) {
        for (let a = 0; a < p; a++) x[q + a] = spread ? rng() - 0.5 : 0.25;
        for (let r = 0; r < q; r++) x[r] = (r + 1) * x[q + r] + 0.1 * (rng() - 0.5);
        pushVector(s, x, 0);
      }
      const known = new Float64Array(p * p);
      for (let a = 0; a < p; a++) known[a * p + a] = 1 / 12;
      const factor = controlFactor(s, q, known);
      expect(factor.l === null).toBe(!spread);
      for (let r = 0; r < q; r++) {
        const shared = controlVariatePoint(s, q, r, known, factor);
        const alone = controlVariatePoint(s, q, r, known);
        expect(JSON.stringify({ ...shared, coef: Array.from(shared.coef) })).toBe(JSON.stringify({ ...alone, coef: Array.from(alone.coef) }));
        if (spread) expect(shared.variance).not.toBe(shared.variancePlain);
      }
    }
  });
});
