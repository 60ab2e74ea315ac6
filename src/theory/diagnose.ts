// Prediction: hypothesis diagnosis (docs/theory.md sec. 12). For each measure of a suite: which limit theorem applies, its
// constants, and why (or why not). Labels: `normal` (with the variance limit), `non-normal` (with the
// reason), `degenerate` (sigma^2 = 0: Var = o(n^p)), `unknown` (no theorem, or hypotheses outside every
// statement). The cases follow docs/theory.md sec. 12, "When the normal limit fails".
// Ties: two quantities are tied when they differ by at most `tieTolerance` (relative, default 1e-9) and
// near-tied up to `nearTieTolerance` (default 1e-2); a near-tie keeps the label but is reported as a
// slow-convergence risk (the limit only shows once sqrt(n) * gap dominates the fluctuations).

import type { Mat2, Measure, Suite, Vec2 } from "../suite/schema.js";
import { MEASURES, measureSpec } from "../geometry/measure-registry.js";
import { BETA_ISOTROPIC, brownianAreaOneWalk, brownianPerimeterConstant, RMC_SOURCE, SCALING_LIMIT_SOURCE, U0_ESTIMATE, V0_ESTIMATE } from "./brownian-limits.js";
import { oneWalkDriftArea } from "./drift-area.js";
import { dist, driftPolygon, locate, type DriftPolygon } from "./geometry.js";
import { isContinuousLaw, stepMoments, type StepMoments } from "./step-moments.js";
import {
  areaGradients, DIAMETER_VARIANCE_SOURCES, diameterVariance, farthestPairs, linearisedVariance, PERIMETER_VARIANCE_SOURCES,
  perimeterGradients, walksAt,
} from "./linearised-variance.js";
import { gaussianMaximum, MAX_FORMS } from "./gaussian-maximum.js";
import { BAXTER_SOURCE } from "./vertices.js";
import type { GaussianMaximumPrediction, LimitLaw, MeasurePrediction } from "./types.js";

export interface Tolerances {
  tie: number;
  nearTie: number;
}

export type Diagnosis = Omit<MeasurePrediction, "exactMeans" | "exactMeansError" | "rows">;

interface Context {
  k: number;
  moments: StepMoments[];
  drifts: Vec2[];
  covs: Mat2[];
  zero: boolean[];
  nearZero: boolean[];
  allZero: boolean;
  P: DriftPolygon;
  tol: Tolerances;
  infiniteVariance: number[];
  uncalibrated: boolean;
  common: string[];
}

const fmt = (x: number) => (Math.abs(x) >= 1e4 || (Math.abs(x) < 1e-3 && x !== 0) ? x.toExponential(4) : x.toPrecision(6));
const vstr = (v: Vec2) => `(${fmt(v[0])}, ${fmt(v[1])})`;

function blank(measure: Measure, c: Context): Diagnosis {
  const { scaling } = measureSpec(measure);
  return {
    measure, limitLaw: "unknown", varianceLimit: null, varianceScaling: scaling.variance, meanGrowth: null, meanScaling: scaling.mean,
    varianceLimitKind: null, meanGrowthKind: null, reasons: [...c.common], sources: [],
    ...(c.uncalibrated ? { varianceUncalibrated: true } : {}),
  };
}

export function buildContext(suite: Suite, tol: Tolerances): Context {
  if (!suite || !Array.isArray(suite.walks) || suite.walks.length === 0) throw new Error("walks: expected a non-empty array of step laws");
  const moments = suite.walks.map((w, j) => stepMoments(w, `walks[${j}]`));
  const drifts = moments.map((m) => m.mean);
  const covs = moments.map((m) => m.cov);
  const noise = moments.map((m) => (m.secondMomentFinite ? Math.sqrt(m.cov[0][0] + m.cov[1][1]) : 1));
  const zero = drifts.map((d, j) => Math.hypot(d[0], d[1]) <= tol.tie * Math.max(noise[j], 1e-300));
  const nearZero = drifts.map((d, j) => !zero[j] && Math.hypot(d[0], d[1]) <= tol.nearTie * noise[j]);
  const effective = drifts.map((d, j) => (zero[j] ? [0, 0] as Vec2 : d));
  const P = driftPolygon(effective, tol.tie);
  const infiniteVariance = moments.flatMap((m, j) => (m.secondMomentFinite ? [] : [j]));
  const uncalibrated = moments.some((m) => !m.fourthMomentFinite);
  const common: string[] = [];
  suite.walks.forEach((w, j) => {
    if (w.law === "student" && !moments[j].fourthMomentFinite) {
      common.push(`walks[${j}]: student steps with dof = ${w.dof} <= 4 have no 4th moment: variance checks are uncalibrated`);
    }
    if (nearZero[j]) common.push(`walks[${j}]: drift ${vstr(drifts[j])} is small against the step noise: slow-convergence risk (drift dominates only for n >> tr(Sigma)/|mu|^2)`);
  });
  return { k: suite.walks.length, moments, drifts: effective, covs, zero, nearZero, allZero: zero.every(Boolean), P, tol, infiniteVariance, uncalibrated, common };
}

/** Problems shared by the linearised (drift) predictions; returns a label and reason when they fail. */
function driftHypotheses(c: Context, relevantVertices: number[] | null): { law: LimitLaw; reason: string } | null {
  const P = c.P;
  const vertices = relevantVertices ?? P.hull;
  // A zero-drift walk at the vertex 0 of P.
  const zeroWalks = c.zero.flatMap((z, j) => (z ? [j] : []));
  if (zeroWalks.length > 0 && vertices.includes(0)) {
    return { law: "non-normal", reason: `walks[${zeroWalks.join(", ")}] without drift sit at the vertex 0 of P: a non-Gaussian Brownian functional enters the limit` };
  }
  for (const v of vertices) {
    if (v === 0) continue;
    const ws = walksAt(P, v, c.tol.tie);
    if (ws.length > 1) {
      return { law: "non-normal", reason: `walks[${ws.join(", ")}] share the drift ${vstr(P.points[v])} (to relative tolerance ${c.tol.tie}) at a vertex of P (repeated vertex): the maximum of several walks is not Gaussian` };
    }
  }
  return null;
}

function nearTieRisks(c: Context): string[] {
  const out: string[] = [];
  const P = c.P, s = Math.max(P.scale, 1e-300);
  for (let i = 0; i < c.k; i++) {
    for (let j = i + 1; j < c.k; j++) {
      const d = dist(c.drifts[i], c.drifts[j]);
      if (d > c.tol.tie * s && d <= c.tol.nearTie * s) out.push(`walks[${i}] and walks[${j}] have nearly equal drifts (relative gap ${fmt(d / s)} <= near-tie tolerance ${c.tol.nearTie}): slow-convergence risk`);
    }
  }
  if (P.hull.length >= 3) {
    const poly = P.hull.map((i) => P.points[i]);
    for (let j = 0; j < c.k; j++) {
      const where = locate(poly, c.drifts[j], c.tol.nearTie);
      const exact = locate(poly, c.drifts[j], c.tol.tie);
      if ((where === "edge" || where === "vertex") && exact === "interior") out.push(`walks[${j}]: drift lies near the boundary of P: slow-convergence risk`);
    }
    if (P.area <= c.tol.nearTie * s * s) out.push(`P is nearly flat (area ${fmt(P.area)}): near-collinear drifts, slow-convergence risk`);
  }
  return out;
}

function boundaryProblems(c: Context): string | null {
  const P = c.P;
  if (P.hull.length < 3) return null;
  const poly = P.hull.map((i) => P.points[i]);
  for (let j = 0; j < c.k; j++) {
    if (c.zero[j]) continue;
    if (!P.hull.some((v) => v !== 0 && walksAt(P, v, c.tol.tie).includes(j)) && locate(poly, c.drifts[j], c.tol.tie) === "edge") {
      return `walks[${j}]: drift ${vstr(c.drifts[j])} lies inside an edge of P, not at a vertex: outside the general-position hypothesis, no theorem`;
    }
  }
  if (!P.hull.includes(0) && locate(poly, [0, 0], c.tol.tie) === "edge") {
    return "0 lies inside an edge of P (anti-parallel drifts along the boundary): outside the general-position hypothesis, no theorem";
  }
  return null;
}

function isotropicScale(cov: Mat2, tol: number): number | null {
  const s = (cov[0][0] + cov[1][1]) / 2;
  return Math.abs(cov[0][0] - cov[1][1]) <= tol * s && Math.abs(cov[0][1]) <= tol * s ? s : null;
}

/** Infinite-variance steps put a suite outside every statement: says so in d; true when they do. */
function outsideEveryStatement(d: Diagnosis, c: Context): boolean {
  if (!c.infiniteVariance.length) return false;
  d.reasons.push(`walks[${c.infiniteVariance.join(", ")}]: infinite variance (student dof <= 2): outside every statement`);
  return true;
}

function diagnosePerimeter(c: Context): Diagnosis {
  const d = blank("perimeter", c);
  if (outsideEveryStatement(d, c)) return d;
  if (c.allZero) {
    const b = brownianPerimeterConstant(c.covs);
    d.limitLaw = "non-normal";
    d.meanScaling = 0.5;
    d.meanGrowth = b.value;
    const iso = c.covs.map((cv) => isotropicScale(cv, c.tol.tie));
    const identicalIso = iso.every((s) => s !== null && Math.abs(s - iso[0]!) <= c.tol.tie * iso[0]!);
    d.meanGrowthKind = identicalIso && c.k <= 3 ? "theorem" : "derived";
    d.reasons.push("zero drift: n^{-1/2} L_n converges to the perimeter of a Brownian convex hull, not normal");
    d.sources.push(SCALING_LIMIT_SOURCE, "lim n^{-1/2} E L_n = int E[max_j s_j(t)|N_j|] dt (Cauchy + reflection) [derived, docs/theory.md sec. 8.1]");
    if (identicalIso && c.k <= 3) d.sources.push(`${RMC_SOURCE}: alpha_${c.k}`);
    if (c.k === 1 && iso[0] !== null) {
      d.varianceLimit = U0_ESTIMATE * iso[0];
      d.varianceLimitKind = "estimate";
      d.reasons.push(`Var(L_n)/n -> u_0 s^2 with u_0 ~ ${U0_ESTIMATE} (simulation estimate; shown, never gating)`);
    } else {
      d.reasons.push("variance limit: no known constant for this configuration");
    }
    return d;
  }
  const { P } = c;
  d.meanGrowth = P.perimeter;
  d.meanGrowthKind = c.k === 1 ? "theorem" : "derived";
  d.sources.push(...(c.k === 1 ? PERIMETER_VARIANCE_SOURCES.slice(0, 1) : PERIMETER_VARIANCE_SOURCES));
  const fail = driftHypotheses(c, null);
  if (fail) {
    d.limitLaw = fail.law;
    d.reasons.push(fail.reason);
    return d;
  }
  if (c.k >= 2 && P.collinear) {
    d.reasons.push("collinear drifts (P is a segment): a normal limit is expected but unproven");
    return d;
  }
  const bp = boundaryProblems(c);
  if (bp) {
    d.reasons.push(bp);
    return d;
  }
  const { sigma2, perWalk } = linearisedVariance(P, perimeterGradients(P), c.covs, c.tol.tie);
  const scale = c.covs.reduce((s, cv) => s + 4 * (cv[0][0] + cv[1][1]), 0);
  d.varianceLimit = sigma2;
  d.varianceLimitKind = c.k <= 2 ? "theorem" : "derived";
  perWalk.forEach((g, j) => {
    d.reasons.push(g ? `walks[${j}] at a vertex of P: g = ${vstr(g)}` : `walks[${j}]: drift inside P, no first-order contribution`);
  });
  if (sigma2 <= c.tol.tie * scale) {
    d.limitLaw = "degenerate";
    d.reasons.push("sigma^2 = 0: the steps are constant along every relevant direction g_j; Var(L_n) = o(n)");
  } else {
    d.limitLaw = "normal";
    d.reasons.push(`drifts in general position: (L_n - E L_n)/sqrt(n) -> N(0, ${fmt(sigma2)})`);
    d.linearisation = { endpoint: perWalk.map((g) => g ?? [0, 0]) };
  }
  d.reasons.push(...nearTieRisks(c));
  return d;
}

function diagnoseDiameter(c: Context): Diagnosis {
  const d = blank("diameter", c);
  if (outsideEveryStatement(d, c)) return d;
  if (c.allZero) {
    d.limitLaw = "non-normal";
    d.meanScaling = 0.5;
    d.reasons.push("zero drift: n^{-1/2} D_n converges to the diameter of a Brownian convex hull, not normal; no closed-form constant known");
    d.sources.push(SCALING_LIMIT_SOURCE);
    return d;
  }
  const dv = diameterVariance(c.drifts, c.covs, c.tol.tie)!;
  d.meanGrowth = dv.meanGrowth;
  d.meanGrowthKind = c.k === 1 ? "theorem" : "derived";
  d.sources.push(...(c.k === 1 ? DIAMETER_VARIANCE_SOURCES.slice(0, 1) : DIAMETER_VARIANCE_SOURCES));
  if (tieLaw(d, c, dv.pair.gap)) return d;
  const fail = driftHypotheses(c, [dv.pair.a, dv.pair.b]);
  if (fail) {
    d.limitLaw = fail.law;
    d.reasons.push(fail.reason);
    return d;
  }
  d.varianceLimit = dv.sigma2;
  d.varianceLimitKind = c.k === 1 ? "theorem" : "derived";
  const scale = c.covs.reduce((s, cv) => s + cv[0][0] + cv[1][1], 0);
  d.reasons.push(`unique farthest pair of vertices of P: ${vstr(dv.P.points[dv.pair.a])} - ${vstr(dv.P.points[dv.pair.b])}, e = ${vstr(dv.e)}`);
  if (dv.sigma2 <= c.tol.tie * scale) {
    d.limitLaw = "degenerate";
    d.reasons.push("sigma^2 = 0: the steps are constant along e; Var(D_n) = o(n)");
  } else {
    d.limitLaw = "normal";
    d.reasons.push(`(D_n - E D_n)/sqrt(n) -> N(0, ${fmt(dv.sigma2)})`);
    // D_n ~ |S^a_n - S^b_n| ~ n |a - b| + e . (X^a_n - X^b_n): +e for the walk at a, -e at b.
    const endpoint: Vec2[] = c.drifts.map(() => [0, 0]);
    for (const [p, sign] of [[dv.pair.a, 1], [dv.pair.b, -1]] as const) {
      const ws = p === 0 ? [] : walksAt(dv.P, p, c.tol.tie);
      if (ws.length > 0) endpoint[ws[0]] = [sign * dv.e[0], sign * dv.e[1]];
    }
    d.linearisation = { endpoint };
  }
  if (dv.pair.gap <= c.tol.nearTie) d.reasons.push(`near-tie for the farthest pair (relative gap ${fmt(dv.pair.gap)} <= near-tie tolerance ${c.tol.nearTie}): slow-convergence risk`);
  return d;
}

/** The Gaussian forms W = e_ab'(X_a - X_b) of the tied farthest pairs (one per walk at each end; X = 0 at the origin). */
export function tieForms(c: Context): GaussianMaximumPrediction["forms"] {
  const forms: GaussianMaximumPrediction["forms"] = [];
  for (const { a, b } of farthestPairs(c.P, c.tol.tie)) {
    const pa = c.P.points[a], pb = c.P.points[b], len = dist(pa, pb);
    const e: Vec2 = [(pa[0] - pb[0]) / len, (pa[1] - pb[1]) / len];
    const at = (p: number) => (p === 0 ? [null] : walksAt(c.P, p, c.tol.tie));
    for (const ja of at(a)) for (const jb of at(b)) {
      const gradients: Vec2[] = c.drifts.map(() => [0, 0]);
      if (ja !== null) gradients[ja] = [e[0], e[1]];
      if (jb !== null) gradients[jb] = [-e[0], -e[1]];
      forms.push({ ends: [[...pa], [...pb]], walks: [ja, jb], gradients });
    }
  }
  return forms;
}

/**
 * Ties for the farthest pair, or a repeated vertex at its ends (docs/theory.md sec. 7.1): D_n is a
 * maximum of asymptotically Gaussian lengths. Sets the label and returns true when that applies.
 */
function tieLaw(d: Diagnosis, c: Context, gap: number): boolean {
  const forms = tieForms(c);
  if (forms.length <= 1) return false;
  const vertices = new Set(forms.flatMap((f) => f.ends.map((v) => `${v[0]},${v[1]}`)));
  const what = gap <= c.tol.tie
    ? `tie for the farthest pair of vertices of P (relative gap ${fmt(Math.max(gap, 0))} <= tie tolerance ${c.tol.tie}; ${vertices.size} vertices involved)`
    : "several walks share a drift at an end of the farthest pair of vertices of P (repeated vertex)";
  const zeroWalks = c.zero.flatMap((z, j) => (z ? [j] : []));
  if (zeroWalks.length > 0 && forms.some((f) => f.walks.includes(null))) {
    d.limitLaw = "non-normal";
    d.reasons.push(`${what}; walks[${zeroWalks.join(", ")}] without drift sit at the vertex 0 of P: their running extremes are not Gaussian forms: non-normal, law not computed`);
    return true;
  }
  const covariance = forms.map((f) => forms.map((g) => f.gradients.reduce((s, gj, j) => s + quad2(c.covs[j], gj, g.gradients[j]), 0)));
  let law;
  try {
    law = gaussianMaximum(covariance);
  } catch (e) {
    d.limitLaw = "non-normal";
    d.reasons.push(`${what}: D_n is a maximum of ${forms.length} Gaussian forms; non-normal, law not computed (${(e as Error).message}; at most ${MAX_FORMS} distinct forms are integrated)`);
    return true;
  }
  const centre = d.meanGrowth ?? 0;
  d.gaussianMaximum = {
    centre, forms, covariance, mean: law.mean, meanError: law.meanError, variance: law.variance, varianceError: law.varianceError, method: law.method,
  };
  const scale = c.covs.reduce((s, cv) => s + cv[0][0] + cv[1][1], 0);
  if (law.variance <= c.tol.tie * scale) {
    d.limitLaw = "degenerate";
    d.reasons.push(`${what}: every Gaussian form vanishes (the steps are constant along the pairs' directions); Var(D_n) = o(n)`);
    return true;
  }
  d.limitLaw = "gaussian-maximum";
  d.varianceLimit = law.variance;
  d.varianceLimitKind = "derived";
  d.sources.push("farthest-pair ties: (D_n - n d)/sqrt(n) -> max of the tied pairs' Gaussian forms [derived, docs/theory.md sec. 7.1]");
  d.reasons.push(
    `${what}: (D_n - n d)/sqrt(n) -> M = max of ${forms.length} Gaussian forms e_ab'(X_a - X_b)/sqrt(n) (${law.distinctForms} distinct${law.hasZeroForm ? ", and 0" : ""}), ` +
      `E M = ${fmt(law.mean)} (error <= ${law.meanError.toExponential(1)}), Var M = ${fmt(law.variance)} (error <= ${law.varianceError.toExponential(1)}); ` +
      `E D_n = n d + sqrt(n) E M + o(sqrt(n)), Var(D_n)/n -> Var M; ${law.method}`,
  );
  return true;
}

/** g' S h for a symmetric 2 x 2 S. */
const quad2 = (S: Mat2, g: Vec2, h: Vec2) => g[0] * (S[0][0] * h[0] + S[0][1] * h[1]) + g[1] * (S[1][0] * h[0] + S[1][1] * h[1]);

function diagnoseArea(c: Context): Diagnosis {
  const d = blank("area", c);
  d.varianceScaling = 3;
  d.meanScaling = 2;
  if (outsideEveryStatement(d, c)) return d;
  if (c.allZero) {
    d.limitLaw = "non-normal";
    d.varianceScaling = 2;
    d.meanScaling = 1;
    d.reasons.push("zero drift: A_n / n converges to the area of a Brownian convex hull, not normal");
    d.sources.push(SCALING_LIMIT_SOURCE);
    if (c.k === 1) {
      d.meanGrowth = brownianAreaOneWalk(c.covs[0]);
      d.meanGrowthKind = "theorem";
      d.sources.push(`${RMC_SOURCE}: beta_1 = pi/2 (times sqrt(det Sigma) by linearity)`);
      d.varianceLimit = V0_ESTIMATE * (c.covs[0][0][0] * c.covs[0][1][1] - c.covs[0][0][1] ** 2);
      d.varianceLimitKind = "estimate";
      d.reasons.push(`Var(A_n)/n^2 -> v_0 det(Sigma) with v_0 ~ ${V0_ESTIMATE} (simulation estimate; shown, never gating)`);
    } else {
      const iso = c.covs.map((cv) => isotropicScale(cv, c.tol.tie));
      if (c.k <= 3 && iso.every((s) => s !== null && Math.abs(s - iso[0]!) <= c.tol.tie * iso[0]!)) {
        d.meanGrowth = BETA_ISOTROPIC[c.k - 1] * iso[0]!;
        d.meanGrowthKind = "derived";
        d.sources.push(`beta_${c.k} for identical isotropic walks [derived, docs/theory.md sec. 8.3]`);
      } else {
        d.reasons.push("mean area growth: no known constant for these covariances");
      }
    }
    return d;
  }
  if (c.k === 1) {
    const a = oneWalkDriftArea(c.drifts[0], c.covs[0]);
    d.limitLaw = "non-normal";
    d.meanScaling = 1.5;
    d.meanGrowth = a.meanGrowth;
    d.meanGrowthKind = "derived";
    d.varianceLimit = a.varianceEstimate;
    d.varianceLimitKind = "estimate";
    d.reasons.push("one walk with drift: 0 is on the boundary of P = [0, mu]; A_n / n^{3/2} -> |mu| sigma_perp x (area of the hull of a Brownian graph), not normal");
    d.reasons.push("mean constant sqrt(2 pi)/3 |mu| sigma_perp [derived]; variance v_+ ~ 0.019 |mu|^2 sigma_perp^2 (simulation estimate)");
    d.sources.push(SCALING_LIMIT_SOURCE, "mean constant sqrt(2 pi)/3 [derived, docs/theory.md sec. 9]");
    return d;
  }
  const { P } = c;
  if (P.collinear) {
    d.limitLaw = "non-normal";
    d.meanScaling = 1.5;
    d.reasons.push("drifts collinear: P is a segment, 0 on its boundary; the area is of order n^{3/2} from the walks' sideways fluctuations, not normal");
    return d;
  }
  d.meanGrowth = P.area;
  d.meanGrowthKind = "derived";
  d.sources.push("linearisation of area(conv{0, S^j_n}) at n mu_j [derived, docs/theory.md sec. 10]");
  const poly = P.hull.map((i) => P.points[i]);
  const where = locate(poly, [0, 0], c.tol.tie);
  if (where !== "interior") {
    d.limitLaw = "non-normal";
    d.reasons.push(`0 lies on the boundary of P (${where === "vertex" ? "a vertex" : "an edge"}): the walks along the edges of P through 0 bulge outward by order sqrt(n) over length n, a non-Gaussian term`);
    return d;
  }
  const fail = driftHypotheses(c, null);
  if (fail) {
    d.limitLaw = fail.law;
    d.reasons.push(fail.reason);
    return d;
  }
  const bp = boundaryProblems(c);
  if (bp) {
    d.reasons.push(bp);
    return d;
  }
  const { sigma2, perWalk } = linearisedVariance(P, areaGradients(P), c.covs, c.tol.tie);
  d.varianceLimit = sigma2;
  d.varianceLimitKind = "derived";
  const scale = c.covs.reduce((s, cv) => s + cv[0][0] + cv[1][1], 0) * P.scale * P.scale;
  if (sigma2 <= c.tol.tie * scale) {
    d.limitLaw = "degenerate";
    d.reasons.push("sigma^2 = 0: Var(A_n) = o(n^3)");
  } else {
    d.limitLaw = "normal";
    d.reasons.push(`0 interior to P: only the endpoints matter to first order; (A_n - E A_n)/n^{3/2} -> N(0, ${fmt(sigma2)}) [derived; variance limit checked by simulation, docs/theory.md sec. 14]`);
    d.linearisation = { endpoint: perWalk.map((g) => g ?? [0, 0]) };
  }
  const nearBoundary = locate(poly, [0, 0], c.tol.nearTie);
  if (nearBoundary !== "interior") d.reasons.push("0 is near the boundary of P: slow-convergence risk");
  d.reasons.push(...nearTieRisks(c));
  return d;
}

function diagnoseVertices(c: Context, suite: Suite): Diagnosis {
  const d = blank("vertices", c);
  d.meanScaling = 0;
  d.reasons.push("no sourced limit law for the vertex count; no variance limit");
  if (c.k >= 2) d.reasons.push(`${c.k} walks: the mean vertex formula is for one walk only: no prediction`);
  else if (!isContinuousLaw(suite.walks[0])) {
    d.reasons.push(`walks[0]: ${suite.walks[0].law} steps are not in general position (atoms or a singular law: collinear points): no mean prediction`);
  } else d.sources.push(BAXTER_SOURCE);
  return d;
}

export function diagnose(suite: Suite, tol: Tolerances): Diagnosis[] {
  const c = buildContext(suite, tol);
  if (!Array.isArray(suite.measure)) throw new Error("measure: expected an array of measures");
  return suite.measure.map((m, i) => {
    switch (m) {
      case "perimeter": return diagnosePerimeter(c);
      case "diameter": return diagnoseDiameter(c);
      case "area": return diagnoseArea(c);
      case "vertices": return diagnoseVertices(c, suite);
      default: {
        // A measure of the registry that no theorem here covers: estimated, never predicted.
        if (!(MEASURES as readonly string[]).includes(m)) throw new Error(`measure[${i}]: unknown measure ${JSON.stringify(m)}`);
        const d = blank(m, c);
        d.reasons.push(`${m}: no limit theorem is implemented for it: reported as an estimate with its confidence interval, no prediction`);
        return d;
      }
    }
  });
}

