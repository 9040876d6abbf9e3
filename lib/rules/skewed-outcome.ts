/**
 * Positive, right-skewed outcomes (times, concentrations, weights): their spread grows with the
 * mean, so a linear model on the original scale has unequal variance and skewed residuals.
 *
 * Triggers: a continuous (or untyped) outcome expected to be right-skewed, unless the plan
 * already uses the log scale or a gamma family. Warning when a plan is given, advice otherwise.
 *
 * The remedy: analyse the log of the outcome (the effect becomes a ratio), or a gamma GLM(M)
 * with log link, whose variance is proportional to the mean squared (McCullagh & Nelder 1989;
 * a gamma GLMM can be fitted with lme4, Bates et al. 2015). The stress test shows how the
 * planned analysis behaves under skew (reading it: Morris, White & Crowther 2019).
 */
import { BATES_2015, MCCULLAGH_NELDER_1989, MORRIS_2019 } from '@/lib/citations';
import { modelPlan } from './model';
import { outcomeName, plannedMethod } from './phrases';
import { ASK_STATISTICIAN, cap } from './text';
import type { Rule } from './types';

const ID = 'skewed-outcome';

export const skewedOutcome: Rule = {
  id: ID,
  title: 'Positive, right-skewed outcome',
  severity: 'warning',
  check(design) {
    const o = design.outcome;
    if (o.shape !== 'right-skewed' || (o.type !== undefined && o.type !== 'continuous')) return [];
    const a = design.analysis;
    if (a.transformation === 'log' || a.glmFamily === 'gamma') return [];
    const positive = o.positiveOnly === true;
    const plan = a.method !== undefined;
    const name = outcomeName(design);
    const unit = o.unit ? ` (${o.unit})` : '';
    const model = modelPlan(design).formula;
    return [
      {
        ruleId: ID,
        key: 'skew',
        severity: plan ? 'warning' : 'advice',
        title: positive ? 'Analyse the skewed outcome on the log scale' : 'Skewed outcome: plan for unequal variance',
        found: `${cap(name)}${unit} is expected to be right-skewed${positive ? ' and takes positive values only' : ''}${plan ? `, and ${plannedMethod(design)} works on the original scale` : ''}.`,
        why:
          `For outcomes like this the spread usually grows with the mean, so a linear model on the original scale meets unequal variance and skewed residuals, and a few large values drive the estimates. ` +
          (positive
            ? `On the log scale such outcomes are often close to symmetric with constant variance, and the treatment effect becomes a ratio (for example "${name} 8% higher in one arm"), which is usually how such effects work. ` +
              `A gamma model with a log link gives the same kind of ratio while modelling a variance proportional to the mean squared on the original scale (${MCCULLAGH_NELDER_1989.short}).`
            : `A log scale needs positive values, and ${name} may be zero or negative; robust standard errors, a transformation that handles zero, or a model for the variance are the options.`),
        todo: positive
          ? `Analyse log(${name}) — \`${model}\` — and report the back-transformed effect as a ratio with its confidence interval; or fit a gamma ${model.includes('|') ? 'GLMM' : 'GLM'} with a log link. Decide before the data are in, checking pilot residuals on both scales; the Stress test tab shows how the planned analysis behaves under skew. ${ASK_STATISTICIAN}`
          : `Describe whether ${name} can be zero or negative, plan robust (HC3 or CR2) standard errors or a variance model, and check the planned analysis under skew on the Stress test tab. ${ASK_STATISTICIAN}`,
        model: positive ? model : undefined,
        citations: [MCCULLAGH_NELDER_1989, BATES_2015, MORRIS_2019],
      },
    ];
  },
};
