// The look of report.html, defined once: colours, type and the verdict marks. The CSS of the report
// is generated from these tokens only (test/report/palette.test.ts checks that no other colour
// appears and that every text colour reaches a WCAG 2 contrast ratio of at least 4.5 on every
// background it is drawn on).
//
// Choices: verdicts are told apart by their word and a mark (a shape) as well as a colour, so the
// report reads the same in grey print and for colour-blind readers. The verdict colours are a blue,
// a brick red and a neutral umber: they differ in lightness and stay apart under red-green colour
// blindness (no red-versus-green distinction is used anywhere). The six walk colours alternate
// light and dark hues for the same reason; walks are also told apart by their legend order.

/** Colour tokens (sRGB hex). */
export const PALETTE = {
  paper: "#ffffff",
  ink: "#1c2430",
  inkMuted: "#4d5866",
  rule: "#c9d1da",
  ruleFaint: "#e4e8ec",
  panel: "#f2f4f1",
  passInk: "#0b5d8c",
  passPanel: "#e9f1f6",
  passRule: "#a9c6d8",
  failInk: "#a02c1c",
  failPanel: "#f8ece8",
  failRule: "#d9a99f",
  openInk: "#66573f",
  dataMain: "#0b5d8c",
  dataFit: "#c0501e",
  dataBand: "#e8a33d",
  dataBar: "#9cc3de",
  dataHull: "#8a4b08",
  dataFloor: "#7d8894",
  walks: ["#0b5d8c", "#d17a22", "#2f7d62", "#7a4fa0", "#b23a48", "#5b6b2e"],
} as const;

/** Type: a serif for reading, a monospaced face for numbers and code; both from the reader's system. */
export const TYPE = {
  text: `"Iowan Old Style", "Palatino Linotype", Palatino, "Book Antiqua", "URW Palladio L", Georgia, serif`,
  figures: `ui-monospace, "DejaVu Sans Mono", "Liberation Mono", Menlo, Consolas, monospace`,
  plot: `"DejaVu Sans", Verdana, "Liberation Sans", Arial, sans-serif`,
} as const;

export type VerdictWord = "pass" | "fail" | "inconclusive" | "confirmed" | "not-yet-visible";

/** Mark shown before each verdict word: a shape that survives grey print and colour blindness. */
export const VERDICT_MARK: Record<VerdictWord, string> = {
  pass: "\u2713", // check mark
  confirmed: "\u25CF", // filled circle
  fail: "\u2716", // heavy cross
  inconclusive: "?",
  "not-yet-visible": "\u2026", // ellipsis
};

/** Ink of each verdict. */
export const VERDICT_INK: Record<VerdictWord, string> = {
  pass: PALETTE.passInk,
  confirmed: PALETTE.passInk,
  fail: PALETTE.failInk,
  inconclusive: PALETTE.openInk,
  "not-yet-visible": PALETTE.openInk,
};

/** Every (text colour, background) pair the CSS below draws text with: the contrast test reads it. */
export const TEXT_PAIRS: [string, string, string][] = [
  ["body text", PALETTE.ink, PALETTE.paper],
  ["muted text", PALETTE.inkMuted, PALETTE.paper],
  ["table header", PALETTE.ink, PALETTE.panel],
  ["code", PALETTE.ink, PALETTE.panel],
  ["summary (passed)", PALETTE.ink, PALETTE.passPanel],
  ["summary (failed)", PALETTE.ink, PALETTE.failPanel],
  ...(Object.entries(VERDICT_INK) as [VerdictWord, string][]).map(([v, c]): [string, string, string] => [`verdict ${v}`, c, PALETTE.paper]),
  ["plot labels", PALETTE.ink, PALETTE.paper],
  ["plot axis text", PALETTE.inkMuted, PALETTE.paper],
];

/** The style sheet of report.html, from the tokens above only. */
export function reportCss(): string {
  const P = PALETTE;
  const verdicts = (Object.keys(VERDICT_INK) as VerdictWord[])
    .map((v) => `.v-${v}{color:${VERDICT_INK[v]};font-weight:${v === "fail" ? 700 : 600}}`)
    .join("");
  const walks = P.walks.map((c, i) => `svg .walk${i}{stroke:${c}}`).join("");
  return `
body{font:15px/1.5 ${TYPE.text};color:${P.ink};max-width:1180px;margin:0 auto;padding:18px 22px;background:${P.paper}}
h1{font-size:23px;margin:0 0 6px;letter-spacing:.01em}h2{font-size:18px;margin:26px 0 8px;border-bottom:2px solid ${P.rule};padding-bottom:3px}h3{font-size:15px;margin:16px 0 6px}
.summary{padding:8px 12px;border-left:6px solid ${P.passRule};background:${P.passPanel}}.summary.failed{background:${P.failPanel};border-left-color:${P.failRule}}
table{border-collapse:collapse;margin:6px 0 10px;font-size:13px}th,td{border:1px solid ${P.rule};padding:3px 7px;text-align:left;vertical-align:top}th{background:${P.panel};font-weight:600}
td.num{text-align:right;font-family:${TYPE.figures};font-size:12px;font-variant-numeric:tabular-nums}
${verdicts}.mark{display:inline-block;min-width:1.1em}
.plots{display:flex;flex-wrap:wrap;gap:10px}figure{margin:0 0 8px;border:1px solid ${P.ruleFaint};padding:6px}figcaption{font-size:12px;color:${P.inkMuted};max-width:460px}
svg.plot{display:block;font:11px ${TYPE.plot}}svg .grid line{stroke:${P.ruleFaint}}svg .axis line{stroke:${P.inkMuted}}svg .axis text{fill:${P.inkMuted}}svg .label{font-size:12px;fill:${P.ink}}
svg circle.pt{fill:${P.dataMain};stroke:${P.paper};stroke-width:.6}svg rect.pt{fill:${P.dataMain}}svg .err{stroke:${P.dataMain};stroke-width:1}svg .band{fill:${P.dataBand};fill-opacity:.25;stroke:none}
svg .fit{fill:none;stroke:${P.dataFit};stroke-width:1.8}svg .predicted{fill:none;stroke:${P.ink};stroke-width:1.4;stroke-dasharray:6 4}svg .floor{fill:none;stroke:${P.dataFloor};stroke-dasharray:2 3}
svg .bar{fill:${P.dataBar};stroke:none}svg .legend text{fill:${P.ink}}svg .walk{fill:none;stroke-width:.9;stroke-opacity:.85}svg .hull{fill:${P.dataBand};fill-opacity:.12;stroke:${P.dataHull};stroke-width:1.6}
svg circle.vertex{fill:${P.dataHull}}svg rect.vertex{fill:${P.dataHull}}svg .origin{fill:${P.ink}}
${walks}
.note{color:${P.inkMuted};font-size:13px}ul.details li{margin:2px 0}code{font-family:${TYPE.figures};background:${P.panel};padding:0 3px}
@media print{body{max-width:none;padding:0;font-size:11pt}figure,table{break-inside:avoid}h2{break-after:avoid}.summary{border:1px solid ${P.ink}}}
`;
}
