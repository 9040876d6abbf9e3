/**
 * Binary, count or proportion outcomes analysed with a linear model on the original scale.
 *
 * Triggers: outcome type binary, count or proportion, and the planned method is not a GLM, GLMM
 * or GEE (which take a family). Warning when a plan is given, advice while it is not.
 * A wrong family inside a GLM is the blocker of `analysis-mismatch`.
 *
 * `overdispersion` (warning): a count outcome planned with a Poisson GLM or GLMM and model-based
 * standard errors while the Assumptions step expects overdispersion κ > 0. A negative binomial
 * count with mean μ has variance μ + κμ² = μ(1 + κμ), so the Poisson model takes the counts for
 * 1 + κμ times as precise as they are (μ = baseline rate × follow-up time when both are given).
 * A random intercept for clusters does not cover it: it models differences between clusters, not
 * between the units inside one. Robust (sandwich) standard errors and GEE do.
 *
 * The remedy: a generalised linear model with the family and link of the outcome — binomial
 * with logit link for binary outcomes and for k-of-n proportions, Poisson with log link for
 * counts (negative binomial or an observation-level random effect when overdispersed), beta
 * regression for continuous proportions (McCullagh & Nelder 1989; proportions: Fleiss, Levin &
 * Paik 2003); with clustering a GLMM (Bates et al. 2015) or GEE (Liang & Zeger 1986), whose
 * effects are cluster-specific and population-averaged respectively.
 */
import { BATES_2015, FLEISS_2003, LIANG_ZEGER_1986, MCCULLAGH_NELDER_1989, ZHU_LAKKIS_2014 } from '@/lib/citations';
import { designFacts } from '@/lib/design/facts';
import { familyFor, modelPlan, randomLevels } from './model';
import { modelFor, outcomeName, plannedMethod } from './phrases';
import { cap, dec, noun, numbers } from './text';
import type { Finding, Rule } from './types';
import type { Design } from '@/lib/design/schema';

const ID = 'outcome-family';

const WHY = {
  binary:
    'A binary outcome has variance p(1 − p), tied to its mean; a linear model assumes constant variance and can predict probabilities below 0 or above 1. A logistic model (binomial family, logit link) keeps predictions between 0 and 1 and reports the effect as an odds ratio.',
  count:
    'Counts are whole numbers from 0 up whose variance grows with the mean (equal to it in a Poisson model, often larger: overdispersion). A linear model misstates that variance and can predict negative counts. A Poisson model with a log link reports the effect as a rate ratio; if the variance clearly exceeds the mean, use a negative binomial model or an observation-level random effect.',
  proportion:
    'A proportion of k successes out of n is binomial: its variance p(1 − p)/n depends on the mean and on n. Model the successes out of the trials with a binomial family and logit link (n as the number of trials), which reports odds ratios and weights each proportion by its n; for continuous proportions (such as percentage cover) use beta regression.',
} as const;

export const outcomeFamily: Rule = {
  id: ID,
  title: 'Binary, count or proportion outcome',
  severity: 'warning',
  check(design) {
    const type = design.outcome.type;
    if (type !== 'binary' && type !== 'count' && type !== 'proportion') return [];
    const m = design.analysis.method;
    if (m === 'glm' || m === 'glmm' || m === 'gee') return type === 'count' ? overdispersion(design) : [];
    const f = designFacts(design);
    const fam = familyFor(design)!;
    const clustered = randomLevels(f);
    const plan = m !== undefined;
    return [
      {
        ruleId: ID,
        key: type,
        severity: plan ? 'warning' : 'advice',
        title: `The outcome is ${type === 'binary' ? 'binary' : type === 'count' ? 'a count' : 'a proportion'}: use a model with the matching family`,
        found: `${cap(outcomeName(design))} is ${type === 'binary' ? 'binary (yes or no)' : type === 'count' ? 'a count' : 'a proportion'}${plan ? `, and ${plannedMethod(design)} models its mean on a linear scale with constant variance` : ''}.`,
        why:
          WHY[type] +
          (clustered.length > 0
            ? ` With the clustering in this design, use ${modelFor(modelPlan(design), clustered)}, or GEE with robust standard errors: mixed-model effects are specific to a ${noun(clustered[0]!.level)}, GEE effects are averaged over the population — choose the one that answers the question.`
            : ''),
        todo: `Use ${modelFor(modelPlan(design), clustered)}: \`${modelPlan(design).formula}\`, and report the effect on the scale of the link (${fam.link === 'logit' ? 'odds ratio' : 'rate ratio'}) together with absolute ${type === 'count' ? 'rates' : 'risks'}.`,
        model: modelPlan(design).formula,
        citations: [MCCULLAGH_NELDER_1989, BATES_2015, LIANG_ZEGER_1986, ...(type === 'proportion' || type === 'binary' ? [FLEISS_2003] : [])],
      },
    ];
  },
};

/** A Poisson model with model-based standard errors for counts the Assumptions step expects to be overdispersed (see the file's comment). */
function overdispersion(design: Design): Finding[] {
  const a = design.analysis;
  const kappa = design.assumptions.dispersion?.value ?? 0;
  if (a.method === 'gee' || a.glmFamily !== 'poisson' || a.standardErrors !== 'model' || !(kappa > 0)) return [];
  const f = designFacts(design);
  const unit = f.bottom ? noun(f.bottom.level) : 'unit';
  const rate = design.assumptions.baselineRate?.value;
  const time = design.assumptions.followUpTime?.value;
  const mean = rate !== undefined && time !== undefined ? rate * time : undefined;
  const factor = mean !== undefined ? 1 + kappa * mean : undefined;
  const clusters = randomLevels(f).filter((l) => l !== f.bottom);
  const size =
    factor !== undefined
      ? `With about ${dec(mean!, 2)} ${outcomeName(design)} per ${unit} over the follow-up (the baseline rate ${dec(rate!, 3)} × follow-up ${dec(time!, 3)}), the variance is 1 + ${dec(kappa, 3)} × ${dec(mean!, 2)} = ${dec(factor, 2)} times the mean, so the Poisson model takes the counts for ${dec(factor, 2)} times as precise as they are: its standard errors are too small (by up to a factor of ${dec(Math.sqrt(factor), 2)}) and its p-values too low.`
      : `The variance is then 1 + ${dec(kappa, 3)} × the mean count times the mean, so the Poisson model takes the counts for more precise than they are: its standard errors are too small and its p-values too low.`;
  return [
    {
      ruleId: ID,
      key: 'overdispersion',
      severity: 'warning',
      title: 'The plan uses a Poisson model, but the counts are expected to be overdispersed',
      found: `${cap(plannedMethod(design))} has the Poisson family, which assumes that the variance of ${outcomeName(design)} equals its mean; the Assumptions step expects an overdispersion of ${dec(kappa, 3)} between ${f.bottom ? noun(f.bottom.level, true) : 'units'}.`,
      why:
        `In a negative binomial model the variance of a count with mean μ is μ + κμ², here with κ = ${dec(kappa, 3)}. ${size}` +
        (clusters.length > 0 ? ` A random intercept for ${clusters.map((l) => noun(l.level)).join(' and ')} does not cover this: it models differences between ${noun(clusters[0]!.level, true)}, not between the ${noun(f.bottom!.level, true)} of one ${noun(clusters[0]!.level)}.` : ''),
      todo: `Use the negative binomial family (or add an observation-level random effect to the Poisson model): \`${modelPlan(design).formula}\`, with the log of each ${unit}’s follow-up time as the offset, and report the rate ratio with its confidence interval.`,
      model: modelPlan(design).formula,
      numbers: numbers({ dispersion: kappa, meanCount: mean, varianceFactor: factor }),
      citations: [MCCULLAGH_NELDER_1989, ZHU_LAKKIS_2014, ...(clusters.length > 0 ? [BATES_2015] : [])],
    },
  ];
}
