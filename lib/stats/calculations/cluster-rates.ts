/**
 * Two event rates, whole clusters randomised: c clusters per arm, m participants per cluster each
 * followed for time t (y = m·t person-time per cluster), rate λ0 in the comparison arm and
 * λ1 = RR·λ0 in the other; the true rates of the clusters of one arm vary with coefficient of
 * variation k (SD of the cluster rates / their mean).
 *
 * Method (Hayes & Bennett 1999, formula for rates per person-year, unmatched trials):
 *   c = 1 + (z₁₋α/2 + z₁₋β)²·[(λ0 + λ1)/y + k²·(λ0² + λ1²)] / (λ0 − λ1)².
 * Its logic, checked here: the observed rate of a cluster, events/y, has variance λ/y (Poisson,
 * given the cluster's rate) + k²λ² (between clusters); the difference of the two arms' mean
 * cluster rates over c clusters each has variance [(λ0 + λ1)/y + k²(λ0² + λ1²)]/c, and the normal
 * approximation gives c without the 1. The added 1 cluster per arm allows for the t distribution
 * of a cluster-level test with few clusters (the formula as published; its rationale from memory).
 * Power inverts it: Φ(|λ0 − λ1|·√((c − 1)/V) − z₁₋α/sides), V the bracket.
 *
 * Extension (not in the paper, by the same reasoning): when participants' own rates vary within a
 * cluster (negative binomial dispersion κ between participants, variance μ + κμ² per
 * participant), a cluster's event count given its rate has variance m·(λt + κλ²t²), so the
 * cluster rate's variance gains κλ²/m and V = (λ0 + λ1)/y + κ(λ0² + λ1²)/m + k²(λ0² + λ1²).
 * With κ = 0 (the default) it is Hayes & Bennett's V.
 *
 * As m → ∞ (or t → ∞) V falls only to k²(λ0² + λ1²): more person-time per cluster cannot lift the
 * power above the plateau this gives, which is reported when solving for the cluster size fails.
 * `designEffect` reports V over the variance the same person-time would have unclustered
 * ((λ0 + λ1)/y): how much the clustering inflates the number of events needed.
 *
 * Valid range: the schema's (λ0, t > 0; 0 ≤ k ≤ 5; 0 ≤ κ ≤ 100; c ≥ 2; m ≥ 1). Accuracy: that of
 * Φ and Φ⁻¹ for the formula (tested against R to 1e-6 relative); against a simulated cluster-level
 * t test (fixtures/generate_rates_proportions.R) within a few points of power. Bad input:
 * CalculationInputError.
 */
import { HAYES_BENNETT_1999, HAYES_MOULTON_2017, narrative, ZHU_LAKKIS_2014 } from '@/lib/citations';
import { SOLVABLE, type CalculationRequest } from './request';
import { adjustAlpha } from './adjust';
import { MAX_CLUSTERS_PER_ARM, solveClusterSize } from './cluster-size';
import { inputError } from './errors';
import { clusterRecruitment, effectFeasibilityWarning, fullReferences, sizeFeasibilityWarning, TWO_SIDED, testSettings } from './output';
import { rateEffect } from './two-rates';
import { zSum, zTestPower, type Sides } from './power';
import { findUnknown, presence, requireTargetPower, solveEffect, solveSize } from './solve';
import type { CalculationOutput, Feasibility } from './types';
import { formatNumber, SENTENCE_DIGITS } from '@/lib/format';

export type ClusterRatesRequest = Extract<CalculationRequest, { kind: 'cluster-rates' }>;

/** The schema's bounds on the rate ratio. */
const MIN_RATE_RATIO = 1e-6;
const MAX_RATE_RATIO = 1e6;

export interface ClusterRatesPowerInput {
  baselineRate: number;
  rateRatio: number;
  exposure: number;
  dispersion: number;
  betweenClusterCv: number;
  /** Participants per cluster m; Infinity gives the plateau. */
  clusterSize: number;
  clustersPerArm: number;
  alpha: number;
  sides: Sides;
}

type ClusterRateDesign = Omit<ClusterRatesPowerInput, 'clustersPerArm' | 'alpha' | 'sides'>;

/** V of the file's comment: the variance of one cluster's observed rate, summed over the two arms. */
export function clusterRateVariance({ baselineRate, rateRatio, exposure, dispersion, betweenClusterCv, clusterSize }: ClusterRateDesign): number {
  const l0 = baselineRate;
  const l1 = baselineRate * rateRatio;
  const squares = l0 * l0 + l1 * l1;
  const between = betweenClusterCv * betweenClusterCv * squares;
  if (clusterSize === Infinity) return between;
  return (l0 + l1) / (clusterSize * exposure) + (dispersion * squares) / clusterSize + between;
}

/** Power by Hayes & Bennett's formula: Φ(|λ0 − λ1|·√((c − 1)/V) − z₁₋α/sides). */
export function clusterRatesPower(input: ClusterRatesPowerInput): number {
  const variance = clusterRateVariance(input);
  const difference = Math.abs(input.baselineRate * (1 - input.rateRatio));
  if (variance === 0) return difference > 0 ? 1 : input.alpha / input.sides;
  return zTestPower(difference * Math.sqrt((input.clustersPerArm - 1) / variance), input.alpha, input.sides);
}

/** Clusters per arm by Hayes & Bennett's formula before rounding up: 1 + (z₁₋α/sides + z₁₋β)²·V/(λ0 − λ1)². */
export function hayesBennettClusters(design: ClusterRateDesign, alpha: number, sides: Sides, power: number): number {
  const difference = design.baselineRate * (1 - design.rateRatio);
  return 1 + (zSum(alpha, sides, power) ** 2 * clusterRateVariance(design)) / (difference * difference);
}

export function clusterRates(request: ClusterRatesRequest): CalculationOutput {
  const { baselineRate, exposure, dispersion, betweenClusterCv, sides, alpha, outcomes, multiplicity, dropout, clusterDropout } = request;
  const adjusted = adjustAlpha(alpha, outcomes, multiplicity);
  const a = adjusted.alphaAdjusted;
  const solvedFor = findUnknown(SOLVABLE['cluster-rates'], presence(request, SOLVABLE['cluster-rates']), request.solveFor);
  if (solvedFor !== 'power' && solvedFor !== 'rateRatio' && request.rateRatio === 1) {
    throw inputError('rateRatio is 1: no number of clusters detects no difference. Give the rate ratio worth detecting, e.g. 0.7 for a 30% reduction.', ['rateRatio']);
  }
  if (solvedFor !== 'power') requireTargetPower(request.power!, a);
  const target = request.power!;

  const warnings: string[] = [...adjusted.warnings];
  let { rateRatio, clusterSize: m, clustersPerArm: c } = request;
  let power: number;
  let feasibility: Feasibility = 'ok';
  const extra: Record<string, number | null> = {};
  const base = { baselineRate, exposure, dispersion, betweenClusterCv, alpha: a, sides };

  if (solvedFor === 'power') {
    power = clusterRatesPower({ ...base, rateRatio: rateRatio!, clusterSize: m!, clustersPerArm: c! });
  } else if (solvedFor === 'clustersPerArm') {
    const design = { ...base, rateRatio: rateRatio!, clusterSize: m! };
    const s = solveSize((k) => clusterRatesPower({ ...design, clustersPerArm: k }), target, 2, MAX_CLUSTERS_PER_ARM, hayesBennettClusters(design, a, sides, target));
    ({ size: c, power, feasibility } = s);
    warnings.push(...sizeFeasibilityWarning(feasibility, 'clusters per arm', s.size, s.power, target));
  } else if (solvedFor === 'clusterSize') {
    const s = solveClusterSize({
      powerAt: (size) => clusterRatesPower({ ...base, rateRatio: rateRatio!, clusterSize: size, clustersPerArm: c! }),
      plateauAt: (clusters) => clusterRatesPower({ ...base, rateRatio: rateRatio!, clusterSize: Infinity, clustersPerArm: clusters }),
      clustersPerArm: c!,
      target,
      why: `the rates still vary between clusters (coefficient of variation ${betweenClusterCv})`,
      members: 'participants per cluster',
    });
    ({ size: m, power, feasibility } = s);
    extra.plateauPower = s.plateauPower;
    if (s.clustersPerArmNeeded !== undefined) extra.clustersPerArmNeeded = s.clustersPerArmNeeded;
    warnings.push(...s.warnings);
  } else {
    // The effect is 1 − RR for a reduction, RR − 1 for an increase; power rises with either
    // (the derivative of (λ0 − λ1)²/V in RR has the sign of RR − 1), up to the schema's bound.
    const lower = request.direction !== 'higher';
    const toRatio = (e: number) => (lower ? 1 - e : 1 + e);
    const upper = lower ? 1 - MIN_RATE_RATIO : MAX_RATE_RATIO - 1;
    const at = (e: number) => clusterRatesPower({ ...base, rateRatio: toRatio(e), clusterSize: m!, clustersPerArm: c! });
    const s = solveEffect(at, target, Math.min(0.1, upper / 2), upper);
    rateRatio = toRatio(s.effect);
    ({ power, feasibility } = s);
    warnings.push(...effectFeasibilityWarning(feasibility, `rate ratio ${lower ? 'below' : 'above'} 1`, rateRatio, s.power, target));
  }

  const design = { baselineRate, rateRatio: rateRatio!, exposure, dispersion, betweenClusterCv, clusterSize: m! };
  const treatedRate = baselineRate * rateRatio!;
  const personTime = m! * exposure;
  const recruitment = clusterRecruitment(c!, m!, dropout, clusterDropout, 'participants');
  if (betweenClusterCv === 0) {
    warnings.push(
      `A coefficient of variation of 0 assumes that the clusters’ underlying rates do not differ at all, which is rarely true; take a value from earlier studies of similar clusters (${HAYES_BENNETT_1999.short} explain how to estimate it).`,
    );
  }
  warnings.push(...recruitment.warnings);
  return {
    kind: 'cluster-rates',
    solvedFor,
    result: {
      ...rateEffect(baselineRate, rateRatio!),
      exposure,
      dispersion,
      betweenClusterCv,
      clusterSize: m!,
      clustersPerArm: c!,
      personTimePerCluster: personTime,
      expectedEventsPerCluster: baselineRate * personTime,
      sides,
      ...testSettings({ alpha, alphaAdjusted: a, outcomes, multiplicity, power, targetPower: solvedFor === 'power' ? null : target }),
      designEffect: (clusterRateVariance(design) * personTime) / (baselineRate + treatedRate),
      ...extra,
      ...recruitment.result,
    },
    feasibility,
    method:
      `Clusters per arm by ${narrative(HAYES_BENNETT_1999)} for rates, ${TWO_SIDED(sides)}: a comparison of cluster rates with one cluster per arm added for the t distribution` +
      `${dispersion > 0 ? `, with variation between participants in a cluster (dispersion ${formatNumber(dispersion, SENTENCE_DIGITS)})` : ''}.`,
    formula:
      'Clusters per arm c = 1 + (z for alpha + z for power)² × [(λ0 + λ1)/y + κ(λ0² + λ1²)/m + k²(λ0² + λ1²)] / (λ0 − λ1)², where λ0 is the baseline rate, ' +
      'λ1 = RR × λ0, y = m × t the person-time per cluster (m participants followed for t each), k the coefficient of variation of the true rates between clusters ' +
      'and κ the dispersion between participants (0 in Hayes & Bennett’s formula).',
    references: fullReferences([HAYES_BENNETT_1999, HAYES_MOULTON_2017, ...(dispersion > 0 ? [ZHU_LAKKIS_2014] : []), ...adjusted.references]),
    warnings,
  };
}
