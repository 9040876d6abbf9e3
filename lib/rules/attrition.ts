/**
 * Attrition over occasions: units lost before their last measurement.
 *
 * Triggers: any occasion with expected attrition above 0. Warning when missing data are not
 * planned for or handled by complete-case analysis, advice otherwise (the sample must still be
 * inflated).
 *
 * Quantified, for the units that are measured (the lowest level that is not a repeated
 * measurement or a replicate), with a the largest cumulative attrition:
 * - units lost N·a and complete cases N·(1 − a);
 * - with several occasions, the share of measurements a mixed model still uses,
 *   mean over occasions of (1 − aₜ), against (1 − a) for a complete-case analysis. Mixed models
 *   are valid under missing at random (MAR); complete-case analysis and unweighted GEE need the
 *   stronger missing completely at random (Diggle et al. 2002; Liang & Zeger 1986).
 * - recruitment for the same analysable number, N/(1 − a) (SPIRIT 2013 item 14 asks for it).
 * A count of events measured once over a follow-up is a rate: a unit that leaves early keeps the
 * events and the time it was followed (the model's offset), so the text says what is lost is
 * follow-up time, and that the bias comes from leaving related to the risk of the event.
 */
import { DIGGLE_2002, LIANG_ZEGER_1986, SPIRIT_2013 } from '@/lib/citations';
import { designFacts } from '@/lib/design/facts';
import { count, noun, num, numbers, pct } from './text';
import type { Rule } from './types';

const ID = 'attrition';

export const attrition: Rule = {
  id: ID,
  title: 'Attrition over occasions',
  severity: 'warning',
  check(design) {
    const f = designFacts(design);
    const list = f.occasions;
    const a = f.maxAttrition;
    if (!(a > 0)) return [];
    const unit = [...f.levels].reverse().find((l) => l.level.kind !== 'repeated' && l.level.kind !== 'replicate');
    const last = list.find((o) => o.attrition === a)!;
    const several = list.length >= 2 && (f.subject !== undefined || list.filter((o) => !o.baseline).length >= 1);
    const repeatedLevel = f.levels.some((l) => l.level.kind === 'repeated');
    const plan = design.analysis.missingData;
    const handled = plan === 'mixed-model-mar' || plan === 'multiple-imputation';
    const N = unit?.total;
    const who = unit ? noun(unit.level, true) : 'units';
    const lost = N !== undefined ? N * a : undefined;
    const complete = N !== undefined ? N * (1 - a) : undefined;
    const used = list.reduce((s, o) => s + (1 - o.attrition), 0) / list.length;
    const recruit = N !== undefined && a < 0.99 ? Math.ceil(N / (1 - a) - 1e-9) : undefined;
    const found =
      `By ${last.label}, ${pct(a)} of ${who} are expected to be lost` +
      (N !== undefined ? `: about ${num(Math.round(lost!))} of ${count(N, unit!.level)}, leaving about ${num(Math.round(complete!))}.` : '.') +
      (plan === 'complete-case' ? ' The plan analyses complete cases.' : plan === 'not-planned' ? ' The plan does not say how missing outcomes will be handled.' : '');
    const multi = several && (repeatedLevel || f.followUps.length >= 2);
    const rate = design.outcome.type === 'count' && !multi;
    const one = unit ? noun(unit.level) : 'unit';
    const why = rate
      ? `The outcome is a count of events over the follow-up: a ${one} that leaves early keeps the events counted and the time followed until then, and a rate analysis with the follow-up time as offset uses both. What is lost is follow-up time, so the study gathers fewer events than planned; and if leaving is related to the risk of the event, the rates of those who stay are biased.`
      : multi
      ? `A complete-case analysis drops every ${unit ? noun(unit.level) : 'unit'} with any missing measurement, keeping ${pct(1 - a)} of them; a mixed model uses every measurement taken — about ${pct(used)} of them — and is valid if the loss is missing at random (MAR) given what is in the model. ` +
        `Complete-case analysis, and GEE without weights, need the stronger assumption that loss is unrelated to anything measured (${DIGGLE_2002.short}; ${LIANG_ZEGER_1986.short}). If loss depends on the outcome itself, every analysis is biased, and a sensitivity analysis is needed.`
      : `Lost ${who} have no outcome, and no analysis recovers it. If the loss is related to the outcome, results from the rest are biased; under missing at random (MAR) given ${f.baselines.length > 0 ? 'the baseline and ' : ''}the other variables in the model, multiple imputation or a likelihood-based model removes that bias.`;
    return [
      {
        ruleId: ID,
        key: 'attrition',
        severity: handled ? 'advice' : 'warning',
        title: `${pct(a)} attrition expected`,
        found,
        why,
        todo:
          (recruit !== undefined ? `Recruit for the loss: ${num(N!)} / (1 − ${a}) = ${num(recruit)} ${who} to keep ${num(N!)} analysable${f.eu?.groupsObservations && !f.withinUnit ? `, and more ${noun(f.eu.level, true)} if whole ${noun(f.eu.level, true)} can drop out` : ''}. ` : '') +
          (rate
            ? `Record each ${one}’s follow-up time until it leaves and analyse events per unit of follow-up time, record reasons for loss, and pre-specify a sensitivity analysis for loss related to the risk of the event.`
            : `${multi ? 'Plan a mixed model that uses all measurements under MAR' : `Plan how missing outcomes will be handled (multiple imputation using ${f.baselines.length > 0 ? 'the baseline and ' : ''}other measured variables)`}, record reasons for loss, and pre-specify a sensitivity analysis for loss that depends on the outcome.`),
        numbers: numbers({ finalAttrition: a, units: N, unitsLost: lost, completeCases: complete, measurementsUsedByMixedModel: multi ? used : undefined, recruitmentForSameN: recruit }),
        citations: [DIGGLE_2002, LIANG_ZEGER_1986, SPIRIT_2013],
        levelIds: unit ? [unit.level.id] : undefined,
      },
    ];
  },
};
