// Extrapolation of Var(X_n)/n^p and E X_n/n^q to n -> infinity from one simulated grid, with
// correlations between grid points (same paths) from the delete-one-block jackknife.
//
// Policy (house rules, see MATH.md "Finite-n behaviour"):
// - >= 5 grid points spanning >= 1.5 decades, geometrically spaced: fit s2 + c n^-beta with beta
//   profiled over [0.1, 2] (src/stats/gls.ts); tests invert the profile likelihood.
// - 3 or more points otherwise: beta fixed to suite.expectedRate (an assumption, default 1/2), with
//   the estimate also shown for beta in {1/4, 1/2, 1}.
// - <= 2 points: no extrapolation; the ratio at the largest n is reported, bias unknown.
// - Mean of the perimeter with q = 1: E L_n = n perimeter(P) + c log n + C + o(1) (MATH.md,
//   [derived] for one walk, assumed for several), so E L_n/n = g + (a ln n + b)/n is fitted by
//   linear GLS (>= 3 points; its misfit is testable from 4).

import { blockJackknife } from "../stats/jackknife.js";
import { fitPowerLawFixed, fitPowerLawProfile, gridIdentifiesRate, linearGls, profileTest, weightMatrix } from "../stats/gls.js";
import { normalQuantile, twoSidedNormalP } from "../stats/normal.js";
import type { MomentState } from "../stats/types.js";
import type { Measure } from "../suite/schema.js";
import type { LimitEstimate } from "./types.js";

export const LEVEL = 0.95;
const SENSITIVITY_RATES = [0.25, 0.5, 1];

export interface ScaledSeries {
  measure: Measure;
  quantity: "varianceLimit" | "meanGrowth";
  scaling: number;
  n: number[];
  /** blocks[b][g]: moment state of grid point g in block b. */
  blocks: MomentState[][];
  expectedRate: number;
}

/** A test of a value against the extrapolated limit. */
export interface LimitTest {
  statistic: number;
  /** The p-value used for gating (the least significant over the rates considered, for "fixed"). */
  pValue: number;
  /** Smallest p-value over the rates considered ("fixed"), else equal to pValue. */
  minPValue: number;
  statisticKind: "z" | "profile-LR";
}

export interface Extrapolation {
  limit: LimitEstimate;
  /** Whether a calibrated test of a value is possible (a model with a misfit test or a derived rate). */
  testable: boolean;
  test: (value: number) => LimitTest;
}

function ratioOf(s: ScaledSeries, st: MomentState, g: number): number {
  const scale = Math.pow(s.n[g], s.scaling);
  if (s.quantity === "varianceLimit") return st.count >= 2 ? st.m2 / (st.count - 1) / scale : NaN;
  return st.mean / scale;
}

export function extrapolate(s: ScaledSeries): Extrapolation {
  const G = s.n.length;
  const B = s.blocks.length;
  const jk = blockJackknife(s.blocks, (merged) => merged.map((st, g) => ratioOf(s, st, g)));
  const y = Array.from(jk.estimate);
  const se = Array.from({ length: G }, (_, g) => Math.sqrt(jk.covariance[g * G + g]));
  const ratios = s.n.map((n, g) => ({ n, value: y[g], standardError: se[g] }));
  // Grid points with no spread (e.g. a vertex count that is constant at tiny n) carry no
  // information and make the covariance singular: they are left out of the fits, and said so.
  const keep = s.n.map((_, g) => g).filter((g) => Number.isFinite(y[g]) && se[g] > 0);
  const dropped = s.n.filter((_, g) => !keep.includes(g));
  const droppedNote = dropped.length ? ` (n = ${dropped.join(", ")} left out: no spread)` : "";
  if (keep.length === 0) {
    const last = G - 1;
    const limit: LimitEstimate = { measure: s.measure, quantity: s.quantity, scaling: s.scaling, level: LEVEL, ratios, method: "none", estimate: y[last], standardError: se[last], ci: null, beta: null, betaInterval: null, misfitPValue: null, sensitivity: [], note: "no grid point has any spread: nothing to extrapolate" };
    return { limit, testable: false, test: () => ({ statistic: NaN, pValue: NaN, minPValue: NaN, statisticKind: "z" }) };
  }
  return fitKept(s, keep.map((g) => s.n[g]), keep.map((g) => y[g]), keep.map((g) => se[g]), subMatrix(jk.covariance, G, keep), B, ratios, droppedNote);
}

function subMatrix(c: Float64Array, d: number, keep: number[]): Float64Array {
  const k = keep.length;
  const out = new Float64Array(k * k);
  for (let i = 0; i < k; i++) for (let j = 0; j < k; j++) out[i * k + j] = c[keep[i] * d + keep[j]];
  return out;
}

function fitKept(s: ScaledSeries, nK: number[], y: number[], se: number[], cov: Float64Array, B: number, ratios: LimitEstimate["ratios"], droppedNote: string): Extrapolation {
  const G = nK.length;
  const z = normalQuantile(1 - (1 - LEVEL) / 2);
  const base = { measure: s.measure, quantity: s.quantity, scaling: s.scaling, level: LEVEL, ratios };
  const what = (s.quantity === "varianceLimit" ? `Var/n^${s.scaling}` : `mean/n^${s.scaling}`) + droppedNote;

  const none = (note: string): Extrapolation => {
    const last = G - 1;
    return {
      limit: { ...base, method: "none", estimate: y[last], standardError: se[last], ci: [y[last] - z * se[last], y[last] + z * se[last]], beta: null, betaInterval: null, misfitPValue: null, sensitivity: [], note },
      testable: false,
      test: (v) => {
        const zz = (y[last] - v) / se[last];
        const p = twoSidedNormalP(zz);
        return { statistic: zz, pValue: p, minPValue: p, statisticKind: "z" };
      },
    };
  };
  if (G <= 2) return none(`${what} at the largest n = ${nK[G - 1]} only (${G} grid point${G > 1 ? "s" : ""}: no extrapolation; the finite-n bias is unknown)`);
  if (B < G + 3) return none(`${B} blocks cannot estimate the ${G}x${G} covariance of the grid (need >= ${G + 3}); ratio at the largest n only, bias unknown`);

  const opts = { blocks: B, level: LEVEL };

  if (s.quantity === "meanGrowth" && s.measure === "perimeter" && s.scaling === 1) {
    const design: number[] = [];
    for (const n of nK) design.push(1, Math.log(n) / n, 1 / n);
    let fit;
    try {
      fit = linearGls(y, design, 3, weightMatrix(cov, G, B));
    } catch (e) {
      return none(`log-rate fit impossible (${(e as Error).message}); ratio at the largest n only, bias unknown`);
    }
    const g = fit.coef[0];
    const gse = Math.sqrt(fit.coefCov[0]);
    const misfit = fit.df > 0 ? fit.pValue : null;
    return {
      limit: {
        ...base, method: "log", estimate: g, standardError: gse, ci: [g - z * gse, g + z * gse], beta: null, betaInterval: null, misfitPValue: misfit, sensitivity: [],
        note: `GLS fit of E X_n/n = g + (a ln n + b)/n (the drift expansion E L_n = n perimeter(P) + c log n + C, MATH.md [derived] for one walk, assumed for several), a = ${fit.coef[1].toPrecision(4)}${fit.df === 0 ? "; 3 points, no misfit test" : ""}`,
      },
      testable: fit.df > 0,
      test: (v) => {
        const zz = (g - v) / gse;
        const p = twoSidedNormalP(zz);
        return { statistic: zz, pValue: p, minPValue: p, statisticKind: "z" };
      },
    };
  }

  if (gridIdentifiesRate(nK)) {
    let fit;
    try {
      fit = fitPowerLawProfile(nK, y, cov, opts);
    } catch (e) {
      return none(`rate fit impossible (${(e as Error).message}); ratio at the largest n only, bias unknown`);
    }
    return {
      limit: {
        ...base, method: "profile", estimate: fit.s2, standardError: fit.s2SE, ci: fit.s2Interval, beta: fit.beta, betaInterval: fit.betaInterval, misfitPValue: fit.pValue, sensitivity: [],
        note: `GLS fit of ${what} = L + c n^-beta, beta profiled over [0.1, 2] (beta = ${fit.beta.toFixed(3)}, ${LEVEL * 100}% profile interval [${fit.betaInterval![0].toFixed(3)}, ${fit.betaInterval![1].toFixed(3)}]${fit.betaAtBound ? ", at a bound of the range" : ""}); profile-likelihood interval for L`,
      },
      testable: true,
      test: (v) => {
        const t = profileTest(nK, y, cov, v, opts);
        return { statistic: t.statistic, pValue: t.pValue, minPValue: t.pValue, statisticKind: "profile-LR" };
      },
    };
  }

  const rates = Array.from(new Set([s.expectedRate, ...SENSITIVITY_RATES]));
  let fits;
  try {
    fits = rates.map((b) => fitPowerLawFixed(nK, y, cov, b, opts));
  } catch (e) {
    return none(`fixed-rate fit impossible (${(e as Error).message}); ratio at the largest n only, bias unknown`);
  }
  const main = fits[0];
  const reason = G < 5 ? `${G} grid points cannot identify the rate` : "the grid does not identify the rate (needs >= 5 geometrically spaced n over >= 1.5 decades)";
  return {
    limit: {
      ...base, method: "fixed", estimate: main.s2, standardError: main.s2SE, ci: main.s2Interval, beta: s.expectedRate, betaInterval: null, misfitPValue: main.df > 0 ? main.pValue : null,
      sensitivity: SENSITIVITY_RATES.map((b) => {
        const f = fits[rates.indexOf(b)];
        return { beta: b, estimate: f.s2, ci: f.s2Interval };
      }),
      note: `GLS fit of ${what} = L + c n^-beta with beta = ${s.expectedRate} ASSUMED (${reason}); ` +
        `L = ${SENSITIVITY_RATES.map((b) => `${fits[rates.indexOf(b)].s2.toPrecision(6)} (beta ${b})`).join(", ")}`,
    },
    testable: true,
    test: (v) => {
      const ps = fits.map((f) => twoSidedNormalP((f.s2 - v) / f.s2SE));
      const zz = (main.s2 - v) / main.s2SE;
      return { statistic: zz, pValue: Math.max(...ps), minPValue: Math.min(...ps), statisticKind: "z" };
    },
  };
}
