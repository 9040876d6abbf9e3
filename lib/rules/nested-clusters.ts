/**
 * Units nested in clusters: a grouping level (classroom, tray, litter, site) holds several units
 * of the level below, so their outcomes are correlated.
 *
 * Triggers: each grouping level that holds more than one observation spread over more than one
 * unit below it (pairs and families are left to `pairs-and-blocks`). Warning while the analysis plan does not account for the level (or is not
 * written yet); advice, as a reminder for the sample size, when it does.
 *
 * Quantified: the design effect of comparing units of this level, 1 + ((cv² + 1)·m − 1)·ρ
 * (Kish 1965; Eldridge, Ashby & Kerry 2006 for unequal sizes), with the ICCs of nested levels
 * below included (1 + Σ(mₖ − 1)ρₖ), and the effective number of independent observations N/DE.
 * Without an ICC, over a plausible range (`plausibleIccRange`), said to be a range. No design
 * effect for a level the treatment is compared within (`comparedWithin`: above the experimental
 * unit, or the unit itself in a cross-over): there the ICC is the share of variance a term for
 * the level removes, and a higher one helps.
 */
import { effectiveSampleSize } from '@/lib/stats/design-effect';
import { DONNER_KLAR_2000, ELDRIDGE_2006, HAYES_MOULTON_2017, KISH_1965 } from '@/lib/citations';
import { accountsFor, comparedWithin, designFacts, givenIccs, iccOf, sizeCv, type LevelInfo } from '@/lib/design/facts';
import { clusteringEffect, plausibleIccRange } from './clustering';
import { modelPlan } from './model';
import { range, treatmentName } from './phrases';
import { cap, count, dec, list, noun, num, numbers, pct } from './text';
import type { Finding, Rule } from './types';

const ID = 'nested-clusters';

export const nestedClusters: Rule = {
  id: ID,
  title: 'Units nested in clusters',
  severity: 'warning',
  check(design) {
    const f = designFacts(design);
    const B = f.bottom;
    if (!B) return [];
    const out: Finding[] = [];
    for (const L of f.levels) {
      // Pairs and families are the subject of `pairs-and-blocks`.
      if (L.level.kind !== 'grouping' || !L.groupsObservations || L.level.groupingType === 'pair' || L.level.groupingType === 'family') continue;
      const child = f.levels[L.index + 1]!;
      const obs = noun(B.level, true);
      const handled = f.planGiven && accountsFor(f, L);
      const cv = sizeCv(f, L.index, B.index);
      const icc = iccOf(f, L.level.id);
      const role = roleOf(f, L);
      const found =
        `${cap(noun(child.level, true))} are nested in ${noun(L.level, true)}: ${count(L.total, L.level)} with ${num(child.perParent)} ${noun(child.level, child.perParent !== 1)} each` +
        `${cv > 0 ? ' on average' : ''}${B !== child ? ` (${num(f.totalObs)} ${obs} in all)` : ` (${num(f.totalObs)} in all)`}.`;
      let quant: string;
      let nums: Record<string, number>;
      const within = comparedWithin(f, L);
      const deText = (de: number) => `the ${num(f.totalObs)} ${obs} carry about as much information as ${num(Math.round(effectiveSampleSize(f.totalObs, de)))} independent ones`;
      if (within) {
        // The treatment is compared within these units: no design effect applies to the comparison.
        quant = icc
          ? `The ICC for ${noun(L.level, true)} is ${dec(icc.value, 3)}: ${pct(icc.value)} of the variance in the outcome lies between ${noun(L.level, true)}. No design effect applies to the comparison of ${treatmentName(design)}: a term for ${noun(L.level)} in the model removes that share from the residual variance (leaving ${dec(1 - icc.value, 3)} of it), so a higher ICC here adds precision rather than costing it.`
          : `No ICC is given for ${noun(L.level, true)}; the number of units needed does not hang on it, as no design effect applies to the comparison of ${treatmentName(design)}.`;
        nums = numbers({ clusters: L.total, perCluster: L.obsPerUnit, icc: icc?.value, residualVarianceFactor: icc ? 1 - icc.value : undefined });
      } else if (icc) {
        const e = clusteringEffect(f, L.index, B.index, givenIccs(f));
        const lowerIccs = list(f.levels.slice(L.index + 1, B.index).filter((l) => iccOf(f, l.level.id)).map((l) => noun(l.level, true)));
        if (e) {
          quant = `The ICC for ${noun(L.level, true)} is ${dec(icc.value, 3)}: ${pct(icc.value)} of the variance in the outcome lies between ${noun(L.level, true)}. With about ${dec(L.obsPerUnit)} ${obs} per ${noun(L.level)} the design effect is ${dec(e.designEffect)}${lowerIccs ? ` (counting the ICCs of ${lowerIccs} as well)` : ''}, so for a comparison between ${noun(L.level, true)} ${deText(e.designEffect)}.`;
          nums = numbers({ clusters: L.total, perCluster: L.obsPerUnit, icc: icc.value, designEffect: e.designEffect, effectiveN: effectiveSampleSize(f.totalObs, e.designEffect), sizeCv: cv });
        } else {
          quant = 'The ICCs given add up to more than 1, so the design effect cannot be computed; check them on the Assumptions step.';
          nums = numbers({ clusters: L.total, perCluster: L.obsPerUnit, icc: icc.value });
        }
      } else {
        const [lo, hi] = plausibleIccRange(f, L);
        const at = (v: number) => clusteringEffect(f, L.index, B.index, new Map([...givenIccs(f), [L.level.id, v]]));
        const low = at(lo);
        const high = at(hi);
        if (low && high) {
          quant = `No ICC is given for ${noun(L.level, true)}; over a plausible range of ${lo} to ${hi} (common in practice, not a value for this study) the design effect of ${dec(L.obsPerUnit)} ${obs} per ${noun(L.level)} is ${range(low.designEffect, high.designEffect)}.`;
          nums = numbers({ clusters: L.total, perCluster: L.obsPerUnit, iccLow: lo, iccHigh: hi, designEffectLow: low.designEffect, designEffectHigh: high.designEffect });
        } else {
          quant = 'The ICCs given add up to more than 1, so the design effect cannot be computed; check them on the Assumptions step.';
          nums = numbers({ clusters: L.total, perCluster: L.obsPerUnit });
        }
      }
      const why =
        `${cap(noun(child.level, true))} in the same ${noun(L.level)} share its conditions and are more alike than ${noun(child.level, true)} in different ${noun(L.level, true)}, so their outcomes are correlated. ${quant} ` +
        (within
          ? `${cap(noun(L.level, true))} ${role === 'above' ? 'are above the level of assignment' : 'each receive every arm'}: the treatment is compared within them, so differences between ${noun(L.level, true)} do not bias the comparison, but left out of the model they add to the residual variance and cost power.`
          : 'Any analysis that treats them as independent overstates the precision of the comparison, and the sample size must be planned for the design effect.');
      const plan = modelPlan(design);
      const model = plan.formula;
      const fixedHere = plan.fixedLevels.includes(L);
      const term = fixedHere ? `a fixed effect, as there are too few ${noun(L.level, true)} for a random intercept:` : 'a random intercept';
      const plannedFixed = (design.analysis.fixedEffectLevels ?? []).includes(L.level.id);
      const todo = handled
        ? fixedHere && !plannedFixed
          ? `The plan accounts for this with a random intercept; with only ${count(L.total, L.level)}, give ${noun(L.level)} a fixed effect instead (\`${model}\`).`
          : `The plan accounts for this. Keep it${within ? '.' : ', and base the sample size on the design effect (Plan tab).'}`
        : fixedHere
          ? `Give ${noun(L.level)} ${term} \`${model}\`.`
          : `Give ${noun(L.level)} ${term} (\`${model}\`)${within ? '.' : ', and base the sample size on the design effect.'}`;
      out.push({
        ruleId: ID,
        key: L.level.id,
        severity: handled ? 'advice' : 'warning',
        title: `${cap(noun(child.level, true))} nested in ${noun(L.level, true)}`,
        found,
        why,
        todo,
        model,
        numbers: nums,
        citations: [KISH_1965, ELDRIDGE_2006, DONNER_KLAR_2000, HAYES_MOULTON_2017],
        levelIds: [L.level.id, child.level.id],
      });
    }
    return out;
  },
};

function roleOf(f: ReturnType<typeof designFacts>, L: LevelInfo): 'above' | 'unit' | 'below' | 'unknown' {
  if (!f.eu) return 'unknown';
  return L.index < f.eu.index ? 'above' : L.index === f.eu.index ? 'unit' : 'below';
}
