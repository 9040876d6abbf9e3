/**
 * Two arms randomised by cluster, compared on cluster means (the cluster-level analysis).
 *
 * Power (exact under the model): the variance of a cluster mean is σ²·DE/m with
 * DE = 1 + ((cv² + 1)·m − 1)·ICC (Eldridge, Ashby & Kerry 2006; Kish's 1 + (m − 1)·ICC when
 * cv = 0); the difference of the arms' means over k clusters each has standard error
 * √(2σ²·DE/(m·k)), and the t test on cluster means has df = 2k − 2 (Donner & Klar 2000). Power
 * is that of the t test with noncentrality δ/SE, both rejection tails counted when two-sided.
 *
 * As m → ∞ the variance of a cluster mean falls only to σ²·(cv² + 1)·ICC: more units per
 * cluster cannot raise power above the plateau this gives, which is reported when solving for
 * the cluster size fails.
 *
 * Valid range: the schema's (k ≥ 2, m ≥ 1, 0 ≤ ICC ≤ 1, 0 ≤ cv ≤ 3). Accuracy: that of the
 * noncentral t; tested against R's pt with ncp to 1e-6 relative. Bad input: CalculationInputError.
 */
import { COHEN_1988, DONNER_KLAR_2000, ELDRIDGE_2006, KISH_1965 } from '@/lib/citations';
import { designEffect } from '@/lib/stats/design-effect';
import { SOLVABLE, type CalculationRequest } from './request';
import { adjustAlpha } from './adjust';
import { MAX_CLUSTERS_PER_ARM, solveClusterSize } from './cluster-size';
import { clusterRecruitment, effectFeasibilityWarning, fullReferences, sizeFeasibilityWarning, TWO_SIDED, testSettings } from './output';
import { tTestPower, zSum, type Sides } from './power';
import { findUnknown, presence, requireTargetPower, solveEffect, solveSize } from './solve';
import type { CalculationOutput, Feasibility } from './types';

export type ClusterMeansRequest = Extract<CalculationRequest, { kind: 'cluster-means' }>;


export interface ClusterMeansPowerInput {
  delta: number;
  sd: number;
  icc: number;
  /** Mean units per cluster m; Infinity gives the plateau. */
  clusterSize: number;
  cv: number;
  clustersPerArm: number;
  alpha: number;
  sides: Sides;
}

/** Variance of one cluster mean in units of σ²: DE/m, or (cv² + 1)·ICC as m → ∞. */
export function clusterMeanVarianceFactor(icc: number, clusterSize: number, cv: number): number {
  if (clusterSize === Infinity) return (cv * cv + 1) * icc;
  return designEffect({ clusterSize, icc, cv }) / clusterSize;
}

/** Power of the t test on cluster means (see the file's comment). */
export function clusterMeansPower({ delta, sd, icc, clusterSize, cv, clustersPerArm: k, alpha, sides }: ClusterMeansPowerInput): number {
  const variance = (2 * sd * sd * clusterMeanVarianceFactor(icc, clusterSize, cv)) / k;
  if (variance === 0) return 1;
  return tTestPower(delta / Math.sqrt(variance), 2 * k - 2, alpha, sides);
}

/**
 * The smallest k with power ≥ target at the other inputs, by the bounded search of solve.ts.
 * Used by the calculation, the sensitivity grid and optimal allocation.
 */
export function solveClustersPerArm(input: Omit<ClusterMeansPowerInput, 'clustersPerArm'>, target: number) {
  const { delta, sd, icc, clusterSize, cv, alpha, sides } = input;
  const guess = (2 * (zSum(alpha, sides, target) * sd) ** 2 * clusterMeanVarianceFactor(icc, clusterSize, cv)) / (delta * delta);
  return solveSize((k) => clusterMeansPower({ ...input, clustersPerArm: k }), target, 2, MAX_CLUSTERS_PER_ARM, guess);
}

export function clusterMeans(request: ClusterMeansRequest): CalculationOutput {
  const { sd, icc, cv, sides, alpha, outcomes, multiplicity, dropout, clusterDropout } = request;
  const adjusted = adjustAlpha(alpha, outcomes, multiplicity);
  const a = adjusted.alphaAdjusted;
  const solvedFor = findUnknown(SOLVABLE['cluster-means'], presence(request, SOLVABLE['cluster-means']), request.solveFor);
  if (solvedFor !== 'power') requireTargetPower(request.power!, a);
  const target = request.power!;

  const warnings: string[] = [...adjusted.warnings];
  let { delta, clusterSize: m, clustersPerArm: k } = request;
  let power: number;
  let feasibility: Feasibility = 'ok';
  const extra: Record<string, number | null> = {};
  const base = { sd, icc, cv, alpha: a, sides };

  if (solvedFor === 'power') {
    power = clusterMeansPower({ ...base, delta: delta!, clusterSize: m!, clustersPerArm: k! });
  } else if (solvedFor === 'clustersPerArm') {
    const s = solveClustersPerArm({ ...base, delta: delta!, clusterSize: m! }, target);
    ({ size: k, power, feasibility } = s);
    warnings.push(...sizeFeasibilityWarning(feasibility, 'clusters per arm', s.size, s.power, target));
  } else if (solvedFor === 'clusterSize') {
    const s = solveClusterSize({
      powerAt: (size) => clusterMeansPower({ ...base, delta: delta!, clusterSize: size, clustersPerArm: k! }),
      plateauAt: (clusters) => clusterMeansPower({ ...base, delta: delta!, clusterSize: Infinity, clustersPerArm: clusters }),
      clustersPerArm: k!,
      target,
      why: `the variance between clusters remains (ICC ${icc})`,
      members: 'units per cluster',
    });
    ({ size: m, power, feasibility } = s);
    extra.plateauPower = s.plateauPower;
    if (s.clustersPerArmNeeded !== undefined) extra.clustersPerArmNeeded = s.clustersPerArmNeeded;
    warnings.push(...s.warnings);
  } else {
    const factor = clusterMeanVarianceFactor(icc, m!, cv);
    const guess = sd * Math.sqrt((2 * factor) / k!) * zSum(a, sides, target);
    const s = solveEffect((d) => clusterMeansPower({ ...base, delta: d, clusterSize: m!, clustersPerArm: k! }), target, Math.max(guess, sd * 1e-6));
    ({ effect: delta, power, feasibility } = s);
    warnings.push(...effectFeasibilityWarning(feasibility, 'difference', s.effect, s.power, target));
  }

  const de = designEffect({ clusterSize: m!, icc, cv });
  const recruitment = clusterRecruitment(k!, m!, dropout, clusterDropout, 'units');
  if (cv > 0) {
    warnings.push(`Unequal cluster sizes are allowed for by the coefficient of variation ${cv} (${ELDRIDGE_2006.short}); the cluster size entered is the mean size.`);
  }
  if (k! < 10) {
    warnings.push(`With ${k} clusters per arm the estimate of the variance between clusters is imprecise; analyses with few clusters need small-sample corrections.`);
  }
  warnings.push(...recruitment.warnings);
  return {
    kind: 'cluster-means',
    solvedFor,
    result: {
      delta: delta!,
      sd,
      standardizedEffect: delta! / sd,
      icc,
      cv,
      clusterSize: m!,
      clustersPerArm: k!,
      sides,
      ...testSettings({ alpha, alphaAdjusted: a, outcomes, multiplicity, power, targetPower: solvedFor === 'power' ? null : target }),
      designEffect: de,
      degreesOfFreedom: 2 * k! - 2,
      ...extra,
      ...recruitment.result,
    },
    feasibility,
    method: `Power of the ${TWO_SIDED(sides)} t test on cluster means (noncentral t, df = 2k − 2), variance of a cluster mean sd² × DE / m, DE = 1 + ((cv² + 1) × m − 1) × ICC.`,
    formula:
      'Power is the chance that a t statistic with 2 × clusters per arm − 2 degrees of freedom and noncentrality delta / √(2 × sd² × DE / (m × k)) ' +
      'falls beyond the critical value at alpha, where m is the mean cluster size, k the clusters per arm and DE = 1 + ((cv² + 1) × m − 1) × ICC the design effect.',
    references: fullReferences([ELDRIDGE_2006, KISH_1965, DONNER_KLAR_2000, COHEN_1988, ...adjusted.references]),
    warnings,
  };
}
