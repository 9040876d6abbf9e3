/**
 * Unequal cluster sizes: clusters of unequal size carry less information than equal ones of the
 * same mean size, so the design effect is larger.
 *
 * Triggers: a grouping level, or an experimental unit that holds several observations, whose
 * number of observations per unit varies (CV > 0, from the countCv of the levels below; see
 * `sizeCv`), and the treatment is compared between its units (not within them: `comparedWithin`). Warning when the extra inflation is 10% or more, advice below (a common-practice cut).
 *
 * Quantified: DE = 1 + ((cv² + 1)·m − 1)·ρ against 1 + (m − 1)·ρ with equal sizes (Eldridge,
 * Ashby & Kerry 2006; Kish 1965), their ratio (the extra inflation, and the extra clusters needed
 * for the same precision when the level is the unit of assignment). Without an ICC, over a
 * plausible range. Eldridge et al. note the formula is conservative when the analysis weights
 * clusters efficiently.
 */
import { ELDRIDGE_2006, KISH_1965 } from '@/lib/citations';
import { comparedWithin, designFacts, givenIccs, iccOf, sizeCv } from '@/lib/design/facts';
import { clusteringEffect, plausibleIccRange } from './clustering';
import { cap, dec, noun, num, numbers, pct } from './text';
import type { Finding, Rule } from './types';

const ID = 'unequal-cluster-sizes';

export const unequalClusterSizes: Rule = {
  id: ID,
  title: 'Unequal cluster sizes',
  severity: 'warning',
  check(design) {
    const f = designFacts(design);
    const B = f.bottom;
    if (!B) return [];
    const out: Finding[] = [];
    for (const L of f.levels) {
      if (!L.groupsObservations || (L.level.kind !== 'grouping' && L !== f.eu)) continue;
      // Compared within these units, no design effect applies (uncertain-icc and nested-clusters say so).
      if (comparedWithin(f, L)) continue;
      const cv = sizeCv(f, L.index, B.index);
      if (!(cv > 0)) continue;
      const icc = iccOf(f, L.level.id);
      const obs = noun(B.level, true);
      const isUnit = L === f.eu && !f.withinUnit;
      const found = `${cap(noun(L.level))} sizes vary: about ${dec(L.obsPerUnit)} ${obs} per ${noun(L.level)} on average, with a coefficient of variation (CV, the SD of the sizes divided by their mean) of ${dec(cv, 2)}.`;
      const evaluate = (value: number) => clusteringEffect(f, L.index, B.index, new Map([...givenIccs(f), [L.level.id, value]]));
      let why: string;
      let nums: Record<string, number>;
      let extra: number;
      if (icc) {
        const e = evaluate(icc.value);
        if (!e) continue;
        extra = e.designEffect / e.equalSizes - 1;
        why =
          `Unequal clusters carry less information than equal ones of the same average size. At the ICC of ${dec(icc.value, 3)}, the design effect rises from ${dec(e.equalSizes, 2)} with equal sizes to ${dec(e.designEffect, 2)} with a CV of ${dec(cv, 2)} (1 + ((CV² + 1)·m − 1)·ICC, ${ELDRIDGE_2006.short}): ${pct(extra)} more` +
          (isUnit ? `, so about ${num(Math.ceil(L.total * (1 + extra) - 1e-9))} ${noun(L.level, true)} give the precision that ${num(L.total)} equal ones would.` : '.') +
          ' The formula is conservative when the analysis weights clusters efficiently (a mixed model does).';
        nums = numbers({ sizeCv: cv, meanClusterSize: L.obsPerUnit, icc: icc.value, designEffect: e.designEffect, designEffectEqualSizes: e.equalSizes, extraInflation: extra, clustersForSamePrecision: isUnit ? L.total * (1 + extra) : undefined });
      } else {
        const [lo, hi] = plausibleIccRange(f, L);
        const a = evaluate(lo);
        const b = evaluate(hi);
        if (!a || !b) continue;
        const ea = a.designEffect / a.equalSizes - 1;
        const eb = b.designEffect / b.equalSizes - 1;
        extra = Math.max(ea, eb);
        why = `Unequal clusters carry less information than equal ones of the same average size. No ICC is given; over a plausible range of ${lo} to ${hi} (common practice, not a value for this study), a CV of ${dec(cv, 2)} raises the design effect by ${pct(ea)} to ${pct(eb)} over equal sizes (${ELDRIDGE_2006.short}).`;
        nums = numbers({ sizeCv: cv, meanClusterSize: L.obsPerUnit, iccLow: lo, iccHigh: hi, extraInflationLow: ea, extraInflationHigh: eb });
      }
      out.push({
        ruleId: ID,
        key: L.level.id,
        severity: extra >= 0.1 ? 'warning' : 'advice',
        title: `Unequal ${noun(L.level)} sizes inflate the design effect`,
        found,
        why,
        todo: `Use the design effect for unequal sizes when planning the number of ${noun(L.level, true)}, and give the expected CV of ${noun(L.level)} sizes in the protocol, with its source.`,
        numbers: nums,
        citations: [ELDRIDGE_2006, KISH_1965],
        levelIds: [L.level.id],
      });
    }
    return out;
  },
};
