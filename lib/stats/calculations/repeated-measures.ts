/**
 * Two groups measured at p baselines and r follow-ups, compared on the mean of the follow-ups
 * (post), its change from the mean of the baselines (change) or the follow-up mean adjusted for
 * the baseline mean (ANCOVA).
 *
 * Frison & Pocock (1992), under compound symmetry (every pair of occasions correlated ρ), give
 * the variance of the treatment difference as 2σ²·f/n with
 *   post    f = (1 + (r − 1)ρ)/r
 *   change  f = (1 + (r − 1)ρ)/r + (1 + (p − 1)ρ)/p − 2ρ
 *   ANCOVA  f = (1 + (r − 1)ρ)/r − pρ²/(1 + (p − 1)ρ)
 * and n = (z₁₋α/2 + z₁₋β)²·2σ²·f/δ² by the normal approximation. The answer is exact: the t test
 * on the summaries with df = 2n − 2 (post, change) or 2n − 3 (ANCOVA, one covariate: the mean of
 * the baselines); the normal approximation is given beside it (summary-measure.ts).
 *
 * Valid range: the schema's; change and ANCOVA need at least one baseline. Accuracy: exact
 * arithmetic on the normal quantiles (1e-14) and the noncentral t (1e-10 absolute); tested
 * against R's pnorm/pt. Bad input: CalculationInputError.
 */
import { FRISON_POCOCK_1992, narrative, VICKERS_ALTMAN_2001 } from '@/lib/citations';
import type { CalculationRequest } from './request';
import { dropoutWarning } from './adjust';
import { inputError } from './errors';
import { fullReferences, TWO_SIDED } from './output';
import { solveSummary, type SummaryDesign } from './summary-measure';
import type { CalculationOutput } from './types';
import { formatNumber, SENTENCE_DIGITS } from '@/lib/format';

export type RepeatedMeasuresRequest = Extract<CalculationRequest, { kind: 'repeated-measures' }>;
export type RepeatedMeasuresAnalysis = RepeatedMeasuresRequest['analysis'];

/** Frison & Pocock's variance factor f (see the file's comment). */
export function frisonPocockFactor(analysis: RepeatedMeasuresAnalysis, baselines: number, followUps: number, rho: number): number {
  const post = (1 + (followUps - 1) * rho) / followUps;
  if (analysis === 'post') return post;
  if (baselines < 1) throw new RangeError(`${analysis} needs at least one baseline, got ${baselines}`);
  if (analysis === 'change') return post + (1 + (baselines - 1) * rho) / baselines - 2 * rho;
  return post - (baselines * rho * rho) / (1 + (baselines - 1) * rho);
}

export function repeatedMeasuresDesign(analysis: RepeatedMeasuresAnalysis, baselines: number, followUps: number, rho: number): SummaryDesign {
  const ancova = analysis === 'ancova';
  return {
    factor: frisonPocockFactor(analysis, baselines, followUps, rho),
    degreesOfFreedom: (n) => 2 * n - (ancova ? 3 : 2),
    minN: 2,
  };
}

const ANALYSIS_WORDS: Record<RepeatedMeasuresAnalysis, string> = {
  post: 'the mean of the follow-ups',
  change: 'the change from the mean of the baselines to the mean of the follow-ups',
  ancova: 'the mean of the follow-ups adjusted for the mean of the baselines (ANCOVA)',
};

export function repeatedMeasures(request: RepeatedMeasuresRequest): CalculationOutput {
  const { analysis, baselines, followUps, rho } = request;
  if (analysis !== 'post' && baselines < 1) {
    throw inputError(`The ${analysis} analysis needs at least one baseline: set baselines to 1 or more, or choose the post analysis.`, [
      'baselines',
      'analysis',
    ]);
  }
  const design = repeatedMeasuresDesign(analysis, baselines, followUps, rho);
  const solved = solveSummary(request, 'delta', request.delta, design);
  const warnings = [
    ...solved.warnings,
    `Assumes compound symmetry: every pair of the ${baselines + followUps} occasions correlated ${rho}. With correlations that fall off over time the factor differs.`,
    ...dropoutWarning(request.dropout, 'subjects'),
  ];
  if (analysis === 'change' && rho < 0.5) {
    warnings.push(`With a correlation of ${rho} (below 0.5), the change analysis is less precise than post; ANCOVA is better than both (${FRISON_POCOCK_1992.short}).`);
  }
  const df = analysis === 'ancova' ? '2n − 3' : '2n − 2';
  return {
    kind: 'repeated-measures',
    solvedFor: solved.solvedFor,
    result: {
      ...solved.result,
      standardizedEffect: solved.effect / request.sd,
      rho,
      baselines,
      followUps,
      analysis,
    },
    feasibility: solved.feasibility,
    method:
      `Variance of ${ANALYSIS_WORDS[analysis]} by ${narrative(FRISON_POCOCK_1992)}, compound symmetry; ` +
      `exact power of the ${TWO_SIDED(request.sides)} t test on it (noncentral t, df = ${df}). The published normal approximation is shown beside it.`,
    formula:
      `Standard error of the difference = sd × √(2f / n), with variance factor f = ${formatNumber(design.factor, SENTENCE_DIGITS)} for ` +
      `${baselines} baseline(s), ${followUps} follow-up(s) and correlation ${rho}` +
      (analysis === 'post'
        ? ' (f = (1 + (r − 1)ρ)/r).'
        : analysis === 'change'
          ? ' (f = (1 + (r − 1)ρ)/r + (1 + (p − 1)ρ)/p − 2ρ).'
          : ' (f = (1 + (r − 1)ρ)/r − pρ²/(1 + (p − 1)ρ)).'),
    references: fullReferences([FRISON_POCOCK_1992, VICKERS_ALTMAN_2001, ...solved.references]),
    warnings,
  };
}
