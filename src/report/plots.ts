// The data behind the HTML report's plots (pure functions, tested) and their SVG rendering.
//
// - variance-ratio: Var(X_n)/n^p at each n with 95% error bars (jackknife SEs from the verdict
//   stage's limit estimate, else the fourth-moment SE of the variance), the predicted limit, the
//   fitted curve s2 + c n^-beta (s2 and beta as reported; c by weighted least squares on the ratios
//   with weights 1/SE^2, unless the limit estimate carries its own coefficient) and the 95% interval
//   of the extrapolated limit as a band.
// - qq / histogram: the kept per-path sample at the largest n, standardised by its own mean and SD,
//   against the standard normal (quantiles at (i - 1/2)/K; density 1/sqrt(2 pi) exp(-z^2/2)).
// - ks-distance: the Kolmogorov distance of the kept sample to the moment-fitted normal at each n
//   (the Lilliefors statistic), log-log, with the resolution floor 0.87/sqrt(m) and, over points
//   above 3x the floor (the rule of src/verdict/normality.ts), an ordinary least-squares line
//   log d = a - r log n. The points share paths, so the slope's SE is indicative only.
// - tie-cdf (a "gaussian-maximum" law, docs/theory.md sec. 7.1): the empirical CDF of the kept sample
//   standardised as (X_n - n d)/sqrt(n) at the smallest and the largest n (at most 400 steps each,
//   evenly spaced in rank between the 0.1% and 99.9% quantiles) against the predicted CDF (src/verdict/tie-law.ts predictedCdf).
// - hull: the points of one sample path per walk and the hull of all of them.

import type { ResultRecord } from "../run/types.js";
import { equalIntervalBreaks, extent, quantileSorted } from "simple-statistics";
import { ksNormalDistance, meanSd } from "../stats/lilliefors.js";
import { normalQuantile } from "../stats/normal.js";
import type { GaussianMaximumPrediction, MeasurePrediction } from "../theory/types.js";
import { predictedCdf } from "../verdict/tie-law.js";
import type { LimitEstimate } from "../verdict/types.js";
import { axes, bottomMargin, clip, errorBars, escapeXml, fmt, legend, LEGEND_ROW, padDomain, pathD, points, scales, svgPlot, type Frame } from "./svg.js";

const Z95 = 1.959963984540054;

/** A frame with a plotting area of about width x height and room below for `rows` legend rows. */
const frame = (x: Frame["x"], y: Frame["y"], rows: number, width = 460, height = 300): Frame => ({
  width,
  height: height + LEGEND_ROW * rows,
  margin: { top: 14, right: 14, bottom: bottomMargin(rows), left: 62 },
  x,
  y,
});

export interface VarianceSeries {
  measure: string;
  scaling: number;
  points: { n: number; value: number; se: number }[];
  predicted: number | null;
  predictedKind: string | null;
  limit: LimitEstimate | null;
  fitted: { s2: number; c: number; beta: number } | null;
}

export function varianceSeries(
  measure: string,
  results: ResultRecord[],
  prediction: MeasurePrediction | undefined,
  limits: LimitEstimate[],
): VarianceSeries | null {
  const limit = limits.find((l) => l.measure === measure && l.quantity === "varianceLimit") ?? null;
  const p = limit?.scaling ?? prediction?.varianceScaling;
  if (p === undefined || p === null || !Number.isFinite(p)) return null;
  const pts =
    limit && limit.ratios.length
      ? limit.ratios.map((r) => ({ n: r.n, value: r.value, se: r.standardError }))
      : results.filter((r) => r.measure === measure).map((r) => ({ n: r.n, value: r.variance / Math.pow(r.n, p), se: r.varianceSE / Math.pow(r.n, p) }));
  let fitted: VarianceSeries["fitted"] = null;
  if (limit && limit.beta !== null && Number.isFinite(limit.beta) && (limit.method === "profile" || limit.method === "fixed")) {
    const own = (limit as unknown as { correction?: unknown; c?: unknown }).correction ?? (limit as unknown as { c?: unknown }).c;
    const beta = limit.beta;
    let c: number;
    if (typeof own === "number" && Number.isFinite(own)) c = own;
    else {
      let num = 0;
      let den = 0;
      for (const q of pts) {
        const w = q.se > 0 ? 1 / (q.se * q.se) : 0;
        const x = Math.pow(q.n, -beta);
        num += w * x * (q.value - limit.estimate);
        den += w * x * x;
      }
      c = den > 0 ? num / den : 0;
    }
    fitted = { s2: limit.estimate, c, beta };
  }
  return {
    measure,
    scaling: p,
    points: pts,
    predicted: prediction?.varianceLimit ?? null,
    predictedKind: prediction?.varianceLimitKind ?? null,
    limit,
    fitted,
  };
}

export function varianceRatioSvg(s: VarianceSeries): string {
  const ns = s.points.map((q) => q.n);
  const ys = s.points.flatMap((q) => [q.value - Z95 * q.se, q.value + Z95 * q.se]);
  if (s.predicted !== null) ys.push(s.predicted);
  if (s.limit?.ci) ys.push(...s.limit.ci);
  else if (s.limit) ys.push(s.limit.estimate);
  const xdom = padDomain(ns, 0.08, "log");
  const rows = 1 + (s.limit?.ci ? 1 : 0) + (s.fitted ? 1 : 0) + (s.predicted !== null ? 1 : 0);
  const f = frame({ kind: "log", domain: xdom, label: "n (log scale)" }, { kind: "linear", domain: padDomain(ys), label: `Var(${s.measure}_n) / n^${fmt(s.scaling)}` }, rows);
  const sc = scales(f);
  const id = `clip-var-${s.measure}`;
  const body: string[] = [`<defs>${clip(id, f)}</defs>`, axes(sc), `<g clip-path="url(#${id})">`];
  const lg: Parameters<typeof legend>[1] = [];
  if (s.limit?.ci) {
    const [lo, hi] = s.limit.ci;
    body.push(`<rect class="band" x="${f.margin.left}" width="${f.width - f.margin.left - f.margin.right}" y="${sc.sy(hi)}" height="${Math.max(0.5, sc.sy(lo) - sc.sy(hi))}"/>`);
    lg.push({ cls: "band", kind: "band", text: `limit estimate ${fmt(s.limit.estimate)}, ${Math.round(100 * s.limit.level)}% CI [${fmt(lo)}, ${fmt(hi)}] (${s.limit.method})` });
  }
  if (s.fitted) {
    const xs: number[] = [];
    const yv: number[] = [];
    for (let i = 0; i <= 80; i++) {
      const n = Math.pow(10, Math.log10(xdom[0]) + (i / 80) * (Math.log10(xdom[1]) - Math.log10(xdom[0])));
      xs.push(n);
      yv.push(s.fitted.s2 + s.fitted.c * Math.pow(n, -s.fitted.beta));
    }
    body.push(`<path class="fit" d="${pathD(sc, xs, yv)}"/>`);
    lg.push({ cls: "fit", kind: "line", text: `fit ${fmt(s.fitted.s2)} + (${fmt(s.fitted.c, 3)}) n^-${fmt(s.fitted.beta, 3)}` });
  }
  if (s.predicted !== null) {
    body.push(`<path class="predicted" d="${pathD(sc, xdom, [s.predicted, s.predicted])}"/>`);
    lg.push({ cls: "predicted", kind: "line", text: `predicted ${fmt(s.predicted, 7)}${s.predictedKind ? ` (${s.predictedKind})` : ""}` });
  }
  body.push(errorBars(sc, s.points.map((q) => ({ x: q.n, lo: q.value - Z95 * q.se, hi: q.value + Z95 * q.se }))));
  body.push(points(sc, s.points.map((q) => ({ x: q.n, y: q.value, title: `n = ${q.n}: ${fmt(q.value, 6)} ± ${fmt(q.se, 3)} (SE)` }))));
  body.push(`</g>`);
  lg.push({ cls: "pt", kind: "dot", text: "simulated ratio, 95% error bars" });
  body.push(legend(f, lg));
  return svgPlot({ "data-plot": "variance-ratio", "data-measure": s.measure, "data-points": s.points.length }, f, `Var/n^p of the ${s.measure}`, body.join(""));
}

export interface QQData {
  /** Standard normal quantiles and standardised sample quantiles, K pairs. */
  theoretical: number[];
  observed: number[];
  size: number;
}

/**
 * K = min(m, maxPoints) quantile pairs at probabilities (i - 1/2)/K; sample quantiles by
 * simple-statistics' quantileSorted (linear interpolation between order statistics, the usual
 * "type 7" definition).
 */
export function qqData(x: ArrayLike<number>, maxPoints = 400): QQData {
  const v = Float64Array.from(x).filter(Number.isFinite).sort();
  const m = v.length;
  if (m < 2) return { theoretical: [], observed: [], size: m };
  const { mean, sd } = meanSd(v);
  const K = Math.min(m, maxPoints);
  const theoretical: number[] = [];
  const observed: number[] = [];
  for (let i = 0; i < K; i++) {
    const p = (i + 0.5) / K;
    theoretical.push(normalQuantile(p));
    observed.push(sd > 0 ? (quantileSorted(v as unknown as number[], p) - mean) / sd : 0);
  }
  return { theoretical, observed, size: m };
}

export function qqSvg(measure: string, n: number, d: QQData): string {
  const lim = padDomain([...d.theoretical, ...d.observed]);
  const f = frame({ kind: "linear", domain: lim, label: "standard normal quantile" }, { kind: "linear", domain: lim, label: `standardised ${measure} quantile` }, 2, 340, 300);
  const sc = scales(f);
  const id = `clip-qq-${measure}`;
  const body = [
    `<defs>${clip(id, f)}</defs>`,
    axes(sc),
    `<g clip-path="url(#${id})">`,
    `<path class="predicted" d="${pathD(sc, lim, lim)}"/>`,
    points(sc, d.theoretical.map((t, i) => ({ x: t, y: d.observed[i] })), "pt", 2),
    `</g>`,
    legend(f, [
      { cls: "predicted", kind: "line", text: "normal law" },
      { cls: "pt", kind: "dot", text: `${d.theoretical.length} quantiles of ${d.size} paths` },
    ]),
  ];
  return svgPlot({ "data-plot": "qq", "data-measure": measure, "data-n": n, "data-points": d.theoretical.length }, f, `QQ plot of the ${measure} at n = ${n}`, body.join(""));
}

export interface HistogramData {
  edges: number[];
  /** Density (count / (m * width)) of each bin, on the standardised scale. */
  density: number[];
  size: number;
  discrete: boolean;
}

/** Histogram of the standardised sample; integer-valued samples with few values get unit bins. */
export function histogramData(x: ArrayLike<number>, maxBins = 40): HistogramData {
  const v = Float64Array.from(x).filter(Number.isFinite);
  const m = v.length;
  if (m < 2) return { edges: [], density: [], size: m, discrete: false };
  const { mean, sd } = meanSd(v);
  const [lo, hi] = extent(v as unknown as number[]);
  const integer = v.every(Number.isInteger);
  const discrete = integer && hi - lo + 1 <= 2 * maxBins;
  let rawEdges: number[];
  if (discrete) rawEdges = Array.from({ length: hi - lo + 2 }, (_, i) => lo - 0.5 + i);
  else {
    const bins = Math.max(5, Math.min(maxBins, Math.ceil(2 * Math.cbrt(m))));
    // Equal-width bins over [min, max] (simple-statistics' equalIntervalBreaks); unit width when all equal.
    rawEdges = hi > lo ? equalIntervalBreaks(v as unknown as number[], bins) : Array.from({ length: bins + 1 }, (_, i) => lo + i);
  }
  const bins = rawEdges.length - 1;
  const counts = new Array<number>(bins).fill(0);
  const w0 = rawEdges[1] - rawEdges[0];
  for (const t of v) counts[Math.min(bins - 1, Math.max(0, Math.floor((t - rawEdges[0]) / w0)))]++;
  const s = sd > 0 ? sd : 1;
  const edges = rawEdges.map((e) => (e - mean) / s);
  const density = counts.map((c, i) => c / (m * (edges[i + 1] - edges[i])));
  return { edges, density, size: m, discrete };
}

export function histogramSvg(measure: string, n: number, h: HistogramData): string {
  const zs = Array.from({ length: 121 }, (_, i) => -4 + (8 * i) / 120);
  const phi = zs.map((z) => Math.exp((-z * z) / 2) / Math.sqrt(2 * Math.PI));
  const xdom = padDomain([...h.edges, -3.5, 3.5], 0.02);
  const f = frame({ kind: "linear", domain: xdom, label: `standardised ${measure} at n = ${n}` }, { kind: "linear", domain: [0, Math.max(0.45, ...h.density) * 1.08], label: "density" }, 2, 380, 300);
  const sc = scales(f);
  const id = `clip-hist-${measure}`;
  const bars = h.density
    .map((d, i) => {
      const x0 = sc.sx(h.edges[i]);
      const x1 = sc.sx(h.edges[i + 1]);
      return `<rect class="bar" x="${x0.toFixed(2)}" y="${sc.sy(d).toFixed(2)}" width="${Math.max(0.3, x1 - x0 - 0.5).toFixed(2)}" height="${Math.max(0, sc.sy(0) - sc.sy(d)).toFixed(2)}"/>`;
    })
    .join("");
  const body = [
    `<defs>${clip(id, f)}</defs>`,
    axes(sc),
    `<g clip-path="url(#${id})">`,
    bars,
    `<path class="predicted" d="${pathD(sc, zs, phi)}"/>`,
    `</g>`,
    legend(f, [
      { cls: "bar", kind: "band", text: `${h.size} paths${h.discrete ? " (unit bins)" : ""}` },
      { cls: "predicted", kind: "line", text: "normal density" },
    ]),
  ];
  return svgPlot({ "data-plot": "histogram", "data-measure": measure, "data-n": n, "data-bins": h.density.length }, f, `Histogram of the ${measure} at n = ${n}`, body.join(""));
}

export interface KsSeries {
  points: { n: number; distance: number; size: number }[];
  /** 0.87/sqrt(m) for the sample size m. */
  floor: number;
  /** Log-log OLS over points above 3x the floor; null with fewer than 2 such points. */
  fit: { rate: number; rateSE: number | null; logC: number; used: number[] } | null;
}

export function ksSeries(n: number[], columns: ArrayLike<number>[]): KsSeries {
  const pts = n.map((nn, g) => {
    const v = Float64Array.from(columns[g]).filter(Number.isFinite);
    // Fewer than 5 values or no spread: no distance (a gap in the plot, not an error).
    let distance = NaN;
    if (v.length >= 5) {
      try {
        distance = ksNormalDistance(v);
      } catch {
        distance = NaN;
      }
    }
    return { n: nn, distance, size: v.length };
  });
  const m = Math.min(...pts.map((p) => p.size));
  const floor = 0.87 / Math.sqrt(Math.max(1, m));
  const use = pts.filter((p) => Number.isFinite(p.distance) && p.distance > 3 * floor);
  let fit: KsSeries["fit"] = null;
  if (use.length >= 2) {
    const X = use.map((p) => Math.log(p.n));
    const Y = use.map((p) => Math.log(p.distance));
    const mx = X.reduce((a, b) => a + b, 0) / X.length;
    const my = Y.reduce((a, b) => a + b, 0) / Y.length;
    const sxx = X.reduce((a, x) => a + (x - mx) ** 2, 0);
    const slope = X.reduce((a, x, i) => a + (x - mx) * (Y[i] - my), 0) / sxx;
    const resid = Y.map((y, i) => y - my - slope * (X[i] - mx));
    const df = X.length - 2;
    const rateSE = df > 0 ? Math.sqrt(resid.reduce((a, r) => a + r * r, 0) / df / sxx) : null;
    fit = { rate: -slope, rateSE, logC: my - slope * mx, used: use.map((p) => p.n) };
  }
  return { points: pts, floor, fit };
}

export function ksSvg(measure: string, s: KsSeries): string {
  const ok = s.points.filter((p) => Number.isFinite(p.distance) && p.distance > 0);
  const xdom = padDomain(s.points.map((p) => p.n), 0.08, "log");
  const ydom = padDomain([...ok.map((p) => p.distance), s.floor], 0.1, "log");
  const f = frame({ kind: "log", domain: xdom, label: "n (log scale)" }, { kind: "log", domain: ydom, label: "KS distance to the fitted normal" }, s.fit ? 3 : 2);
  const sc = scales(f);
  const id = `clip-ks-${measure}`;
  const body = [`<defs>${clip(id, f)}</defs>`, axes(sc), `<g clip-path="url(#${id})">`];
  body.push(`<path class="floor" d="${pathD(sc, xdom, [s.floor, s.floor])}"/>`);
  const lg: Parameters<typeof legend>[1] = [{ cls: "floor", kind: "line", text: `resolution floor 0.87/sqrt(m) = ${fmt(s.floor, 3)}` }];
  if (s.fit) {
    const fit = s.fit;
    body.push(`<path class="fit" d="${pathD(sc, xdom, xdom.map((n) => Math.exp(fit.logC) * Math.pow(n, -fit.rate)))}"/>`);
    lg.push({ cls: "fit", kind: "line", text: `fitted rate n^-${fmt(fit.rate, 3)}${fit.rateSE !== null ? ` ± ${fmt(fit.rateSE, 2)}` : ""} (${fit.used.length} points)` });
  }
  body.push(points(sc, ok.map((p) => ({ x: p.n, y: p.distance, title: `n = ${p.n}: D = ${fmt(p.distance, 4)} (${p.size} paths)` }))));
  body.push(`</g>`);
  lg.push({ cls: "pt", kind: "dot", text: "KS distance (kept sample)" });
  body.push(legend(f, lg));
  return svgPlot({ "data-plot": "ks-distance", "data-measure": measure, "data-points": ok.length }, f, `KS distance vs n for the ${measure}`, body.join(""));
}

export interface PathGeometry {
  /** Interleaved x, y of each walk's points S_0..S_nMax. */
  points: Float64Array[];
  /** Interleaved x, y of the hull vertices, counter-clockwise. */
  hull: Float64Array;
}

/** The walks (at most maxPerWalk points drawn per walk, evenly strided) and the exact hull. */
export function hullSvg(g: PathGeometry, maxPerWalk = 3000): string {
  const xs: number[] = [];
  const ys: number[] = [];
  for (const p of g.points) for (let i = 0; i < p.length; i += 2) { xs.push(p[i]); ys.push(p[i + 1]); }
  for (let i = 0; i < g.hull.length; i += 2) { xs.push(g.hull[i]); ys.push(g.hull[i + 1]); }
  // Equal units on both axes; the frame's height follows the cloud's aspect ratio (a drifting
  // walk is a long thin needle) within [160, 560] pixels of plotting area.
  const xd = padDomain(xs);
  const yd = padDomain(ys);
  const plotW = 840;
  const plotH = Math.max(160, Math.min(560, (plotW * (yd[1] - yd[0])) / (xd[1] - xd[0])));
  const rows = g.points.length + 1;
  const f: Frame = { width: plotW + 76, height: plotH + 14 + bottomMargin(rows), margin: { top: 14, right: 14, bottom: bottomMargin(rows), left: 62 }, x: { kind: "linear", domain: xd, label: "x" }, y: { kind: "linear", domain: yd, label: "y" }, equalAspect: true };
  const sc = scales(f);
  const body = [axes(sc)];
  g.points.forEach((p, j) => {
    const count = p.length / 2;
    const stride = Math.max(1, Math.ceil(count / maxPerWalk));
    const wx: number[] = [];
    const wy: number[] = [];
    for (let i = 0; i < count; i += stride) { wx.push(p[2 * i]); wy.push(p[2 * i + 1]); }
    if ((count - 1) % stride !== 0) { wx.push(p[2 * count - 2]); wy.push(p[2 * count - 1]); }
    body.push(`<path class="walk walk${j % 6}" data-walk="${j}" d="${pathD(sc, wx, wy)}"/>`);
  });
  const hx: number[] = [];
  const hy: number[] = [];
  for (let i = 0; i < g.hull.length; i += 2) { hx.push(g.hull[i]); hy.push(g.hull[i + 1]); }
  if (hx.length) body.push(`<path class="hull" d="${pathD(sc, [...hx, hx[0]], [...hy, hy[0]])}Z"/>`);
  body.push(points(sc, hx.map((x, i) => ({ x, y: hy[i] })), "vertex", 2.5));
  body.push(`<rect class="origin" x="${(sc.sx(0) - 3).toFixed(2)}" y="${(sc.sy(0) - 3).toFixed(2)}" width="6" height="6"/>`);
  body.push(
    legend(f, [
      ...g.points.map((_, j) => ({ cls: `walk walk${j % 6}`, kind: "line" as const, text: `walk ${j + 1}` })),
      { cls: "hull", kind: "line", text: `hull, ${hx.length} vertices` },
    ]),
  );
  return svgPlot({ "data-plot": "hull", "data-walks": g.points.length, "data-points": hx.length }, f, "Hull of one sample path", body.join(""));
}

export { escapeXml };

export interface TieCdfData {
  /** The predicted CDF on a grid of x. */
  predicted: { x: number[]; F: number[] };
  /** Empirical CDFs (x sorted, F = rank/m) of the standardised sample at the smallest and largest n. */
  empirical: { n: number; size: number; x: number[]; F: number[] }[];
}

export function tieCdfData(grid: number[], columns: ArrayLike<number>[], law: GaussianMaximumPrediction, maxSteps = 400): TieCdfData {
  const F = predictedCdf(law);
  const picks = grid.length > 1 ? [0, grid.length - 1] : [0];
  const empirical = picks.flatMap((g) => {
    const n = grid[g];
    const v = Float64Array.from(columns[g], (x) => (x - n * law.centre) / Math.sqrt(n)).filter(Number.isFinite).sort();
    const m = v.length;
    if (m < 2) return [];
    // Ranks from the 0.1% to the 99.9% quantile (the extremes would stretch the axis).
    const a = Math.floor(0.001 * (m - 1)), b = Math.ceil(0.999 * (m - 1));
    const K = Math.min(b - a + 1, maxSteps);
    const idx = Array.from({ length: K }, (_, i) => a + Math.round((i * (b - a)) / Math.max(1, K - 1)));
    return [{ n, size: m, x: idx.map((i) => v[i]), F: idx.map((i) => (i + 1) / m) }];
  });
  const all = empirical.flatMap((e) => e.x);
  const sd = Math.sqrt(law.variance) || 1;
  const [lo, hi] = all.length ? [Math.min(...all), Math.max(...all)] : [law.mean - 4 * sd, law.mean + 4 * sd];
  const x = Array.from({ length: 201 }, (_, i) => lo + ((hi - lo) * i) / 200);
  return { predicted: { x, F: x.map(F.cdf) }, empirical };
}

export function tieCdfSvg(measure: string, d: TieCdfData): string {
  const xdom = padDomain(d.predicted.x, 0.02);
  const f = frame({ kind: "linear", domain: xdom, label: `(${measure} - n d)/sqrt(n)` }, { kind: "linear", domain: [0, 1], label: "CDF" }, 1 + d.empirical.length);
  const sc = scales(f);
  const id = `clip-tiecdf-${measure}`;
  const body = [`<defs>${clip(id, f)}</defs>`, axes(sc), `<g clip-path="url(#${id})">`, `<path class="predicted" d="${pathD(sc, d.predicted.x, d.predicted.F)}"/>`];
  const lg: Parameters<typeof legend>[1] = [{ cls: "predicted", kind: "line", text: "predicted law: maximum of Gaussian forms" }];
  d.empirical.forEach((e, i) => {
    const cls = i === d.empirical.length - 1 ? "fit" : "floor";
    body.push(`<path class="${cls}" d="${pathD(sc, e.x, e.F)}"/>`);
    lg.push({ cls, kind: "line", text: `empirical CDF at n = ${e.n} (${e.size} paths)` });
  });
  body.push(`</g>`, legend(f, lg));
  return svgPlot({ "data-plot": "tie-cdf", "data-measure": measure, "data-points": d.empirical.reduce((a, e) => a + e.x.length, 0) }, f, `Predicted and empirical CDF of the ${measure}`, body.join(""));
}
