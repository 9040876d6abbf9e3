/**
 * Two arms randomised by cluster, compared on a yes-or-no outcome: k clusters per arm of mean
 * size m, control proportion p1 and p2 under the intervention (or the difference, risk ratio or
 * odds ratio: proportion-effect.ts).
 *
 * Method: the k·m units of an arm carry the information of k·m/DE independent ones, with the
 * design effect DE = 1 + ((cv² + 1)·m − 1)·ρ, ρ the ICC on the proportion scale (Donner & Klar
 * 2000; Kish's 1 + (m − 1)·ρ with equal sizes, cv the coefficient of variation of the cluster
 * sizes, Eldridge, Ashby & Kerry 2006). Power is then Fleiss, Levin & Paik's normal approximation
 * for two proportions at n = k·m/DE per arm (two-proportions.ts, without continuity
 * correction): Φ((|p1 − p2|·√n − z₁₋α/sides·√(2p̄q̄)) / √(p1q1 + p2q2)); the clusters per arm
 * are the smallest whole k that reaches the target, i.e. ⌈n·DE/m⌉ for the n the unclustered
 * formula gives (Donner & Klar 2000).
 *
 * As m → ∞ the information per arm rises only to k/((cv² + 1)·ρ): more units per cluster
 * cannot lift power above the plateau this gives, which is reported when solving for the
 * cluster size fails.
 *
 * Valid range: 0 < p1, p2 < 1, the schema's (k ≥ 2, m ≥ 1, 0 ≤ ρ ≤ 1, 0 ≤ cv ≤ 3). Accuracy: that
 * of Φ and Φ⁻¹; tested against R's power.prop.test at n = k·m/DE to 1e-6 relative.
 *
 * With few clusters the normal approximation is optimistic for the analysis it stands for: a
 * simulated t test on cluster proportions (fixtures/generate_rates_proportions.R) had 6 points
 * less power at 8 clusters per arm. So the result also gives `powerT`, the power of that t test:
 * noncentral t with df = 2k − 2 and noncentrality |p1 − p2| / √((p1q1 + p2q2)·DE/(k·m)) (as
 * cluster-means.ts does for means; both tails counted when two-sided), which matched the
 * simulations within their Monte Carlo error, and, when solving for clusters, the clusters per
 * arm it needs (`clustersPerArmByT`), with a warning when they are more.
 *
 * Bad input: CalculationInputError.
 */
import { DONNER_KLAR_2000, ELDRIDGE_2006, FLEISS_2003, KISH_1965 } from '@/lib/citations';
import { designEffect } from '@/lib/stats/design-effect';
import { SOLVABLE, type CalculationRequest } from './request';
import { adjustAlpha } from './adjust';
import { MAX_CLUSTERS_PER_ARM, solveClusterSize } from './cluster-size';
import { inputError } from './errors';
import { clusterRecruitment, effectFeasibilityWarning, fullReferences, sizeFeasibilityWarning, TWO_SIDED, testSettings } from './output';
import { tTestPower, zSum, type Sides } from './power';
import { effectMeasures, p2FromEffect } from './proportion-effect';
import { effectPresence, findUnknown, requireTargetPower, solveEffect, solveSize, type SizeSolution } from './solve';
import { twoProportionsPower } from './two-proportions';
import type { CalculationOutput, Feasibility } from './types';
import { formatNumber, SENTENCE_DIGITS } from '@/lib/format';

export type ClusterProportionsRequest = Extract<CalculationRequest, { kind: 'cluster-proportions' }>;

/** How close to 0 or 1 a solved p2 may come. */
const P_EDGE = 1e-9;

export interface ClusterProportionsPowerInput {
  p1: number;
  p2: number;
  icc: number;
  /** Mean units per cluster m; Infinity gives the plateau. */
  clusterSize: number;
  cv: number;
  clustersPerArm: number;
  alpha: number;
  sides: Sides;
}

/** Independent units an arm is worth: k·m/DE, or k/((cv² + 1)·ρ) as m → ∞ (Infinity when ρ = 0). */
export function effectiveUnitsPerArm(icc: number, clusterSize: number, cv: number, clustersPerArm: number): number {
  if (clusterSize === Infinity) return icc === 0 ? Infinity : clustersPerArm / ((cv * cv + 1) * icc);
  return (clustersPerArm * clusterSize) / designEffect({ clusterSize, icc, cv });
}

/** Power by the normal approximation at k·m/DE units per arm (see the file's comment). */
export function clusterProportionsPower({ p1, p2, icc, clusterSize, cv, clustersPerArm, alpha, sides }: ClusterProportionsPowerInput): number {
  const n = effectiveUnitsPerArm(icc, clusterSize, cv, clustersPerArm);
  if (n === Infinity) return p1 === p2 ? alpha / sides : 1;
  return twoProportionsPower({ p1, p2, n, alpha, sides, continuityCorrection: false });
}

/** Power of the t test on cluster proportions (noncentral t, df = 2k − 2; see the file's comment). */
export function clusterProportionsPowerT({ p1, p2, icc, clusterSize, cv, clustersPerArm, alpha, sides }: ClusterProportionsPowerInput): number {
  const n = effectiveUnitsPerArm(icc, clusterSize, cv, clustersPerArm);
  if (n === Infinity) return p1 === p2 ? alpha : 1;
  const ncp = Math.abs(p1 - p2) / Math.sqrt((p1 * (1 - p1) + p2 * (1 - p2)) / n);
  return tTestPower(ncp, 2 * clustersPerArm - 2, alpha, sides);
}

/** The smallest k with power ≥ target, starting from the normal-approximation size. */
export function solveClusterProportionsK(input: Omit<ClusterProportionsPowerInput, 'clustersPerArm'>, target: number): SizeSolution {
  const { p1, p2, icc, clusterSize, cv, alpha, sides } = input;
  const n = ((zSum(alpha, sides, target) / (p1 - p2)) ** 2) * (p1 * (1 - p1) + p2 * (1 - p2));
  const guess = (n * designEffect({ clusterSize, icc, cv })) / clusterSize;
  return solveSize((k) => clusterProportionsPower({ ...input, clustersPerArm: k }), target, 2, MAX_CLUSTERS_PER_ARM, guess);
}

export function clusterProportions(request: ClusterProportionsRequest): CalculationOutput {
  const { p1, icc, cv, sides, alpha, outcomes, multiplicity, dropout, clusterDropout } = request;
  const adjusted = adjustAlpha(alpha, outcomes, multiplicity);
  const a = adjusted.alphaAdjusted;
  const solvedFor = findUnknown(SOLVABLE['cluster-proportions'], effectPresence(request, SOLVABLE['cluster-proportions']), request.solveFor);
  let p2 = solvedFor === 'p2' ? undefined : p2FromEffect(request);
  if (solvedFor !== 'power' && solvedFor !== 'p2' && p2 === p1) {
    throw inputError('The second proportion equals p1: no number of clusters detects a difference of zero. Give an effect.', ['p2']);
  }
  if (solvedFor !== 'power') requireTargetPower(request.power!, a);
  const target = request.power!;

  const warnings: string[] = [...adjusted.warnings];
  let { clusterSize: m, clustersPerArm: k } = request;
  let power: number;
  let feasibility: Feasibility = 'ok';
  const extra: Record<string, number | null> = {};
  const base = { p1, icc, cv, alpha: a, sides };

  if (solvedFor === 'power') {
    power = clusterProportionsPower({ ...base, p2: p2!, clusterSize: m!, clustersPerArm: k! });
  } else if (solvedFor === 'clustersPerArm') {
    const design = { ...base, p2: p2!, clusterSize: m! };
    const s = solveClusterProportionsK(design, target);
    ({ size: k, power, feasibility } = s);
    warnings.push(...sizeFeasibilityWarning(feasibility, 'clusters per arm', s.size, s.power, target));
    const byT = solveSize((size) => clusterProportionsPowerT({ ...design, clustersPerArm: size }), target, 2, MAX_CLUSTERS_PER_ARM, s.size);
    extra.clustersPerArmByT = byT.feasibility === 'unreachable' ? null : byT.size;
    if (byT.feasibility !== 'unreachable' && byT.size > k) {
      warnings.push(
        `An analysis of cluster proportions by the t test (${2 * k - 2} degrees of freedom) would have power ` +
          `${formatNumber(clusterProportionsPowerT({ ...design, clustersPerArm: k }), SENTENCE_DIGITS)} with ${k} clusters per arm; ${byT.size} clusters per arm reach ${formatNumber(target, SENTENCE_DIGITS)} by t.`,
      );
    }
  } else if (solvedFor === 'clusterSize') {
    const s = solveClusterSize({
      powerAt: (size) => clusterProportionsPower({ ...base, p2: p2!, clusterSize: size, clustersPerArm: k! }),
      plateauAt: (clusters) => clusterProportionsPower({ ...base, p2: p2!, clusterSize: Infinity, clustersPerArm: clusters }),
      clustersPerArm: k!,
      target,
      why: `the variation between clusters remains (ICC ${icc})`,
      members: 'units per cluster',
    });
    ({ size: m, power, feasibility } = s);
    extra.plateauPower = s.plateauPower;
    if (s.clustersPerArmNeeded !== undefined) extra.clustersPerArmNeeded = s.clustersPerArmNeeded;
    warnings.push(...s.warnings);
  } else {
    const lower = request.direction === 'lower';
    const room = lower ? p1 - P_EDGE : 1 - P_EDGE - p1;
    const sign = lower ? -1 : 1;
    if (!(room > 0)) throw inputError(`p1 leaves no room for a second proportion ${lower ? 'below' : 'above'} it.`, ['p1', 'direction']);
    const n = effectiveUnitsPerArm(icc, m!, cv, k!);
    const s = solveEffect(
      (d) => clusterProportionsPower({ ...base, p2: p1 + sign * d, clusterSize: m!, clustersPerArm: k! }),
      target,
      Math.min(room / 2, 1 / Math.sqrt(n)),
      room,
    );
    p2 = p1 + sign * s.effect;
    ({ power, feasibility } = s);
    warnings.push(...effectFeasibilityWarning(feasibility, `second proportion ${lower ? 'below' : 'above'} p1`, p2, s.power, target));
  }

  const de = designEffect({ clusterSize: m!, icc, cv });
  const recruitment = clusterRecruitment(k!, m!, dropout, clusterDropout, 'units');
  if (cv > 0) warnings.push(`Unequal cluster sizes are allowed for by the coefficient of variation ${cv} (${ELDRIDGE_2006.short}); the cluster size entered is the mean size.`);
  warnings.push(...recruitment.warnings);
  return {
    kind: 'cluster-proportions',
    solvedFor,
    result: {
      p1,
      p2: p2!,
      ...effectMeasures(p1, p2!),
      icc,
      cv,
      clusterSize: m!,
      clustersPerArm: k!,
      sides,
      ...testSettings({ alpha, alphaAdjusted: a, outcomes, multiplicity, power, targetPower: solvedFor === 'power' ? null : target }),
      powerT: clusterProportionsPowerT({ ...base, p2: p2!, clusterSize: m!, clustersPerArm: k! }),
      degreesOfFreedom: 2 * k! - 2,
      designEffect: de,
      nPerGroup: k! * m!,
      effectiveNPerGroup: (k! * m!) / de,
      ...extra,
      ...recruitment.result,
    },
    feasibility,
    method:
      `Normal approximation for two proportions (${FLEISS_2003.short}), ${TWO_SIDED(sides)}, at the effective number of units per arm: ` +
      `clusters × units per cluster / design effect ${formatNumber(de, SENTENCE_DIGITS)} (${DONNER_KLAR_2000.short}).`,
    formula:
      'Power = Φ((|p1 − p2| × √n − z for alpha × √(2 × p̄ × (1 − p̄))) / √(p1(1 − p1) + p2(1 − p2))), with p̄ the mean of p1 and p2 and ' +
      'n = k × m / DE the effective units per arm: k clusters per arm of mean size m, design effect DE = 1 + ((cv² + 1) × m − 1) × ICC.',
    references: fullReferences([DONNER_KLAR_2000, FLEISS_2003, ELDRIDGE_2006, KISH_1965, ...adjusted.references]),
    warnings,
  };
}

