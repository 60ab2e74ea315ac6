// Plain-TS twin of the WASM kernel (assembly/laws.ts, walks.ts, extremes.ts, filters.ts, paths.ts):
// the same streams and draw order, the same per-walk frames, octagon extremes, certified filter and
// second pass (joint frame for k > 1, frame rotated by pi/8 for k = 1), sort, chain and measures,
// so both give the same values (up to last-ulp differences of exp/log/cos/sin/pow between V8 and
// AssemblyScript's math library; see ./prng.ts) and the same filter survivors. It leaves out only
// what the kernel does for speed without changing a result: the f64x2 (two points per step)
// arithmetic, the per-chunk bounding boxes that drop whole chunks, and the box-guided search for
// extremes in large groups (each proved there to give the point-by-point outcome); and it copies
// a group into the candidates before filtering it (the kernel filters while reading). It is the
// oracle of the kernel tests and the JS baseline of the bench.

import { CONTROLS_PER_WALK, LAW_CODE, recordLayout, type CompiledWalk, type Kernel, type KernelSetup, type RecordLayout } from "./types.js";
import { Rng } from "./prng.js";
import { monotoneChain, sortPoints } from "../geometry/convex-hull.js";
import { hullFunctionals, MEASURE_COUNT } from "../geometry/measure-registry.js";

export { convexHull, perimeterOf, diameterOf, areaOf, orient, crossSign } from "../geometry/convex-hull.js";
export { hullMeasures, type HullMeasures } from "../geometry/measure-registry.js";
export { Rng, zigguratTables } from "./prng.js";

/** Draws `count` steps of a compiled law (draw order: see assembly/laws.ts). */
export function drawStepsInto(
  walk: CompiledWalk,
  count: number,
  sx: Float64Array,
  sy: Float64Array,
  normals: Float64Array,
  rng: Rng,
): void {
  const p = walk.params;
  switch (walk.code) {
    case LAW_CODE.gaussian: {
      rng.fillNormals(normals, 2 * count);
      const mx = p[0], my = p[1], l11 = p[2], l21 = p[3], l22 = p[4];
      for (let i = 0; i < count; i++) {
        const z1 = normals[2 * i], z2 = normals[2 * i + 1];
        sx[i] = mx + l11 * z1;
        sy[i] = my + (l21 * z1 + l22 * z2);
      }
      return;
    }
    case LAW_CODE.discrete: {
      const m = p[0] | 0;
      for (let i = 0; i < count; i++) {
        const t = rng.uniform() * m;
        let col = Math.floor(t);
        if (col >= m) col = m - 1;
        const frac = t - col;
        const pick = frac < p[1 + 2 * m + col] ? col : p[1 + 3 * m + col] | 0;
        sx[i] = p[1 + 2 * pick];
        sy[i] = p[2 + 2 * pick];
      }
      return;
    }
    case LAW_CODE.circle: {
      const mx = p[0], my = p[1], r = p[2];
      for (let i = 0; i < count; i++) {
        const th = 6.283185307179586 * rng.uniform();
        sx[i] = mx + r * Math.cos(th);
        sy[i] = my + r * Math.sin(th);
      }
      return;
    }
    case LAW_CODE.student: {
      const mx = p[0], my = p[1], l11 = p[2], l21 = p[3], l22 = p[4], dof = p[5];
      for (let i = 0; i < count; i++) {
        const z1 = rng.normal();
        const z2 = rng.normal();
        const w = 2.0 * rng.gamma(0.5 * dof);
        const s = Math.sqrt(dof / w);
        sx[i] = mx + s * (l11 * z1);
        sy[i] = my + s * (l21 * z1 + l22 * z2);
      }
      return;
    }
    default: {
      const m = p[0] | 0;
      for (let i = 0; i < count; i++) {
        let row = Math.floor(rng.uniform() * m);
        if (row >= m) row = m - 1;
        sx[i] = p[1 + 2 * row];
        sy[i] = p[2 + 2 * row];
      }
    }
  }
}

const FILTER_MIN = 32;
// cos and sin of pi/8 (assembly/setup.ts rotateFrame).
const COS_PI8 = 0.9238795325112867;
const SIN_PI8 = 0.3826834323650898;

/** The twin kernel; extra methods serve tests and benches. */
export class TwinKernel implements Kernel {
  readonly k: number;
  readonly nMax: number;
  readonly grid: number[];
  readonly layout: RecordLayout;
  readonly walks: CompiledWalk[];
  readonly seed: number;
  readonly rng = new Rng();
  private readonly PX: Float64Array;
  private readonly PY: Float64Array;
  private readonly SX: Float64Array;
  private readonly SY: Float64Array;
  private readonly NZ: Float64Array;
  private readonly CX: Float64Array;
  private readonly CY: Float64Array;
  private readonly HX: Float64Array;
  private readonly HY: Float64Array;
  private readonly SEG: Float64Array;
  private readonly EDGES = new Float64Array(24);
  private readonly polyX = new Float64Array(8);
  private readonly polyY = new Float64Array(8);
  private hullCount = 0;
  private candCount = 0;
  /** Filter survivors (candidates left for the sort and chain) summed over every grid point run. */
  survivors = 0;
  // Frame and extremes (see assembly/setup.ts and extremes.ts).
  private fa = 1; private fb = 0; private fc = 1; private fd = 0;
  private ext = new Float64Array(8);
  private exX = new Float64Array(8);
  private exY = new Float64Array(8);
  private absX = 0; private absY = 0;

  constructor(setup: KernelSetup) {
    this.walks = setup.walks;
    this.k = setup.walks.length;
    this.grid = setup.grid.slice();
    this.layout = recordLayout(this.grid.length);
    this.seed = setup.seed;
    this.nMax = this.grid[this.grid.length - 1];
    const pts = this.k * (this.nMax + 1);
    this.PX = new Float64Array(pts);
    this.PY = new Float64Array(pts);
    this.SX = new Float64Array(Math.max(this.nMax, 1));
    this.SY = new Float64Array(Math.max(this.nMax, 1));
    this.NZ = new Float64Array(Math.max(2 * this.nMax, 1));
    const cap = 2 * pts + 8;
    this.CX = new Float64Array(cap);
    this.CY = new Float64Array(cap);
    this.HX = new Float64Array(2 * cap + 2);
    this.HY = new Float64Array(2 * cap + 2);
    this.SEG = new Float64Array(5 * this.grid.length * this.k);
  }

  private setFrame(cnt: number, sx: number, sy: number, sxx: number, sxy: number, syy: number): void {
    this.fa = 1; this.fb = 0; this.fc = 1; this.fd = 0;
    const mx = sx / cnt, my = sy / cnt;
    const cxx = sxx / cnt - mx * mx;
    const cxy = sxy / cnt - mx * my;
    const cyy = syy / cnt - my * my;
    if (!(cxx > 0) || !(cyy > 0)) return;
    const l11 = Math.sqrt(cxx);
    const l21 = cxy / l11;
    const schur = cyy - l21 * l21;
    if (!(schur > 1e-9 * cyy)) return;
    const l22 = Math.sqrt(schur);
    this.fa = 1.0 / l11;
    this.fb = -l21 / (l11 * l22);
    this.fc = 1.0 / l22;
  }

  private resetExtremes(x: number, y: number): void {
    const u = this.fa * x + this.fd * y, v = this.fb * x + this.fc * y;
    const e = this.ext;
    e[0] = u; e[4] = u; e[1] = u + v; e[5] = u + v; e[2] = v; e[6] = v; e[3] = u - v; e[7] = u - v;
    this.exX.fill(x);
    this.exY.fill(y);
    this.absX = Math.abs(x);
    this.absY = Math.abs(y);
  }

  /** As assembly/extremes.ts gatherGroup, point by point (from resetExtremes at the group's first point). */
  private scanExtremes(srcX: Float64Array, srcY: Float64Array, from: number, to: number): void {
    const e = this.ext, X = this.exX, Y = this.exY;
    let u0 = e[0], s1 = e[1], v2 = e[2], d3 = e[3], u4 = e[4], s5 = e[5], v6 = e[6], d7 = e[7];
    let mxa = this.absX, mya = this.absY;
    const a = this.fa, b = this.fb, c = this.fc, dd = this.fd;
    for (let i = from; i < to; i++) {
      const x = srcX[i], y = srcY[i];
      const u = a * x + dd * y, v = b * x + c * y;
      const s = u + v, d = u - v;
      if (u > u0) { u0 = u; X[0] = x; Y[0] = y; }
      if (u < u4) { u4 = u; X[4] = x; Y[4] = y; }
      if (s > s1) { s1 = s; X[1] = x; Y[1] = y; }
      if (s < s5) { s5 = s; X[5] = x; Y[5] = y; }
      if (v > v2) { v2 = v; X[2] = x; Y[2] = y; }
      if (v < v6) { v6 = v; X[6] = x; Y[6] = y; }
      if (d < d3) { d3 = d; X[3] = x; Y[3] = y; }
      if (d > d7) { d7 = d; X[7] = x; Y[7] = y; }
      mxa = Math.max(mxa, Math.abs(x));
      mya = Math.max(mya, Math.abs(y));
    }
    e[0] = u0; e[1] = s1; e[2] = v2; e[3] = d3; e[4] = u4; e[5] = s5; e[6] = v6; e[7] = d7;
    this.absX = mxa; this.absY = mya;
  }

  /** Extremes of src[from..to) (to > from), then the group appended to the candidates and filtered. */
  private gatherAndFilter(srcX: Float64Array, srcY: Float64Array, from: number, to: number): void {
    const start = this.candCount;
    this.resetExtremes(srcX[from], srcY[from]);
    this.scanExtremes(srcX, srcY, from, to);
    this.append(srcX, srcY, from, to);
    this.filterCandidates(start);
  }

  /** As assembly/filters.ts filterSecondPass: the survivors filtered again, in place. */
  private filterSecondPass(g: number, hi: number): void {
    const count = this.candCount;
    if (this.k > 1) {
      // Joint frame of all walks (filterJoint).
      let sx = 0, sy = 0, sxx = 0, sxy = 0, syy = 0;
      for (let j = 0; j < this.k; j++) {
        const o = 5 * (j * this.grid.length + g);
        sx += this.SEG[o]; sy += this.SEG[o + 1]; sxx += this.SEG[o + 2]; sxy += this.SEG[o + 3]; syy += this.SEG[o + 4];
      }
      this.setFrame(this.k * (1 + hi), sx, sy, sxx, sxy, syy);
    } else {
      // The walk's frame rotated by pi/8 (filterRotated; setup.ts rotateFrame).
      if (count < FILTER_MIN) return;
      const a = this.fa, b = this.fb, c = this.fc;
      this.fa = COS_PI8 * a + SIN_PI8 * b;
      this.fd = SIN_PI8 * c;
      this.fb = COS_PI8 * b - SIN_PI8 * a;
      this.fc = COS_PI8 * c;
    }
    this.resetExtremes(this.CX[0], this.CY[0]);
    this.scanExtremes(this.CX, this.CY, 0, count);
    this.filterCandidates(0);
  }

  /** The conservative filter of assembly/filters.ts filterGroup (proof there). */
  private filterCandidates(start: number): number {
    const count = this.candCount;
    if (count - start < FILTER_MIN) return count;
    const px = this.polyX, py = this.polyY;
    let m = 0;
    for (let e = 0; e < 8; e++) {
      const x = this.exX[e], y = this.exY[e];
      if (m > 0 && px[m - 1] === x && py[m - 1] === y) continue;
      px[m] = x; py[m] = y; m++;
    }
    while (m > 1 && px[m - 1] === px[0] && py[m - 1] === py[0]) m--;
    if (m < 3) return count;
    const E = this.EDGES;
    for (let e = 0; e < m; e++) {
      const f = e + 1 === m ? 0 : e + 1;
      const exx = px[f] - px[e], eyy = py[f] - py[e];
      const c = exx * py[e] - eyy * px[e];
      const eps = 4e-15 * (Math.abs(exx) * this.absY + Math.abs(eyy) * this.absX);
      E[3 * e] = exx; E[3 * e + 1] = eyy; E[3 * e + 2] = c + eps;
    }
    const CX = this.CX, CY = this.CY;
    let w = start;
    for (let i = start; i < count; i++) {
      const x = CX[i], y = CY[i];
      let inside = true;
      for (let e = 0; e < m; e++) {
        const o = 3 * e;
        if (!(E[o] * y - E[o + 1] * x > E[o + 2])) { inside = false; break; }
      }
      if (!inside) { CX[w] = x; CY[w] = y; w++; }
    }
    this.candCount = w;
    return w;
  }

  private append(srcX: Float64Array, srcY: Float64Array, from: number, to: number): void {
    let w = this.candCount;
    for (let i = from; i < to; i++) {
      this.CX[w] = srcX[i];
      this.CY[w] = srcY[i];
      w++;
    }
    this.candCount = w;
  }

  /** As assembly/paths.ts runPath: per-walk frames and filters, one chain per grid n. */
  private runPath(out: Float64Array, offset: number, ctl: Float64Array | null, ctlOffset: number): void {
    const { k, nMax: N, grid, PX, PY, SX, SY, NZ, SEG } = this;
    const G = grid.length;
    const stride = N + 1;
    for (let j = 0; j < k; j++) {
      this.rng.nextSubstream();
      drawStepsInto(this.walks[j], N, SX, SY, NZ, this.rng);
      const base = j * stride;
      let x = 0, y = 0;
      PX[base] = 0; PY[base] = 0;
      let i = 0;
      let sx = 0, sy = 0, sxx = 0, sxy = 0, syy = 0;
      for (let g = 0; g < G; g++) {
        const hi = grid[g];
        for (; i < hi; i++) {
          x += SX[i]; y += SY[i];
          PX[base + i + 1] = x; PY[base + i + 1] = y;
          sx += x; sy += y; sxx += x * x; sxy += x * y; syy += y * y;
        }
        const o = 5 * (j * G + g);
        SEG[o] = sx; SEG[o + 1] = sy; SEG[o + 2] = sxx; SEG[o + 3] = sxy; SEG[o + 4] = syy;
      }
    }
    let prev = 0;
    for (let g = 0; g < G; g++) {
      const hi = grid[g];
      this.candCount = 0;
      if (g === 0) this.append(PX, PY, 0, 1);
      else this.append(this.HX, this.HY, 0, this.hullCount);
      for (let j = 0; j < k; j++) {
        const o = 5 * (j * G + g);
        this.setFrame(1 + hi, SEG[o], SEG[o + 1], SEG[o + 2], SEG[o + 3], SEG[o + 4]);
        const base = j * stride;
        this.gatherAndFilter(PX, PY, base + prev + 1, base + hi + 1);
      }
      this.filterSecondPass(g, hi);
      this.survivors += this.candCount;
      const h = this.chain();
      hullFunctionals(this.HX, this.HY, h, out, offset + this.layout.perPoint * g);
      if (ctl) this.writeControls(ctl, ctlOffset, g, hi);
      prev = hi;
    }
  }

  /** As assembly/walks.ts writeControls: centred endpoint and integrated path of each walk at n = hi. */
  private writeControls(ctl: Float64Array, offset: number, g: number, hi: number): void {
    const { k, nMax: N, grid, PX, PY, SEG } = this;
    const G = grid.length;
    const fn = hi;
    const tri = 0.5 * fn * (fn + 1.0);
    for (let j = 0; j < k; j++) {
      const [mx, my] = this.walks[j].mean;
      const at = j * (N + 1) + hi;
      const o = 5 * (j * G + g);
      const r = offset + CONTROLS_PER_WALK * (g * k + j);
      ctl[r] = PX[at] - fn * mx;
      ctl[r + 1] = PY[at] - fn * my;
      ctl[r + 2] = SEG[o] - tri * mx;
      ctl[r + 3] = SEG[o + 1] - tri * my;
    }
  }

  private chain(): number {
    const n = this.candCount;
    sortPoints(this.CX, this.CY, 0, n - 1);
    this.hullCount = monotoneChain(this.CX, this.CY, n, this.HX, this.HY);
    return this.hullCount;
  }

  runBlock(block: number, pathCount: number, controls?: Float64Array): Float64Array {
    const rec = this.layout.width;
    const crec = this.grid.length * this.k * CONTROLS_PER_WALK;
    if (controls && controls.length !== pathCount * crec) throw new Error(`controls: length ${controls.length}, expected ${pathCount * crec}`);
    const out = new Float64Array(pathCount * rec);
    this.rng.seedBlock(this.seed, block);
    for (let p = 0; p < pathCount; p++) this.runPath(out, p * rec, controls ?? null, p * crec);
    return out;
  }

  /** Points and hull interleaved: [x_0, y_0, x_1, y_1, ...]; points[j] has nMax + 1 points. */
  samplePath(block: number): { points: Float64Array[]; hull: Float64Array } {
    const rec = this.layout.width;
    this.rng.seedBlock(this.seed, block);
    this.runPath(new Float64Array(rec), 0, null, 0);
    const stride = this.nMax + 1;
    const points: Float64Array[] = [];
    for (let j = 0; j < this.k; j++) {
      const pts = new Float64Array(2 * stride);
      for (let i = 0; i < stride; i++) {
        pts[2 * i] = this.PX[j * stride + i];
        pts[2 * i + 1] = this.PY[j * stride + i];
      }
      points.push(pts);
    }
    const hull = new Float64Array(2 * this.hullCount);
    for (let i = 0; i < this.hullCount; i++) {
      hull[2 * i] = this.HX[i];
      hull[2 * i + 1] = this.HY[i];
    }
    return { points, hull };
  }

  /** `count` raw steps of walk j from the first substream of (seed, block). */
  drawSteps(block: number, j: number, count: number): { x: Float64Array; y: Float64Array } {
    this.rng.seedBlock(this.seed, block);
    this.rng.nextSubstream();
    const x = new Float64Array(count), y = new Float64Array(count);
    drawStepsInto(this.walks[j], count, x, y, new Float64Array(2 * count), this.rng);
    return { x, y };
  }

  /**
   * Hull through the kernel's own filter + chain (frame from the points' moments); count must not
   * exceed k * (nMax + 1). Returns the vertices and the measures in slot order.
   */
  hullOfPoints(xs: ArrayLike<number>, ys: ArrayLike<number>, useFilter = true): { x: Float64Array; y: Float64Array; measures: Float64Array } {
    const count = xs.length;
    const px = Float64Array.from(xs), py = Float64Array.from(ys);
    let sx = 0, sy = 0, sxx = 0, sxy = 0, syy = 0;
    for (let i = 0; i < count; i++) {
      const x = px[i], y = py[i];
      sx += x; sy += y; sxx += x * x; sxy += x * y; syy += y * y;
    }
    this.setFrame(count, sx, sy, sxx, sxy, syy);
    this.candCount = 0;
    let h = 0;
    if (count > 0) {
      this.resetExtremes(px[0], py[0]);
      this.scanExtremes(px, py, 0, count);
      this.append(px, py, 0, count);
      if (useFilter) this.filterCandidates(0);
      h = this.chain();
    }
    this.hullCount = h;
    const x = this.HX.slice(0, h), y = this.HY.slice(0, h);
    const measures = new Float64Array(MEASURE_COUNT);
    hullFunctionals(x, y, h, measures, 0);
    return { x, y, measures };
  }
}

export function createTwinKernel(setup: KernelSetup): TwinKernel {
  return new TwinKernel(setup);
}
