// Small SVG plotting helpers for the HTML report: linear and log axes with readable ticks, points,
// error bars, curves, bands and bars. Hand-written rather than a plotting library: the report must
// be one self-contained file rendered on Node without a DOM, the charts are few and fixed, and the
// tests count elements (one <circle> per data point, nothing else drawn as a circle).

export type AxisKind = "linear" | "log";

export interface Axis {
  kind: AxisKind;
  domain: [number, number];
  label: string;
}

export interface Frame {
  width: number;
  height: number;
  margin: { top: number; right: number; bottom: number; left: number };
  x: Axis;
  y: Axis;
  /** Keep one unit of x equal to one unit of y (geometry plots). */
  equalAspect?: boolean;
}

export interface Scales {
  sx: (x: number) => number;
  sy: (y: number) => number;
  frame: Frame;
}

export function escapeXml(s: string): string {
  return String(s).replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(/"/g, "&quot;").replace(/'/g, "&#39;");
}

/** Short number for labels (4 significant digits, exponent outside [1e-3, 1e6)). */
export function fmt(x: number, digits = 4): string {
  if (!Number.isFinite(x)) return String(x);
  if (x === 0) return "0";
  const a = Math.abs(x);
  if (a >= 1e-3 && a < 1e6) return Number(x.toPrecision(digits)).toString();
  return x.toExponential(Math.max(0, digits - 2)).replace("e+", "e");
}

const r2 = (v: number) => Math.round(v * 100) / 100;

/** Domain [lo, hi] padded by a fraction of its width (or of |lo| when degenerate). */
export function padDomain(values: number[], frac = 0.06, kind: AxisKind = "linear"): [number, number] {
  const v = values.filter((x) => Number.isFinite(x) && (kind === "linear" || x > 0));
  if (v.length === 0) return kind === "log" ? [1, 10] : [0, 1];
  let lo = Math.min(...v);
  let hi = Math.max(...v);
  if (kind === "log") {
    const f = Math.pow(hi / lo, frac) || 1.2;
    return lo === hi ? [lo / 2, hi * 2] : [lo / f, hi * f];
  }
  if (lo === hi) {
    const d = Math.abs(lo) * 0.1 || 1;
    return [lo - d, hi + d];
  }
  const d = (hi - lo) * frac;
  lo -= d;
  hi += d;
  return [lo, hi];
}

/** About `count` round tick values covering [lo, hi] (1, 2, 5 x 10^k steps). */
export function linearTicks(lo: number, hi: number, count = 5): number[] {
  if (!(hi > lo)) return [lo];
  const raw = (hi - lo) / count;
  const mag = Math.pow(10, Math.floor(Math.log10(raw)));
  const step = [1, 2, 5, 10].map((m) => m * mag).find((s) => s >= raw) ?? 10 * mag;
  const out: number[] = [];
  for (let t = Math.ceil(lo / step) * step; t <= hi + step * 1e-9; t += step) out.push(Math.abs(t) < step * 1e-9 ? 0 : Number(t.toPrecision(12)));
  return out;
}

/** Powers of ten in [lo, hi]; with fewer than 3, also 2 and 5 times them. */
export function logTicks(lo: number, hi: number): number[] {
  const a = Math.floor(Math.log10(lo));
  const b = Math.ceil(Math.log10(hi));
  const pow: number[] = [];
  for (let k = a; k <= b; k++) pow.push(Math.pow(10, k));
  let t = pow.filter((x) => x >= lo * (1 - 1e-9) && x <= hi * (1 + 1e-9));
  if (t.length < 3) t = pow.flatMap((p) => [p, 2 * p, 5 * p]).filter((x) => x >= lo * (1 - 1e-9) && x <= hi * (1 + 1e-9));
  // Less than a factor 5 wide: round linear steps read better than one lone label.
  if (t.length < 2) t = linearTicks(lo, hi, 4).filter((x) => x > 0);
  return t.map((x) => Number(x.toPrecision(12)));
}

export function scales(frame: Frame): Scales {
  const { width, height, margin } = frame;
  let x0 = margin.left;
  let x1 = width - margin.right;
  let y0 = height - margin.bottom;
  let y1 = margin.top;
  const tr = (a: Axis) => (a.kind === "log" ? (v: number) => Math.log10(v) : (v: number) => v);
  const tx = tr(frame.x);
  const ty = tr(frame.y);
  const [dx0, dx1] = frame.x.domain.map(tx);
  const [dy0, dy1] = frame.y.domain.map(ty);
  if (frame.equalAspect) {
    const k = Math.min((x1 - x0) / (dx1 - dx0), (y0 - y1) / (dy1 - dy0));
    const cx = (x0 + x1) / 2;
    const cy = (y0 + y1) / 2;
    x0 = cx - (k * (dx1 - dx0)) / 2;
    x1 = cx + (k * (dx1 - dx0)) / 2;
    y0 = cy + (k * (dy1 - dy0)) / 2;
    y1 = cy - (k * (dy1 - dy0)) / 2;
  }
  return {
    sx: (v) => x0 + ((tx(v) - dx0) / (dx1 - dx0)) * (x1 - x0),
    sy: (v) => y0 - ((ty(v) - dy0) / (dy1 - dy0)) * (y0 - y1),
    frame,
  };
}

/** Axes, ticks, grid and labels. */
export function axes(s: Scales): string {
  const { frame, sx, sy } = s;
  const { width, height, margin } = frame;
  const left = margin.left;
  const bottom = height - margin.bottom;
  const out: string[] = [];
  const xt = frame.x.kind === "log" ? logTicks(...frame.x.domain) : linearTicks(...frame.x.domain, 6);
  const yt = frame.y.kind === "log" ? logTicks(...frame.y.domain) : linearTicks(...frame.y.domain, 5);
  out.push(`<g class="grid">`);
  for (const t of xt) out.push(`<line x1="${r2(sx(t))}" x2="${r2(sx(t))}" y1="${margin.top}" y2="${bottom}"/>`);
  for (const t of yt) out.push(`<line x1="${left}" x2="${width - margin.right}" y1="${r2(sy(t))}" y2="${r2(sy(t))}"/>`);
  out.push(`</g><g class="axis">`);
  out.push(`<line x1="${left}" x2="${width - margin.right}" y1="${bottom}" y2="${bottom}"/>`);
  out.push(`<line x1="${left}" x2="${left}" y1="${margin.top}" y2="${bottom}"/>`);
  for (const t of xt) out.push(`<text x="${r2(sx(t))}" y="${bottom + 15}" text-anchor="middle">${escapeXml(fmt(t))}</text>`);
  for (const t of yt) out.push(`<text x="${left - 5}" y="${r2(sy(t)) + 4}" text-anchor="end">${escapeXml(fmt(t))}</text>`);
  out.push(`<text class="label" x="${(left + width - margin.right) / 2}" y="${bottom + 32}" text-anchor="middle">${escapeXml(frame.x.label)}</text>`);
  out.push(`<text class="label" transform="translate(13 ${(margin.top + bottom) / 2}) rotate(-90)" text-anchor="middle">${escapeXml(frame.y.label)}</text>`);
  out.push(`</g>`);
  return out.join("");
}

/** Clip path id of a frame's plotting area. */
export function clip(id: string, f: Frame): string {
  return `<clipPath id="${id}"><rect x="${f.margin.left}" y="${f.margin.top}" width="${f.width - f.margin.left - f.margin.right}" height="${f.height - f.margin.top - f.margin.bottom}"/></clipPath>`;
}

/** A polyline through (x, y) pairs, skipping non-finite ones. */
export function pathD(s: Scales, xs: ArrayLike<number>, ys: ArrayLike<number>): string {
  let d = "";
  let pen = false;
  for (let i = 0; i < xs.length; i++) {
    const X = s.sx(xs[i]);
    const Y = s.sy(ys[i]);
    if (!Number.isFinite(X) || !Number.isFinite(Y)) {
      pen = false;
      continue;
    }
    d += `${pen ? "L" : "M"}${r2(X)} ${r2(Y)}`;
    pen = true;
  }
  return d;
}

/** One <circle> per point, with a tooltip. */
export function points(s: Scales, pts: { x: number; y: number; title?: string }[], cls = "pt", r = 3.2): string {
  return pts
    .map((p) => `<circle class="${cls}" cx="${r2(s.sx(p.x))}" cy="${r2(s.sy(p.y))}" r="${r}">${p.title ? `<title>${escapeXml(p.title)}</title>` : ""}</circle>`)
    .join("");
}

/** Vertical error bars [lo, hi] at x. */
export function errorBars(s: Scales, bars: { x: number; lo: number; hi: number }[]): string {
  return bars
    .filter((b) => Number.isFinite(b.lo) && Number.isFinite(b.hi))
    .map((b) => {
      const X = r2(s.sx(b.x));
      return `<line class="err" x1="${X}" x2="${X}" y1="${r2(s.sy(b.lo))}" y2="${r2(s.sy(b.hi))}"/><line class="err" x1="${X - 3}" x2="${X + 3}" y1="${r2(s.sy(b.lo))}" y2="${r2(s.sy(b.lo))}"/><line class="err" x1="${X - 3}" x2="${X + 3}" y1="${r2(s.sy(b.hi))}" y2="${r2(s.sy(b.hi))}"/>`;
    })
    .join("");
}

/** Room below the x axis for its label and `rows` legend rows (legends never cover the data). */
export const LEGEND_ROW = 14;
export function bottomMargin(rows: number): number {
  return 44 + LEGEND_ROW * rows;
}

/** A legend below the x-axis label: rows of (css class of the swatch, swatch kind, text). */
export function legend(f: Frame, rows: { cls: string; kind: "line" | "band" | "dot"; text: string }[]): string {
  const x = 8;
  let y = f.height - f.margin.bottom + 44 + 10;
  const out: string[] = [`<g class="legend">`];
  for (const r of rows) {
    if (r.kind === "line") out.push(`<line class="${r.cls}" x1="${x}" x2="${x + 18}" y1="${y - 4}" y2="${y - 4}"/>`);
    else if (r.kind === "band") out.push(`<rect class="${r.cls}" x="${x}" y="${y - 9}" width="18" height="9"/>`);
    else out.push(`<rect class="${r.cls} swatch" x="${x + 5}" y="${y - 8}" width="7" height="7" rx="3.5"/>`);
    out.push(`<text x="${x + 24}" y="${y}">${escapeXml(r.text)}</text>`);
    y += LEGEND_ROW;
  }
  out.push(`</g>`);
  return out.join("");
}

/** Wrap a plot: <svg data-plot=... data-points=...> with a title and its content. */
export function svgPlot(attrs: Record<string, string | number>, f: Frame, title: string, body: string): string {
  const a = Object.entries(attrs)
    .map(([k, v]) => ` ${k}="${escapeXml(String(v))}"`)
    .join("");
  return `<svg xmlns="http://www.w3.org/2000/svg" class="plot"${a} viewBox="0 0 ${f.width} ${f.height}" width="${f.width}" height="${f.height}" role="img" aria-label="${escapeXml(title)}"><title>${escapeXml(title)}</title>${body}</svg>`;
}
