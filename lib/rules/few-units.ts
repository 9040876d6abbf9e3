/**
 * Too few units at the level of assignment: for the comparison itself, for estimating the
 * variance between them, and for the large-sample methods the plan relies on.
 *
 * Triggers (one finding each):
 * - `per-arm`: fewer than 10 experimental units in the smallest arm (fewer than 5: severely
 *   small); in a cross-over or within-unit design, fewer than 10 units in all. Common practice,
 *   not a published threshold.
 * - `variance`: the experimental units group observations and there are fewer than 10 of them in
 *   all: their variance component rests on very few degrees of freedom and often comes out as 0
 *   (a "singular" fit). Common practice.
 * - `robust-se`: GEE or cluster-robust standard errors with fewer than about 40–50 clusters: the
 *   ordinary sandwich estimator is biased downward; use the CR2 bias-reduced estimator with
 *   Satterthwaite degrees of freedom (Bell & McCaffrey 2002; Pustejovsky & Tipton 2018). With CR2
 *   already planned, advice to pair it with Satterthwaite df.
 * - `df`: a mixed model on fewer than about 40 experimental units with residual degrees of
 *   freedom: use Satterthwaite (1946) or Kenward–Roger (1997) df; a GLMM uses between-within df
 *   (units minus the parameters estimated between units). The cut-off of about 40 is common
 *   practice (`FEW_CLUSTERS`).
 * - `level-<id>` / `crossed-<id>`: a level that would carry a random intercept (sites, donors,
 *   litters, batches, blocks above the experimental unit, or the unit itself when it receives
 *   every arm) or a crossed factor has fewer than `FEW_LEVELS` (6) units: its variance rests on at
 *   most units − 1 degrees of freedom. The treatment is compared within it, so a fixed effect does
 *   the same job without a variance; the recommended model carries it as one (model.ts). Warning
 *   when the plan gives it a random intercept, advice otherwise. Common practice (Gomes 2022
 *   examines the rule of thumb).
 * Quantified: units per arm, the degrees of freedom between units (units − arms) against the
 * residual df of an analysis of every observation (N − arms); for a level with few units, the
 * degrees of freedom of its variance (units − 1).
 */
import { BELL_MCCAFFREY_2002, DONNER_KLAR_2000, GOMES_2022, HAYES_MOULTON_2017, KENWARD_ROGER_1997, narrative, PUSTEJOVSKY_TIPTON_2018, RAUDENBUSH_1997, SATTERTHWAITE_1946 } from '@/lib/citations';
import { designFacts, unitsPerArm } from '@/lib/design/facts';
import type { Design } from '@/lib/design/schema';
import { FEW_CLUSTERS, FEW_LEVELS } from './clustering';
import { modelPlan } from './model';
import { assignedVerb, modelKind, treatmentName, unitsWithArms } from './phrases';
import { ASK_STATISTICIAN, cap, count, list, noun, num, numbers, pluralWord } from './text';
import type { Finding, Rule } from './types';

const ID = 'few-units';

export const fewUnits: Rule = {
  id: ID,
  title: 'Too few units at the level of assignment',
  severity: 'warning',
  check(design) {
    const f = designFacts(design);
    const E = f.eu;
    if (!E || !f.assignment) return [];
    const out: Finding[] = [];
    const arms = design.assignment.arms.length;
    const perArm = unitsPerArm(f);
    const a = design.analysis;
    const units = count(E.total, E.level);
    // Levels above the unit that the recommended model enters as fixed effects (few blocks, sites)
    // spend their df from the same units: whole plots in 4 blocks, 2 arms → 8 − 2 − 3 = 3.
    const fixedAbove = f.withinUnit ? [] : modelPlan(design).fixedLevels.filter((l) => l.index < E.index);
    const blockDf = fixedAbove.reduce((s, l) => s + Math.max(0, l.total - 1), 0);
    const betweenDf = Math.max(0, E.total - Math.max(arms, 1) - blockDf);
    const fitted = fixedAbove.length > 0 ? `the arms and ${list(fixedAbove.map((l) => noun(l.level, true)))}` : 'the arms';
    const clustered = E.groupsObservations;

    // per arm
    const n = f.withinUnit ? E.total : perArm;
    if (n !== undefined && n < 10 && (f.withinUnit || arms >= 2)) {
      const severe = n < 5;
      out.push({
        ruleId: ID,
        key: 'per-arm',
        severity: 'warning',
        title: severe ? `Very few ${noun(E.level, true)}: ${num(n)} ${f.withinUnit ? 'in all' : 'per arm'}` : `Few ${noun(E.level, true)}: ${num(n)} ${f.withinUnit ? 'in all' : 'per arm'}`,
        found: f.withinUnit
          ? `Every ${noun(E.level)} receives each arm in turn, and there are ${units}.`
          : `${cap(treatmentName(design))} ${assignedVerb(design)} to ${unitsWithArms(f, E, perArm)}.`,
        why:
          `The comparison rests on the ${units}, not on the ${num(f.totalObs)} observations${clustered ? ` inside them` : ''}. ` +
          `With ${num(n)} ${f.withinUnit ? noun(E.level, true) : `${noun(E.level, true)} per arm`}, one unusual ${noun(E.level)} moves the result, randomisation balances ${noun(E.level)}-level differences poorly, ` +
          `and methods that rely on large samples (z tests, sandwich standard errors) are unreliable. ` +
          `${severe ? 'Fewer than 5 per arm is severely small: any result will be fragile. ' : ''}` +
          `Fewer than 10 ${f.withinUnit ? 'units' : 'units per arm'} is commonly treated as small (a threshold from common practice, not from a published source).`,
        todo:
          `Add ${noun(E.level, true)} if at all possible${clustered ? ` — once the design effect is large, more ${noun(E.level, true)} help far more than more observations per ${noun(E.level)} (${RAUDENBUSH_1997.short} gives the best size per ${noun(E.level)} under a budget)` : ''}. ` +
          `Analyse with small-sample degrees of freedom (Kenward–Roger or Satterthwaite), consider a randomisation (permutation) test as a sensitivity analysis, and report the result as exploratory if the numbers cannot grow. ${ASK_STATISTICIAN}`,
        numbers: numbers({ unitsPerArm: f.withinUnit ? undefined : n, experimentalUnits: E.total, betweenUnitDf: betweenDf }),
        citations: [HAYES_MOULTON_2017, DONNER_KLAR_2000, RAUDENBUSH_1997],
        levelIds: [E.level.id],
      });
    }

    // variance component of the experimental units
    if (clustered && E.total < 10) {
      out.push({
        ruleId: ID,
        key: 'variance',
        severity: 'warning',
        title: `Too few ${noun(E.level, true)} to estimate their variance`,
        found: `There are ${units} in all, each holding about ${num(Math.round(E.obsPerUnit * 10) / 10)} observations.`,
        why:
          `A random intercept for ${noun(E.level)} estimates the variance between ${noun(E.level, true)} from ${num(E.total)} values, leaving about ${num(betweenDf)} degrees of freedom once ${fitted} are fitted. ` +
          `Such an estimate is very imprecise and often comes out as exactly 0 (a "singular" fit), which makes the model behave like one that ignores the clustering. ` +
          `Fewer than about 10 units is a common-practice warning sign, not a published bound.`,
        todo: `Add ${noun(E.level, true)}; otherwise analyse ${noun(E.level)} means (${fixedAbove.length > 0 ? `a linear model of the ${num(E.total)} means on ${fitted}` : `a t-test on ${num(E.total)} means`} with ${num(betweenDf)} df is honest about the little information there is) and show the ICC you assume rather than estimating it. ${ASK_STATISTICIAN}`,
        numbers: numbers({ experimentalUnits: E.total, betweenUnitDf: betweenDf }),
        citations: [HAYES_MOULTON_2017, DONNER_KLAR_2000],
        levelIds: [E.level.id],
      });
    }

    // sandwich standard errors with few clusters
    const robust = a.method === 'gee' || a.standardErrors === 'cluster-robust' || a.standardErrors === 'cr2';
    if (robust && (clustered || f.withinUnit) && E.total < FEW_CLUSTERS) {
      const cr2 = a.standardErrors === 'cr2';
      if (!cr2 || a.dfMethod !== 'satterthwaite') {
        out.push({
          ruleId: ID,
          key: 'robust-se',
          severity: cr2 ? 'advice' : 'warning',
          title: cr2 ? 'Pair CR2 standard errors with Satterthwaite degrees of freedom' : `Cluster-robust standard errors with only ${units}`,
          found: `The plan uses ${a.method === 'gee' ? 'GEE with sandwich' : cr2 ? 'CR2' : 'cluster-robust'} standard errors, clustered on ${units}.`,
          why:
            `Sandwich (cluster-robust) standard errors are justified as the number of clusters grows; with fewer than about 40–50 clusters (common practice) the usual version is too small and the test's false-positive rate exceeds the nominal level. ` +
            `The bias-reduced CR2 estimator with Satterthwaite degrees of freedom keeps the test close to its nominal level with few clusters (${BELL_MCCAFFREY_2002.short}; ${PUSTEJOVSKY_TIPTON_2018.short}).`,
          todo: `Use CR2 standard errors with Satterthwaite degrees of freedom (about ${num(betweenDf)} or fewer here, not a normal reference distribution). ${ASK_STATISTICIAN}`,
          numbers: numbers({ clusters: E.total, betweenUnitDf: betweenDf }),
          citations: [BELL_MCCAFFREY_2002, PUSTEJOVSKY_TIPTON_2018],
          levelIds: [E.level.id],
        });
      }
    }

    // degrees of freedom of a mixed model
    if ((a.method === 'mixed-model' || a.method === 'glmm') && (clustered || f.withinUnit) && E.total < FEW_CLUSTERS && a.dfMethod === 'residual') {
      const glmm = a.method === 'glmm';
      const residualDf = Math.max(0, f.totalObs - Math.max(arms, 1));
      out.push({
        ruleId: ID,
        key: 'df',
        severity: 'warning',
        title: `Use small-sample degrees of freedom for ${units}`,
        found: `The mixed model compares arms across ${units} but plans residual degrees of freedom (${num(residualDf)}, from ${num(f.totalObs)} observations).`,
        why:
          `The information about ${treatmentName(design)} comes from the ${units}, so its test has roughly ${num(betweenDf)} degrees of freedom, not ${num(residualDf)}. ` +
          `Residual df (or a normal reference distribution) make the test too liberal when there are fewer than about 40–50 units (common practice). ` +
          (glmm
            ? 'For a generalised linear mixed model, between-within degrees of freedom (units minus parameters estimated between units) are the practical choice.'
            : `${narrative(SATTERTHWAITE_1946)} and ${narrative(KENWARD_ROGER_1997)} approximations give the right reference distribution; Kenward–Roger also corrects the standard error for small samples.`),
        todo: glmm
          ? `Use between-within degrees of freedom (about ${num(betweenDf)}). ${ASK_STATISTICIAN}`
          : `Use Kenward–Roger degrees of freedom with REML (or Satterthwaite) for the test of ${treatmentName(design)}. ${ASK_STATISTICIAN}`,
        numbers: numbers({ experimentalUnits: E.total, betweenUnitDf: betweenDf, residualDf }),
        citations: glmm ? [HAYES_MOULTON_2017] : [KENWARD_ROGER_1997, SATTERTHWAITE_1946],
        levelIds: [E.level.id],
      });
    }
    out.push(...fewLevels(design));
    return out;
  },
};

/** Levels and crossed factors with too few units for a variance (see the header). */
function fewLevels(design: Design): Finding[] {
  const f = designFacts(design);
  const plan = modelPlan(design);
  const a = design.analysis;
  const treatment = treatmentName(design);
  const model = plan.formula;
  const threshold = `Fewer than about ${FEW_LEVELS - 1}–${FEW_LEVELS} units is too few for a random effect: a rule of thumb from common practice (${GOMES_2022.short} examines it).`;
  const item = (key: string, name: string, plural: string, n: number, plannedRandom: boolean, levelIds: string[] | undefined): Finding => ({
    ruleId: ID,
    key,
    severity: plannedRandom ? 'warning' : 'advice',
    title: `Only ${num(n)} ${n === 1 ? name : plural}: too few for a random effect`,
    found: `The study has ${num(n)} ${n === 1 ? name : plural}, and ${treatment} is compared within them${plannedRandom ? '; the planned model gives them a random intercept' : ''}.`,
    why:
      `A random intercept for ${name} estimates the variance between ${plural} from ${num(n)} values: ${num(Math.max(0, n - 1))} degrees of freedom at most (the ${num(n)} means less their overall mean). ` +
      `So few values give a very imprecise variance that often comes out as exactly 0 (a "singular" fit). ${threshold} ` +
      `Because ${treatment} is compared within ${plural}, a fixed effect for ${name} removes the differences between them just as well, at the cost of ${num(Math.max(0, n - 1))} degrees of freedom, and needs no variance.`,
    todo:
      `Enter ${name} as a fixed effect rather than a random intercept, here in ${modelKind(plan)}: \`${model}\`. ` +
      `Conclusions then hold for these ${num(n)} ${plural}; to generalise to others, more ${plural} are needed. ${ASK_STATISTICIAN}`,
    model,
    numbers: numbers({ units: n, varianceDf: Math.max(0, n - 1), threshold: FEW_LEVELS }),
    citations: [GOMES_2022],
    ...(levelIds ? { levelIds } : {}),
  });
  const mixedPlan = a.method === 'mixed-model' || a.method === 'glmm';
  const out = plan.fixedLevels.map((L) =>
    item(`level-${L.level.id}`, noun(L.level), noun(L.level, true), L.total, mixedPlan && a.randomIntercepts.includes(L.level.id), [L.level.id]),
  );
  for (const c of design.structure.crossedFactors) {
    if (c.count >= FEW_LEVELS) continue;
    const name = c.name.trim().toLowerCase();
    out.push(item(`crossed-${c.id}`, name, pluralWord(name), c.count, false, undefined));
  }
  return out;
}
