/**
 * Unit-of-analysis error: the treatment is assigned to clusters but the analysis counts the
 * units inside them as independent.
 *
 * Triggers: the assignment level holds more than one observation per unit, the treatment does
 * not vary within its units (not a cross-over), an analysis plan is given, and the plan does not
 * account for the assignment level (`accountsFor` in facts.ts). Silent while the assignment level
 * or the analysis plan is missing.
 *
 * Quantified, for the level the analysis counts (the stated unit of analysis, else the bottom):
 * - design effect DE = 1 + ((cv² + 1)·m − 1)·ρ with m observations per cluster and cv the CV of
 *   cluster sizes (Kish 1965; unequal sizes Eldridge, Ashby & Kerry 2006); with nested levels
 *   1 + Σ(mₖ − 1)ρₖ plus the cv term of the top level (`clusteringEffect`);
 * - effective number of independent units N/DE (Kish 1965);
 * - the real false-positive rate of the planned test at nominal level α,
 *   2·(1 − Φ(z₁₋α/₂/√DE)): the naive standard error is too small by √DE (a large-sample figure;
 *   with few clusters the real rate is higher still; Donner & Klar 2000).
 * With no ICC for the assignment level the same figures are given over a plausible range
 * (`plausibleIccRange`) and the finding says so.
 */
import { effectiveSampleSize, naiveTypeIError } from '@/lib/stats/design-effect';
import { DONNER_KLAR_2000, ELDRIDGE_2006, HAYES_MOULTON_2017, KISH_1965 } from '@/lib/citations';
import { accountsFor, designFacts, givenIccs, iccOf, sizeCv, unitsPerArm } from '@/lib/design/facts';
import { clusteringEffect, plausibleIccRange, type ClusteringEffect } from './clustering';
import { modelPlan } from './model';
import { assignedVerb, clusterSummaries, modelFor, plannedMethod, range, treatmentName, unitsWithArms } from './phrases';
import { ASK_STATISTICIAN, cap, count, dec, list, noun, num, numbers, pct } from './text';
import type { Finding, Rule } from './types';

const ID = 'unit-of-analysis';

export const unitOfAnalysis: Rule = {
  id: ID,
  title: 'Treatment assigned to clusters but analysed per individual',
  severity: 'blocker',
  check(design) {
    const f = designFacts(design);
    const A = f.assignment;
    const B = f.bottom;
    if (!A || !B || !f.planGiven || f.withinUnit || !A.groupsObservations || accountsFor(f, A)) return [];
    const U = f.unitOfAnalysis && f.unitOfAnalysis.index > A.index ? f.unitOfAnalysis : B;
    const alpha = design.assumptions.alpha;
    const perArm = unitsPerArm(f);
    const icc = iccOf(f, A.level.id);
    const ignored = f.levels.slice(A.index, U.index);
    const m = A.total > 0 ? U.total / A.total : 0;
    const cv = sizeCv(f, A.index, U.index);
    const unitPlural = noun(U.level, true);

    const found =
      `${cap(treatmentName(design))} ${assignedVerb(design)} to whole ${noun(A.level, true)} — ${unitsWithArms(f, A, perArm)} — ` +
      (f.unitOfAnalysis
        ? `but ${plannedMethod(design)} analyses each of the ${num(U.total)} ${unitPlural} as an independent unit.`
        : `but ${plannedMethod(design)} names no unit of analysis, so it would treat each of the ${num(U.total)} ${unitPlural} as independent.`);

    const sizeNote = cv > 0 ? `; their sizes vary with a CV of ${dec(cv, 2)}` : '';
    const base = {
      clusters: A.total,
      perCluster: m,
      analysedUnits: U.total,
      unitsPerArm: perArm,
      alpha,
      sizeCv: cv,
    };
    const alike = `${cap(list(ignored.map((l) => `${noun(f.levels[l.index + 1]!.level, true)} of the same ${noun(l.level)}`)))} are more alike than those of different ones`;
    const consequence = (de: ClusteringEffect) =>
      `the ${num(U.total)} ${unitPlural} carry about as much information as ${num(Math.round(effectiveSampleSize(U.total, de.designEffect)))} independent ones`;
    let why: string;
    let nums: Record<string, number>;

    if (icc) {
      const effect = clusteringEffect(f, A.index, U.index, givenIccs(f));
      if (!effect) return [inconsistent(found, A.level.id, design)];
      const fp = naiveTypeIError({ designEffect: effect.designEffect, alpha });
      const iccText = list(ignored.filter((l) => iccOf(f, l.level.id)).map((l) => `${dec(iccOf(f, l.level.id)!.value, 3)} for ${noun(l.level, true)}`));
      const missingText = effect.missing.length > 0 ? ` No ICC is given for ${list(effect.missing.map((l) => noun(l.level, true)))}; it is counted as 0, so these figures are a lower bound.` : '';
      const equal = Math.abs(effect.designEffect - effect.equalSizes) > 0.005 ? ` (${dec(effect.equalSizes)} if every ${noun(A.level)} had the same size${sizeNote})` : '';
      why =
        `${alike} (ICC ${iccText}), so clustered ${unitPlural} carry less information than independent ones. ` +
        `With about ${dec(m)} ${unitPlural} per ${noun(A.level)} the design effect is ${dec(effect.designEffect)}${equal}: ${consequence(effect)}. ` +
        `A test at the ${pct(alpha)} level that ignores this has a real false-positive rate of about ${pct(fp)}: if ${treatmentName(design)} had no effect at all, ` +
        `about ${pct(fp)} of such studies would still report a "significant" difference, and the confidence intervals are too narrow by a factor of ${dec(Math.sqrt(effect.designEffect))}.${missingText}`;
      nums = numbers({
        ...base,
        icc: icc.value,
        designEffect: effect.designEffect,
        designEffectEqualSizes: effect.equalSizes,
        effectiveN: effectiveSampleSize(U.total, effect.designEffect),
        naiveTypeIError: fp,
      });
    } else {
      const [lo, hi] = plausibleIccRange(f, A);
      const at = (value: number) => clusteringEffect(f, A.index, U.index, new Map([...givenIccs(f), [A.level.id, value]]));
      const low = at(lo);
      const high = at(hi);
      if (!low || !high) return [inconsistent(found, A.level.id, design)];
      const fpLow = naiveTypeIError({ designEffect: low.designEffect, alpha });
      const fpHigh = naiveTypeIError({ designEffect: high.designEffect, alpha });
      why =
        `${alike}, so clustered ${unitPlural} carry less information than independent ones. No ICC is given for ${noun(A.level, true)}. ` +
        `Over a plausible range of ${lo} to ${hi} (a range common in practice, not a value for this study), with about ${dec(m)} ${unitPlural} per ${noun(A.level)}, ` +
        `the design effect is ${range(low.designEffect, high.designEffect)}, the ${num(U.total)} ${unitPlural} count as ${num(Math.round(effectiveSampleSize(U.total, low.designEffect)))} to ${num(Math.round(effectiveSampleSize(U.total, high.designEffect)))} independent ones, ` +
        `and a test at the ${pct(alpha)} level that ignores the clustering has a real false-positive rate of ${pct(fpLow)} to ${pct(fpHigh)}.`;
      nums = numbers({
        ...base,
        iccLow: lo,
        iccHigh: hi,
        designEffectLow: low.designEffect,
        designEffectHigh: high.designEffect,
        effectiveNLow: effectiveSampleSize(U.total, low.designEffect),
        effectiveNHigh: effectiveSampleSize(U.total, high.designEffect),
        naiveTypeIErrorLow: fpLow,
        naiveTypeIErrorHigh: fpHigh,
      });
    }

    const plan = modelPlan(design);
    const model = plan.formula;
    const todo =
      `Analyse with the ${noun(A.level)} as the unit of comparison: ${modelFor(plan, f.levels)}, \`${model}\`, ` +
      `which counts the ${count(A.total, A.level)} as the independent units (${plan.family ? `a t-test on the ${num(A.total)} ${noun(A.level)} ${clusterSummaries(design)} is a simple valid alternative` : `in a balanced design a t-test on the ${num(A.total)} ${noun(A.level)} means gives the same answer`}). ` +
      `Plan the sample size with the design effect. ${ASK_STATISTICIAN}`;
    return [
      {
        ruleId: ID,
        key: A.level.id,
        severity: 'blocker',
        title: `Analysed per ${noun(U.level)}, but ${treatmentName(design)} ${assignedVerb(design)} per ${noun(A.level)}`,
        found,
        why,
        todo,
        model,
        numbers: nums,
        citations: [KISH_1965, ELDRIDGE_2006, DONNER_KLAR_2000, HAYES_MOULTON_2017],
        levelIds: ignored.map((l) => l.level.id).concat(U.level.id),
      } satisfies Finding,
    ];
  },
};

function inconsistent(found: string, key: string, design: Parameters<Rule['check']>[0]): Finding {
  return {
    ruleId: ID,
    key,
    severity: 'blocker',
    title: 'Analysed per individual, but assigned per cluster',
    found,
    why:
      'Units in the same cluster are more alike than units in different clusters, so the planned analysis overstates the information in the data and its false-positive rate exceeds the nominal level. ' +
      'The size of the problem cannot be computed: the ICCs given add up to more than 1 (or the counts per level are inconsistent), so they cannot all be shares of one variance. Check the ICCs and counts on the Assumptions and Structure steps.',
    todo: `Analyse with the cluster as the unit of comparison: \`${modelPlan(design).formula}\`. ${ASK_STATISTICIAN}`,
    model: modelPlan(design).formula,
    citations: [KISH_1965, DONNER_KLAR_2000],
  };
}
