/**
 * Baseline measured but not used: adjusting the follow-up for the baseline (ANCOVA) gains power.
 *
 * Triggers: a baseline occasion and at least one follow-up, and the plan neither adjusts for
 * the baseline nor is an ANCOVA. Warning when a plan is given, advice otherwise.
 *
 * Quantified (Frison & Pocock 1992): with correlation ρ between baseline and follow-up, the
 * variance of the treatment effect relative to a follow-up-only analysis is 1 − ρ² for ANCOVA
 * and 2(1 − ρ) for change scores, so ANCOVA needs (1 − ρ²) of the sample. ANCOVA also corrects
 * chance baseline imbalance (Vickers & Altman 2001). Without ρ, shown at ρ = 0.3 and 0.7 for
 * illustration, said to be so.
 */
import { FRISON_POCOCK_1992, VICKERS_ALTMAN_2001 } from '@/lib/citations';
import { designFacts } from '@/lib/design/facts';
import { modelPlan, randomLevels } from './model';
import { outcomeName, plannedMethod, sourcePhrase } from './phrases';
import { ASK_STATISTICIAN, cap, dec, numbers, pct } from './text';
import type { Rule } from './types';

const ID = 'baseline-adjustment';

export const baselineAdjustment: Rule = {
  id: ID,
  title: 'Baseline measured but not used',
  severity: 'warning',
  check(design) {
    const f = designFacts(design);
    const a = design.analysis;
    if (f.baselines.length === 0 || f.followUps.length === 0 || a.adjustsForBaseline || a.method === 'ancova') return [];
    const plan = a.method !== undefined;
    const name = outcomeName(design);
    const corr = design.assumptions.occasionCorrelation;
    const base = f.baselines[0]!.label;
    const follow = f.followUps[f.followUps.length - 1]!.label;
    const clustered = randomLevels(f).length > 0;
    let quant: string;
    let nums: Record<string, number>;
    if (corr && corr.value > -1 && corr.value < 1) {
      const r = corr.value;
      const ancova = 1 - r * r;
      const change = 2 * (1 - r);
      quant =
        `With a correlation of ${dec(r, 2)} between baseline and follow-up (from ${sourcePhrase(corr.source)}), ANCOVA reduces the variance of the treatment effect to 1 − ρ² = ${dec(ancova, 2)} of a follow-up-only analysis, ` +
        `and does better than analysing change scores, whose factor is 2(1 − ρ) = ${dec(change, 2)} (${FRISON_POCOCK_1992.short}). At the same power ANCOVA needs about ${pct(ancova)} of the sample.`;
      nums = numbers({ occasionCorrelation: r, ancovaVarianceFactor: ancova, changeScoreVarianceFactor: change });
    } else {
      const f3 = 1 - 0.3 ** 2;
      const f7 = 1 - 0.7 ** 2;
      quant =
        `With a correlation ρ between baseline and follow-up, ANCOVA's variance factor against a follow-up-only analysis is 1 − ρ² and that of change scores 2(1 − ρ) (${FRISON_POCOCK_1992.short}): ` +
        `${dec(f3, 2)} and ${dec(2 * 0.7, 2)} at ρ = 0.3, ${dec(f7, 2)} and ${dec(2 * 0.3, 2)} at ρ = 0.7 (values for illustration; give the correlation expected for this outcome on the Assumptions step).`;
      nums = numbers({ ancovaVarianceFactorAt03: f3, ancovaVarianceFactorAt07: f7, changeScoreVarianceFactorAt03: 1.4, changeScoreVarianceFactorAt07: 0.6 });
    }
    const model = modelPlan(design).formula;
    return [
      {
        ruleId: ID,
        key: 'baseline',
        severity: plan ? 'warning' : 'advice',
        title: 'Adjust for the baseline measurement',
        found: `${cap(name)} is measured at baseline (${base}) and at follow-up (${follow}), but ${plan ? plannedMethod(design) : 'the analysis plan'} does not use the baseline.`,
        why:
          `${quant} ANCOVA also corrects for chance imbalance between the arms at baseline (${VICKERS_ALTMAN_2001.short}).` +
          (clustered ? ' In a clustered design the correlation differs between the individual and the cluster level, so these factors are approximate.' : ''),
        todo: `Include the baseline ${name} as a covariate (ANCOVA; in a mixed model, a fixed effect): \`${model}\`. Plan the sample size with the variance factor. ${ASK_STATISTICIAN}`,
        model,
        numbers: nums,
        citations: [FRISON_POCOCK_1992, VICKERS_ALTMAN_2001],
      },
    ];
  },
};
