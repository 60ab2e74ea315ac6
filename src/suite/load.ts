// Parse and validate a suite file. Every error names the field it is about, in one format:
// `<field path>: <what is wrong>` (thrown as SuiteError; the CLI maps it to exit code 2).

import { createHash } from "node:crypto";
import { readFileSync } from "node:fs";
import { dirname, resolve } from "node:path";
import { recordLayout } from "../engine/types.js";
import {
  LAW_NAMES,
  MEASURES,
  type Claim,
  type Linearisation,
  type LoadedSuite,
  type Mat2,
  type Measure,
  type StepLaw,
  type Suite,
  type Vec2,
} from "./schema.js";

/** An error about one field of some input: the message starts with the field's path. */
export class FieldError extends Error {
  constructor(
    readonly field: string,
    problem: string,
  ) {
    super(`${field}: ${problem}`);
    this.name = new.target.name;
  }
}

/** A suite file or object that is not a valid suite. */
export class SuiteError extends FieldError {}

/** Largest number of stored path points (all walks, walks x (n+1)) per worker: 2^24. */
export const MAX_POINTS_PER_WORKER = 2 ** 24;
/** Kernel memory per stored point (coordinates, filter and hull buffers), measured from assembly/. */
export const BYTES_PER_POINT = 112;
/** Largest number of paths a suite may ask for (2^40: far beyond any machine's budget, catches typos). */
export const MAX_PATHS = 2 ** 40;
export const DEFAULT_BLOCKS = 64;
export const MIN_BLOCKS = 32;
/** Fewest paths a suite may ask for: one per block of the smallest block count, so the block
 *  jackknife always has MIN_BLOCKS blocks (fewer paths cannot give a standard error). */
export const MIN_PATHS = MIN_BLOCKS;
const MAX_WALKS = 64;
const MAX_ATOMS = 1 << 20;

const TOP_KEYS = new Set([
  "title", "seed", "walks", "measure", "n", "paths", "claims", "alpha", "expectedRate",
  "normalityTolerance", "tolerance", "blocks", "description", "$schema",
]);
const LAW_KEYS: Record<string, string[]> = {
  gaussian: ["law", "mean", "cov"],
  discrete: ["law", "atoms", "weights"],
  circle: ["law", "mean", "radius"],
  student: ["law", "mean", "scale", "dof"],
  empirical: ["law", "file"],
};
const CLAIM_KEYS = new Set([
  "measure", "varianceLimit", "meanGrowth", "limitLaw", "n", "mean", "varianceScaling", "meanScaling", "label", "tolerance", "linearisation",
]);

export interface SuiteOverrides {
  paths?: number;
  seed?: number;
}

/** Read, parse and validate a suite file. Relative `file` fields are read relative to its folder. */
export function loadSuite(path: string, overrides: SuiteOverrides = {}): LoadedSuite {
  const abs = resolve(path);
  let text: string;
  try {
    text = readFileSync(abs, "utf8");
  } catch (e) {
    throw new SuiteError("suite", `cannot read ${path}: ${(e as Error).message}`);
  }
  let raw: unknown;
  try {
    raw = JSON.parse(text);
  } catch (e) {
    throw new SuiteError("suite", `${path} is not valid JSON (${(e as Error).message})`);
  }
  return validateSuite(raw, { baseDir: dirname(abs), path: abs, overrides });
}

export interface ValidateOptions {
  /** Folder against which relative `file` fields are resolved (default: the working directory). */
  baseDir?: string;
  path?: string | null;
  overrides?: SuiteOverrides;
}

/** Validate a parsed suite object (the library entry point for suites built in code). */
export function validateSuite(raw: unknown, opts: ValidateOptions = {}): LoadedSuite {
  const baseDir = opts.baseDir ?? process.cwd();
  const o = asObject(raw, "suite");
  for (const k of Object.keys(o)) {
    if (!TOP_KEYS.has(k)) throw new SuiteError(k, `unknown field${suggest(k, [...TOP_KEYS])}`);
  }
  const title = o.title === undefined ? "untitled suite" : asString(o.title, "title");
  const seedRaw = opts.overrides?.seed ?? o.seed;
  if (seedRaw === undefined) throw new SuiteError("seed", "missing (a non-negative integer; or pass --seed)");
  const seed = asInteger(seedRaw, "seed", 0, Number.MAX_SAFE_INTEGER);

  const walksRaw = o.walks;
  if (!Array.isArray(walksRaw) || walksRaw.length === 0) throw new SuiteError("walks", "must be a non-empty array of step laws");
  if (walksRaw.length > MAX_WALKS) throw new SuiteError("walks", `at most ${MAX_WALKS} walks (got ${walksRaw.length})`);
  const walks = walksRaw.map((w, i) => validateLaw(w, `walks[${i}]`, baseDir));

  if (!Array.isArray(o.measure) || o.measure.length === 0) {
    throw new SuiteError("measure", `must be a non-empty array of ${MEASURES.join(", ")}`);
  }
  const measure: Measure[] = [];
  o.measure.forEach((m, i) => {
    if (typeof m !== "string" || !(MEASURES as readonly string[]).includes(m)) {
      throw new SuiteError(`measure[${i}]`, `unknown measure ${JSON.stringify(m)} (known: ${MEASURES.join(", ")})`);
    }
    if (measure.includes(m as Measure)) throw new SuiteError(`measure[${i}]`, `${m} is listed twice`);
    measure.push(m as Measure);
  });

  if (!Array.isArray(o.n) || o.n.length === 0) throw new SuiteError("n", "must be a non-empty array of step counts");
  const n = o.n.map((v, i) => asInteger(v, `n[${i}]`, 1, 2 ** 31 - 1));
  for (let i = 1; i < n.length; i++) {
    if (n[i] <= n[i - 1]) throw new SuiteError(`n[${i}]`, `must be larger than n[${i - 1}] = ${n[i - 1]} (the grid is strictly increasing)`);
  }
  const nMax = n[n.length - 1];
  const points = walks.length * (nMax + 1);
  if (points > MAX_POINTS_PER_WORKER) {
    const gib = (points * BYTES_PER_POINT) / 2 ** 30;
    throw new SuiteError(
      "n",
      `largest n = ${nMax} with ${walks.length} walk(s) needs about ${gib.toFixed(1)} GiB per worker; the limit is ${MAX_POINTS_PER_WORKER} stored points (walks x (n+1), ${((MAX_POINTS_PER_WORKER * BYTES_PER_POINT) / 2 ** 30).toFixed(2)} GiB)`,
    );
  }

  const pathsRaw = opts.overrides?.paths ?? o.paths;
  if (pathsRaw === undefined) throw new SuiteError("paths", `missing (an integer >= ${MIN_PATHS}; or pass --paths)`);
  const paths = asInteger(pathsRaw, "paths", MIN_PATHS, MAX_PATHS);

  const suite: Suite = { title, seed, walks, measure, n, paths };
  if (o.description !== undefined) suite.description = asString(o.description, "description");
  if (o.alpha !== undefined) suite.alpha = asNumber(o.alpha, "alpha", { gt: 0, le: 0.5 });
  if (o.expectedRate !== undefined) suite.expectedRate = asNumber(o.expectedRate, "expectedRate", { ge: 0.1, le: 2 });
  if (o.tolerance !== undefined) suite.tolerance = asNumber(o.tolerance, "tolerance", { gt: 0, lt: 1 });
  if (o.normalityTolerance !== undefined) {
    suite.normalityTolerance = asNumber(o.normalityTolerance, "normalityTolerance", { gt: 0, lt: 1 });
  }
  if (o.blocks !== undefined) suite.blocks = asInteger(o.blocks, "blocks", MIN_BLOCKS, 1 << 16);
  checkBlockSums(suite);
  if (o.claims !== undefined) {
    if (!Array.isArray(o.claims)) throw new SuiteError("claims", "must be an array");
    suite.claims = o.claims.map((c, i) => validateClaim(c, `claims[${i}]`, suite));
  }

  const hash = createHash("sha256").update(canonicalJson(suite)).digest("hex");
  return { ...suite, path: opts.path ?? null, hash };
}

/**
 * Largest number of co-moment sums a run keeps (blocks x width^2, width = grid points x measures):
 * 2^23 doubles = 64 MiB, held in memory and written per block into the report.
 */
export const MAX_BLOCK_COMOMENTS = 2 ** 23;

/** Refuses grids and block counts whose per-block co-moment matrices would not fit (field-named). */
function checkBlockSums(suite: Suite): void {
  const width = recordLayout(suite.n.length).width;
  const blocks = blockCount(suite);
  if (blocks * width * width <= MAX_BLOCK_COMOMENTS) return;
  const maxGrid = Math.floor(Math.sqrt(MAX_BLOCK_COMOMENTS / blocks) / (width / suite.n.length));
  const gridFits = Math.min(blocks, MIN_BLOCKS) * width * width <= MAX_BLOCK_COMOMENTS;
  const what = `${suite.n.length} step counts (${width} numbers per path) with ${blocks} blocks keep ${blocks} co-moment matrices of ${width}^2 numbers, more than the limit of ${MAX_BLOCK_COMOMENTS}`;
  if (suite.blocks !== undefined && gridFits) {
    throw new SuiteError("blocks", `${what}: use at most ${Math.floor(MAX_BLOCK_COMOMENTS / (width * width))} blocks with this grid`);
  }
  throw new SuiteError("n", `${what}: use at most ${maxGrid} step counts`);
}

/** Number of blocks of a run: the suite's `blocks` (default 64), never more than the paths. */
export function blockCount(suite: Suite): number {
  return Math.min(suite.blocks ?? DEFAULT_BLOCKS, suite.paths);
}

/** First path index and size of block b when `paths` are split into `blocks` near-equal blocks. */
export function blockRange(paths: number, blocks: number, b: number): { first: number; count: number } {
  const base = Math.floor(paths / blocks);
  const extra = paths % blocks;
  const first = b * base + Math.min(b, extra);
  return { first, count: base + (b < extra ? 1 : 0) };
}

function validateLaw(raw: unknown, at: string, baseDir: string): StepLaw {
  const o = asObject(raw, at);
  const law = o.law;
  if (typeof law !== "string" || !(LAW_NAMES as readonly string[]).includes(law)) {
    throw new SuiteError(`${at}.law`, `unknown law ${JSON.stringify(law)} (known: ${LAW_NAMES.join(", ")})`);
  }
  const allowed = LAW_KEYS[law];
  for (const k of Object.keys(o)) {
    if (!allowed.includes(k)) throw new SuiteError(`${at}.${k}`, `not a field of the ${law} law${suggest(k, allowed)} (fields: ${allowed.join(", ")})`);
  }
  switch (law) {
    case "gaussian":
      return { law, mean: asVec2(o.mean, `${at}.mean`), cov: asPsd(o.cov, `${at}.cov`) };
    case "circle":
      return { law, mean: asVec2(o.mean, `${at}.mean`), radius: asNumber(o.radius, `${at}.radius`, { gt: 0, le: MAX_COORD }) };
    case "student": {
      const dof = asNumber(o.dof, `${at}.dof`, { gt: 2 });
      if (!Number.isFinite(dof)) throw new SuiteError(`${at}.dof`, "must be finite (use the gaussian law for dof = infinity)");
      return { law, mean: asVec2(o.mean, `${at}.mean`), scale: asPsd(o.scale, `${at}.scale`), dof };
    }
    case "discrete": {
      if (!Array.isArray(o.atoms) || o.atoms.length === 0) throw new SuiteError(`${at}.atoms`, "must be a non-empty array of [x, y] points");
      if (o.atoms.length > MAX_ATOMS) throw new SuiteError(`${at}.atoms`, `at most ${MAX_ATOMS} atoms`);
      const atoms = o.atoms.map((a, i) => asVec2(a, `${at}.atoms[${i}]`));
      if (!Array.isArray(o.weights)) throw new SuiteError(`${at}.weights`, "must be an array of probabilities");
      if (o.weights.length !== atoms.length) {
        throw new SuiteError(`${at}.weights`, `has ${o.weights.length} entries but atoms has ${atoms.length}`);
      }
      const weights = o.weights.map((w, i) => asNumber(w, `${at}.weights[${i}]`, { ge: 0 }));
      const total = weights.reduce((s, w) => s + w, 0);
      if (Math.abs(total - 1) > 1e-9) throw new SuiteError(`${at}.weights`, `must sum to 1 (sum is ${total})`);
      return { law, atoms, weights };
    }
    case "empirical": {
      const file = asString(o.file, `${at}.file`);
      return { law, file, steps: readStepsCsv(resolve(baseDir, file), `${at}.file`) };
    }
  }
  throw new SuiteError(`${at}.law`, "unreachable");
}

/** Read increments from a CSV: two numeric columns (comma, semicolon, tab or spaces), header optional. */
export function readStepsCsv(file: string, field: string): Vec2[] {
  let text: string;
  try {
    text = readFileSync(file, "utf8");
  } catch (e) {
    throw new SuiteError(field, `cannot read ${file}: ${(e as Error).message}`);
  }
  const steps: Vec2[] = [];
  const lines = text.split(/\r?\n/);
  lines.forEach((line, i) => {
    const t = line.trim();
    if (t === "" || t.startsWith("#")) return;
    const cells = t.split(/\s*[,;\t]\s*|\s+/).filter((c) => c !== "");
    const nums = cells.map(Number);
    const numeric = cells.length >= 2 && cells.every((c) => c !== "" && Number.isFinite(Number(c)));
    if (!numeric) {
      if (steps.length === 0 && i === firstContentLine(lines)) return; // a header line
      throw new SuiteError(field, `${file} line ${i + 1}: expected two numbers, got ${JSON.stringify(t.slice(0, 60))}`);
    }
    if (cells.length !== 2) throw new SuiteError(field, `${file} line ${i + 1}: expected exactly two columns, got ${cells.length}`);
    if (nums.some((x) => Math.abs(x) > MAX_COORD)) throw new SuiteError(field, `${file} line ${i + 1}: a step coordinate beyond +-${MAX_COORD}`);
    steps.push([nums[0], nums[1]]);
  });
  if (steps.length < 2) throw new SuiteError(field, `${file} holds ${steps.length} increment(s); at least 2 are needed`);
  return steps;
}

function firstContentLine(lines: string[]): number {
  return lines.findIndex((l) => l.trim() !== "" && !l.trim().startsWith("#"));
}

function validateClaim(raw: unknown, at: string, suite: Suite): Claim {
  const o = asObject(raw, at);
  for (const k of Object.keys(o)) {
    if (!CLAIM_KEYS.has(k)) throw new SuiteError(`${at}.${k}`, `unknown claim field${suggest(k, [...CLAIM_KEYS])}`);
  }
  const m = o.measure;
  if (typeof m !== "string" || !(MEASURES as readonly string[]).includes(m)) {
    throw new SuiteError(`${at}.measure`, `unknown measure ${JSON.stringify(m)}`);
  }
  if (!suite.measure.includes(m as Measure)) throw new SuiteError(`${at}.measure`, `${m} is not among the suite's measures`);
  const c: Claim = { measure: m as Measure };
  if (o.varianceLimit !== undefined) c.varianceLimit = asNumber(o.varianceLimit, `${at}.varianceLimit`, { ge: 0 });
  if (o.meanGrowth !== undefined) c.meanGrowth = asNumber(o.meanGrowth, `${at}.meanGrowth`, {});
  if (o.varianceScaling !== undefined) c.varianceScaling = asNumber(o.varianceScaling, `${at}.varianceScaling`, { ge: 0, le: 4 });
  if (o.meanScaling !== undefined) c.meanScaling = asNumber(o.meanScaling, `${at}.meanScaling`, { ge: 0, le: 4 });
  if (o.label !== undefined) c.label = asString(o.label, `${at}.label`);
  if (o.tolerance !== undefined) c.tolerance = asNumber(o.tolerance, `${at}.tolerance`, { gt: 0, lt: 1 });
  if (o.limitLaw !== undefined) {
    if (o.limitLaw !== "normal" && o.limitLaw !== "non-normal") {
      throw new SuiteError(`${at}.limitLaw`, `must be "normal" or "non-normal" (got ${JSON.stringify(o.limitLaw)})`);
    }
    c.limitLaw = o.limitLaw;
  }
  if (o.mean !== undefined || o.n !== undefined) {
    if (o.mean === undefined) throw new SuiteError(`${at}.mean`, "missing: a claim with `n` states the mean at that n");
    if (o.n === undefined) throw new SuiteError(`${at}.n`, "missing: a claimed `mean` needs the n it holds at");
    c.mean = asNumber(o.mean, `${at}.mean`, {});
    c.n = asInteger(o.n, `${at}.n`, 1, 2 ** 31 - 1);
    if (!suite.n.includes(c.n)) throw new SuiteError(`${at}.n`, `${c.n} is not on the suite's grid n = [${suite.n.join(", ")}]`);
  }
  if (o.linearisation !== undefined) c.linearisation = validateLinearisation(o.linearisation, `${at}.linearisation`, suite.walks.length);
  if (c.varianceLimit === undefined && c.meanGrowth === undefined && c.limitLaw === undefined && c.mean === undefined && c.linearisation === undefined) {
    throw new SuiteError(at, "claims nothing: give varianceLimit, meanGrowth, limitLaw, linearisation, or n with mean");
  }
  return c;
}

function validateLinearisation(raw: unknown, at: string, walks: number): Linearisation {
  const o = asObject(raw, at);
  for (const k of Object.keys(o)) {
    if (k !== "endpoint" && k !== "path") throw new SuiteError(`${at}.${k}`, `unknown linearisation field${suggest(k, ["endpoint", "path"])}`);
  }
  if (o.endpoint === undefined) throw new SuiteError(`${at}.endpoint`, "missing: one gradient [x, y] per walk");
  const vectors = (v: unknown, field: string): Vec2[] => {
    if (!Array.isArray(v)) throw new SuiteError(field, `must be an array of ${walks} [x, y] pairs (one per walk)`);
    if (v.length !== walks) throw new SuiteError(field, `has ${v.length} entries; the suite has ${walks} walk${walks === 1 ? "" : "s"} (one [x, y] per walk)`);
    return v.map((g, j) => {
      if (!Array.isArray(g) || g.length !== 2) throw new SuiteError(`${field}[${j}]`, "must be a pair [x, y]");
      return [asNumber(g[0], `${field}[${j}][0]`, {}), asNumber(g[1], `${field}[${j}][1]`, {})] as Vec2;
    });
  };
  const out: Linearisation = { endpoint: vectors(o.endpoint, `${at}.endpoint`) };
  if (o.path !== undefined) out.path = vectors(o.path, `${at}.path`);
  return out;
}

function asObject(v: unknown, at: string): Record<string, unknown> {
  if (typeof v !== "object" || v === null || Array.isArray(v)) throw new SuiteError(at, "must be a JSON object");
  return v as Record<string, unknown>;
}
function asString(v: unknown, at: string): string {
  if (typeof v !== "string" || v.length === 0) throw new SuiteError(at, "must be a non-empty string");
  return v;
}
interface Bounds {
  gt?: number;
  ge?: number;
  lt?: number;
  le?: number;
}
function asNumber(v: unknown, at: string, b: Bounds): number {
  if (typeof v !== "number" || !Number.isFinite(v)) throw new SuiteError(at, `must be a finite number (got ${JSON.stringify(v)})`);
  if (b.gt !== undefined && !(v > b.gt)) throw new SuiteError(at, `must be > ${b.gt} (got ${v})`);
  if (b.ge !== undefined && !(v >= b.ge)) throw new SuiteError(at, `must be >= ${b.ge} (got ${v})`);
  if (b.lt !== undefined && !(v < b.lt)) throw new SuiteError(at, `must be < ${b.lt} (got ${v})`);
  if (b.le !== undefined && !(v <= b.le)) throw new SuiteError(at, `must be <= ${b.le} (got ${v})`);
  return v;
}
function asInteger(v: unknown, at: string, min: number, max: number): number {
  if (typeof v !== "number" || !Number.isInteger(v)) throw new SuiteError(at, `must be an integer (got ${JSON.stringify(v)})`);
  if (v < min) throw new SuiteError(at, `must be >= ${min} (got ${v})`);
  if (v > max) throw new SuiteError(at, `must be <= ${max} (got ${v}): too large for this tool`);
  return v;
}
/** Largest |coordinate| of a step law (means, atoms, radius, CSV steps): 1e12, so that positions
 *  (n up to 2^31 steps) and hull areas stay finite and well inside double precision. Covariance and
 *  scale entries: MAX_COORD^2. */
export const MAX_COORD = 1e12;
const COORD_BOUNDS = { ge: -MAX_COORD, le: MAX_COORD };
function asVec2(v: unknown, at: string): Vec2 {
  if (!Array.isArray(v) || v.length !== 2) throw new SuiteError(at, "must be a pair [x, y]");
  return [asNumber(v[0], `${at}[0]`, COORD_BOUNDS), asNumber(v[1], `${at}[1]`, COORD_BOUNDS)];
}
function asPsd(v: unknown, at: string): Mat2 {
  if (!Array.isArray(v) || v.length !== 2 || !v.every((r) => Array.isArray(r) && r.length === 2)) {
    throw new SuiteError(at, "must be a 2x2 matrix [[a, b], [b, d]]");
  }
  const m = v as unknown[][];
  const bounds = { ge: -MAX_COORD * MAX_COORD, le: MAX_COORD * MAX_COORD };
  const a = asNumber(m[0][0], `${at}[0][0]`, bounds);
  const b = asNumber(m[0][1], `${at}[0][1]`, bounds);
  const c = asNumber(m[1][0], `${at}[1][0]`, bounds);
  const d = asNumber(m[1][1], `${at}[1][1]`, bounds);
  const scale = Math.max(Math.abs(a), Math.abs(b), Math.abs(c), Math.abs(d));
  if (Math.abs(b - c) > 1e-12 * scale) throw new SuiteError(at, `must be symmetric (${b} != ${c})`);
  // Eigenvalues of a symmetric 2x2 matrix; PSD up to a relative rounding tolerance (common practice).
  const tr = a + d;
  const disc = Math.sqrt(((a - d) / 2) ** 2 + b * b);
  const lo = tr / 2 - disc;
  const hi = tr / 2 + disc;
  if (lo < -1e-12 * scale) {
    throw new SuiteError(at, `not positive semi-definite (eigenvalues ${fmt(lo)} and ${fmt(hi)}; a covariance needs both >= 0)`);
  }
  return [[a, b], [b, d]];
}
function fmt(x: number): string {
  return Number(x.toPrecision(6)).toString();
}
function suggest(key: string, known: string[]): string {
  const close = known.find((k) => k.toLowerCase() === key.toLowerCase() || k.startsWith(key) || key.startsWith(k));
  return close ? ` (did you mean \`${close}\`?)` : "";
}

/** JSON with object keys sorted, for hashing. */
export function canonicalJson(v: unknown): string {
  if (Array.isArray(v)) return `[${v.map(canonicalJson).join(",")}]`;
  if (v && typeof v === "object") {
    const o = v as Record<string, unknown>;
    return `{${Object.keys(o)
      .filter((k) => o[k] !== undefined)
      .sort()
      .map((k) => `${JSON.stringify(k)}:${canonicalJson(o[k])}`)
      .join(",")}}`;
  }
  return JSON.stringify(v);
}
