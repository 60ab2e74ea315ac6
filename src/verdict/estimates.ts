// Per (measure, n) estimates of E M_n and Var M_n: plain and with control variates, and the series
// the extrapolation fits (ratios with their jackknife covariance across the grid).
//
// Controls (kernel, per walk j and grid n): the centred endpoint X_n^j = S_n^j - n mu_j and the
// centred integrated path Y_n^j = sum_{i<=n} (S_i^j - i mu_j). Their means are 0 and, with Sigma_j
// the step covariance (sums of i.i.d. steps; common practice):
//   Cov X = n Sigma, Cov Y = n(n+1)(2n+1)/6 Sigma, Cov(X, Y) = n(n+1)/2 Sigma, walks independent.
// A walk whose step covariance is infinite (student, dof <= 2) gives no control; a singular Sigma
// gives controls along its non-zero eigenvectors only; at n = 1, Y = X and only X is used.
// Estimates (src/stats/control-variates.ts) with the regression refitted in every delete-one-block
// replicate; a control-variate estimate replaces the plain one at a grid point only when its
// jackknife standard error is lower (the choice is shown, per measure, quantity and n).

import { projectControls, controlFactor, controlVariatePoint, leaveOneOutStates, type ControlBasis, type ControlFactor } from "../stats/control-variates.js";
import { jackknifeFromReplicates } from "../stats/jackknife.js";
import { symmetricEigen2 } from "../stats/linalg.js";
import type { CoMomentState } from "../stats/types.js";
import type { SimulationResult } from "../run/types.js";
import { CONTROLS_PER_WALK, recordLayout } from "../engine/types.js";
import { stepMoments } from "../theory/step-moments.js";
import type { Measure, StepLaw } from "../suite/schema.js";

export type Quantity = "mean" | "variance";

/** One (measure, n): plain and control-variate estimates with jackknife standard errors. */
export interface PointEstimate {
  measure: Measure;
  n: number;
  paths: number;
  /** Number of controls used at this n (0: none available). */
  controls: number;
  mean: number;
  meanSE: number;
  meanPlain: number;
  meanPlainSE: number;
  /** plain SE^2 / control-variate SE^2 of the mean. */
  meanReduction: number;
  /** Whether `mean` is the control-variate estimate (else the plain one). */
  meanUsesControls: boolean;
  variance: number;
  varianceSE: number;
  variancePlain: number;
  variancePlainSE: number;
  varianceReduction: number;
  varianceUsesControls: boolean;
  /** Fitted regression coefficients on the used controls (their order: `controlLabels`). */
  coefficients: number[];
  controlLabels: string[];
  /** Residual variance Var(M - b'Z): what the controls leave unexplained. */
  residualVariance: number;
}

/** Replicates of one quantity over the grid: the full value and every delete-one-block value. */
interface Replicates {
  plain: { full: number[]; leaveOut: number[][] };
  cv: { full: number[]; leaveOut: number[][] };
}

export interface MeasureEstimates {
  measure: Measure;
  points: PointEstimate[];
  replicates: Record<Quantity, Replicates>;
  /** Paths per block (jackknife group sizes). */
  sizes: number[];
}

/** Known covariance factor of (X_n, Y_n) along one unit direction u: Cov(u'T_t, u'T_s) = F[t][s] u' Sigma u, t, s in {X, Y}. */
export function controlCovarianceFactor(n: number): [[number, number], [number, number]] {
  return [[n, (n * (n + 1)) / 2], [(n * (n + 1)) / 2, (n * (n + 1) * (2 * n + 1)) / 6]];
}

/** The controls used at step count n, with their known covariance. */
export function controlBasis(walks: readonly StepLaw[], n: number): ControlBasis & { labels: string[] } {
  const c = walks.length * CONTROLS_PER_WALK;
  const rows: number[][] = [];
  const labels: string[] = [];
  const F = controlCovarianceFactor(n);
  const parts: { walk: number; t: number; u: [number, number]; lambda: number; axis: number }[] = [];
  walks.forEach((law, j) => {
    let m;
    try {
      m = stepMoments(law, `walks[${j}]`);
    } catch {
      return;
    }
    if (!m.secondMomentFinite) return;
    const [[a, b], [, d]] = m.cov;
    if (![a, b, d].every(Number.isFinite)) return;
    const tr = a + d;
    const { values: eig, vectors } = symmetricEigen2(a, b, d);
    eig.forEach((lambda, axis) => {
      if (!(lambda > 1e-12 * Math.max(tr, 1e-300))) return;
      for (const t of n >= 2 ? [0, 1] : [0]) parts.push({ walk: j, t, u: vectors[axis], lambda, axis });
    });
  });
  for (const part of parts) {
    const row = new Array<number>(c).fill(0);
    const base = part.walk * CONTROLS_PER_WALK + 2 * part.t;
    row[base] = part.u[0];
    row[base + 1] = part.u[1];
    rows.push(row);
    labels.push(`${part.t === 0 ? "X" : "Y"}${part.walk + 1}.(${formatDirection(part.u)})`);
  }
  const p = rows.length;
  const known = new Float64Array(p * p);
  for (let i = 0; i < p; i++)
    for (let k = 0; k < p; k++) {
      const A = parts[i], B = parts[k];
      if (A.walk !== B.walk) continue;
      // Cov(u'T_t, v'T_s) = F[t][s] u' Sigma v; orthonormal eigenvectors: u' Sigma v = lambda [u = v].
      known[i * p + k] = A.axis === B.axis ? F[A.t][B.t] * A.lambda : 0;
    }
  return { p, c, transform: Float64Array.from(rows.flat()), known, labels };
}

/** A unit direction as "x,y" to 3 decimals (control and coefficient labels). */
export const formatDirection = (u: [number, number]) => `${+u[0].toFixed(3)},${+u[1].toFixed(3)}`;

/** The order of the four numbers of statistics(). */
const STATISTICS_ORDER: [Quantity, "plain" | "cv"][] = [["mean", "plain"], ["variance", "plain"], ["mean", "cv"], ["variance", "cv"]];

function statistics(s: CoMomentState, q: number, r: number, known: Float64Array, factor: ControlFactor): [number, number, number, number] {
  const e = controlVariatePoint(s, q, r, known, factor);
  return [e.meanPlain, e.variancePlain, e.mean, e.variance];
}

const sd = (cov: Float64Array, d: number, i: number) => Math.sqrt(cov[i * d + i]);

/** Control-variate and plain estimates of every measure of the suite at every n. */
export function estimateMeasures(sim: SimulationResult): Map<Measure, MeasureEstimates> {
  const suite = sim.suite;
  const grid = suite.n;
  const G = grid.length;
  const B = sim.blocks.length;
  const sizes = sim.blocks.map((b) => b.paths);
  const out = new Map<Measure, MeasureEstimates>();
  const layout = recordLayout(G);
  const q = layout.perPoint;
  if (B < 2 || sim.blocks.some((b) => !b.controlComoments || b.controlComoments.length !== G)) return out;
  // Per grid point: the projected states (full and leave-one-out), shared by all measures.
  const perPoint = grid.map((n, g) => {
    // Sums without control values (dim = the measures alone): plain estimates only.
    const bare = sim.blocks[0].controlComoments[g].dim === q;
    const basis = bare ? { p: 0, c: 0, transform: new Float64Array(0), known: new Float64Array(0), labels: [] } : controlBasis(suite.walks, n);
    const projected = sim.blocks.map((b) => projectControls(b.controlComoments[g], q, basis));
    const { full, leaveOut } = leaveOneOutStates(projected);
    // The controls' factor of each state: the same for every measure.
    return { basis, full, leaveOut, fullFactor: controlFactor(full, q, basis.known), leaveOutFactors: leaveOut.map((st) => controlFactor(st, q, basis.known)) };
  });
  for (const measure of suite.measure) {
    const r = layout.index(0, measure);
    const rep = (): Replicates => ({
      plain: { full: new Array(G), leaveOut: Array.from({ length: B }, () => new Array(G)) },
      cv: { full: new Array(G), leaveOut: Array.from({ length: B }, () => new Array(G)) },
    });
    const replicates: Record<Quantity, Replicates> = { mean: rep(), variance: rep() };
    const fits = perPoint.map(({ basis, full, leaveOut, fullFactor, leaveOutFactors }, g) => {
      const f = controlVariatePoint(full, q, r, basis.known, fullFactor);
      const put = (v: [number, number, number, number], loo: number | null) => {
        STATISTICS_ORDER.forEach(([q, kind], i) => {
          if (loo === null) replicates[q][kind].full[g] = v[i];
          else replicates[q][kind].leaveOut[loo][g] = v[i];
        });
      };
      put([f.meanPlain, f.variancePlain, f.mean, f.variance], null);
      leaveOut.forEach((st, j) => put(statistics(st, q, r, basis.known, leaveOutFactors[j]), j));
      return { f, basis };
    });
    const cov = (q: Quantity, kind: "plain" | "cv") => jackknifeFromReplicates(replicates[q][kind].full, replicates[q][kind].leaveOut, sizes).covariance;
    const cMP = cov("mean", "plain"), cMC = cov("mean", "cv"), cVP = cov("variance", "plain"), cVC = cov("variance", "cv");
    const points: PointEstimate[] = grid.map((n, g) => {
      const { f, basis } = fits[g];
      const meanPlainSE = sd(cMP, G, g), meanCvSE = sd(cMC, G, g);
      const varPlainSE = sd(cVP, G, g), varCvSE = sd(cVC, G, g);
      const meanUses = basis.p > 0 && meanCvSE < meanPlainSE;
      const varUses = basis.p > 0 && varCvSE < varPlainSE;
      return {
        measure, n, paths: perPoint[g].full.count, controls: basis.p,
        mean: meanUses ? f.mean : f.meanPlain, meanSE: meanUses ? meanCvSE : meanPlainSE,
        meanPlain: f.meanPlain, meanPlainSE, meanReduction: ratio(meanPlainSE, meanCvSE), meanUsesControls: meanUses,
        variance: varUses ? f.variance : f.variancePlain, varianceSE: varUses ? varCvSE : varPlainSE,
        variancePlain: f.variancePlain, variancePlainSE: varPlainSE, varianceReduction: ratio(varPlainSE, varCvSE), varianceUsesControls: varUses,
        coefficients: Array.from(f.coef), controlLabels: basis.labels, residualVariance: f.residualVariance,
      };
    });
    out.set(measure, { measure, points, replicates, sizes });
  }
  return out;
}

const ratio = (plain: number, cv: number) => (cv > 0 ? (plain * plain) / (cv * cv) : plain > 0 ? Infinity : 1);

/**
 * The series Q_n / n^power over the grid (Q = mean or variance), each point from the estimate
 * chosen in `points` (control variates where they lower the SE), with the jackknife covariance
 * of the whole vector (correlations across n included). Also the plain series for comparison.
 */
export function scaledSeries(est: MeasureEstimates, q: Quantity, power: number, grid: number[]): { y: number[]; cov: Float64Array; plainY: number[]; plainCov: Float64Array; usesControls: boolean[] } {
  const uses = est.points.map((p) => (q === "mean" ? p.meanUsesControls : p.varianceUsesControls));
  const rep = est.replicates[q];
  const scale = grid.map((n) => Math.pow(n, power));
  const pick = (vals: number[], plainVals: number[]) => vals.map((v, g) => (uses[g] ? v : plainVals[g]) / scale[g]);
  const y = pick(rep.cv.full, rep.plain.full);
  const leaveOut = rep.cv.leaveOut.map((row, j) => pick(row, rep.plain.leaveOut[j]));
  const plainY = rep.plain.full.map((v, g) => v / scale[g]);
  const plainLeave = rep.plain.leaveOut.map((row) => row.map((v, g) => v / scale[g]));
  return {
    y,
    cov: jackknifeFromReplicates(y, leaveOut, est.sizes).covariance,
    plainY,
    plainCov: jackknifeFromReplicates(plainY, plainLeave, est.sizes).covariance,
    usesControls: uses,
  };
}
