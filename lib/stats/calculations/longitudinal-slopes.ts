/**
 * Difference in rates of change between two groups, each subject measured at the same times
 * t₁ … t_T and summarised by the slope of an ordinary least-squares line.
 *
 * Diggle, Heagerty, Liang & Zeger (2002, §2.4): under compound symmetry (correlation ρ between
 * any two measurements of a subject, variance σ²) the variance of a subject's OLS slope is
 * σ²(1 − ρ)/Σ(tⱼ − t̄)², so n = (z₁₋α/2 + z₁₋β)²·2σ²(1 − ρ)/(Σ(tⱼ − t̄)²·δ²) subjects per group
 * by the normal approximation. The answer is exact: the t test on the subjects' slopes,
 * df = 2n − 2 (summary-measure.ts).
 *
 * Valid range: the schema's; the times must not all be equal. Σ(tⱼ − t̄)² is computed about the
 * mean (two passes), not from raw sums. Accuracy and bad input: as summary-measure.ts.
 */
import { DIGGLE_2002 } from '@/lib/citations';
import type { CalculationRequest } from './request';
import { dropoutWarning } from './adjust';
import { inputError } from './errors';
import { fullReferences, TWO_SIDED } from './output';
import { solveSummary, type SummaryDesign } from './summary-measure';
import type { CalculationOutput } from './types';
import { formatNumber, SENTENCE_DIGITS } from '@/lib/format';

export type LongitudinalSlopesRequest = Extract<CalculationRequest, { kind: 'longitudinal-slopes' }>;

/** Σ(tⱼ − t̄)², about the mean. */
export function sumOfSquaredDeviations(times: readonly number[]): number {
  const mean = times.reduce((s, t) => s + t, 0) / times.length;
  return times.reduce((s, t) => s + (t - mean) ** 2, 0);
}

export function slopesDesign(times: readonly number[], rho: number): SummaryDesign {
  return { factor: (1 - rho) / sumOfSquaredDeviations(times), degreesOfFreedom: (n) => 2 * n - 2, minN: 2 };
}

export function longitudinalSlopes(request: LongitudinalSlopesRequest): CalculationOutput {
  const { times, rho } = request;
  const sxx = sumOfSquaredDeviations(times);
  if (!(sxx > 0)) throw inputError('The times must not all be equal: a slope needs at least two different times.', ['times']);
  const design = slopesDesign(times, rho);
  const solved = solveSummary(request, 'slopeDifference', request.slopeDifference, design);
  return {
    kind: 'longitudinal-slopes',
    solvedFor: solved.solvedFor,
    result: { ...solved.result, rho, times: [...times], sumOfSquaredTimeDeviations: sxx },
    feasibility: solved.feasibility,
    method:
      `Variance of the OLS slope by ${DIGGLE_2002.short} (§2.4), compound symmetry; exact power of the ${TWO_SIDED(request.sides)} t test on the subjects' slopes ` +
      '(noncentral t, df = 2n − 2). The published normal approximation is shown beside it.',
    formula:
      'Standard error of the slope difference = sd × √(2 × (1 − correlation) / (n × Σ(time − mean time)²)), ' +
      `with Σ(time − mean time)² = ${formatNumber(sxx, SENTENCE_DIGITS)} for the ${times.length} times given.`,
    references: fullReferences([DIGGLE_2002, ...solved.references]),
    warnings: [
      ...solved.warnings,
      `Assumes compound symmetry (every pair of measurements correlated ${rho}) and a straight-line trend per subject.`,
      ...dropoutWarning(request.dropout, 'subjects'),
    ],
  };
}
