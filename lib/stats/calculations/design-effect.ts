/**
 * The design-effect calculation: DE = 1 + ((cv² + 1)·m − 1)·ICC (Eldridge et al. 2006; Kish
 * 1965 with equal sizes), the effective sample size N/DE of a given total, and the real
 * false-positive rate 2·(1 − Φ(z₁₋α/2/√DE)) of a test at level α that ignores the clustering.
 * A thin layer over lib/stats/design-effect.ts; it solves nothing.
 */
import { DONNER_KLAR_2000, ELDRIDGE_2006, KISH_1965 } from '@/lib/citations';
import { designEffect as de, effectiveSampleSize, naiveTypeIError } from '@/lib/stats/design-effect';
import type { CalculationRequest } from './request';

import { fullReferences } from './output';
import type { CalculationOutput } from './types';
import { formatNumber, SENTENCE_DIGITS } from '@/lib/format';

export type DesignEffectRequest = Extract<CalculationRequest, { kind: 'design-effect' }>;

export function designEffectCalculation(request: DesignEffectRequest): CalculationOutput {
  const { icc, clusterSize, cv, alpha, totalObservations } = request;
  const value = de({ clusterSize, icc, cv });
  const naive = naiveTypeIError({ designEffect: value, alpha });
  const warnings: string[] = [];
  if (value > 1) {
    warnings.push(
      `An analysis that ignores the clustering would reject a true null hypothesis about ${formatNumber(naive * 100, SENTENCE_DIGITS)}% of the time instead of ${formatNumber(alpha * 100, SENTENCE_DIGITS)}% (a large-sample figure; with few clusters it is higher).`,
    );
  }
  if (cv > 0) warnings.push(`The coefficient of variation ${cv} allows for unequal cluster sizes; the cluster size entered is the mean size.`);
  return {
    kind: 'design-effect',
    solvedFor: null,
    result: {
      icc,
      clusterSize,
      cv,
      alpha,
      designEffect: value,
      totalObservations: totalObservations ?? null,
      effectiveSampleSize: totalObservations === undefined ? null : effectiveSampleSize(totalObservations, value),
      naiveTypeIError: naive,
    },
    feasibility: 'ok',
    method: `Design effect for clusters of mean size m with intracluster correlation ICC (${KISH_1965.short}; unequal sizes, ${ELDRIDGE_2006.short}).`,
    formula:
      'Design effect = 1 + ((cv² + 1) × m − 1) × ICC; effective sample size = total observations / design effect; ' +
      'false-positive rate of an analysis that ignores clustering = 2 × (1 − Φ(z for alpha/2 / √design effect)).',
    references: fullReferences([KISH_1965, ELDRIDGE_2006, DONNER_KLAR_2000]),
    warnings,
  };
}
