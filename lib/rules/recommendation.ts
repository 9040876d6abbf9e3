/**
 * The recommended analysis for a design: the method, the model in standard notation (from
 * `model.ts`), family and link, standard errors, degrees of freedom, further adjustments, the
 * unit that counts as n, and the analysis-plan fields that carry it out (`analysisPatch`), with
 * an explanation in words and the methods it rests on. Plain JSON: stored with each revision.
 *
 * Adopting `analysisPatch` resolves every blocker the rules raise (tested in
 * `recommendation.test.ts`): it accounts for every level that groups observations and chooses
 * the family of the outcome.
 */
import type { Analysis, Design } from '@/lib/design/schema';
import {
  BATES_2015,
  DIGGLE_2002,
  DONNER_KLAR_2000,
  FRISON_POCOCK_1992,
  HOLM_1979,
  HUBER_1964,
  KENWARD_ROGER_1997,
  KISH_1965,
  MACKINNON_WHITE_1985,
  MCCULLAGH_NELDER_1989,
  SATTERTHWAITE_1946,
  GOMES_2022,
  SENN_2002,
  uniqueCitations,
} from '@/lib/citations';
import { designFacts, unitsPerArm } from '@/lib/design/facts';
import { FEW_LEVELS } from './clustering';
import { modelPlan } from './model';
import { assignedVerb, outcomeName, treatmentName } from './phrases';
import { cap, count, identifier, list, noun, num, pct } from './text';
import type { Citation, Finding, Recommendation, UnitOfAnalysis } from './types';
import { formatDecimal } from '@/lib/format';

const DF_WORDS: Record<Analysis['dfMethod'], string> = {
  residual: 'residual degrees of freedom',
  satterthwaite: 'Satterthwaite degrees of freedom',
  'kenward-roger': 'Kenward–Roger degrees of freedom (with REML)',
  'between-within': 'between-within degrees of freedom',
};

export function recommend(design: Design, findings: readonly Finding[]): Recommendation {
  const f = designFacts(design);
  const plan = modelPlan(design);
  const fired = new Set(findings.map((x) => x.ruleId));
  const a = design.analysis;
  const mixed = plan.method === 'mixed-model' || plan.method === 'glmm';
  const unequalVariance = design.outcome.unequalVarianceExpected === true;
  const standardErrors: Analysis['standardErrors'] = unequalVariance && !mixed ? 'hc3' : 'model';
  const modelVariance = unequalVariance && mixed;
  const maxAttrition = f.maxAttrition;
  const K = design.outcome.primaryOutcomes;
  const citations: Citation[] = [];
  const adjustments: string[] = [];
  const name = outcomeName(design);

  // unit of analysis
  const E = f.eu;
  const perArm = unitsPerArm(f);
  const unit: UnitOfAnalysis | undefined = E
    ? { levelId: E.level.id, name: E.level.name, total: E.total, ...(perArm !== undefined && !f.withinUnit ? { perArm } : {}) }
    : undefined;

  // adjustments, in the order a protocol would list them
  if (plan.baselineTerm) {
    const r = design.assumptions.occasionCorrelation?.value;
    adjustments.push(`ANCOVA: adjust for the baseline ${name} (${plan.baselineTerm})${r !== undefined && r > -1 && r < 1 ? `; variance factor 1 − ρ² = ${formatDecimal(1 - r * r, 2)} against the follow-up alone` : ''}.`);
    citations.push(FRISON_POCOCK_1992);
  }
  if (plan.blockTerm) adjustments.push(`Include ${plan.blockTerm} in the model, as the randomisation was ${design.assignment.blocking.kind} by it.`);
  if (plan.fixedLevels.length > 0 || plan.fixedCrossed.length > 0) {
    const crossed = design.structure.crossedFactors.filter((c) => plan.fixedCrossed.includes(identifier(c.name, 'factor')));
    const names = [...plan.fixedLevels.map((l) => `${noun(l.level)} (${count(l.total, l.level)})`), ...crossed.map((c) => `${c.name.toLowerCase()} (${num(c.count)})`)];
    adjustments.push(`${cap(list(names))} as ${names.length > 1 ? 'fixed effects' : 'a fixed effect'}: too few units to estimate a variance between them (fewer than about ${FEW_LEVELS - 1}–${FEW_LEVELS}, common practice; ${GOMES_2022.short}), and ${treatmentName(design)} is compared within them.`);
    citations.push(GOMES_2022);
  }
  if (plan.perOccasion) {
    adjustments.push(
      `One model for all ${f.followUps.length} follow-up occasions in place of a test at each, with a treatment × occasion term; the comparison that answers the question (the last occasion, or the average over occasions) fixed in the protocol as one contrast, and the other occasions as secondary estimates with confidence intervals.`,
    );
    citations.push(DIGGLE_2002);
  }
  if (f.crossover) {
    adjustments.push('Period as a fixed effect; a washout (or a run-in left out of the analysis) rather than a test for carry-over.');
    citations.push(SENN_2002);
  }
  if (plan.logScale) adjustments.push(`Analyse ${name} on the log scale and report the back-transformed effect as a ratio with its confidence interval (a gamma model with log link is the alternative).`);
  if (design.outcome.type === 'count') {
    const who = f.bottom ? noun(f.bottom.level, true) : 'units';
    adjustments.push(`The log of each ${f.bottom ? noun(f.bottom.level) : 'unit'}’s follow-up time as an offset: the effect is a rate ratio, and ${who} followed for less time count for the time they were followed.`);
  }
  if (plan.family === 'negative-binomial') adjustments.push(`Negative binomial family, as the Assumptions step expects overdispersion (${design.assumptions.dispersion!.value}): a Poisson model would understate the standard errors.`);
  if (plan.family === 'poisson') adjustments.push('Check for overdispersion; use a negative binomial model (or an observation-level random effect) if the variance clearly exceeds the mean.');
  if (plan.timeModel === 'spline') adjustments.push('Model time with a natural cubic spline (3 degrees of freedom), fixed in the protocol.');
  if (plan.slopeLevel) adjustments.push(`Random slope for time at the ${noun(plan.slopeLevel.level)} level, as the trajectory is of interest.`);
  if (plan.covarianceStructure === 'ar1') {
    adjustments.push(`AR(1) correlation between consecutive measurements within ${f.subject ? noun(f.subject.level) : 'unit'}, on top of the random intercept; a sensitivity analysis under another structure.`);
    citations.push(DIGGLE_2002);
  }
  if (standardErrors === 'hc3') {
    adjustments.push('HC3 (heteroscedasticity-consistent) standard errors, since the variance is expected to differ between arms.');
    citations.push(MACKINNON_WHITE_1985);
  }
  if (modelVariance) adjustments.push(`A separate residual variance for each arm (or CR2 standard errors clustered on ${E ? noun(E.level, true) : 'the experimental units'}), since the variance is expected to differ between arms.`);
  if (K >= 2) {
    adjustments.push(`${a.multiplicity !== 'none' ? `${cap(a.multiplicity)} adjustment, as planned,` : "Holm's procedure"} across the ${K} primary outcomes (family-wise error ${pct(1 - (1 - design.assumptions.alpha) ** K)} unadjusted).`);
    if (a.multiplicity === 'none' || a.multiplicity === 'holm') citations.push(HOLM_1979);
  }
  if (maxAttrition > 0) {
    adjustments.push(`${mixed ? 'Missing outcomes handled by the mixed model under missing at random (MAR)' : 'Missing outcomes handled by multiple imputation under MAR'}; recruit for ${pct(maxAttrition)} attrition.`);
    citations.push(DIGGLE_2002);
  }
  if (fired.has('outliers')) {
    adjustments.push('Sensitivity analysis with robust regression (Huber M-estimation) for extreme values.');
    citations.push(HUBER_1964);
  }
  for (const v of design.outcome.explanatoryVariables) {
    if (findings.some((x) => x.ruleId === 'narrow-range' && x.key === v.id)) adjustments.push(`Restrict conclusions about ${v.name} to the range studied (${v.observedMin}–${v.observedMax}).`);
  }
  if (fired.has('uncertain-icc')) adjustments.push('Show the sample size over the plausible range of the ICC.');

  // explanation
  const parts: string[] = [];
  if (E && !f.withinUnit) {
    parts.push(
      `${cap(treatmentName(design))} ${assignedVerb(design)} to ${count(E.total, E.level)}${perArm !== undefined && design.assignment.arms.length >= 2 ? ` (${num(perArm)} per arm)` : ''}, so the ${noun(E.level)} is the experimental unit and counts as n` +
        (f.bottom && f.bottom !== E ? `; the ${num(f.totalObs)} ${noun(f.bottom.level, true)} are observations within them.` : '.'),
    );
  } else if (E) {
    parts.push(`Each of the ${count(E.total, E.level)} receives every arm, so ${treatmentName(design)} is compared within ${noun(E.level, true)} and the ${num(E.total)} ${noun(E.level, true)} count as n.`);
  } else if (f.levels.length > 0) {
    parts.push('The level at which the treatment or exposure varies is not given yet, so the unit that counts as n cannot be fixed; the model below assumes nothing about it.');
  } else {
    parts.push('The structure is not described yet: the model below is a placeholder until the levels, the assignment and the outcome are filled in.');
  }
  const fixedNames = plan.fixedLevels.map((l) => noun(l.level, true));
  const independent =
    fixedNames.length > 0 ? `With a fixed effect for ${list(plan.fixedLevels.map((l) => noun(l.level)))}, the ${fixedNames.length > 1 ? 'units within them are' : `units within ${fixedNames[0]} are`} independent,` : 'The units are independent,';
  if (mixed) {
    const levels = plan.randomLevels.map((l) => noun(l.level));
    parts.push(
      `A ${plan.method === 'glmm' ? `generalised linear mixed model (${plan.family} family, ${plan.link} link)` : 'linear mixed model'} with a random intercept for ${list(levels)} accounts for the correlation of observations that share ${levels.length > 1 ? 'these units' : `a ${levels[0] ?? 'unit'}`}` +
        (plan.slopeLevel ? `, and a random slope lets each ${noun(plan.slopeLevel.level)} follow their own trajectory` : '') +
        '.',
    );
    citations.push(BATES_2015, KISH_1965);
    if (E?.groupsObservations && !f.withinUnit) citations.push(DONNER_KLAR_2000);
    if (f.subject) citations.push(DIGGLE_2002);
  } else if (plan.method === 'glm') {
    parts.push(`${independent} so a generalised linear model (${plan.family} family, ${plan.link} link) is enough.`);
    citations.push(MCCULLAGH_NELDER_1989);
  } else if (f.levels.length > 0) {
    parts.push(`${independent} so ${plan.method === 'ancova' ? 'ANCOVA (a linear regression of the follow-up on the arms and the baseline)' : fixedNames.length > 0 ? 'a linear regression' : 'a linear regression (for two arms, the same test as a t-test)'} is enough.`);
  }
  if (plan.method === 'glmm' && plan.family) citations.push(MCCULLAGH_NELDER_1989);
  if (plan.dfMethod === 'kenward-roger') {
    parts.push(`${cap(DF_WORDS[plan.dfMethod])}, because ${E ? count(E.total, E.level) : 'the experimental units'} are too few for large-sample tests.`);
    citations.push(KENWARD_ROGER_1997);
  } else if (plan.dfMethod === 'satterthwaite') {
    parts.push(`${cap(DF_WORDS[plan.dfMethod])} for the tests of fixed effects.`);
    citations.push(SATTERTHWAITE_1946);
  } else if (plan.dfMethod === 'between-within') {
    parts.push(`${cap(DF_WORDS[plan.dfMethod])} (the number of ${E ? noun(E.level, true) : 'units'} minus the parameters estimated between them).`);
  }
  parts.push('These are planning recommendations from the design as described; agree the final analysis with a qualified statistician and write it into the protocol before the data are collected.');

  const analysisPatch: Partial<Analysis> = {
    method: plan.method,
    randomIntercepts: plan.randomLevels.map((l) => l.level.id),
    fixedEffectLevels: plan.fixedLevels.map((l) => l.level.id),
    ...(plan.blockEffect ? { blockEffect: plan.blockEffect } : {}),
    randomSlopeForTime: plan.slopeLevel !== undefined,
    ...(E ? { unitOfAnalysisLevelId: E.level.id } : {}),
    adjustsForBaseline: plan.baselineTerm !== undefined,
    ...(plan.family ? { glmFamily: plan.family } : {}),
    standardErrors,
    dfMethod: plan.dfMethod,
    transformation: plan.logScale ? 'log' : 'none',
    timeModel: plan.timeModel,
    covarianceStructure: plan.covarianceStructure,
    ...(maxAttrition > 0 ? { missingData: mixed ? 'mixed-model-mar' : 'multiple-imputation' } : {}),
    ...(K >= 2 && a.multiplicity === 'none' ? { multiplicity: 'holm' } : {}),
    modelVariance,
  };

  return {
    method: plan.method,
    model: plan.formula,
    ...(plan.family ? { family: plan.family, link: plan.link } : {}),
    standardErrors,
    dfMethod: plan.dfMethod,
    adjustments,
    ...(unit ? { unitOfAnalysis: unit } : {}),
    randomIntercepts: plan.randomLevels.map((l) => l.level.id),
    analysisPatch,
    explanation: parts.join(' '),
    citations: uniqueCitations(citations),
  };
}

/** Shown if building the recommendation fails on an unforeseen design (the error is reported). */
export function fallbackRecommendation(): Recommendation {
  return {
    method: 'other',
    model: 'y ~ arm',
    dfMethod: 'residual',
    adjustments: [],
    randomIntercepts: [],
    analysisPatch: {},
    explanation: 'No recommendation could be built for this design as described. Check the Design steps, and ask a qualified statistician.',
    citations: [],
  };
}
