/**
 * Several primary outcomes tested without a multiplicity adjustment.
 *
 * Triggers: more than one primary outcome and no adjustment planned.
 * Quantified: the family-wise error rate 1 − (1 − α)^K for K independent tests at level α (with
 * correlated outcomes it is lower, but above α), and the Bonferroni level α/K. Holm's step-down
 * procedure controls the family-wise error at α and is never less powerful than Bonferroni (Holm
 * 1979, outside PRODUCT.md's list). The sample size is then planned at the adjusted level
 * (SPIRIT 2013, item 14).
 */
import { HOLM_1979, SPIRIT_2013 } from '@/lib/citations';
import { dec, num, numbers, pct } from './text';
import type { Rule } from './types';

const ID = 'multiplicity';

export const multiplicity: Rule = {
  id: ID,
  title: 'Several primary outcomes',
  severity: 'warning',
  check(design) {
    const K = design.outcome.primaryOutcomes;
    if (K < 2 || design.analysis.multiplicity !== 'none') return [];
    const alpha = design.assumptions.alpha;
    const fwer = 1 - (1 - alpha) ** K;
    return [
      {
        ruleId: ID,
        key: 'primary-outcomes',
        severity: 'warning',
        title: `${num(K)} primary outcomes without a multiplicity adjustment`,
        found: `${num(K)} primary outcomes are planned, each to be tested at ${pct(alpha)}, with no adjustment for testing several.`,
        why:
          `If the treatment affects none of them, the chance that at least one test comes out "significant" is 1 − (1 − ${dec(alpha, 3)})^${K} = ${pct(fwer)} for independent outcomes; ` +
          `correlated outcomes give somewhat less, but still more than ${pct(alpha)}. A claim of effect based on any one of them is then weaker than it looks.`,
        todo:
          `Choose one primary outcome and make the others secondary, or adjust: Holm's step-down procedure keeps the family-wise error at ${pct(alpha)} and is never less powerful than Bonferroni (each test at ${dec(alpha, 3)}/${K} = ${dec(alpha / K, 4)}); ` +
          `or test in a pre-specified order (hierarchical testing). Plan the sample size at the adjusted level.`,
        numbers: numbers({ primaryOutcomes: K, alpha, familyWiseError: fwer, bonferroniAlpha: alpha / K }),
        citations: [HOLM_1979, SPIRIT_2013],
      },
    ];
  },
};
