/**
 * Cross-over designs: every unit receives the arms in sequence, so period effects and carry-over
 * from one period into the next threaten the within-unit comparison.
 *
 * Triggers (the treatment changes over time within each unit, `changesOverTime` in facts.ts: a
 * described cross-over, or occasions of one unit assigned to the arms, which is a cross-over in
 * effect; both findings always, as every cross-over faces them):
 * - `carry-over`: whether the washout is long enough for this outcome and treatment. Warning when
 *   carry-over is marked possible or no washout is described (or one that reads as none); advice
 *   when a washout is described, which then asks for its justification. A described washout
 *   changes the wording, not whether it is said. A 2-period cross-over cannot separate carry-over
 *   from the treatment × period interaction and from sequence-group differences; the preliminary
 *   carry-over test has low power and choosing the analysis by its result distorts the
 *   false-positive rate, so the remedy is a washout (or a run-in discarded from the analysis),
 *   not a test (Senn 2002).
 * - `period` (advice): include period as a fixed effect and balance the sequences (Senn 2002).
 */
import { SENN_2002 } from '@/lib/citations';
import { designFacts } from '@/lib/design/facts';
import { modelPlan } from './model';
import { outcomeName, treatmentName } from './phrases';
import { cap, count, list, noun, num, numbers } from './text';
import type { Finding, Rule } from './types';

const ID = 'crossover';

/** A washout text that says there is none ("None planned", "no washout", "0 days"). */
function saysNone(text: string): boolean {
  return /^\s*(none|no|nil|0)\b/i.test(text) || /\bno washout\b|\bwithout (a )?washout\b|\bnone planned\b/i.test(text);
}

export const crossover: Rule = {
  id: ID,
  title: 'Cross-over: period effects and carry-over',
  severity: 'warning',
  check(design) {
    const f = designFacts(design);
    const c = design.assignment.crossover;
    if (!c.enabled && !f.changesOverTime) return [];
    // Not described as a cross-over: the assigned occasions (nights, sessions) are its periods.
    const described = c.enabled;
    const A = f.assignment;
    const periods = described ? c.periods : Math.round(A?.perParent ?? 2);
    const periodWord = described ? 'period' : A ? noun(A.level) : 'occasion';
    const periodsWord = described ? 'periods' : A ? noun(A.level, true) : 'occasions';
    const E = f.eu;
    const who = E ? noun(E.level) : 'unit';
    const whoPlural = E ? noun(E.level, true) : 'units';
    const units = E ? count(E.total, E.level) : 'the units';
    const arms = design.assignment.arms.map((a) => a.name);
    const armsText = arms.length === 2 ? `both arms (${list(arms)})` : arms.length > 2 ? `all ${arms.length} arms (${list(arms)})` : 'each arm';
    const plan = modelPlan(design);
    const model = plan.formula;
    // The unit's term as the model carries it: a fixed effect when there are too few units for a variance (few-units).
    const unitTerm = E && plan.fixedLevels.includes(E) ? 'a fixed effect' : 'a random intercept';
    const out: Finding[] = [];

    const washout = c.washout?.trim();
    const noWashout = !washout || saysNone(washout);
    {
      const serious = c.carryoverPossible === true || noWashout;
      out.push({
        ruleId: ID,
        key: 'carry-over',
        severity: serious ? 'warning' : 'advice',
        title: !described ? `The arms change between ${periodsWord}: carry-over?` : noWashout ? 'Cross-over without a washout' : c.carryoverPossible === true ? 'Carry-over possible between periods' : 'Is the washout long enough?',
        found:
          `Each ${who} receives ${armsText} over ${num(periods)} ${periodsWord}` +
          (washout ? `; the washout is described as "${washout}"` : '; no washout is described') +
          (c.carryoverPossible === true ? ', and carry-over is marked as possible.' : '.'),
        why:
          `If the effect of the first period's arm lasts into the next, the within-${who} comparison of ${treatmentName(design)} is biased. ` +
          `${periods === 2 ? 'In a two-period cross-over, carry-over cannot be tested away: it cannot be separated from the treatment × period interaction or from differences between the sequence groups. ' : ''}` +
          `A preliminary test for carry-over has little power, and choosing the analysis by its result distorts the false-positive rate (${SENN_2002.short}): the protection lies in the design, not in a test.`,
        todo:
          (noWashout
            ? `Plan a washout long enough for the effect to wear off and justify its length from what is known about ${treatmentName(design)} and ${outcomeName(design)}; if a gap is not possible, treat the first measurements of each period as a run-in and leave them out of the primary analysis. `
            : `Justify in the protocol that the washout ("${washout}") outlasts the effect of ${treatmentName(design)} on ${outcomeName(design)} (its duration of action, or how long ${outcomeName(design)} takes to return to its usual level), citing the evidence; if in doubt, lengthen it or leave the first measurements of each period out of the primary analysis as a run-in. `) +
          `Do not rely on a test for carry-over to choose the analysis.`,
        numbers: numbers({ periods }),
        citations: [SENN_2002],
        levelIds: E ? [E.level.id] : undefined,
      });
    }

    out.push({
      ruleId: ID,
      key: 'period',
      severity: 'advice',
      title: described ? 'Include period in the cross-over analysis' : `Include the ${periodWord} in the analysis`,
      found: `${cap(units)} each receive ${armsText} in ${num(periods)} ${periodsWord}${described ? '' : ': a cross-over in effect, though the Assignment step does not describe one'}.`,
      why:
        `Outcomes can drift between periods whatever the arm — practice with the task, season, fatigue, growing familiarity with the setting. ` +
        `With the sequences balanced, a period effect does not bias the comparison if period is in the model; left out, it adds to the error variance (${SENN_2002.short}).`,
      todo: `Randomise ${whoPlural} to the sequences in equal numbers and include ${described ? 'period' : `the ${periodWord} (\`occasion\` in the model)`} as a fixed effect, with ${who} as ${unitTerm}: \`${model}\`.`,
      model,
      numbers: numbers({ periods, units: E?.total, sequences: arms.length === 2 && periods === 2 ? 2 : undefined }),
      citations: [SENN_2002],
      levelIds: E ? [E.level.id] : undefined,
    } satisfies Finding);
    return out;
  },
};
