/**
 * The planned analysis does not match the design — the blocker the recommendation resolves.
 *
 * Triggers (an analysis plan given):
 * - `repeated-<unit>` (blocker): the treatment varies within the experimental unit (cross-over,
 *   or occasions of one volunteer assigned to arms), the unit holds several observations, and the
 *   plan does not account for it — e.g. a t-test on every night of every volunteer. The t-test's
 *   standard error, its degrees of freedom (N − 2 instead of about units − 2) and its p-value do
 *   not describe the design (Senn 2002; Diggle et al. 2002).
 * - `family` (blocker): a GLM, GLMM or GEE whose family does not fit the outcome type (binomial
 *   for binary and k-of-n outcomes, Poisson or negative binomial for counts, gaussian or gamma
 *   for continuous ones; McCullagh & Nelder 1989).
 * - `level-<id>` (warning): the experimental unit is accounted for but a level nested in it that
 *   groups observations is not (a random intercept for tray, none for plant): the test of the
 *   treatment stays close to right in a balanced design, the variance structure does not.
 * - `unassigned-<id>` (warning): no level of assignment given yet, and a level that groups
 *   observations is not accounted for.
 * - `above-unit` (warning): the unit of analysis lies above the experimental unit while the
 *   treatment varies between units, so its means average over both arms.
 * - `two-groups` (warning): a t-test with three or more arms, or a continuous exposure.
 * - `paired-between` (warning): a paired t-test where the arms do not differ within the pairs
 *   (before-and-after measurements of units randomised between arms), or where nothing pairs the
 *   observations: it tests the change within units, not the arms (Frison & Pocock 1992 for the
 *   analysis that does, ANCOVA).
 * The unit-of-analysis error for cluster-assigned treatments is rule `unit-of-analysis`; it is
 * not repeated here.
 */
import type { Analysis, Design } from '@/lib/design/schema';
import { BATES_2015, DIGGLE_2002, DONNER_KLAR_2000, FRISON_POCOCK_1992, GELMAN_HILL_2007, HOLM_1979, MCCULLAGH_NELDER_1989, SENN_2002 } from '@/lib/citations';
import { accountsFor, comparedWithin, designFacts, iccOf, pairingLevel } from '@/lib/design/facts';
import { familyFor, modelPlan } from './model';
import { methodName, modelFor, outcomeName, plannedMethod, treatmentName } from './phrases';
import { ASK_STATISTICIAN, cap, count, dec, noun, num, numbers } from './text';
import type { Finding, Rule } from './types';

const ID = 'analysis-mismatch';

type Family = NonNullable<Analysis['glmFamily']>;

const FITTING: Record<NonNullable<Design['outcome']['type']>, Family[] | undefined> = {
  continuous: ['gaussian', 'gamma'],
  binary: ['binomial'],
  count: ['poisson', 'negative-binomial'],
  proportion: ['binomial', 'beta'],
  'bounded-score': ['gaussian', 'binomial', 'beta'],
  'time-to-event': undefined,
};

const TYPE_WORDS: Record<NonNullable<Design['outcome']['type']>, string> = {
  continuous: 'continuous',
  binary: 'binary (yes or no)',
  count: 'a count',
  proportion: 'a proportion',
  'bounded-score': 'a bounded score',
  'time-to-event': 'a time to an event',
};

export const analysisMismatch: Rule = {
  id: ID,
  title: 'The planned analysis does not match the design',
  severity: 'blocker',
  check(design) {
    const f = designFacts(design);
    if (!f.planGiven) return [];
    const a = design.analysis;
    const out: Finding[] = [];
    const model = modelPlan(design).formula;
    const E = f.eu;

    if (E && f.withinUnit && E.groupsObservations && !accountsFor(f, E)) {
      const icc = iccOf(f, E.level.id)?.value;
      const naiveDf = Math.max(0, f.totalObs - 2);
      const designDf = Math.max(0, E.total - (f.crossover ? 2 : 1));
      out.push({
        ruleId: ID,
        key: `repeated-${E.level.id}`,
        severity: 'blocker',
        title: `${cap(plannedMethod(design))} treats ${num(f.totalObs)} measurements of ${count(E.total, E.level)} as independent`,
        found: `${cap(treatmentName(design))} varies within each ${noun(E.level)} — every ${noun(E.level)} is measured under more than one arm — but ${plannedMethod(design)} treats the ${num(f.totalObs)} measurements as independent and has no term for ${noun(E.level)}.`,
        why:
          `Measurements of the same ${noun(E.level)} are correlated${icc !== undefined ? ` (ICC ${dec(icc, 3)})` : ''}. An analysis that ignores this gets the error wrong in two ways at once: ` +
          `it counts differences between ${noun(E.level, true)}, which a within-${noun(E.level)} comparison removes, as noise (wasting the design's main advantage), and it treats consecutive measurements under the same arm as independent, which overstates the information in them. ` +
          `Its standard error, its degrees of freedom (${num(naiveDf)} in place of about ${num(designDf)} from ${count(E.total, E.level)}) and its p-value do not describe this design.`,
        todo: `Analyse within ${noun(E.level, true)}: ${modelFor(modelPlan(design), [E])}${f.crossover ? ', with period as a fixed effect' : ''}, \`${model}\`, counting the ${count(E.total, E.level)} as n. ${ASK_STATISTICIAN}`,
        model,
        numbers: numbers({ observations: f.totalObs, experimentalUnits: E.total, naiveDf, designDf, icc }),
        citations: [SENN_2002, DIGGLE_2002, BATES_2015],
        levelIds: [E.level.id],
      });
    }

    const type = design.outcome.type;
    const fam = a.glmFamily;
    const usesFamily = a.method === 'glm' || a.method === 'glmm' || a.method === 'gee';
    const fitting = type ? FITTING[type] : undefined;
    const positive = design.outcome.positiveOnly !== false;
    if (usesFamily && fam && type && fitting && (!fitting.includes(fam) || (fam === 'gamma' && !positive))) {
      const right = familyFor(design);
      const suggestion = right ? `the ${right.family} family with a ${right.link} link` : type === 'continuous' ? 'a gaussian family (a linear model), or a gamma family with log link for positive skewed values' : `one of ${fitting.join(', ')}`;
      out.push({
        ruleId: ID,
        key: 'family',
        severity: 'blocker',
        title: `The ${fam} family does not fit ${outcomeName(design)}`,
        found: `${cap(plannedMethod(design))} uses the ${fam} family, but ${outcomeName(design)} is ${TYPE_WORDS[type]}${fam === 'gamma' && !positive ? ' and can be zero or negative' : ''}.`,
        why: `The family states how the outcome varies around its mean — which values it can take and how its variance depends on the mean. With a family that cannot produce the outcome's values, the estimates, standard errors and p-values have no meaning (${MCCULLAGH_NELDER_1989.short}).`,
        todo: `Use ${suggestion}: \`${model}\`.`,
        model,
        citations: [MCCULLAGH_NELDER_1989],
      });
    }

    if (E && accountsFor(f, E)) {
      for (const L of f.levels) {
        if (L.index <= E.index || !L.groupsObservations || accountsFor(f, L)) continue;
        const child = f.levels[L.index + 1]!;
        out.push({
          ruleId: ID,
          key: `level-${L.level.id}`,
          severity: 'warning',
          title: `No random intercept for ${noun(L.level)}`,
          found: `The plan accounts for ${noun(E.level, true)} but not for ${noun(L.level, true)}, although each ${noun(L.level)} gives ${num(child.perParent)} ${noun(child.level, child.perParent !== 1)}.`,
          why: `${cap(noun(child.level, true))} of the same ${noun(L.level)} are correlated${iccOf(f, L.level.id) ? ` (ICC ${dec(iccOf(f, L.level.id)!.value, 3)})` : ''}. Because ${treatmentName(design)} is compared between ${noun(E.level, true)}, its test stays close to right in a balanced design; but the model misstates the variance structure, weights unbalanced ${noun(E.level, true)} wrongly, and gives wrong standard errors for anything compared within ${noun(E.level, true)}.`,
          todo: `Add a random intercept for ${noun(L.level)} nested in ${noun(E.level)}: \`${model}\`.`,
          model,
          citations: [BATES_2015],
          levelIds: [L.level.id],
        });
      }
    }

    if (!f.assignment) {
      for (const L of f.levels) {
        if (!L.groupsObservations || accountsFor(f, L)) continue;
        out.push({
          ruleId: ID,
          key: `unassigned-${L.level.id}`,
          severity: 'warning',
          title: `${cap(plannedMethod(design))} does not account for ${noun(L.level, true)}`,
          found: `Each ${noun(L.level)} holds about ${dec(L.obsPerUnit)} observations, and ${plannedMethod(design)} does not account for ${noun(L.level, true)}. The level of assignment is not given yet.`,
          why: `Observations in the same ${noun(L.level)} are correlated, so an analysis that treats them as independent overstates precision for anything that varies between ${noun(L.level, true)}. How serious this is depends on the level at which ${treatmentName(design)} varies: if it varies between ${noun(L.level, true)}, it is a unit-of-analysis error.`,
          todo: `Give the level of assignment on the Assignment step, and give ${noun(L.level)} a random intercept: \`${model}\`.`,
          model,
          citations: [BATES_2015, DIGGLE_2002],
          levelIds: [L.level.id],
        });
      }
    }

    if (E && !f.withinUnit && f.unitOfAnalysis && f.unitOfAnalysis.index < E.index) {
      const U = f.unitOfAnalysis;
      out.push({
        ruleId: ID,
        key: 'above-unit',
        severity: 'warning',
        title: `The unit of analysis (${noun(U.level)}) is above the experimental unit (${noun(E.level)})`,
        found: `${cap(treatmentName(design))} is compared between ${noun(E.level, true)}, but the plan analyses ${noun(U.level)} means (${count(U.total, U.level)}).`,
        why: `Each ${noun(U.level)} contains ${noun(E.level, true)} of more than one arm, so its mean averages over the treatment; a comparison of arms cannot be made on those means except as a paired analysis within ${noun(U.level, true)}.`,
        todo: `Analyse at the level of the ${noun(E.level)} with ${noun(U.level)} as a block: \`${model}\`.`,
        model,
        citations: [DONNER_KLAR_2000, BATES_2015],
        levelIds: [U.level.id, E.level.id],
      });
    }

    const arms = design.assignment.arms.length;
    if (a.method === 't-test' && (arms >= 3 || design.assignment.kind === 'continuous')) {
      out.push({
        ruleId: ID,
        key: 'two-groups',
        severity: 'warning',
        title: 'A t-test compares two groups',
        found: arms >= 3 ? `The plan uses a t-test, but there are ${num(arms)} arms.` : `The plan uses a t-test, but ${treatmentName(design)} is continuous.`,
        why: arms >= 3
          ? `A t-test compares two groups; with ${num(arms)} arms, separate t-tests multiply the chance of a false positive and each uses only part of the data to estimate the variance.`
          : 'A t-test needs two groups; cutting a continuous variable into groups throws information away and makes the result depend on the cut.',
        todo: `Use a regression model with ${arms >= 3 ? 'the arms as a factor and pre-specified contrasts' : 'the variable as a continuous predictor'}: \`${model}\` (${methodName(modelPlan(design).method)}).`,
        model,
        citations: arms >= 3 ? [GELMAN_HILL_2007, HOLM_1979] : [GELMAN_HILL_2007],
      });
    }

    // A paired t-test pairs within units; the arms must differ within each pair for it to compare them.
    const P = pairingLevel(f);
    const pairedBlocks = design.assignment.blocking.kind === 'paired' || design.assignment.blocking.kind === 'matched';
    if (a.method === 'paired-t-test' && E && !pairedBlocks && (!P || (!comparedWithin(f, P) && P.index >= E.index))) {
      out.push({
        ruleId: ID,
        key: 'paired-between',
        severity: 'warning',
        title: 'A paired t-test does not compare these arms',
        found: P
          ? `The plan pairs the measurements of each ${noun(P.level)}, but ${treatmentName(design)} is compared between ${noun(E.level, true)}: each ${noun(P.level)} is in one arm only.`
          : `The plan uses a paired t-test, but nothing in the design pairs the observations: no unit receives both arms, and there are no pairs or repeated measurements.`,
        why: P
          ? `A paired t-test tests whether the mean difference within ${noun(P.level, true)} (for example, from before to after) is zero, over both arms together; it does not compare the arms. The comparison of arms is between ${noun(E.level, true)}.`
          : 'A paired t-test needs two measurements that belong together (one under each arm, or before and after); without them it has no pairs to take differences of.',
        todo: `Compare the arms between ${noun(E.level, true)}${f.baselines.length > 0 ? ', adjusting for the baseline (ANCOVA)' : ''}: \`${model}\`.`,
        model,
        citations: [FRISON_POCOCK_1992],
        levelIds: [E.level.id],
      });
    }
    return out;
  },
};
