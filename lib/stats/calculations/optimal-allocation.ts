/**
 * Cluster size that buys the most information per unit of cost in a two-arm cluster-randomised
 * trial, and what a budget then buys.
 *
 * Raudenbush (1997): with cost c_cluster per cluster and c_unit per unit, the cost per unit of
 * information (c_cluster + m·c_unit)·(ICC + (1 − ICC)/m) — proportional to the budget needed
 * for a given variance of the treatment effect — is least at
 *   m* = √((c_cluster/c_unit)·(1 − ICC)/ICC).
 * m* is returned unrounded (`clusterSize`) and as the neighbouring whole number (at least 1)
 * with the lower cost per unit of information (`clusterSizeInteger`): the ICC and the two costs
 * alone answer it, no budget or effect needed. Then, at that whole size, when given:
 * - with a budget: clusters per arm ⌊budget / (2·(c_cluster + m·c_unit))⌋, and their power when
 *   delta and sd are given (cluster-means.ts, cv 0);
 * - with delta, sd and power: the clusters per arm that reach the power (cluster-means.ts, cv 0)
 *   and the budget 2k·(c_cluster + m·c_unit) they cost.
 *
 * Valid range: 0 < ICC < 1, positive costs, m* up to 1,000,000. Bad input: CalculationInputError.
 */
import { COHEN_1988, DONNER_KLAR_2000, RAUDENBUSH_1997 } from '@/lib/citations';
import { designEffect } from '@/lib/stats/design-effect';
import type { CalculationRequest } from './request';
import { adjustAlpha } from './adjust';
import { clusterMeansPower, solveClustersPerArm } from './cluster-means';
import { inputError } from './errors';
import { fullReferences, sizeFeasibilityWarning } from './output';
import { requireTargetPower } from './solve';
import type { CalculationOutput, Feasibility, ResultValue } from './types';
import { formatNumber, SENTENCE_DIGITS } from '@/lib/format';

export type OptimalAllocationRequest = Extract<CalculationRequest, { kind: 'optimal-allocation' }>;

/** The largest cluster size the calculations take (as clusterSize of cluster-means). */
const MAX_CLUSTER_SIZE = 1_000_000;

/** Raudenbush's m* (unrounded). */
export function optimalClusterSize(icc: number, costPerCluster: number, costPerUnit: number): number {
  return Math.sqrt(((costPerCluster / costPerUnit) * (1 - icc)) / icc);
}

/** Cost per unit of information (c_cluster + m·c_unit)·(ICC + (1 − ICC)/m). */
export function costPerInformation(m: number, icc: number, costPerCluster: number, costPerUnit: number): number {
  return (costPerCluster + m * costPerUnit) * (icc + (1 - icc) / m);
}

/** The whole number next to m* (at least 1) with the lower cost per unit of information. */
export function optimalWholeClusterSize(icc: number, costPerCluster: number, costPerUnit: number): number {
  const m = optimalClusterSize(icc, costPerCluster, costPerUnit);
  const below = Math.max(1, Math.floor(m));
  const above = Math.max(1, Math.ceil(m));
  return costPerInformation(below, icc, costPerCluster, costPerUnit) <= costPerInformation(above, icc, costPerCluster, costPerUnit) ? below : above;
}

export function optimalAllocation(request: OptimalAllocationRequest): CalculationOutput {
  const { icc, costPerCluster, costPerUnit, budget, delta, sd, alpha: nominalAlpha, power: target, sides } = request;
  const adjusted = adjustAlpha(nominalAlpha, request.outcomes ?? 1, request.multiplicity ?? 'none');
  const alpha = adjusted.alphaAdjusted;
  const mStar = optimalClusterSize(icc, costPerCluster, costPerUnit);
  if (!(mStar <= MAX_CLUSTER_SIZE)) {
    throw inputError(
      `At this ICC and these costs the best cluster would have ${Number.isFinite(mStar) ? `${formatNumber(mStar, SENTENCE_DIGITS)} units` : 'no limit on its units'}, more than the ${formatNumber(MAX_CLUSTER_SIZE, SENTENCE_DIGITS)} a cluster can have here: check the ICC and the two costs.`,
      ['icc', 'costPerCluster', 'costPerUnit'],
    );
  }
  const m = optimalWholeClusterSize(icc, costPerCluster, costPerUnit);
  const costOfCluster = costPerCluster + m * costPerUnit;
  const hasEffect = delta !== undefined && sd !== undefined;
  if ((delta === undefined) !== (sd === undefined)) {
    const missing = delta === undefined ? 'delta' : 'sd';
    throw inputError(`For power give both delta and sd: ${missing} is missing.`, [missing]);
  }
  const warnings: string[] = [...adjusted.warnings];
  const result: Record<string, ResultValue> = {
    icc,
    costPerCluster,
    costPerUnit,
    clusterSize: mStar,
    clusterSizeInteger: m,
    costPerFullCluster: costOfCluster,
    designEffect: designEffect({ clusterSize: m, icc }),
    costPerInformation: costPerInformation(m, icc, costPerCluster, costPerUnit),
    alpha: nominalAlpha,
    alphaAdjusted: alpha,
    outcomes: request.outcomes ?? 1,
    multiplicity: request.multiplicity ?? 'none',
    sides,
    delta: delta ?? null,
    sd: sd ?? null,
  };
  let feasibility: Feasibility = 'ok';
  let solvedFor = 'clusterSize';
  const base = hasEffect ? { delta: delta!, sd: sd!, icc, clusterSize: m, cv: 0, alpha, sides } : null;

  if (budget !== undefined) {
    const k = Math.floor(budget / (2 * costOfCluster));
    result.budget = budget;
    result.clustersPerArm = k;
    result.budgetUsed = 2 * k * costOfCluster;
    if (k < 2) {
      feasibility = 'unreachable';
      result.power = null;
      warnings.push(
        `The budget pays for ${2 * k} cluster(s) of ${m} units (${formatNumber(costOfCluster, SENTENCE_DIGITS)} each); a comparison needs at least 2 per arm, costing ${formatNumber(4 * costOfCluster, SENTENCE_DIGITS)}.`,
      );
    } else if (base) {
      result.power = clusterMeansPower({ ...base, clustersPerArm: k });
      if (target !== undefined) result.targetPower = target;
    }
  }
  if (base && target !== undefined) {
    requireTargetPower(target, alpha);
    const s = solveClustersPerArm(base, target);
    if (budget !== undefined) {
      // Both asked: what the budget buys (above) and what the target needs.
      result.clustersPerArmNeeded = s.size;
      result.budgetNeeded = 2 * s.size * costOfCluster;
    } else {
      result.clustersPerArm = s.size;
      result.budget = 2 * s.size * costOfCluster;
      result.power = s.power;
      result.targetPower = target;
      feasibility = s.feasibility;
      solvedFor = 'budget';
    }
    warnings.push(...sizeFeasibilityWarning(s.feasibility, 'clusters per arm', s.size, s.power, target));
  }
  if (m === 1) warnings.push('One unit per cluster is optimal at these costs: the clustering adds nothing worth paying for.');
  return {
    kind: 'optimal-allocation',
    solvedFor,
    result,
    feasibility,
    method:
      `Cluster size that minimises the cost per unit of information (${RAUDENBUSH_1997.short}); clusters and power at the whole-number size by the t test on cluster means (df = 2k − 2).`,
    formula:
      'Best cluster size = √((cost per cluster / cost per unit) × (1 − ICC) / ICC), rounded to the neighbouring whole number with the lower ' +
      '(cost per cluster + m × cost per unit) × (ICC + (1 − ICC)/m); clusters per arm = budget / (2 × (cost per cluster + m × cost per unit)), rounded down.',
    references: fullReferences([RAUDENBUSH_1997, DONNER_KLAR_2000, ...(hasEffect ? [COHEN_1988] : []), ...adjusted.references]),
    warnings,
  };
}
