/**
 * Outcome measured repeatedly on the same unit (a volunteer over nights, a pupil over terms).
 *
 * Triggers: a repeated level with more than one measurement per unit of the level above, or —
 * with no repeated level in the structure — two or more follow-up occasions, which measure the
 * bottom level repeatedly without the structure showing it. Warning unless the analysis accounts
 * for the measured unit; advice when it does.
 *
 * Quantified with the correlation ρ between measurements of one unit (the unit's ICC, else the
 * occasion correlation): for a comparison between units the design effect is 1 + (m − 1)·ρ
 * (Kish 1965) and the effective number of measurements N/DE; for a comparison within units the
 * between-unit variance drops out of the differences, leaving the factor 1 − ρ (Var(y₁ − y₂) =
 * 2σ²(1 − ρ) against 2σ² for two units; Diggle et al. 2002). Without either correlation, a
 * plausible range 0.2–0.8 (common practice), said to be a range. When the treatment varies
 * within the unit (cross-over) only the within-unit factor is quoted: no design effect applies.
 */
import { designEffect, effectiveSampleSize } from '@/lib/stats/design-effect';
import { BATES_2015, DIGGLE_2002, KISH_1965 } from '@/lib/citations';
import { accountsFor, comparedWithin, designFacts, iccOf } from '@/lib/design/facts';
import { modelPlan } from './model';
import { modelFor, outcomeName, range, treatmentName } from './phrases';
import { cap, count, dec, noun, num, numbers } from './text';
import type { Finding, Rule } from './types';

const ID = 'repeated-measures';

export const repeatedMeasures: Rule = {
  id: ID,
  title: 'Outcome measured repeatedly on the same unit',
  severity: 'warning',
  check(design) {
    const f = designFacts(design);
    const S = f.subject;
    if (!S) return [];
    const repeated = f.levels.find((l) => l.level.kind === 'repeated' && l.index === S.index + 1);
    const implicit = f.implicitRepeats;
    if (!implicit && !(repeated && repeated.perParent > 1)) return [];
    const m = implicit ? f.followUps.length : S.obsPerUnit;
    const measurements = implicit ? S.total * m : f.totalObs;
    const what = implicit ? 'measurement' : noun(repeated!.level);
    const whatPlural = implicit ? 'measurements' : noun(repeated!.level, true);

    const icc = iccOf(f, S.level.id)?.value;
    const rho = icc ?? design.assumptions.occasionCorrelation?.value;
    const between = !f.withinUnit && f.eu !== undefined && f.eu.index <= S.index;
    const within = comparedWithin(f, S);

    let quant: string;
    let nums: Record<string, number>;
    if (rho !== undefined && rho >= 0) {
      const de = designEffect({ clusterSize: Math.max(1, m), icc: rho });
      const source = icc !== undefined ? `the ICC for ${noun(S.level, true)}` : 'the occasion correlation';
      const share = `${dec(rho, 2)}, from ${source}`;
      const betweenText = `for a comparison between ${noun(S.level, true)} the design effect is 1 + (${dec(m)} − 1) × ${dec(rho, 2)} = ${dec(de)}, so the ${num(measurements)} ${whatPlural} count as about ${num(Math.round(effectiveSampleSize(measurements, de)))} independent ones`;
      const withinText = `for a comparison within ${noun(S.level, true)} the same correlation helps: the differences between ${noun(S.level, true)} drop out, leaving a share 1 − ρ = ${dec(1 - rho, 2)} of the variance of a comparison between them`;
      // Compared within the unit, no design effect applies: only the within-unit factor is quoted.
      quant = `The correlation between two ${whatPlural} of the same ${noun(S.level)} is ${share}. ${cap(within ? withinText : `${betweenText}; ${withinText}`)}.`;
      nums = within
        ? numbers({ units: S.total, measurementsPerUnit: m, measurements, correlation: rho, varianceFactorWithin: 1 - rho })
        : numbers({ units: S.total, measurementsPerUnit: m, measurements, correlation: rho, designEffectBetween: de, effectiveNBetween: effectiveSampleSize(measurements, de), varianceFactorWithin: 1 - rho });
    } else {
      const lo = designEffect({ clusterSize: Math.max(1, m), icc: 0.2 });
      const hi = designEffect({ clusterSize: Math.max(1, m), icc: 0.8 });
      const range02 = 'Over a plausible range of 0.2 to 0.8 (common in practice for repeated measurements of one unit, not a value for this study)';
      quant = within
        ? `No correlation between ${whatPlural} of the same ${noun(S.level)} is given. ${range02}, a comparison within ${noun(S.level, true)} keeps a share 1 − ρ, from 0.8 to 0.2, of the variance of a comparison between them: the higher the correlation, the more the within-${noun(S.level)} comparison gains.`
        : `No correlation between ${whatPlural} of the same ${noun(S.level)} is given. ${range02}, the design effect for a comparison between ${noun(S.level, true)} is ${range(lo, hi)}.`;
      nums = within
        ? numbers({ units: S.total, measurementsPerUnit: m, measurements, correlationLow: 0.2, correlationHigh: 0.8, varianceFactorWithinLow: 0.2, varianceFactorWithinHigh: 0.8 })
        : numbers({ units: S.total, measurementsPerUnit: m, measurements, correlationLow: 0.2, correlationHigh: 0.8, designEffectBetweenLow: lo, designEffectBetweenHigh: hi });
    }

    // With repeats the structure does not show, naming the measured level as the unit of
    // analysis does not average anything: only a model of the repeats accounts for them.
    const a = design.analysis;
    const modelsRepeats =
      ((a.method === 'mixed-model' || a.method === 'glmm') && a.randomIntercepts.includes(S.level.id)) ||
      a.method === 'gee' ||
      a.method === 'cluster-means' ||
      a.standardErrors === 'cluster-robust' ||
      a.standardErrors === 'cr2';
    const handled = f.planGiven && (implicit ? modelsRepeats : accountsFor(f, S));
    const model = modelPlan(design).formula;
    const found = implicit
      ? `The occasions list ${f.followUps.length} follow-up measurements of ${outcomeName(design)}, but the structure has no repeated level: each of the ${count(S.total, S.level)} would be measured ${f.followUps.length} times.`
      : repeated!.groupsObservations
        ? // The repeated level holds members (patients of a ward in each period): name both counts.
          `Each ${noun(S.level)} is measured in ${num(repeated!.perParent)} ${noun(repeated!.level, repeated!.perParent !== 1)}, ${num(f.levels[repeated!.index + 1]!.perParent)} ${noun(f.levels[repeated!.index + 1]!.level, f.levels[repeated!.index + 1]!.perParent !== 1)} in each: ${num(measurements)} measurements of ${outcomeName(design)} from ${count(S.total, S.level)}.`
        : `Each ${noun(S.level)} is measured on ${num(m)} ${whatPlural}: ${num(measurements)} measurements of ${outcomeName(design)} from ${count(S.total, S.level)}.`;
    const why =
      `Measurements of the same ${noun(S.level)} are correlated: a ${noun(S.level)} with a high score on one ${what} tends to have high scores on the others. They are not ${num(measurements)} independent observations. ${quant}` +
      (between ? ` Here ${treatmentName(design)} is compared between ${noun(S.level, true)}, so the ${count(S.total, S.level)} are the units that count.` : '') +
      (within ? ` Here ${treatmentName(design)} varies within each ${noun(S.level)}, so each ${noun(S.level)} serves as their own comparison.` : '');
    const todo = handled
      ? `The plan accounts for this. Keep the data in long format (one row per ${what}) and base the sample size on the ${count(S.total, S.level)}.`
      : (implicit ? `Add a repeated level (for example "Occasion") below ${noun(S.level)} in the structure, so the counts and checks include the repeated measurements, and analyse` : 'Analyse') +
        ` the ${whatPlural} of each ${noun(S.level)} together: ${modelFor(modelPlan(design), [S])}, \`${model}\`, with the data in long format (one row per ${what}).`;
    const finding: Finding = {
      ruleId: ID,
      key: implicit ? 'occasions' : repeated!.level.id,
      severity: handled ? 'advice' : 'warning',
      title: `${cap(noun(S.level, true))} measured repeatedly`,
      found,
      why,
      todo,
      model,
      numbers: nums,
      citations: [DIGGLE_2002, KISH_1965, BATES_2015],
      levelIds: implicit ? [S.level.id] : [S.level.id, repeated!.level.id],
    };
    return [finding];
  },
};
