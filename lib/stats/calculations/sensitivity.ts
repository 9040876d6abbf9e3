/**
 * Sensitivity of a calculation for the Plan tab's plots: power against the kind's main size
 * with the other inputs fixed, and the clusters per arm needed over a grid of ICC and cluster
 * size. Both use the kinds' own power functions at the adjusted alpha, so a point on the curve
 * at the solved size equals the calculation's achieved power.
 */
import type { CalculationRequest } from './request';
import { adjustAlpha } from './adjust';
import { clusterMeansPower, solveClustersPerArm, type ClusterMeansRequest } from './cluster-means';
import { inputError } from './errors';
import { slopesDesign } from './longitudinal-slopes';
import { regressionPower } from './regression';
import { repeatedMeasuresDesign } from './repeated-measures';
import { summaryPower } from './summary-measure';
import { smallestGroupOne, twoGroupMeansPower } from './two-group-means';
import { twoProportionsPower } from './two-proportions';
import { clusterProportionsPower } from './cluster-proportions';
import { clusterRatesPower } from './cluster-rates';
import { p2FromEffect } from './proportion-effect';
import { twoRatesPower } from './two-rates';
import { designEffect } from '@/lib/stats/design-effect';
import { calculate } from './index';
import { optimalWholeClusterSize } from './optimal-allocation';

export interface PowerPoint {
  size: number;
  power: number;
}

/** The size a power curve varies, by kind ('clustersPerArm' for the cluster kinds). */
export const CURVE_SIZE: Record<CalculationRequest['kind'], string | null> = {
  'two-group-means': 'nPerGroup',
  regression: 'n',
  'cluster-means': 'clustersPerArm',
  'repeated-measures': 'nPerGroup',
  'longitudinal-slopes': 'nPerGroup',
  'two-proportions': 'nPerGroup',
  'cluster-proportions': 'clustersPerArm',
  'two-rates': 'nPerGroup',
  'cluster-rates': 'clustersPerArm',
  'design-effect': null,
  'optimal-allocation': 'clustersPerArm',
};

/**
 * Power at each size, the request's other inputs fixed. When the request leaves the effect (or,
 * for cluster-means, the cluster size) out, it is first solved from the request, so the curve
 * passes through the target power at the request's size. Sizes below a kind's minimum are
 * refused. For repeated-measures and longitudinal-slopes the power is the normal approximation,
 * as their `power`.
 */
export function powerCurve(request: CalculationRequest, sizes: readonly number[]): PowerPoint[] {
  const sizeName = CURVE_SIZE[request.kind];
  if (sizeName === null || request.kind === 'design-effect') throw inputError('A design-effect calculation has no power to plot.', ['kind']);
  const alpha = adjustAlpha(request.alpha, request.outcomes ?? 1, request.multiplicity ?? 'none').alphaAdjusted;
  // The effect as given, or solved once from the request when it is left out.
  const effect = (name: string, given: number | undefined): number => given ?? (calculate(request).result[name] as number);
  let at: (size: number) => number;
  let minSize = 2;
  switch (request.kind) {
    case 'two-group-means': {
      const delta = effect('delta', request.delta);
      minSize = smallestGroupOne(request.ratio);
      at = (n) => twoGroupMeansPower({ delta, sd: request.sd, nPerGroup: n, ratio: request.ratio, alpha, sides: request.sides });
      break;
    }
    case 'regression': {
      const f2 = request.f2 ?? (calculate(request).result.f2 as number);
      const predictors = request.predictors ?? request.testedPredictors;
      minSize = predictors + 2;
      at = (n) => regressionPower({ f2, n, testedPredictors: request.testedPredictors, predictors, alpha });
      break;
    }
    case 'cluster-means': {
      const delta = effect('delta', request.delta);
      const clusterSize = request.clusterSize ?? (calculate(request).result.clusterSize as number);
      at = (k) => clusterMeansPower({ delta, sd: request.sd, icc: request.icc, clusterSize, cv: request.cv, clustersPerArm: k, alpha, sides: request.sides });
      break;
    }
    case 'repeated-measures': {
      const delta = effect('delta', request.delta);
      const design = repeatedMeasuresDesign(request.analysis, request.baselines, request.followUps, request.rho);
      at = (n) => summaryPower(delta, request.sd, n, design, alpha, request.sides).powerT;
      break;
    }
    case 'longitudinal-slopes': {
      const slopeDifference = effect('slopeDifference', request.slopeDifference);
      const design = slopesDesign(request.times, request.rho);
      at = (n) => summaryPower(slopeDifference, request.sd, n, design, alpha, request.sides).powerT;
      break;
    }
    case 'two-proportions': {
      const p2 = effect('p2', p2FromEffect(request));
      const clustered = request.icc !== undefined && request.clusterSize !== undefined;
      const de = clustered ? designEffect({ clusterSize: request.clusterSize!, icc: request.icc!, cv: request.cv }) : 1;
      at = (n) => twoProportionsPower({ p1: request.p1, p2, n: n / de, alpha, sides: request.sides, continuityCorrection: request.continuityCorrection });
      break;
    }
    case 'cluster-proportions': {
      const p2 = effect('p2', p2FromEffect(request));
      const clusterSize = request.clusterSize ?? (calculate(request).result.clusterSize as number);
      at = (k) => clusterProportionsPower({ p1: request.p1, p2, icc: request.icc, clusterSize, cv: request.cv, clustersPerArm: k, alpha, sides: request.sides });
      break;
    }
    case 'two-rates': {
      const rateRatio = effect('rateRatio', request.rateRatio);
      minSize = smallestGroupOne(request.ratio);
      at = (n) => twoRatesPower({ ...request, rateRatio, nPerGroup: n, alpha });
      break;
    }
    case 'cluster-rates': {
      const rateRatio = effect('rateRatio', request.rateRatio);
      const clusterSize = request.clusterSize ?? (calculate(request).result.clusterSize as number);
      at = (k) => clusterRatesPower({ ...request, rateRatio, clusterSize, clustersPerArm: k, alpha });
      break;
    }
    case 'optimal-allocation': {
      if (request.delta === undefined || request.sd === undefined) throw inputError('A power curve needs delta and sd.', ['delta', 'sd']);
      const { delta, sd } = request;
      const m = optimalWholeClusterSize(request.icc, request.costPerCluster, request.costPerUnit);
      at = (k) => clusterMeansPower({ delta, sd, icc: request.icc, clusterSize: m, cv: 0, clustersPerArm: k, alpha, sides: request.sides });
      break;
    }
  }
  return sizes.map((size) => {
    if (!Number.isInteger(size) || size < minSize) {
      throw inputError(`Sizes on this power curve are whole numbers of at least ${minSize}; got ${size}.`, [sizeName]);
    }
    return { size, power: at(size) };
  });
}

export interface GridCell {
  icc: number;
  clusterSize: number;
  /** Clusters per arm reaching the request's power; null when no number up to the maximum does. */
  clustersPerArm: number | null;
}

/**
 * Clusters per arm needed for the request's target power at each ICC × cluster size, the other
 * inputs (delta, sd, cv, alpha and its adjustment, sides) fixed. The request needs delta and power.
 */
export function clustersGrid(request: ClusterMeansRequest, iccs: readonly number[], clusterSizes: readonly number[]): GridCell[] {
  if (request.delta === undefined || request.power === undefined) {
    throw inputError('The grid of clusters needs delta and power.', [...(request.delta === undefined ? ['delta'] : []), ...(request.power === undefined ? ['power'] : [])]);
  }
  const alpha = adjustAlpha(request.alpha, request.outcomes, request.multiplicity).alphaAdjusted;
  if (!(request.power > alpha)) throw inputError('power must be above the significance level.', ['power']);
  return iccs.flatMap((icc) =>
    clusterSizes.map((clusterSize) => {
      designEffect({ clusterSize, icc, cv: request.cv }); // validates the cell's inputs
      const s = solveClustersPerArm({ delta: request.delta!, sd: request.sd, icc, clusterSize, cv: request.cv, alpha, sides: request.sides }, request.power!);
      return { icc, clusterSize, clustersPerArm: s.feasibility === 'unreachable' ? null : s.size };
    }),
  );
}
