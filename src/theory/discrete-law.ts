// Exact law of S_k = Z_1 + ... + Z_k for a discrete step law, and E|S_k| for k = 1..n.
//
// Lattice atoms (all coordinates rational with a common denominator q <= 10^4): the law of q S_k
// lives on the integer grid; a dense array is convolved step by step, so the probabilities are
// exact up to floating-point rounding (relative error ~ k * 1e-16). Cost ~ sum_k box_k * atoms.
// General atoms: a support map keyed by the point rounded to 1e-12 * scale; merging points closer
// than that moves them by at most 1e-12 * scale * k, which bounds the error of E|S_k| (stated).
// Both stop at `maxOps` elementary operations: the caller reports the cap. (common practice)

import type { Vec2 } from "../suite/schema.js";
import { KahanSum } from "./special.js";

export interface AbsMeans {
  /** absMeans[k - 1] = E|S_k| for k = 1..reached. */
  absMeans: number[];
  /** Absolute error bounds, same indexing. */
  errors: number[];
  /** Largest k reached within the operation budget. */
  reached: number;
  method: "lattice" | "support-map";
}

function commonDenominator(atoms: Vec2[]): number | null {
  let q = 1;
  const gcd = (a: number, b: number): number => (b === 0 ? a : gcd(b, a % b));
  for (const a of atoms) {
    for (const v of a) {
      let found = 0;
      for (let d = 1; d <= 10000; d++) {
        const x = v * q * d;
        if (Math.abs(x - Math.round(x)) <= 1e-9 * Math.max(1, Math.abs(x))) { found = d; break; }
      }
      if (!found) return null;
      q = (q * found) / gcd(q, found);
      if (q > 10000) return null;
    }
  }
  return q;
}

export function discreteAbsMeans(atoms: Vec2[], weights: number[], n: number, maxOps: number): AbsMeans {
  const q = commonDenominator(atoms);
  if (q !== null) {
    const ia = atoms.map((a) => [Math.round(a[0] * q), Math.round(a[1] * q)]);
    const minX = Math.min(...ia.map((a) => a[0])), maxX = Math.max(...ia.map((a) => a[0]));
    const minY = Math.min(...ia.map((a) => a[1])), maxY = Math.max(...ia.map((a) => a[1]));
    // Find the largest n whose total work fits.
    let nCap = 0, ops = 0;
    while (nCap < n) {
      const k = nCap + 1;
      const cells = (k * (maxX - minX) + 1) * (k * (maxY - minY) + 1);
      if (ops + cells * (1 + atoms.length) > maxOps) break;
      ops += cells * (1 + atoms.length);
      nCap = k;
    }
    const W = nCap * (maxX - minX) + 1, H = nCap * (maxY - minY) + 1;
    // Cell (x, y) of S_k stored at (x - k*minX) + W * (y - k*minY).
    let cur = new Float64Array(W * H), next = new Float64Array(W * H);
    const absMeans: number[] = [], errors: number[] = [];
    cur[0] = 1; // S_0 = 0 at offset 0 for k = 0
    for (let k = 1; k <= nCap; k++) {
      const wPrev = (k - 1) * (maxX - minX) + 1, hPrev = (k - 1) * (maxY - minY) + 1;
      const wCur = k * (maxX - minX) + 1, hCur = k * (maxY - minY) + 1;
      next.fill(0, 0, W * hCur);
      for (let a = 0; a < ia.length; a++) {
        const dx = ia[a][0] - minX, dy = ia[a][1] - minY, p = weights[a];
        if (p === 0) continue;
        for (let y = 0; y < hPrev; y++) {
          const src = y * W, dst = (y + dy) * W + dx;
          for (let x = 0; x < wPrev; x++) {
            const v = cur[src + x];
            if (v !== 0) next[dst + x] += p * v;
          }
        }
      }
      const s = new KahanSum();
      for (let y = 0; y < hCur; y++) {
        const yy = (y + k * minY) / q;
        for (let x = 0; x < wCur; x++) {
          const v = next[y * W + x];
          if (v !== 0) s.add(v * Math.hypot((x + k * minX) / q, yy));
        }
      }
      absMeans.push(s.value);
      errors.push(4e-16 * k * s.value + 1e-300);
      const t = cur; cur = next; next = t;
    }
    return { absMeans, errors, reached: nCap, method: "lattice" };
  }
  // General atoms: rounded support map.
  const scale = Math.max(...atoms.map((a) => Math.hypot(a[0], a[1])), 1e-300);
  const delta = 1e-12 * scale;
  let law = new Map<string, [number, number, number]>([["0,0", [0, 0, 1]]]);
  const absMeans: number[] = [], errors: number[] = [];
  let ops = 0, k = 0;
  while (k < n) {
    if (ops + law.size * atoms.length * 4 > maxOps) break;
    const nxt = new Map<string, [number, number, number]>();
    for (const [, [x, y, p]] of law) {
      for (let a = 0; a < atoms.length; a++) {
        const nx = x + atoms[a][0], ny = y + atoms[a][1];
        const key = `${Math.round(nx / delta)},${Math.round(ny / delta)}`;
        const e = nxt.get(key);
        if (e) e[2] += p * weights[a];
        else nxt.set(key, [nx, ny, p * weights[a]]);
      }
    }
    ops += law.size * atoms.length * 4;
    law = nxt;
    k++;
    const s = new KahanSum();
    for (const [, [x, y, p]] of law) s.add(p * Math.hypot(x, y));
    absMeans.push(s.value);
    errors.push(k * delta + 4e-16 * k * s.value);
  }
  return { absMeans, errors, reached: k, method: "support-map" };
}
