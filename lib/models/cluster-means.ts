/**
 * `cluster-means`: the analysis of cluster summaries — each cluster (the groups at `level`,
 * default 0, the outermost; or the units at the assignment level when the caller passes that
 * level) is reduced to one number and those numbers are analysed by OLS with df = G − p, G the
 * number of clusters and p the number of cluster-level coefficients. With a cluster-level
 * treatment this is a valid analysis whatever the correlation within clusters (Donner & Klar
 * 2000, Design and Analysis of Cluster Randomization Trials; Hayes & Moulton 2017, Cluster
 * Randomised Trials, 2nd ed.),
 * unweighted, so each cluster counts once.
 *
 * - Target `treat`: the cluster means of y regressed on the cluster means of intercept, treat and
 *   the covariates. Time, a within-cluster variable, is left out: with the same occasions in
 *   every cluster its mean is constant and would only make the design singular. With intercept +
 *   0/1 treat and clusters nested in arms this is the pooled two-sample t test on the cluster
 *   means (the fast path: estimate = mean of cluster means in arm 1 − in arm 0,
 *   SE² = s²(1/G₁ + 1/G₀)).
 * - Target `treat:time`: each cluster's OLS slope of y on time (the summary-measures analysis of
 *   serial measurements: Matthews, Altman, Campbell & Royston 1990, BMJ 300:230–235 — from
 *   memory) regressed on the cluster means of intercept, treat and the covariates; the effect is
 *   the coefficient of treat, the difference in mean slopes.
 *
 * If treat varies within a cluster its cluster mean is a proportion and the estimate is the
 * regression on that proportion. A data set without grouping levels is analysed row by row
 * (then this is `ols`). Reference: R's summary(lm()) on the cluster summaries computed with
 * aggregate()/lm() (fixtures/generate_models.R), to 1e-6 relative.
 *
 * Returns a non-converged result when G ≤ p, the cluster-level design is rank-deficient, or (for
 * slopes) a cluster has fewer than two distinct times.
 */
import { buildDesignMatrix, isTwoArmComparison } from './design-matrix';
import { badGroupId, clustersOf, notEstimable } from './estimate';
import { LeastSquares } from './least-squares';
import { TwoArmSums } from './two-arm';
import type { Dataset, EffectEstimate, FixedEffects, Grouping } from './types';

export interface ClusterMeansOptions {
  /** Grouping level whose groups are summarised (default 0, the outermost). */
  level?: number;
  /** Use the general path even when the closed form applies (for tests). */
  general?: boolean;
}

const sums = new TwoArmSums();

function twoArmFast(data: Dataset, grouping: Grouping): EffectEstimate | null {
  sums.compute(data.y, data.treat, data.n, grouping);
  if (!sums.nestedInArms) return null;
  const { clusterSize, clusterArm, clusterResidualSum } = sums;
  // Cluster mean − arm mean of rows, d_g = E_g/n_g; two passes per arm.
  let g0 = 0;
  let g1 = 0;
  let sd0 = 0;
  let sd1 = 0;
  for (let g = 0; g < sums.clusters; g++) {
    const a = clusterArm[g];
    if (a === -1) continue;
    const d = clusterResidualSum[g]! / clusterSize[g]!;
    if (a === 1) {
      g1++;
      sd1 += d;
    } else {
      g0++;
      sd0 += d;
    }
  }
  const total = g0 + g1;
  if (total <= 2) return notEstimable();
  const dm0 = sd0 / g0;
  const dm1 = sd1 / g1;
  let ss = 0;
  for (let g = 0; g < sums.clusters; g++) {
    const a = clusterArm[g];
    if (a === -1) continue;
    const d = clusterResidualSum[g]! / clusterSize[g]! - (a === 1 ? dm1 : dm0);
    ss += d * d;
  }
  const s2 = ss / (total - 2);
  return {
    estimate: sums.mean1 + dm1 - (sums.mean0 + dm0),
    se: Math.sqrt(s2 * (1 / g0 + 1 / g1)),
    df: total - 2,
    converged: true,
  };
}

const ls = new LeastSquares();
let xBuffer: Float64Array = new Float64Array(0);
let count: Float64Array = new Float64Array(0);
let slot: Int32Array = new Int32Array(0);
let cx: Float64Array = new Float64Array(0);
let cy: Float64Array = new Float64Array(0);
let tMean: Float64Array = new Float64Array(0);
let stt: Float64Array = new Float64Array(0);
let sty: Float64Array = new Float64Array(0);

function ensure(groups: number, p: number): void {
  if (count.length < groups) {
    count = new Float64Array(groups);
    slot = new Int32Array(groups);
    cy = new Float64Array(groups);
    tMean = new Float64Array(groups);
    stt = new Float64Array(groups);
    sty = new Float64Array(groups);
  }
  if (cx.length < groups * p) cx = new Float64Array(groups * p);
}

function general(data: Dataset, fixed: FixedEffects, grouping: Grouping): EffectEstimate {
  const n = data.n;
  const slopes = fixed.target === 'treat:time';
  const design = buildDesignMatrix(data, fixed, xBuffer);
  xBuffer = design.x;
  const { x } = design;
  // Cluster-level columns: intercept, treat and the covariates (the leading columns of the design
  // matrix); time, a within-cluster variable, is left out.
  const p = 2 + fixed.covariates.length;
  const { id, count: groups } = grouping;
  ensure(groups, design.p);
  count.fill(0, 0, groups);
  for (let i = 0; i < n; i++) {
    const g = id[i]!;
    if (!(g >= 0 && g < groups)) badGroupId(grouping.name, i, g, groups);
    count[g]!++;
  }
  let G = 0;
  for (let g = 0; g < groups; g++) slot[g] = count[g]! > 0 ? G++ : -1;
  if (G <= p) return notEstimable();
  cx.fill(0, 0, G * p);
  cy.fill(0, 0, G);
  for (let i = 0; i < n; i++) {
    const s = slot[id[i]!]!;
    for (let j = 0; j < p; j++) cx[s + j * G]! += x[i + j * n]!;
  }
  for (let g = 0; g < groups; g++) {
    const s = slot[g]!;
    if (s < 0) continue;
    for (let j = 0; j < p; j++) cx[s + j * G]! /= count[g]!;
  }
  if (!slopes) {
    // Two-pass cluster means of y: a first mean, then the mean deviation from it.
    for (let i = 0; i < n; i++) cy[slot[id[i]!]!]! += data.y[i]!;
    for (let g = 0; g < groups; g++) if (slot[g]! >= 0) cy[slot[g]!]! /= count[g]!;
    tMean.fill(0, 0, G);
    for (let i = 0; i < n; i++) {
      const s = slot[id[i]!]!;
      tMean[s]! += data.y[i]! - cy[s]!;
    }
    for (let g = 0; g < groups; g++) if (slot[g]! >= 0) cy[slot[g]!]! += tMean[slot[g]!]! / count[g]!;
  } else {
    const time = data.time!;
    // Per-cluster slope Σ(t − t̄)(y − ȳ)/Σ(t − t̄)², with t̄ and ȳ from a first pass.
    tMean.fill(0, 0, G);
    cy.fill(0, 0, G);
    for (let i = 0; i < n; i++) {
      const s = slot[id[i]!]!;
      tMean[s]! += time[i]!;
      cy[s]! += data.y[i]!;
    }
    for (let g = 0; g < groups; g++) {
      const s = slot[g]!;
      if (s < 0) continue;
      tMean[s]! /= count[g]!;
      cy[s]! /= count[g]!;
    }
    stt.fill(0, 0, G);
    sty.fill(0, 0, G);
    for (let i = 0; i < n; i++) {
      const s = slot[id[i]!]!;
      const dt = time[i]! - tMean[s]!;
      stt[s]! += dt * dt;
      sty[s]! += dt * (data.y[i]! - cy[s]!);
    }
    for (let s = 0; s < G; s++) {
      if (!(stt[s]! > 0)) return notEstimable();
      cy[s] = sty[s]! / stt[s]!;
    }
  }
  if (ls.fit(cx, G, p, cy) < p) return notEstimable();
  const cov = ls.unscaledCovariance();
  const s2 = ls.rss / (G - p);
  return { estimate: ls.coef[1]!, se: Math.sqrt(s2 * cov[1 + p]!), df: G - p, converged: true };
}

export function fitClusterMeans(data: Dataset, fixed: FixedEffects, options: ClusterMeansOptions = {}): EffectEstimate {
  const grouping = clustersOf(data, options.level);
  if (!options.general && isTwoArmComparison(data, fixed)) {
    const fast = twoArmFast(data, grouping);
    if (fast) return fast;
  }
  return general(data, fixed, grouping);
}
