/**
 * Outliers plausible, or no plan for handling them.
 *
 * Triggers: outliers marked as plausible with no outlier plan (warning); or outliers not ruled
 * out, an analysis chosen, no outlier plan and a continuous (or untyped) outcome (advice). Silent
 * when a plan is written, when outliers are ruled out, or when robust regression is the method.
 *
 * The remedy: pre-specify checks and what counts as an error, keep genuine extreme values, and
 * run Huber's M-estimation (robust regression, Huber 1964) as a sensitivity analysis.
 */
import { HUBER_1964 } from '@/lib/citations';
import { outcomeName } from './phrases';
import type { Rule } from './types';

const ID = 'outliers';

export const outliers: Rule = {
  id: ID,
  title: 'Outliers plausible or no outlier plan',
  severity: 'warning',
  check(design) {
    const o = design.outcome;
    const a = design.analysis;
    if (a.outlierPlan?.trim() || o.outliersExpected === false || a.method === 'robust-regression') return [];
    const expected = o.outliersExpected === true;
    if (!expected && (a.method === undefined || (o.type !== undefined && o.type !== 'continuous' && o.type !== 'bounded-score'))) return [];
    const name = outcomeName(design);
    return [
      {
        ruleId: ID,
        key: 'outliers',
        severity: expected ? 'warning' : 'advice',
        title: expected ? 'Outliers are plausible and there is no plan for them' : 'No plan for outliers',
        found: expected
          ? `Outliers or extreme values of ${name} are considered plausible, and the analysis plan does not say how they will be handled.`
          : `The analysis plan does not say how outliers or data-entry extremes of ${name} will be handled.`,
        why:
          'A few extreme values can move a mean, and the estimated effect with it. Deciding what to do with them after seeing the data invites choices that favour one result. ' +
          `Huber's M-estimation (robust regression) down-weights large residuals instead of deleting them; comparing it with the main analysis shows whether a few values drive the conclusion (${HUBER_1964.short}).`,
        todo: `Pre-specify: how values are checked (ranges, double data entry), what counts as an error (corrected, or removed with a record) and what as a genuine extreme (kept), and a sensitivity analysis with robust regression. Write it into the protocol before the data are in.`,
        citations: [HUBER_1964],
      },
    ];
  },
};
