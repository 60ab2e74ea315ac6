// Law of the running maximum M_i = max(0, S_1, ..., S_i) of a 1-D Gaussian walk with steps N(r, 1),
// for every i <= n, by the Lindley recursion in distribution-function form:
//   u_0(y) = 1 (y >= 0),   u_i(y) = P(M_i <= y) = int_0^inf u_{i-1}(z) phi(y - z - r) dz  (y >= 0)
// (first-step decomposition; M_i has the law of the Lindley waiting time W_i = max(0, W_{i-1} + X_i):
// Lindley, Proc. Camb. Phil. Soc. 48 (1952); common practice).
//
// Discretisation [our method]: Nyström with the trapezoid rule after the substitution
// z = psi(xi) = c log(1 + e^{xi/c}), which clusters nodes at the killing boundary z = 0. Each u_i is
// the restriction to [0, inf) of an entire function and psi is analytic in |Im xi| < pi c, so the rule
// converges exponentially in 1/h (error ~ exp(-2 pi^2 c / h) + exp(-2 pi^2 / h^2)), not like h^2: no
// Richardson step is needed. Accuracy is certified per call against Spitzer's exact
// E M_n = sum_{k<=n} E[S_k^+]/k (Spitzer, "A combinatorial lemma and its application to probability
// theory", Trans. AMS 82 (1956)), see `spitzerMaxMean`.
// Cost: O(n^{3/2} / h^2) flops (window of width ~18 sqrt(i) around the drift, band ~17/h nodes); with a
// negative drift the iterates reach the stationary law to the last bit (after ~(8.5/r)^2 steps) and stop there.

import { loadHelperModule } from "../engine/helper-module.js";
import { projectFile } from "../paths.js";
import { INV_SQRT_2PI, positivePartMean } from "./special.js";
import { normalCdf } from "../stats/normal.js";

const TAIL = 8.5; // |x| beyond which phi(x) < 1.1e-16: kernel band half-width

export interface RunningMaxLaw {
  /** Drift r of the unit-variance steps. */
  r: number;
  /** Requested step counts, ascending. */
  ns: number[];
  /** Evaluate P(M_n <= y) for y >= 0 (ns[idx] = n). */
  cdf(idx: number, y: number): number;
  /** Smallest y below which the cdf at ns[idx] is < 1e-30, and largest y above which it is 1 - 1e-17. */
  support(idx: number): [number, number];
}

export interface GridOptions {
  /** Node spacing in xi (default 0.5). */
  h?: number;
  /** Clustering scale c of psi (default 1). */
  c?: number;
  /** The recursion's engine: build/lindley.wasm when built (default), or TypeScript ("js"). */
  engine?: "wasm" | "js";
}

export function runningMaxLaw(r: number, ns: number[], opts: GridOptions = {}): RunningMaxLaw {
  const h = opts.h ?? 0.5;
  const c = opts.c ?? 1;
  const n = ns[ns.length - 1];
  const reach = r < 0 ? Math.min(9 * Math.sqrt(n), 45 / -r) : 9 * Math.sqrt(n) + n * r;
  const zMax = reach + 3 * TAIL + Math.abs(r) + 10;
  const xi0 = -39 * c;
  const N = Math.ceil((zMax - xi0) / h) + 1;
  const z = new Float64Array(N), w = new Float64Array(N);
  for (let b = 0; b < N; b++) {
    const xi = xi0 + b * h;
    const e = xi / c;
    z[b] = e > 35 ? xi + c * Math.log1p(Math.exp(-e)) : c * Math.log1p(Math.exp(e));
    w[b] = h / (1 + Math.exp(-e));
  }
  // Index of the first node with z >= y (binary search; nodes increase).
  const firstAtLeast = (y: number) => {
    let lo = 0, hi = N;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if (z[mid] < y) lo = mid + 1;
      else hi = mid;
    }
    return lo;
  };
  // Past xi = 37 c the nodes are uniform (z = xi, w = h to rounding): there the kernel is one row,
  // kern[t] = h phi((oMax - t) h - r) for b = a - oMax + t (a Toeplitz band), shared by the rows
  // toeplitz[0] <= a < toeplitz[1] whose whole band is uniform and ends before the grid does
  // (the entries differ from w_b phi(z_a - z_b - r) by the rounding of z only).
  const oMin = Math.ceil((r - TAIL) / h), oMax = Math.floor((r + TAIL) / h);
  const kern = new Float64Array(oMax - oMin + 1);
  for (let t = 0; t < kern.length; t++) {
    const d = (oMax - t) * h - r;
    kern[t] = h * INV_SQRT_2PI * Math.exp(-0.5 * d * d);
  }
  const uniform = Math.max(0, Math.ceil((37 * c - xi0) / h));
  const shrink = Math.exp(-h * h);
  const toeplitz: [number, number, number] = [uniform + oMax, Math.max(uniform + oMax, N - 1 + oMin), oMax];
  // Band of node a: b with |z_a - z_b - r| <= TAIL, stored row by row.
  const bLo = new Int32Array(N), bHi = new Int32Array(N), off = new Int32Array(N + 1);
  for (let a = 0; a < N; a++) {
    const shared = a >= toeplitz[0] && a < toeplitz[1];
    bLo[a] = shared ? a - oMax : firstAtLeast(z[a] - r - TAIL);
    bHi[a] = shared ? a - oMin + 1 : Math.min(N, firstAtLeast(z[a] - r + TAIL));
    off[a + 1] = off[a] + Math.max(0, bHi[a] - bLo[a]);
  }
  const K = new Float64Array(off[N]);
  for (let a = 0; a < N; a++) {
    if (a >= toeplitz[0] && a < toeplitz[1]) {
      K.set(kern, off[a]);
      continue;
    }
    for (let b = bLo[a], p = off[a]; b < bHi[a]; b++, p++) {
      const d = z[a] - z[b] - r;
      K[p] = w[b] * INV_SQRT_2PI * Math.exp(-0.5 * d * d);
    }
  }
  // Mass of the kernel on the (virtual) nodes past the grid end, where u = 1.
  const zEnd = z[N - 1] + h / 2;
  const beyond = new Float64Array(N);
  for (let a = 0; a < N; a++) beyond[a] = normalCdfFast(z[a] - r - zEnd);
  const band: Band = { N, r, z, K, off, bLo, bHi, beyond, kern, toeplitz };
  const wasm = opts.engine === "js" ? null : lindleyModule();
  const saved = wasm ? stepsWasm(wasm, band, ns) : stepsJs(band, ns, firstAtLeast);
  // saved[j] holds u_{ns[j]-1}; one more kernel application gives u_{ns[j]} anywhere.
  // firstAtLeast, started from the node index on the uniform nodes (z_b = xi0 + b h there): the same answer.
  const atLeast = (y: number) => {
    if (!(uniform < N && y > z[uniform])) return firstAtLeast(y);
    let b = Math.min(N, Math.ceil((y - xi0) / h));
    while (b > uniform && z[b - 1] >= y) b--;
    while (b < N && z[b] < y) b++;
    return b;
  };
  // w_b u_b / sqrt(2 pi) of each saved u, made on first use.
  const weighted: (Float64Array | undefined)[] = saved.map(() => undefined);
  const cdf = (idx: number, y: number): number => {
    const { u, lo: l, hi: hh } = saved[idx];
    // Past the support the cdf is 1 to 1e-13 (and the grid may end there).
    if (y >= z[Math.min(hh, N - 1)] + r + TAIL) return 1;
    let wu = weighted[idx];
    if (!wu) {
      wu = new Float64Array(N);
      for (let b = l; b < N; b++) wu[b] = w[b] * u[b] * INV_SQRT_2PI;
      weighted[idx] = wu;
    }
    const b0 = Math.max(l, atLeast(y - r - TAIL)), b1 = Math.min(N, atLeast(y - r + TAIL));
    let s = 0, b = b0;
    for (; b < b1 && b < uniform; b++) {
      const d = y - z[b] - r;
      s += wu[b] * Math.exp(-0.5 * d * d);
    }
    if (b < b1) {
      // Uniform nodes: d falls by h from node to node, so phi(d - h) = phi(d) exp(d h - h^2 / 2) and the
      // factor itself shrinks by exp(-h^2): two products per node instead of an exp (rounding ~1e-15 relative).
      const d = y - z[b] - r;
      let e = Math.exp(-0.5 * d * d), q = Math.exp(d * h - 0.5 * h * h);
      for (; b < b1; b++) {
        s += wu[b] * e;
        e *= q;
        q *= shrink;
      }
    }
    if (b1 === N) s += normalCdf(y - r - zEnd);
    return s > 1 ? 1 : s;
  };
  const support = (idx: number): [number, number] => {
    const { lo: l, hi: hh } = saved[idx];
    return [Math.max(0, z[l] + r - TAIL), z[Math.min(hh, N - 1)] + r + TAIL];
  };
  return { r, ns, cdf, support };
}

/** The discretised kernel: nodes z, band K (row a: columns bLo[a]..bHi[a], from off[a]), mass past the end. */
interface Band {
  N: number;
  r: number;
  z: Float64Array;
  K: Float64Array;
  off: Int32Array;
  bLo: Int32Array;
  bHi: Int32Array;
  beyond: Float64Array;
  /** The shared row of the Toeplitz rows toeplitz[0] <= a < toeplitz[1]: kern[t] multiplies node a - toeplitz[2] + t. */
  kern: Float64Array;
  toeplitz: [number, number, number];
}
type Saved = { u: Float64Array; lo: number; hi: number }[];

/**
 * u_{ns[j]-1} for every j, with its window (lo, hi): the recursion in TypeScript (fallback and oracle).
 * Every sum is taken in the order of build/lindley.wasm (assembly/lindley.ts), so both give the same
 * numbers bit for bit: a Toeplitz row (in the blocks of eight rows the module sums at once) as one
 * sum over its kernel row; any other row as four partial sums (the module's two f64x2 accumulators)
 * plus the left-over terms, added as the module adds its lanes. The windows then agree too (their
 * ends compare values with thresholds, which a last-bit difference could move by one node).
 */
function stepsJs({ N, r, z, K, off, bLo, bHi, beyond, kern, toeplitz }: Band, ns: number[], firstAtLeast: (y: number) => number): Saved {
  const n = ns[ns.length - 1];
  const [tStart, tEnd, shift] = toeplitz;
  const kLen = kern.length;
  let cur = new Float64Array(N).fill(1), nxt = new Float64Array(N).fill(1);
  let lo = 0; // nodes below lo hold values < 1e-30 (ignored)
  let hi = 0; // nodes at or above hi hold 1 - 1e-17 or more
  const saved: { u: Float64Array; lo: number; hi: number }[] = [];
  let want = 0;
  const bandRow = (a: number) => {
    const b0 = Math.max(bLo[a], lo), b1 = bHi[a];
    // Four partial sums: the loop is bound by the latency of the additions, not by the loads
    // (1.5-1.8x faster than one sum, measured with node --cpu-prof).
    let s0 = 0, s1 = 0, s2 = 0, s3 = 0;
    let b = b0, p = off[a] + (b0 - bLo[a]);
    for (; b + 3 < b1; b += 4, p += 4) {
      s0 += K[p] * cur[b];
      s1 += K[p + 1] * cur[b + 1];
      s2 += K[p + 2] * cur[b + 2];
      s3 += K[p + 3] * cur[b + 3];
    }
    let s = 0;
    for (; b < b1; b++, p++) s += K[p] * cur[b];
    s += (s0 + s2) + (s1 + s3);
    if (b1 === N) s += beyond[a];
    nxt[a] = s > 1 ? 1 : s;
  };
  for (let i = 1; i <= n && want < ns.length; i++) {
    if (ns[want] === i) {
      saved.push({ u: cur.slice(), lo, hi });
      want++;
    }
    const aLo = firstAtLeast(z[lo] + r - TAIL);
    const aHi = Math.min(N, firstAtLeast(z[Math.min(hi, N - 1)] + r + TAIL) + 1);
    // Toeplitz rows whose band lies above lo: [t0, t1), in blocks of eight (as the module takes them).
    const t0 = Math.max(aLo, Math.max(tStart, lo + shift)), t1 = Math.min(aHi, tEnd);
    for (let a = aLo; a < aHi; a++) {
      if (a >= t0 && a + 8 <= t1) {
        // As many whole blocks of eight rows as fit before t1.
        const end = a + 8 * Math.floor((t1 - a) / 8);
        for (; a < end; a++) {
          let s = 0;
          for (let t = 0, c = a - shift; t < kLen; t++, c++) s += kern[t] * cur[c];
          nxt[a] = s > 1 ? 1 : s;
        }
        if (a >= aHi) break;
      }
      bandRow(a);
    }
    // Nodes above the updated range stay at 1 in both buffers; below it, below `lo`, are ignored.
    let newHi = aHi;
    while (newHi > aLo && nxt[newHi - 1] >= 1 - 1e-13) newHi--;
    let newLo = Math.max(lo, aLo);
    while (newLo < newHi && nxt[newLo] < 1e-30) newLo++;
    for (let a = aHi; a < N && a < aHi + 2; a++) nxt[a] = 1;
    const fixed = r < 0 && newLo === lo && Math.max(newHi, lo) === hi && sameFrom(cur, nxt, lo, N);
    const t = cur; cur = nxt; nxt = t;
    lo = newLo;
    hi = Math.max(newHi, lo);
    // A fixed point (a negative drift's stationary law, reached to the last bit): every later u is cur.
    if (fixed) for (; want < ns.length; want++) saved.push({ u: cur.slice(), lo, hi });
  }
  return saved;
}

/** x[a] === y[a] for lo <= a < N. */
function sameFrom(x: Float64Array, y: Float64Array, lo: number, N: number): boolean {
  for (let a = lo; a < N; a++) if (x[a] !== y[a]) return false;
  return true;
}

/** The same recursion in build/lindley.wasm (assembly/lindley.ts: SIMD, ~3x faster). */
function stepsWasm(w: LindleyExports, { N, r, z, K, off, bLo, bHi, beyond, kern, toeplitz }: Band, ns: number[]): Saved {
  const count = ns.length;
  const f64 = [N, N, N, N, K.length, count * N, kern.length], i32 = [N + 1, N, N, count, 2 * count];
  const bytes = 8 * f64.reduce((x, y) => x + y, 0) + 4 * i32.reduce((x, y) => x + y, 0) + 64;
  const base = w.reserve(bytes);
  const buf = w.memory.buffer;
  let at = base;
  const f = (len: number) => { const v = new Float64Array(buf, at, len); at += 8 * len; return v; };
  const i = (len: number) => { const v = new Int32Array(buf, at, len); at += 4 * len; return v; };
  const [zW, beyondW, curW, nxtW, KW, savedW, kernW] = f64.map(f);
  const [offW, bLoW, bHiW, nsW, loHiW] = i32.map(i);
  zW.set(z); beyondW.set(beyond); kernW.set(kern); KW.set(K); offW.set(off); bLoW.set(bLo); bHiW.set(bHi); nsW.set(ns);
  curW.fill(1); nxtW.fill(1);
  w.lindleySteps(N, r, TAIL, zW.byteOffset, KW.byteOffset, offW.byteOffset, bLoW.byteOffset, bHiW.byteOffset, beyondW.byteOffset,
    curW.byteOffset, nxtW.byteOffset, nsW.byteOffset, count, savedW.byteOffset, loHiW.byteOffset,
    kernW.byteOffset, kern.length, ...toeplitz);
  return ns.map((_, j) => ({ u: savedW.slice(j * N, (j + 1) * N), lo: loHiW[2 * j], hi: loHiW[2 * j + 1] }));
}

interface LindleyExports {
  memory: WebAssembly.Memory;
  reserve(bytes: number): number;
  lindleySteps(N: number, r: number, tail: number, z: number, K: number, off: number, bLo: number, bHi: number, beyond: number,
    cur: number, nxt: number, ns: number, count: number, saved: number, savedLoHi: number,
    kern: number, kLen: number, tStart: number, tEnd: number, shift: number): void;
}

/** build/lindley.wasm (two levels below the project root from src/theory and dist/theory), or null when not built. */
const LINDLEY_URL = projectFile("build/lindley.wasm");
let lindley: LindleyExports | null | undefined;
export function lindleyModule(): LindleyExports | null {
  if (lindley === undefined) lindley = loadHelperModule<LindleyExports>(LINDLEY_URL);
  return lindley;
}

/** normalCdf(z) without the call where it is exactly 1 (z >= 8.3) or 0 (z <= -38.5) in double precision (same bits; a test checks). */
export function normalCdfFast(z: number): number {
  return z >= 8.3 ? 1 : z <= -38.5 ? 0 : normalCdf(z);
}

/** positivePartMean(mu, sigma) for sigma > 0 with normalCdfFast (same bits). */
function positivePart(mu: number, sigma: number): number {
  const z = mu / sigma;
  return sigma * INV_SQRT_2PI * Math.exp(-0.5 * z * z) + mu * normalCdfFast(z);
}

/** Exact E M_n for steps N(r, 1) (Spitzer): sum_{k<=n} E[S_k^+]/k, S_k ~ N(k r, k). */
export function spitzerMaxMean(r: number, n: number): number {
  let s = 0;
  for (let k = 1; k <= n; k++) s += positivePartMean(k * r, Math.sqrt(k)) / k;
  return s;
}

/** Exact E M_n for steps N(r, 1) at every n of the ascending `ns`, in one pass. */
export function spitzerMaxMeans(r: number, ns: number[]): number[] {
  const out: number[] = [];
  let s = 0, k = 0;
  for (const n of ns) {
    for (k++; k <= n; k++) s += positivePart(k * r, Math.sqrt(k)) / k;
    k--;
    out.push(s);
  }
  return out;
}
