/**
 * Variance expected to differ between arms or to grow with a covariate.
 *
 * Triggers: the outcome is marked as having unequal variance, and the plan uses model-based
 * standard errors without a model for the variance. Warning when a plan is given, advice otherwise.
 *
 * The reasoning: ordinary standard errors assume one residual variance. With equal allocation a
 * pooled two-arm test is fairly robust to unequal variances; with unequal allocation it is not
 * (when the larger arm has the smaller variance, the false-positive rate rises above nominal).
 * Heteroscedasticity-consistent HC3 standard errors behave best of the simple versions in small
 * samples (MacKinnon & White 1985); with clustering, CR2 at the level of assignment (Pustejovsky &
 * Tipton 2018), or a separate residual variance per arm in the mixed model.
 * Quantified: the allocation ratio, largest share over smallest.
 */
import { MACKINNON_WHITE_1985, PUSTEJOVSKY_TIPTON_2018 } from '@/lib/citations';
import { designFacts } from '@/lib/design/facts';
import { randomLevels } from './model';
import { plannedMethod } from './phrases';
import { dec, noun, numbers } from './text';
import type { Rule } from './types';

const ID = 'unequal-variance';

export const unequalVariance: Rule = {
  id: ID,
  title: 'Variance expected to differ between arms',
  severity: 'warning',
  check(design) {
    const a = design.analysis;
    if (design.outcome.unequalVarianceExpected !== true || a.standardErrors !== 'model' || a.modelVariance) return [];
    const f = designFacts(design);
    const shares = f.armShares;
    const ratio = shares.length >= 2 ? Math.max(...shares) / Math.min(...shares) : undefined;
    const clustered = randomLevels(f).length > 0;
    const E = f.eu;
    const plan = a.method !== undefined;
    const allocation =
      ratio === undefined
        ? ''
        : Math.abs(ratio - 1) < 1e-9
          ? ' The arms are allocated equally, which makes a pooled test fairly robust to unequal variances, but not the estimates of other effects in the model.'
          : ` The allocation is unequal (largest arm ${dec(ratio, 2)} times the smallest): a pooled test is then not robust — if the larger arm has the smaller variance, its false-positive rate rises above the nominal level; the reverse wastes power.`;
    return [
      {
        ruleId: ID,
        key: 'variance',
        severity: plan ? 'warning' : 'advice',
        title: 'Plan for unequal variances',
        found: `The variance of the outcome is expected to differ between arms or with a covariate${plan ? `, and ${plannedMethod(design)} uses model-based standard errors with one residual variance` : ''}.`,
        why: `Model-based standard errors assume a single residual variance.${allocation} Heteroscedasticity-consistent (HC3) standard errors keep the test honest without a model for the variance, and behave best of the simple versions in small samples (${MACKINNON_WHITE_1985.short}).`,
        todo: clustered && E
          ? `In this clustered design, model a separate residual variance for each arm in the mixed model, or use CR2 standard errors clustered on ${noun(E.level, true)} (${PUSTEJOVSKY_TIPTON_2018.short}); pre-specify which.`
          : 'Use HC3 standard errors (or model the variance explicitly, for example a separate variance per arm); pre-specify which.',
        numbers: numbers({ allocationRatio: ratio }),
        citations: clustered ? [MACKINNON_WHITE_1985, PUSTEJOVSKY_TIPTON_2018] : [MACKINNON_WHITE_1985],
      },
    ];
  },
};
