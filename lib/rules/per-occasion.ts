/**
 * An analysis per occasion: the arms compared by a separate test (t-test or ANOVA) at each
 * follow-up occasion.
 *
 * Triggers: the planned method is `per-occasion-tests` and a unit is measured at two or more
 * follow-up occasions (not a cross-over, whose periods model.ts handles) (warning).
 *
 * Quantified: the number of tests K (the follow-up occasions) and the family-wise error
 * 1 − (1 − α)^K if the treatment does nothing (for independent tests; tests on the same units at
 * correlated occasions give somewhat less, but more than α — Holm 1979 for the adjustment). The
 * tests also ignore that the occasions are measurements of the same units: their results are not
 * independent pieces of evidence, a unit missing at one occasion drops out of that test only
 * (complete cases per occasion, valid only if loss is unrelated to anything), and the information
 * the occasions share is not used. The remedy is one longitudinal model for all occasions with a
 * treatment × occasion term and the primary question as one pre-specified contrast (Diggle et al.
 * 2002), which `model.ts` recommends for such a plan.
 */
import { DIGGLE_2002, HOLM_1979 } from '@/lib/citations';
import { designFacts } from '@/lib/design/facts';
import { modelPlan } from './model';
import { modelFor, treatmentName } from './phrases';
import { ASK_STATISTICIAN, count, dec, list, noun, num, numbers, pct } from './text';
import type { Finding, Rule } from './types';

const ID = 'per-occasion';

export const perOccasion: Rule = {
  id: ID,
  title: 'A separate test at each occasion',
  severity: 'warning',
  check(design) {
    if (design.analysis.method !== 'per-occasion-tests') return [];
    const f = designFacts(design);
    const K = f.followUps.length;
    const S = f.subject;
    // The same condition as model.ts's repeated measurements over time (a cross-over compares periods instead).
    if (K < 2 || !S || f.crossover) return [];
    const alpha = design.assumptions.alpha;
    const fwer = 1 - (1 - alpha) ** K;
    const plan = modelPlan(design);
    const labels = f.followUps.map((o) => o.label);
    const who = noun(S.level, true);
    const finding: Finding = {
      ruleId: ID,
      key: 'per-occasion',
      severity: 'warning',
      title: `${num(K)} separate tests, one per occasion`,
      found: `The plan compares the arms by a separate test at each of the ${num(K)} follow-up occasions (${list(labels)}), each on the same ${count(S.total, S.level)}.`,
      why:
        `If ${treatmentName(design)} has no effect, the chance that at least one of ${num(K)} tests at ${pct(alpha)} comes out "significant" is up to 1 − (1 − ${dec(alpha, 3)})^${K} = ${pct(fwer)} (for independent tests; tests on the same ${who} at correlated occasions give somewhat less, but more than ${pct(alpha)}). ` +
        `The tests also ignore that the occasions are measurements of the same ${who}: their results are correlated and are not ${num(K)} independent pieces of evidence, a pattern across occasions is judged by eye rather than tested, ` +
        `and ${who} missing at one occasion drop out of that test only, which is valid only if the loss is unrelated to anything measured (${DIGGLE_2002.short}).`,
      todo:
        `Fit one longitudinal model for all occasions, ${modelFor(plan, plan.randomLevels.length > 0 || plan.fixedLevels.length > 0 ? [...plan.randomLevels, ...plan.fixedLevels] : [])}: \`${plan.formula}\`. ` +
        `State the primary question as one contrast fixed in the protocol (the difference at ${labels[labels.length - 1]}, or averaged over the occasions) and report the effect at each occasion from the same model as secondary estimates with confidence intervals; if several occasions must be primary, adjust across them with Holm's procedure (${HOLM_1979.short}). ${ASK_STATISTICIAN}`,
      model: plan.formula,
      numbers: numbers({ tests: K, alpha, familyWiseError: fwer, units: S.total }),
      citations: [DIGGLE_2002, HOLM_1979],
      levelIds: [S.level.id],
    };
    return [finding];
  },
};
