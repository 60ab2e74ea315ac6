/*
 * Native C baseline of the WASM kernel (assembly/ *.ts files), Gaussian step laws only: the same
 * xoshiro256** streams seeded by splitmix64, the same 256-layer ziggurat (tables passed in by the
 * bench, so they are the kernel's), the same per-walk frame, extremes and certified octagon filter
 * (with the same chunk boxes and chunk-bounded search for extremes, scalar),
 * the same quicksort + monotone chain with the exact orientation sign, the same compensated
 * measures, in the same order. Built by bench/pipeline.ts with gcc -O3 -ffp-contract=off (no FMA
 * contraction, so the floating-point operations are those of the WASM build).
 *
 * Usage:
 *   walkhull-native ZIGFILE values SEED BLOCK PATHS GRID K [mx my l11 l21 l22]*K
 *       -> PATHS * |GRID| * MEASURE_COUNT doubles (the measures in registry slot order) on stdout, binary
 *   walkhull-native ZIGFILE time SEED BLOCK PATHS GRID K [...] REPS
 *       -> "seconds per call" (mean over REPS calls of PATHS paths each, after one warm-up call)
 *   walkhull-native ZIGFILE normals COUNT REPS
 *       -> seconds per fill of COUNT ziggurat normals
 *   walkhull-native ZIGFILE uniforms COUNT REPS
 *       -> seconds per COUNT uniforms on [0, 1) (summed)
 * GRID is a comma-separated increasing list of step counts. ZIGFILE holds 514 doubles (X then F).
 */
#include <math.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>

/* ---- PRNG (xoshiro256**, splitmix64) ---- */
static uint64_t s0, s1, s2, s3, sm;
#define GOLDEN 0x9e3779b97f4a7c15ULL
static inline uint64_t mix64(uint64_t z) {
  z = (z ^ (z >> 30)) * 0xbf58476d1ce4e5b9ULL;
  z = (z ^ (z >> 27)) * 0x94d049bb133111ebULL;
  return z ^ (z >> 31);
}
static inline uint64_t rotl(uint64_t x, int k) { return (x << k) | (x >> (64 - k)); }
static void seedBlockStream(uint64_t seed, uint64_t block) { sm = mix64(mix64(seed ^ 0x6a09e667f3bcc909ULL) ^ block); }
static inline uint64_t splitmixNext(void) { sm += GOLDEN; return mix64(sm); }
static void nextSubstream(void) { s0 = splitmixNext(); s1 = splitmixNext(); s2 = splitmixNext(); s3 = splitmixNext(); }
static inline uint64_t nextU64(void) {
  uint64_t result = rotl(s1 * 5, 7) * 9, t = s1 << 17;
  s2 ^= s0; s3 ^= s1; s1 ^= s2; s0 ^= s3; s2 ^= t; s3 = rotl(s3, 45);
  return result;
}
#define TWO_M53 1.1102230246251565e-16
static inline double uniform01(void) { return (double)(nextU64() >> 11) * TWO_M53; }
static inline double uniformPos(void) { return 1.0 - (double)(nextU64() >> 11) * TWO_M53; }

#define ZIG_R 3.6541528853610088
static double ZX[257], ZF[257];

static double zigSlow(int i, double x, double u) {
  int layer = i; double cand = x, uu = u;
  for (;;) {
    if (layer == 0) {
      double tx, ty;
      do { tx = -log(uniformPos()) / ZIG_R; ty = -log(uniformPos()); } while (ty + ty < tx * tx);
      return uu < 0 ? -(ZIG_R + tx) : ZIG_R + tx;
    }
    double fi = ZF[layer], fi1 = ZF[layer + 1];
    if (fi1 + uniform01() * (fi - fi1) < exp(-0.5 * cand * cand)) return cand;
    uint64_t r = nextU64();
    layer = (int)(r & 255);
    uu = 2.0 * ((double)(r >> 11) * TWO_M53) - 1.0;
    cand = uu * ZX[layer];
    if (fabs(cand) < ZX[layer + 1]) return cand;
  }
}

static void fillNormals(double *out, int count) {
  uint64_t a = s0, b = s1, c = s2, d = s3;
  for (int k = 0; k < count; k++) {
    uint64_t r = rotl(b * 5, 7) * 9, t = b << 17;
    c ^= a; d ^= b; b ^= c; a ^= d; c ^= t; d = rotl(d, 45);
    unsigned i = (unsigned)(r & 255);
    double u = 2.0 * ((double)(r >> 11) * TWO_M53) - 1.0;
    double x = u * ZX[i];
    if (!(fabs(x) < ZX[i + 1])) {
      s0 = a; s1 = b; s2 = c; s3 = d;
      x = zigSlow((int)i, x, u);
      a = s0; b = s1; c = s2; d = s3;
    }
    out[k] = x;
  }
  s0 = a; s1 = b; s2 = c; s3 = d;
}

/* ---- Exact orientation sign (Shewchuk's filter + exact expansion), as assembly/hull.ts ---- */
#define EPSU 1.1102230246251565e-16
static const double CCW_ERRBOUND_A = (3.0 + 16.0 * EPSU) * EPSU;
#define SPLITTER 134217729.0
static double expansion[32];
static int expLen;
static inline void growWith(double q) {
  for (int i = 0; i < expLen; i++) {
    double e = expansion[i], s = q + e, bv = s - q, av = s - bv, h = (q - av) + (e - bv);
    expansion[i] = h; q = s;
  }
  expansion[expLen++] = q;
}
static void addProduct(double a, double b) {
  double x = a * b, c = SPLITTER * a, ahi = c - (c - a), alo = a - ahi;
  c = SPLITTER * b;
  double bhi = c - (c - b), blo = b - bhi;
  double err = alo * blo - (((x - ahi * bhi) - alo * bhi) - ahi * blo);
  growWith(err); growWith(x);
}
static int crossSignExact(double ax, double ay, double bx, double by, double cx, double cy, double dx, double dy) {
  expLen = 0;
  addProduct(ax, cy); addProduct(-ax, dy); addProduct(-bx, cy); addProduct(bx, dy);
  addProduct(-ay, cx); addProduct(ay, dx); addProduct(by, cx); addProduct(-by, dx);
  for (int i = expLen - 1; i >= 0; i--) { if (expansion[i] > 0) return 1; if (expansion[i] < 0) return -1; }
  return 0;
}
static inline int crossSign(double ax, double ay, double bx, double by, double cx, double cy, double dx, double dy) {
  double l = (ax - bx) * (cy - dy), r = (ay - by) * (cx - dx), det = l - r;
  double bound = CCW_ERRBOUND_A * (fabs(l) + fabs(r));
  if (det > bound) return 1;
  if (-det > bound) return -1;
  return crossSignExact(ax, ay, bx, by, cx, cy, dx, dy);
}
static inline int orient(double ax, double ay, double bx, double by, double cx, double cy) {
  return crossSign(bx, by, ax, ay, cx, cy, ax, ay);
}

/* ---- Sort (same quicksort) and monotone chain ---- */
static inline int lessAt(const double *xs, const double *ys, int i, double px, double py) {
  return xs[i] < px || (xs[i] == px && ys[i] < py);
}
static inline void swp(double *xs, double *ys, int i, int j) {
  double tx = xs[i], ty = ys[i]; xs[i] = xs[j]; ys[i] = ys[j]; xs[j] = tx; ys[j] = ty;
}
static void insertionSort(double *xs, double *ys, int lo, int hi) {
  for (int i = lo + 1; i <= hi; i++) {
    double px = xs[i], py = ys[i];
    int j = i - 1;
    while (j >= lo) {
      double x = xs[j];
      if (x < px || (x == px && ys[j] <= py)) break;
      xs[j + 1] = x; ys[j + 1] = ys[j]; j--;
    }
    xs[j + 1] = px; ys[j + 1] = py;
  }
}
static void sortPoints(double *xs, double *ys, int lo, int hi) {
  while (hi - lo > 16) {
    int mid = lo + ((hi - lo) >> 1);
    if (lessAt(xs, ys, mid, xs[lo], ys[lo])) swp(xs, ys, mid, lo);
    if (lessAt(xs, ys, hi, xs[lo], ys[lo])) swp(xs, ys, hi, lo);
    if (lessAt(xs, ys, hi, xs[mid], ys[mid])) swp(xs, ys, hi, mid);
    double px = xs[mid], py = ys[mid];
    int i = lo - 1, j = hi + 1;
    for (;;) {
      do { i++; } while (lessAt(xs, ys, i, px, py));
      do { j--; } while (px < xs[j] || (px == xs[j] && py < ys[j]));
      if (i >= j) break;
      swp(xs, ys, i, j);
    }
    if (j - lo < hi - j) { sortPoints(xs, ys, lo, j); lo = j + 1; }
    else { sortPoints(xs, ys, j + 1, hi); hi = j; }
  }
  insertionSort(xs, ys, lo, hi);
}
static int monotoneChain(double *xs, double *ys, int count, double *hx, double *hy) {
  if (count == 0) return 0;
  int m = 1;
  for (int i = 1; i < count; i++) {
    double x = xs[i], y = ys[i];
    if (x != xs[m - 1] || y != ys[m - 1]) { xs[m] = x; ys[m] = y; m++; }
  }
  if (m == 1) { hx[0] = xs[0]; hy[0] = ys[0]; return 1; }
  int h = 0;
  for (int i = 0; i < m; i++) {
    double x = xs[i], y = ys[i];
    while (h >= 2 && orient(hx[h - 2], hy[h - 2], hx[h - 1], hy[h - 1], x, y) <= 0) h--;
    hx[h] = x; hy[h] = y; h++;
  }
  int lowerSize = h + 1;
  for (int i = m - 2; i >= 0; i--) {
    double x = xs[i], y = ys[i];
    while (h >= lowerSize && orient(hx[h - 2], hy[h - 2], hx[h - 1], hy[h - 1], x, y) <= 0) h--;
    hx[h] = x; hy[h] = y; h++;
  }
  return h - 1;
}

/* ---- Measures ---- */
static double perimeter(const double *hx, const double *hy, int h) {
  if (h < 2) return 0.0;
  double sum = 0.0, comp = 0.0;
  for (int i = 0; i < h; i++) {
    int j = i + 1 == h ? 0 : i + 1;
    double dx = hx[j] - hx[i], dy = hy[j] - hy[i];
    double len = sqrt(dx * dx + dy * dy), t = sum + len;
    comp += fabs(sum) >= len ? (sum - t) + len : (len - t) + sum;
    sum = t;
  }
  return sum + comp;
}
static double area(const double *hx, const double *hy, int h) {
  if (h < 3) return 0.0;
  double x0 = hx[0], y0 = hy[0], sum = 0.0, comp = 0.0;
  for (int i = 1; i + 1 < h; i++) {
    double ax = hx[i] - x0, ay = hy[i] - y0, bx = hx[i + 1] - x0, by = hy[i + 1] - y0;
    double v = ax * by - ay * bx, t = sum + v;
    comp += fabs(sum) >= fabs(v) ? (sum - t) + v : (v - t) + sum;
    sum = t;
  }
  return 0.5 * (sum + comp);
}
static inline double dist2(const double *hx, const double *hy, int i, int j) {
  double dx = hx[i] - hx[j], dy = hy[i] - hy[j];
  return dx * dx + dy * dy;
}
static double diameter(const double *hx, const double *hy, int h) {
  if (h < 2) return 0.0;
  if (h == 2) return sqrt(dist2(hx, hy, 0, 1));
  double best = 0.0;
  int j = 1, steps = 0;
  for (int i = 0; i < h; i++) {
    int i1 = i + 1 == h ? 0 : i + 1;
    for (;;) {
      int j1 = j + 1 == h ? 0 : j + 1;
      if (steps > 2 * h) break;
      if (crossSign(hx[i1], hy[i1], hx[i], hy[i], hx[j1], hy[j1], hx[j], hy[j]) > 0) { j = j1; steps++; }
      else break;
    }
    int j1 = j + 1 == h ? 0 : j + 1;
    double d = dist2(hx, hy, i, j); if (d > best) best = d;
    d = dist2(hx, hy, i1, j); if (d > best) best = d;
    d = dist2(hx, hy, i, j1); if (d > best) best = d;
    d = dist2(hx, hy, i1, j1); if (d > best) best = d;
  }
  return sqrt(best);
}

/* The record of one grid point: every measure at its slot (src/geometry/measure-registry.ts),
 * as assembly/measures.ts writeMeasures. */
static double width(const double *hx, const double *hy, int h) {
  if (h < 3) return 0.0;
  double best = INFINITY;
  int j = 1;
  for (int i = 0; i < h; i++) {
    int i1 = i + 1 == h ? 0 : i + 1;
    double ax = hx[i], ay = hy[i], bx = hx[i1], by = hy[i1];
    for (int s = 0; s < h; s++) {
      int j1 = j + 1 == h ? 0 : j + 1;
      if (crossSign(bx, by, ax, ay, hx[j1], hy[j1], hx[j], hy[j]) <= 0) break;
      j = j1;
    }
    double ex = bx - ax, ey = by - ay;
    double d = (ex * (hy[j] - ay) - ey * (hx[j] - ax)) / sqrt(ex * ex + ey * ey);
    if (d < best) best = d;
  }
  return best;
}
#define MEASURE_COUNT 5
static void writeMeasures(double *r, const double *hx, const double *hy, int h) {
  r[0] = perimeter(hx, hy, h); r[1] = diameter(hx, hy, h); r[2] = area(hx, hy, h); r[3] = (double)h;
  r[4] = width(hx, hy, h);
}

/* ---- The path pipeline (assembly/paths.ts) ---- */
static int K, N, G, *grid;
static double *params; /* K * 5 */
static double *PX, *PY, *NZ, *CX, *CY, *HX, *HY, *SEG;
static int hullCount, candCount;
static double fa = 1, fb = 0, fc = 1, fd = 0;
static double exs[8], eys[8], absX, absY;
#define FILTER_MIN 32

static void setFrame(double cnt, double sx, double sy, double sxx, double sxy, double syy) {
  fa = 1; fb = 0; fc = 1; fd = 0;
  double mx = sx / cnt, my = sy / cnt;
  double cxx = sxx / cnt - mx * mx, cxy = sxy / cnt - mx * my, cyy = syy / cnt - my * my;
  if (!(cxx > 0) || !(cyy > 0)) return;
  double l11 = sqrt(cxx), l21 = cxy / l11, schur = cyy - l21 * l21;
  if (!(schur > 1e-9 * cyy)) return;
  double l22 = sqrt(schur);
  fa = 1.0 / l11; fb = -l21 / (l11 * l22); fc = 1.0 / l22;
}

/* Chunks of CHUNK points: bounding boxes (BOX) for filterGroup's whole-chunk test; extremes from
 * per-chunk maxima, the first chunk holding each rescanned for its first point with it; groups of
 * GUIDED_MIN points or more evaluate only the chunks whose corner bounds (BND) may hold an extreme
 * (as assembly/extremes.ts gatherGroup, scalar). */
#define CHUNK 32
#define GUIDED_MIN 2048
static double *BOX, *BND;
static const double *boxSrc = 0;
static int boxFrom = -1, boxTo = -1;
/* Directions: 0 max u, 1 max v, 2 min u, 3 min v, 4 max u+v, 5 max u-v, 6 min u+v, 7 min u-v. */
static double best[8];
static int bestChunk[8];

static void evalChunk(const double *srcX, const double *srcY, int cs, int to) {
  double a = fa, b = fb, c = fc, dd = fd;
  int ce = cs + CHUNK < to ? cs + CHUNK : to;
  double m[8] = { -INFINITY, -INFINITY, INFINITY, INFINITY, -INFINITY, -INFINITY, INFINITY, INFINITY };
  for (int i = cs; i < ce; i++) {
    double x = srcX[i], y = srcY[i];
    double u = x * a + y * dd, v = x * b + y * c, s = u + v, d = u - v;
    m[0] = u > m[0] ? u : m[0]; m[1] = v > m[1] ? v : m[1];
    m[2] = u < m[2] ? u : m[2]; m[3] = v < m[3] ? v : m[3];
    m[4] = s > m[4] ? s : m[4]; m[5] = d > m[5] ? d : m[5];
    m[6] = s < m[6] ? s : m[6]; m[7] = d < m[7] ? d : m[7];
  }
  for (int e = 0; e < 8; e++) {
    int better = (e & 2) ? m[e] < best[e] : m[e] > best[e];
    if (better || (m[e] == best[e] && cs < bestChunk[e])) { best[e] = m[e]; bestChunk[e] = cs; }
  }
}

static int firstWith(const double *srcX, const double *srcY, int cs, int to, int kind, double target) {
  double a = fa, b = fb, c = fc, dd = fd;
  int ce = cs + CHUNK < to ? cs + CHUNK : to;
  for (int i = cs; i < ce; i++) {
    double x = srcX[i], y = srcY[i];
    double u = x * a + y * dd, v = x * b + y * c;
    double val = kind == 0 ? u : kind == 1 ? u + v : kind == 2 ? v : u - v;
    if (val == target) return i;
  }
  return cs < to ? cs : to - 1;
}

static void gatherGroup(const double *srcX, const double *srcY, int from, int to) {
  double a = fa, b = fb, c = fc, dd = fd;
  int guided = to - from >= GUIDED_MIN;
  double gxl = INFINITY, gxh = -INFINITY, gyl = INFINITY, gyh = -INFINITY;
  double bb[8] = { -INFINITY, -INFINITY, INFINITY, INFINITY, -INFINITY, -INFINITY, INFINITY, INFINITY };
  int bc[8];
  for (int e = 0; e < 8; e++) { best[e] = (e & 2) ? INFINITY : -INFINITY; bestChunk[e] = guided ? to : from; bc[e] = from; }
  double *box = BOX, *bnd = BND;
  for (int cs = from; cs < to; cs += CHUNK) {
    int ce = cs + CHUNK < to ? cs + CHUNK : to;
    double xl = INFINITY, xh = -INFINITY, yl = INFINITY, yh = -INFINITY;
    for (int i = cs; i < ce; i++) {
      double x = srcX[i], y = srcY[i];
      xl = x < xl ? x : xl; xh = x > xh ? x : xh;
      yl = y < yl ? y : yl; yh = y > yh ? y : yh;
    }
    box[0] = xl; box[1] = yl; box[2] = xh; box[3] = yh; box += 4;
    gxl = xl < gxl ? xl : gxl; gxh = xh > gxh ? xh : gxh;
    gyl = yl < gyl ? yl : gyl; gyh = yh > gyh ? yh : gyh;
    if (!guided) { evalChunk(srcX, srcY, cs, to); continue; }
    double u00 = xl * a + yl * dd, u10 = xh * a + yl * dd, u01 = xl * a + yh * dd, u11 = xh * a + yh * dd;
    double v00 = xl * b + yl * c, v10 = xh * b + yl * c, v01 = xl * b + yh * c, v11 = xh * b + yh * c;
    double uH = fmax(fmax(u00, u10), fmax(u01, u11)), uL = fmin(fmin(u00, u10), fmin(u01, u11));
    double vH = fmax(fmax(v00, v10), fmax(v01, v11)), vL = fmin(fmin(v00, v10), fmin(v01, v11));
    double q[8] = { uH, vH, uL, vL, uH + vH, uH + (-vL), uL + vL, uL + (-vH) };
    for (int e = 0; e < 8; e++) {
      bnd[e] = q[e];
      if ((e & 2) ? q[e] < bb[e] : q[e] > bb[e]) { bb[e] = q[e]; bc[e] = cs; }
    }
    bnd += 8;
  }
  if (guided) {
    for (int e = 0; e < 8; e++) evalChunk(srcX, srcY, bc[e], to);
    bnd = BND;
    for (int cs = from; cs < to; cs += CHUNK, bnd += 8) {
      int any = 0;
      for (int e = 0; e < 8; e++) any |= (e & 2) ? bnd[e] <= best[e] : bnd[e] >= best[e];
      if (any) evalChunk(srcX, srcY, cs, to);
    }
  }
  boxSrc = srcX; boxFrom = from; boxTo = to;
  /* exs/eys order: max u, max u+v, max v, min u-v, min u, min u+v, min v, max u-v */
  static const int dir[8] = { 0, 4, 1, 7, 2, 6, 3, 5 };
  static const int kind[8] = { 0, 1, 2, 3, 0, 1, 2, 3 };
  for (int e = 0; e < 8; e++) {
    int i = firstWith(srcX, srcY, bestChunk[dir[e]], to, kind[e], best[dir[e]]);
    exs[e] = srcX[i]; eys[e] = srcY[i];
  }
  absX = fmax(fabs(gxl), fabs(gxh));
  absY = fmax(fabs(gyl), fabs(gyh));
}

static void append(const double *srcX, const double *srcY, int from, int to);

/* Appends the points of src[from..to) not certified strictly inside the octagon to the candidates. */
static void filterGroup(const double *srcX, const double *srcY, int from, int to) {
  if (to - from < FILTER_MIN) { append(srcX, srcY, from, to); return; }
  double px[8], py[8];
  int m = 0;
  for (int e = 0; e < 8; e++) {
    if (m > 0 && px[m - 1] == exs[e] && py[m - 1] == eys[e]) continue;
    px[m] = exs[e]; py[m] = eys[e]; m++;
  }
  while (m > 1 && px[m - 1] == px[0] && py[m - 1] == py[0]) m--;
  if (m < 3) { append(srcX, srcY, from, to); return; }
  double A[8], B[8], C[8];
  for (int e = 0; e < 8; e++) {
    int e0 = e < m ? e : 0, f = e0 + 1 == m ? 0 : e0 + 1;
    double ax = px[e0], ay = py[e0], bx = px[f], by = py[f];
    double exx = bx - ax, eyy = by - ay, c = exx * ay - eyy * ax;
    double eps = 4e-15 * (fabs(exx) * absY + fabs(eyy) * absX);
    A[e] = exx; B[e] = eyy; C[e] = c + eps;
  }
  int w = candCount;
  int chunked = boxSrc == srcX && boxFrom == from && boxTo == to;
  const double *box = BOX;
  for (int cs = from; cs < to; cs += CHUNK, box += 4) {
    int ce = cs + CHUNK < to ? cs + CHUNK : to;
    if (chunked) {
      /* The 4 corners of the chunk's box pass the test: so does every point of the chunk. */
      int all = 1;
      for (int q = 0; q < 4 && all; q++) {
        double x = box[(q & 1) ? 2 : 0], y = box[(q & 2) ? 3 : 1];
        for (int e = 0; e < 8; e++) all &= A[e] * y - B[e] * x > C[e];
      }
      if (all) continue;
    }
    for (int i = cs; i < ce; i++) {
      double x = srcX[i], y = srcY[i];
      int inside = A[0] * y - B[0] * x > C[0] && A[1] * y - B[1] * x > C[1] && A[2] * y - B[2] * x > C[2] &&
        A[3] * y - B[3] * x > C[3] && A[4] * y - B[4] * x > C[4] && A[5] * y - B[5] * x > C[5] &&
        A[6] * y - B[6] * x > C[6] && A[7] * y - B[7] * x > C[7];
      if (!inside) { CX[w] = x; CY[w] = y; w++; }
    }
  }
  candCount = w;
}

static void append(const double *srcX, const double *srcY, int from, int to) {
  int w = candCount;
  for (int i = from; i < to; i++) { CX[w] = srcX[i]; CY[w] = srcY[i]; w++; }
  candCount = w;
}

/* Second pass for k > 1: candidates vs the octagon of their joint extremes, joint frame, in place. */
static void filterJoint(int g, int hi) {
  double sx = 0, sy = 0, sxx = 0, sxy = 0, syy = 0;
  for (int j = 0; j < K; j++) {
    const double *o = SEG + 5 * (j * G + g);
    sx += o[0]; sy += o[1]; sxx += o[2]; sxy += o[3]; syy += o[4];
  }
  setFrame((double)(K * (1 + hi)), sx, sy, sxx, sxy, syy);
  int count = candCount;
  gatherGroup(CX, CY, 0, count);
  candCount = 0;
  filterGroup(CX, CY, 0, count);
}

/* One walk: second pass in the walk's frame rotated by pi/8, in place. */
#define COS_PI8 0.9238795325112867
#define SIN_PI8 0.3826834323650898
static void filterRotated(void) {
  int count = candCount;
  if (count < FILTER_MIN) return;
  double a = fa, b = fb, c = fc;
  fa = COS_PI8 * a + SIN_PI8 * b;
  fd = SIN_PI8 * c;
  fb = COS_PI8 * b - SIN_PI8 * a;
  fc = COS_PI8 * c;
  gatherGroup(CX, CY, 0, count);
  candCount = 0;
  filterGroup(CX, CY, 0, count);
}

static void runPath(double *out) {
  int stride = N + 1;
  memset(SEG, 0, sizeof(double) * 5 * G * K);
  for (int j = 0; j < K; j++) {
    nextSubstream();
    fillNormals(NZ, N << 1);
    const double *p = params + 5 * j;
    double mx = p[0], my = p[1], l11 = p[2], l21 = p[3], l22 = p[4];
    double *px = PX + j * stride, *py = PY + j * stride;
    double x = 0.0, y = 0.0;
    px[0] = 0.0; py[0] = 0.0;
    int i = 0;
    double sx = 0, sy = 0, sxx = 0, sxy = 0, syy = 0;
    for (int g = 0; g < G; g++) {
      int hi = grid[g];
      for (; i < hi; i++) {
        double z1 = NZ[2 * i], z2 = NZ[2 * i + 1];
        x += mx + l11 * z1;
        y += my + (l21 * z1 + l22 * z2);
        px[i + 1] = x; py[i + 1] = y;
        sx += x; sy += y; sxx += x * x; sxy += x * y; syy += y * y;
      }
      double *o = SEG + 5 * (j * G + g);
      o[0] = sx; o[1] = sy; o[2] = sxx; o[3] = sxy; o[4] = syy;
    }
  }
  int prev = 0;
  for (int g = 0; g < G; g++) {
    int hi = grid[g];
    candCount = 0;
    if (g == 0) append(PX, PY, 0, 1);
    else append(HX, HY, 0, hullCount);
    for (int j = 0; j < K; j++) {
      double *o = SEG + 5 * (j * G + g);
      setFrame((double)(1 + hi), o[0], o[1], o[2], o[3], o[4]);
      int base = j * stride;
      gatherGroup(PX, PY, base + prev + 1, base + hi + 1);
      filterGroup(PX, PY, base + prev + 1, base + hi + 1);
    }
    if (K > 1) filterJoint(g, hi);
    else filterRotated();
    sortPoints(CX, CY, 0, candCount - 1);
    int h = hullCount = monotoneChain(CX, CY, candCount, HX, HY);
    writeMeasures(out + MEASURE_COUNT * g, HX, HY, h);
    prev = hi;
  }
}

static double *allocD(size_t n) {
  double *p = malloc(sizeof(double) * (n < 1 ? 1 : n));
  if (!p) { fprintf(stderr, "walkhull-native: out of memory\n"); exit(3); }
  return p;
}

static void setupKernel(int k, int *gr, int g) {
  K = k; G = g; grid = gr; N = gr[g - 1];
  size_t pts = (size_t)k * (N + 1), cand = 2 * pts + 8;
  PX = allocD(pts); PY = allocD(pts); NZ = allocD(2 * (size_t)N);
  BOX = allocD(4 * (cand / CHUNK + 2)); BND = allocD(8 * (cand / CHUNK + 2));
  CX = allocD(cand); CY = allocD(cand); HX = allocD(2 * cand + 2); HY = allocD(2 * cand + 2);
  SEG = allocD(5 * (size_t)g * k);
}

/* Wall clock, or this process's CPU time when WALKHULL_CPU_CLOCK=1 (the bench's --cpu). */
static double now(void) {
  static int cpu = -1;
  if (cpu < 0) { const char *e = getenv("WALKHULL_CPU_CLOCK"); cpu = e && strcmp(e, "1") == 0; }
  struct timespec ts;
  clock_gettime(cpu ? CLOCK_PROCESS_CPUTIME_ID : CLOCK_MONOTONIC, &ts);
  return ts.tv_sec + 1e-9 * ts.tv_nsec;
}

int main(int argc, char **argv) {
  if (argc < 5) { fprintf(stderr, "usage: see bench/native/walkhull.c\n"); return 2; }
  FILE *zf = fopen(argv[1], "rb");
  if (!zf || fread(ZX, sizeof(double), 257, zf) != 257 || fread(ZF, sizeof(double), 257, zf) != 257) {
    fprintf(stderr, "walkhull-native: cannot read ziggurat tables from %s\n", argv[1]);
    return 2;
  }
  fclose(zf);
  const char *mode = argv[2];
  if (strcmp(mode, "normals") == 0) {
    int count = atoi(argv[3]), reps = atoi(argv[4]);
    double *buf = allocD(count);
    seedBlockStream(1, 0); nextSubstream();
    fillNormals(buf, count);
    double t0 = now();
    for (int r = 0; r < reps; r++) fillNormals(buf, count);
    double sink = buf[count - 1];
    printf("%.9g %g\n", (now() - t0) / reps, sink);
    return 0;
  }
  if (strcmp(mode, "uniforms") == 0) {
    int count = atoi(argv[3]), reps = atoi(argv[4]);
    seedBlockStream(1, 0); nextSubstream();
    double sum = 0.0, t0 = now();
    for (int r = 0; r < reps; r++) for (int k = 0; k < count; k++) sum += uniform01();
    printf("%.9g %g\n", (now() - t0) / reps, sum);
    return 0;
  }
  if (argc < 8) { fprintf(stderr, "usage: see bench/native/walkhull.c\n"); return 2; }
  uint64_t seed = strtoull(argv[3], NULL, 10), block = strtoull(argv[4], NULL, 10);
  int paths = atoi(argv[5]);
  int gr[64], g = 0;
  for (char *tok = strtok(argv[6], ","); tok && g < 64; tok = strtok(NULL, ",")) gr[g++] = atoi(tok);
  int k = atoi(argv[7]);
  if (argc < 8 + 5 * k) { fprintf(stderr, "walkhull-native: need 5 parameters per walk\n"); return 2; }
  params = allocD(5 * (size_t)k);
  for (int i = 0; i < 5 * k; i++) params[i] = strtod(argv[8 + i], NULL);
  setupKernel(k, gr, g);
  double *out = allocD((size_t)paths * g * MEASURE_COUNT);
  if (strcmp(mode, "values") == 0) {
    seedBlockStream(seed, block);
    for (int p = 0; p < paths; p++) runPath(out + (size_t)p * g * MEASURE_COUNT);
    fwrite(out, sizeof(double), (size_t)paths * g * MEASURE_COUNT, stdout);
    return 0;
  }
  if (strcmp(mode, "time") == 0) {
    int reps = argc > 8 + 5 * k ? atoi(argv[8 + 5 * k]) : 5;
    seedBlockStream(seed, block);
    for (int p = 0; p < paths; p++) runPath(out + (size_t)p * g * MEASURE_COUNT);
    double t0 = now();
    for (int r = 0; r < reps; r++) {
      seedBlockStream(seed, block + 1 + r);
      for (int p = 0; p < paths; p++) runPath(out + (size_t)p * g * MEASURE_COUNT);
    }
    printf("%.9g %g\n", (now() - t0) / reps, out[0]);
    return 0;
  }
  fprintf(stderr, "walkhull-native: unknown mode %s\n", mode);
  return 2;
}
