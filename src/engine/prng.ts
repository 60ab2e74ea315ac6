// The TS twin of assembly/rng.ts: the same streams bit for bit (xoshiro256** seeded from splitmix64,
// ziggurat and polar normals, Marsaglia–Tsang gamma), with 64-bit words held as two uint32 halves
// so that the hot loops stay in plain numbers (no BigInt).
// Sources: xoshiro256** ("Scrambled linear pseudorandom number generators", ACM TOMS 47 (2021));
// splitmix64 ("Fast splittable pseudorandom number generators", OOPSLA 2014); ziggurat ("The ziggurat
// method for generating random variables", J. Stat. Softw. 5 (2000), with the uniform-in-(-1,1)
// variant of "An improved ziggurat method to generate normal random samples", 2005); polar method
// ("A convenient method for generating normal variables", SIAM Review 6 (1964)); gamma ("A simple
// method for generating gamma variables", ACM TOMS 26 (2000)) [memory for the titles].
// Math.exp/log/cos/sin/pow of V8 and of AssemblyScript's library may differ in the last ulp; only
// values computed with them (tails, wedges, circle steps, gamma) can differ from the WASM stream,
// and a different accept/reject decision would need a tie within an ulp (probability ~1e-16 per
// draw). sqrt is correctly rounded in both.

const TWO32 = 4294967296;
const TWO_M53 = 1.1102230246251565e-16;

// Scratch result of the 32x32 -> 64 multiply.
let mulHi = 0;
let mulLo = 0;

function mulFull32(a: number, b: number): void {
  const a0 = a & 0xffff, a1 = a >>> 16, b0 = b & 0xffff, b1 = b >>> 16;
  const mid = a0 * b1 + a1 * b0;
  const low = a0 * b0 + (mid % 65536) * 65536;
  const lo = low >>> 0;
  mulLo = lo;
  mulHi = (a1 * b1 + Math.floor(mid / 65536) + (low - lo) / TWO32) >>> 0;
}

/** (h, l) * (ch, cl) mod 2^64 into (mulHi, mulLo); all uint32. */
function mul64(h: number, l: number, ch: number, cl: number): void {
  mulFull32(l, cl);
  mulHi = (mulHi + Math.imul(h, cl) + Math.imul(l, ch)) >>> 0;
}

let mixHi = 0;
let mixLo = 0;
/** splitmix64 finaliser of (h, l) into (mixHi, mixLo). */
function mix64(h0: number, l0: number): void {
  let h = h0 >>> 0, l = l0 >>> 0;
  // z ^= z >> 30
  l = (l ^ ((l >>> 30) | (h << 2))) >>> 0;
  h = (h ^ (h >>> 30)) >>> 0;
  mul64(h, l, 0xbf58476d, 0x1ce4e5b9);
  h = mulHi; l = mulLo;
  l = (l ^ ((l >>> 27) | (h << 5))) >>> 0;
  h = (h ^ (h >>> 27)) >>> 0;
  mul64(h, l, 0x94d049bb, 0x133111eb);
  h = mulHi; l = mulLo;
  l = (l ^ ((l >>> 31) | (h << 1))) >>> 0;
  h = (h ^ (h >>> 31)) >>> 0;
  mixHi = h; mixLo = l;
}

function splitU64(v: bigint): [number, number] {
  const x = BigInt.asUintN(64, v);
  return [Number(x >> 32n), Number(x & 0xffffffffn)];
}

/** Ziggurat tables X[0..256], F[0..256] (256 layers), as in assembly/rng.ts initZiggurat. */
export const ZIG_R = 3.6541528853610088;
export const ZIG_V = 0.00492867323399;
export function zigguratTables(): { X: Float64Array; F: Float64Array } {
  const X = new Float64Array(257);
  const F = new Float64Array(257);
  X[0] = ZIG_V / Math.exp(-0.5 * ZIG_R * ZIG_R);
  X[1] = ZIG_R;
  let x = ZIG_R;
  for (let i = 2; i < 256; i++) {
    x = Math.sqrt(-2.0 * Math.log(ZIG_V / x + Math.exp(-0.5 * x * x)));
    X[i] = x;
  }
  X[256] = 0;
  for (let i = 0; i <= 256; i++) F[i] = Math.exp(-0.5 * X[i] * X[i]);
  return { X, F };
}
const ZIG = zigguratTables();
const ZX = ZIG.X;
const ZF = ZIG.F;

/**
 * A block stream: splitmix64 state mix64(mix64(seed ^ C) ^ block), and the current xoshiro256**
 * substream (four splitmix64 outputs per (path, walk)).
 */
export class Rng {
  smH = 0; smL = 0;
  a0 = 0; a1 = 0; b0 = 0; b1 = 0; c0 = 0; c1 = 0; d0 = 0; d1 = 0; // s0..s3 as (hi, lo)
  /** Last 64-bit output (hi, lo). */
  rH = 0; rL = 0;

  seedBlock(seed: number | bigint, block: number | bigint): void {
    const [sh, sl] = splitU64(BigInt(seed) ^ 0x6a09e667f3bcc909n);
    mix64(sh, sl);
    const [bh, bl] = splitU64(BigInt(block));
    mix64((mixHi ^ bh) >>> 0, (mixLo ^ bl) >>> 0);
    this.smH = mixHi;
    this.smL = mixLo;
  }

  private splitmixNext(): void {
    // sm += 0x9e3779b97f4a7c15
    const lo = this.smL + 0x7f4a7c15;
    const l = lo >>> 0;
    this.smH = (this.smH + 0x9e3779b9 + (lo - l) / TWO32) >>> 0;
    this.smL = l;
    mix64(this.smH, this.smL);
  }

  nextSubstream(): void {
    this.splitmixNext(); this.a0 = mixHi; this.a1 = mixLo;
    this.splitmixNext(); this.b0 = mixHi; this.b1 = mixLo;
    this.splitmixNext(); this.c0 = mixHi; this.c1 = mixLo;
    this.splitmixNext(); this.d0 = mixHi; this.d1 = mixLo;
  }

  /** Current xoshiro state as four BigInts (tests). */
  state(): bigint[] {
    const w = (h: number, l: number) => (BigInt(h >>> 0) << 32n) | BigInt(l >>> 0);
    return [w(this.a0, this.a1), w(this.b0, this.b1), w(this.c0, this.c1), w(this.d0, this.d1)];
  }

  /** xoshiro256** step; output in (rH, rL). */
  next(): void {
    const bh = this.b0 >>> 0, bl = this.b1 >>> 0;
    // r = rotl(s1 * 5, 7) * 9
    let p = bl * 5;
    let ml = p >>> 0;
    let mh = (bh * 5 + (p - ml) / TWO32) >>> 0;
    const rh = ((mh << 7) | (ml >>> 25)) >>> 0;
    const rl = ((ml << 7) | (mh >>> 25)) >>> 0;
    p = rl * 9;
    ml = p >>> 0;
    mh = (rh * 9 + (p - ml) / TWO32) >>> 0;
    this.rH = mh; this.rL = ml;
    const th = (bh << 17) | (bl >>> 15), tl = bl << 17;
    this.c0 ^= this.a0; this.c1 ^= this.a1;
    this.d0 ^= this.b0; this.d1 ^= this.b1;
    this.b0 ^= this.c0; this.b1 ^= this.c1;
    this.a0 ^= this.d0; this.a1 ^= this.d1;
    this.c0 ^= th; this.c1 ^= tl;
    const dh = this.d0 >>> 0, dl = this.d1 >>> 0;
    this.d0 = (dl << 13) | (dh >>> 19);
    this.d1 = (dh << 13) | (dl >>> 19);
  }

  /** Next output as a BigInt (tests). */
  nextU64(): bigint {
    this.next();
    return (BigInt(this.rH >>> 0) << 32n) | BigInt(this.rL >>> 0);
  }

  uniform(): number {
    this.next();
    return ((this.rH >>> 0) * 2097152 + (this.rL >>> 11)) * TWO_M53;
  }

  uniformPos(): number {
    this.next();
    return 1.0 - ((this.rH >>> 0) * 2097152 + (this.rL >>> 11)) * TWO_M53;
  }

  zigSlow(i0: number, x0: number, u0: number): number {
    let layer = i0, cand = x0, uu = u0;
    for (;;) {
      if (layer === 0) {
        let tx: number, ty: number;
        do {
          tx = -Math.log(this.uniformPos()) / ZIG_R;
          ty = -Math.log(this.uniformPos());
        } while (ty + ty < tx * tx);
        return uu < 0 ? -(ZIG_R + tx) : ZIG_R + tx;
      }
      const fi = ZF[layer], fi1 = ZF[layer + 1];
      if (fi1 + this.uniform() * (fi - fi1) < Math.exp(-0.5 * cand * cand)) return cand;
      this.next();
      layer = this.rL & 255;
      uu = 2.0 * (((this.rH >>> 0) * 2097152 + (this.rL >>> 11)) * TWO_M53) - 1.0;
      cand = uu * ZX[layer];
      if (Math.abs(cand) < ZX[layer + 1]) return cand;
    }
  }

  normal(): number {
    this.next();
    const i = this.rL & 255;
    const u = 2.0 * (((this.rH >>> 0) * 2097152 + (this.rL >>> 11)) * TWO_M53) - 1.0;
    const x = u * ZX[i];
    if (Math.abs(x) < ZX[i + 1]) return x;
    return this.zigSlow(i, x, u);
  }

  /** count ziggurat normals into out (the same draws as count calls of normal()). */
  fillNormals(out: Float64Array, count: number): void {
    for (let k = 0; k < count; k++) {
      this.next();
      const i = this.rL & 255;
      const u = 2.0 * (((this.rH >>> 0) * 2097152 + (this.rL >>> 11)) * TWO_M53) - 1.0;
      const x = u * ZX[i];
      out[k] = Math.abs(x) < ZX[i + 1] ? x : this.zigSlow(i, x, u);
    }
  }

  /** Polar-method normals (count even), as assembly/rng.ts fillNormalsPolar. */
  fillNormalsPolar(out: Float64Array, count: number): void {
    let k = 0;
    while (k + 1 < count) {
      let v1: number, v2: number, q: number;
      do {
        v1 = 2.0 * this.uniform() - 1.0;
        v2 = 2.0 * this.uniform() - 1.0;
        q = v1 * v1 + v2 * v2;
      } while (q >= 1.0 || q === 0.0);
      const f = Math.sqrt((-2.0 * Math.log(q)) / q);
      out[k] = v1 * f;
      out[k + 1] = v2 * f;
      k += 2;
    }
  }

  gamma(shape: number): number {
    if (shape < 1.0) {
      const g = this.gamma(shape + 1.0);
      return g * Math.pow(this.uniformPos(), 1.0 / shape);
    }
    const dd = shape - 1.0 / 3.0;
    const cc = 1.0 / Math.sqrt(9.0 * dd);
    for (;;) {
      const x = this.normal();
      let v = 1.0 + cc * x;
      if (v <= 0.0) continue;
      v = v * v * v;
      const u = this.uniformPos();
      const x2 = x * x;
      if (u < 1.0 - 0.0331 * x2 * x2) return dd * v;
      if (Math.log(u) < 0.5 * x2 + dd * (1.0 - v + Math.log(v))) return dd * v;
    }
  }
}
