/**
 * Two event rates, participants randomised one by one: n0 participants in the comparison arm
 * followed for time t each at rate λ0 (events per unit of time), n1 = ⌈ratio·n0⌉ in the other at
 * λ1 = RR·λ0. Counts are Poisson (κ = 0) or negative binomial with variance μ + κ·μ², μ = λt —
 * the Poisson–gamma mixture in which each participant's own rate varies with coefficient of
 * variation √κ.
 *
 * Method: the Wald test of log RR = 0 from a Poisson or negative binomial regression. The
 * estimated log rate of an arm is the log of its mean count over t, with variance
 * (μ + κμ²)/(n·μ²) = (1/(λt) + κ)/n (delta method), so
 *   Var(log RR̂) = (1/(λ0·t) + κ)/n0 + (1/(λ1·t) + κ)/n1
 * and power = Φ(|log RR| / √Var − z₁₋α/sides) (one rejection tail, as the sample-size formulas
 * publish it). Inverted: n0 = (z₁₋α/sides + z₁₋β)²·[1/(λ0t) + κ + (1/(λ1t) + κ)/ratio] / (log RR)².
 * This is the variance at the expected rates under both hypotheses, the Wald test's own
 * (Zhu & Lakkis 2014; it is the second of their three variants as a public implementation
 * numbers them — the paper itself was not at hand, so the numbering is not verified). With
 * κ = 0 it is the usual Poisson formula for a log rate ratio.
 *
 * For a reduction (RR < 1) the power does not rise without limit as RR falls: fewer events in the
 * treated arm make log RR̂ less precise, and |log RR|/√Var peaks where
 * (1/(λ1·t·n1))·(|log RR| − 2) = 2·[(1/(λ0t) + κ)/n0 + κ/n1] (set the derivative of
 * (log RR)²/Var to zero). The smallest detectable reduction is searched only up to that peak;
 * beyond it a larger effect would have less power.
 *
 * Valid range: the schema's (λ0, t > 0; 0 ≤ κ ≤ 100; RR in [1e-6, 1e6]; n0 ≥ 2). Accuracy: that
 * of Φ and Φ⁻¹ for the formula (tested against R to 1e-6 relative); against a simulated Wald
 * test (glm / glm.nb in R, fixtures/generate_rates_proportions.R) the formula is within a few
 * points of power when each arm expects a few dozen events or more; with very few events it is
 * rough (a warning says so). Bad input: CalculationInputError.
 */
import { ZHU_LAKKIS_2014 } from '@/lib/citations';
import { brentRoot } from '@/lib/stats/root';
import { SOLVABLE, type CalculationRequest } from './request';
import { adjustAlpha, dropoutWarning, toRecruit } from './adjust';
import { inputError } from './errors';
import { effectFeasibilityWarning, fullReferences, sizeFeasibilityWarning, TWO_SIDED, testSettings } from './output';
import { zSum, zTestPower, type Sides } from './power';
import { findUnknown, presence, requireTargetPower, solveEffect, solveSize } from './solve';
import { groupTwoSize, smallestGroupOne } from './two-group-means';
import type { CalculationOutput, Feasibility } from './types';
import { formatNumber, SENTENCE_DIGITS } from '@/lib/format';

export type TwoRatesRequest = Extract<CalculationRequest, { kind: 'two-rates' }>;

const MAX_N = 10_000_000;
/** The schema's bounds on a rate ratio, as |log RR|. */
export const MAX_LOG_RATE_RATIO = Math.log(1e6);
/** Fewer expected events than this in an arm earn a warning about the normal approximation. */
const FEW_EVENTS = 10;

export interface TwoRatesPowerInput {
  baselineRate: number;
  rateRatio: number;
  exposure: number;
  dispersion: number;
  nPerGroup: number;
  ratio: number;
  alpha: number;
  sides: Sides;
}

type RateDesign = Omit<TwoRatesPowerInput, 'alpha' | 'sides'>;

/** Var(log RR̂) with n0 and n1 = ⌈ratio·n0⌉ participants (see the file's comment). */
export function logRateRatioVariance({ baselineRate, rateRatio, exposure, dispersion, nPerGroup, ratio }: RateDesign): number {
  const n1 = groupTwoSize(nPerGroup, ratio);
  return (1 / (baselineRate * exposure) + dispersion) / nPerGroup + (1 / (baselineRate * rateRatio * exposure) + dispersion) / n1;
}

/** Power of the Wald test on the log rate ratio (see the file's comment). */
export function twoRatesPower(input: TwoRatesPowerInput): number {
  return zTestPower(Math.abs(Math.log(input.rateRatio)) / Math.sqrt(logRateRatioVariance(input)), input.alpha, input.sides);
}

/**
 * |log RR| of the reduction with the most power at the design's sizes: the root e > 2 of
 * b·eᵉ·(e − 2) = 2a, a = (1/(λ0t) + κ)/n0 + κ/n1, b = 1/(λ0·t·n1); capped at the schema's
 * bound. b·eᵉ·(e − 2) − 2a rises for e > 1 and is −2a < 0 at e = 2, so Brent's method on
 * [2, cap] finds it when it lies below the cap.
 */
export function mostPowerfulReduction({ baselineRate, exposure, dispersion, nPerGroup, ratio }: Omit<RateDesign, 'rateRatio'>): number {
  const n1 = groupTwoSize(nPerGroup, ratio);
  const a = (1 / (baselineRate * exposure) + dispersion) / nPerGroup + dispersion / n1;
  const b = 1 / (baselineRate * exposure * n1);
  const h = (e: number) => b * Math.exp(e) * (e - 2) - 2 * a;
  if (h(MAX_LOG_RATE_RATIO) <= 0) return MAX_LOG_RATE_RATIO;
  return brentRoot(h, 2, MAX_LOG_RATE_RATIO, { xTolerance: 1e-12 });
}

/** The effect in the result: the two rates, their ratio and their difference. */
export function rateEffect(baselineRate: number, rateRatio: number): Record<string, number> {
  const treatedRate = baselineRate * rateRatio;
  return { baselineRate, rateRatio, treatedRate, rateDifference: treatedRate - baselineRate };
}

export function twoRates(request: TwoRatesRequest): CalculationOutput {
  const { baselineRate, exposure, dispersion, ratio, sides, alpha, outcomes, multiplicity, dropout } = request;
  const adjusted = adjustAlpha(alpha, outcomes, multiplicity);
  const a = adjusted.alphaAdjusted;
  const solvedFor = findUnknown(SOLVABLE['two-rates'], presence(request, SOLVABLE['two-rates']), request.solveFor);
  const minN = smallestGroupOne(ratio);
  if (solvedFor !== 'nPerGroup' && request.nPerGroup! < minN) {
    throw inputError(`With ratio ${ratio}, nPerGroup must be at least ${minN} so that group 2 has at least 2 participants.`, ['nPerGroup', 'ratio']);
  }
  if (solvedFor === 'nPerGroup' && request.rateRatio === 1) {
    throw inputError('rateRatio is 1: no sample size detects no difference. Give the rate ratio worth detecting, e.g. 0.7 for a 30% reduction.', ['rateRatio']);
  }
  if (solvedFor !== 'power') requireTargetPower(request.power!, a);
  const target = request.power!;

  const warnings: string[] = [...adjusted.warnings];
  let { rateRatio, nPerGroup } = request;
  let power: number;
  let feasibility: Feasibility = 'ok';
  const design = { baselineRate, exposure, dispersion, ratio };
  const powerAt = (rr: number, n: number) => twoRatesPower({ ...design, rateRatio: rr, nPerGroup: n, alpha: a, sides });

  if (solvedFor === 'power') {
    power = powerAt(rateRatio!, nPerGroup!);
  } else if (solvedFor === 'nPerGroup') {
    const rr = rateRatio!;
    const perUnit = 1 / (baselineRate * exposure) + dispersion + (1 / (baselineRate * rr * exposure) + dispersion) / ratio;
    const guess = (zSum(a, sides, target) ** 2 * perUnit) / Math.log(rr) ** 2;
    const s = solveSize((n) => powerAt(rr, n), target, minN, MAX_N, guess);
    ({ size: nPerGroup, power, feasibility } = s);
    warnings.push(...sizeFeasibilityWarning(feasibility, 'participants in group 1', s.size, s.power, target));
  } else {
    const n = nPerGroup!;
    const lower = request.direction !== 'higher';
    const sign = lower ? -1 : 1;
    const peak = lower ? mostPowerfulReduction({ ...design, nPerGroup: n }) : MAX_LOG_RATE_RATIO;
    const at = (e: number) => powerAt(Math.exp(sign * e), n);
    const guess = zSum(a, sides, target) * Math.sqrt(logRateRatioVariance({ ...design, rateRatio: 1, nPerGroup: n }));
    const s = solveEffect(at, target, Math.min(guess, peak / 2), peak);
    rateRatio = Math.exp(sign * s.effect);
    ({ power, feasibility } = s);
    if (feasibility === 'unreachable' && lower && peak < MAX_LOG_RATE_RATIO) {
      warnings.push(
        `No reduction, however large, reaches power ${formatNumber(target, SENTENCE_DIGITS)} with ${n} participants in group 1: the power is highest, ` +
          `${formatNumber(s.power, SENTENCE_DIGITS)}, at a rate ratio of about ${formatNumber(rateRatio, SENTENCE_DIGITS)}, because with very few events in the treated arm ` +
          'the rate ratio is estimated less precisely. Increase the sample size or the follow-up time.',
      );
    } else {
      warnings.push(...effectFeasibilityWarning(feasibility, `rate ratio ${lower ? 'below' : 'above'} 1`, rateRatio, s.power, target));
    }
  }

  const n0 = nPerGroup!;
  const n1 = groupTwoSize(n0, ratio);
  const treatedRate = baselineRate * rateRatio!;
  const expectedEvents = n0 * baselineRate * exposure;
  const expectedEventsGroup2 = n1 * treatedRate * exposure;
  const fewest = Math.min(expectedEvents, expectedEventsGroup2);
  if (fewest < FEW_EVENTS) {
    warnings.push(
      `Only about ${formatNumber(fewest, SENTENCE_DIGITS)} events are expected in one arm: with so few events the normal approximation to the log rate ratio is rough, ` +
        'and the stress test is the better guide to power.',
    );
  }
  const n0Recruit = toRecruit(n0, dropout);
  const n1Recruit = toRecruit(n1, dropout);
  warnings.push(...dropoutWarning(dropout, 'participants'));
  const model = dispersion > 0 ? `negative binomial counts (dispersion ${formatNumber(dispersion, SENTENCE_DIGITS)})` : 'Poisson counts';
  return {
    kind: 'two-rates',
    solvedFor,
    result: {
      ...rateEffect(baselineRate, rateRatio!),
      exposure,
      dispersion,
      nPerGroup: n0,
      nGroup2: n1,
      ratio,
      sides,
      ...testSettings({ alpha, alphaAdjusted: a, outcomes, multiplicity, power, targetPower: solvedFor === 'power' ? null : target }),
      standardError: Math.sqrt(logRateRatioVariance({ ...design, rateRatio: rateRatio!, nPerGroup: n0 })),
      expectedEvents,
      expectedEventsGroup2,
      dropout,
      nPerGroupToRecruit: n0Recruit,
      nGroup2ToRecruit: n1Recruit,
      totalAnalysed: n0 + n1,
      totalToRecruit: n0Recruit + n1Recruit,
    },
    feasibility,
    method: `Wald test on the log rate ratio, ${TWO_SIDED(sides)}, for ${model}, with the variance at the expected rates (${ZHU_LAKKIS_2014.short}).`,
    formula:
      'Power = Φ(|log RR| / SE − z for alpha), SE² = (1/(λ0 × t) + κ)/n1 + (1/(λ1 × t) + κ)/n2, where λ0 is the baseline rate, λ1 = RR × λ0, ' +
      't the follow-up time per participant, κ the negative binomial dispersion (0 for Poisson counts) and n1, n2 the participants per group.',
    references: fullReferences([ZHU_LAKKIS_2014, ...adjusted.references]),
    warnings,
  };
}
