// Prediction cache: the predictions of a suite are read back instead of recomputed when the theory
// inputs (walks, n grid, measures, tie tolerances), the requested accuracy (meanTargets) and the tool
// version are the same. One JSON file per key under $XDG_CACHE_HOME/walkhull/predictions (else
// ~/.cache/walkhull/predictions; the XDG Base Directory Specification). Each entry carries the
// sha256 of its content; an entry that does not parse, does not match its key, version or format, or
// fails its checksum is ignored, recomputed and rewritten: never trusted. Predictions cut short by a
// time cap (a mean that did not reach its target, an n skipped) are not stored: they depend on the
// machine's speed, not only on the inputs. Writes are atomic (temporary file + rename); a cache that
// cannot be written is skipped silently (the run does not depend on it).

import { createHash } from "node:crypto";
import { mkdirSync, readFileSync } from "node:fs";
import { writeAtomic } from "../io/write-atomic.js";
import { homedir } from "node:os";
import { isAbsolute, join } from "node:path";
import { canonicalJson } from "../suite/load.js";
import type { Suite } from "../suite/schema.js";
import { toolVersion } from "../version.js";
import { predict } from "./predict.js";
import type { Prediction, PredictOptions } from "./types.js";

/** Entry format; bump THEORY_REVISION when a numerical method changes its values within a version. */
export const CACHE_FORMAT = "walkhull-prediction-cache/1";
export const THEORY_REVISION = "accuracy-targeted-6+gaussian-maximum-2+linearisation";

export interface CacheOptions {
  /** false: compute, neither read nor write (--no-cache). */
  use?: boolean;
  /** Tool version in the key (default: package.json's). */
  version?: string;
  /** Environment to read XDG_CACHE_HOME and HOME from (default process.env). */
  env?: NodeJS.ProcessEnv;
}

interface Entry {
  format: string;
  version: string;
  key: string;
  checksum: string;
  prediction: Prediction;
}

/** $XDG_CACHE_HOME/walkhull/predictions, else ~/.cache/walkhull/predictions (a relative XDG path is ignored, as the spec says). */
export function predictionCacheDir(env: NodeJS.ProcessEnv = process.env): string {
  const xdg = env.XDG_CACHE_HOME;
  const base = xdg && isAbsolute(xdg) ? xdg : join(env.HOME && isAbsolute(env.HOME) ? env.HOME : homedir(), ".cache");
  return join(base, "walkhull", "predictions");
}

const sha256 = (text: string) => createHash("sha256").update(text).digest("hex");

/** The key: sha256 of the canonical JSON of everything predict() reads, the accuracy and the version. */
export function predictionKey(suite: Suite, opts: PredictOptions, version: string): string {
  return sha256(canonicalJson({
    format: CACHE_FORMAT,
    revision: THEORY_REVISION,
    version,
    walks: suite.walks,
    n: suite.n,
    measure: suite.measure,
    tieTolerance: opts.tieTolerance ?? null,
    nearTieTolerance: opts.nearTieTolerance ?? null,
    meanTargets: opts.meanTargets ?? null,
  }));
}

/** True when every mean reached its target and no time cap cut anything short (then the result depends only on the inputs). */
export function cacheable(p: Prediction): boolean {
  return p.measures.every((m) =>
    Object.keys(m.exactMeans).every((k) => m.exactMeansTarget?.[k] === undefined || m.exactMeansError[k] <= m.exactMeansTarget[k]) &&
    !m.reasons.some((r) => /time (cap|budget)|budget/.test(r)));
}

function readEntry(file: string, key: string, version: string): Prediction | null {
  let entry: Entry;
  try {
    entry = JSON.parse(readFileSync(file, "utf8")) as Entry;
  } catch {
    return null; // missing or corrupt
  }
  if (!entry || typeof entry !== "object" || entry.format !== CACHE_FORMAT || entry.version !== version || entry.key !== key) return null;
  if (!entry.prediction || !Array.isArray(entry.prediction.measures)) return null;
  if (entry.checksum !== sha256(canonicalJson(entry.prediction))) return null;
  return entry.prediction;
}

function writeEntry(dir: string, file: string, entry: Entry): void {
  try {
    mkdirSync(dir, { recursive: true });
    writeAtomic(file, JSON.stringify(entry) + "\n");
  } catch {
    // A cache that cannot be written only costs the next run a recomputation.
  }
}

/** The cached predictions when a valid entry exists (what predictCached would return as a hit), else null; never computes. */
export function cachedPrediction(suite: Suite, opts: PredictOptions = {}, cache: CacheOptions = {}): Prediction | null {
  if (cache.use === false) return null;
  const version = cache.version ?? toolVersion();
  const key = predictionKey(suite, opts, version);
  const file = join(predictionCacheDir(cache.env), `${key}.json`);
  const hit = readEntry(file, key, version);
  return hit ? { ...hit, cache: { status: "hit", file } } : null;
}

/** predict() through the cache. The result's `cache` says hit, miss (computed, stored if cacheable) or off. */
export function predictCached(suite: Suite, opts: PredictOptions = {}, cache: CacheOptions = {}): Prediction {
  if (cache.use === false) return { ...predict(suite, opts), cache: { status: "off", file: null } };
  const hit = cachedPrediction(suite, opts, cache);
  if (hit) return hit;
  const version = cache.version ?? toolVersion();
  const key = predictionKey(suite, opts, version);
  const dir = predictionCacheDir(cache.env);
  const file = join(dir, `${key}.json`);
  const computed = predict(suite, opts);
  if (cacheable(computed)) {
    const prediction = JSON.parse(JSON.stringify({ measures: computed.measures })) as Prediction;
    writeEntry(dir, file, { format: CACHE_FORMAT, version, key, checksum: sha256(canonicalJson(prediction)), prediction });
  }
  return { ...computed, cache: { status: "miss", file } };
}
