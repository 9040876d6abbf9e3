/**
 * ICC missing or from an unreliable source (no source, an expert guess, low certainty).
 *
 * Triggers: a level that groups observations with no ICC (warning), or with an ICC whose source
 * is none or an expert guess, or whose certainty is low (advice).
 *
 * Quantified: the design effect of the level (`clusteringEffect`: Kish 1965, Eldridge et al.
 * 2006 for unequal sizes) over a sensitivity range — half to twice the value given (a
 * common-practice range), or the plausible range of `plausibleIccRange` when none is given — and
 * the ratio of high to low, which is the ratio of the numbers of units needed. Published ICCs
 * for the outcome and setting are the better source (Donner & Klar 2000; Hayes & Moulton 2017);
 * CONSORT's cluster extension asks trials to report the ICC and its uncertainty.
 *
 * Direction. All of the above holds where the treatment is compared between the level's units.
 * Where it is compared within them (`comparedWithin`) the direction reverses and no design effect
 * applies: for the experimental unit of a cross-over or within-unit design, the variance of the
 * within-unit comparison is proportional to 1 − ρ (exchangeable correlation; Senn 2002), so a
 * correlation guessed too high leaves the study underpowered — the finding quotes 1 − ρ over the
 * range, half the value to halfway between it and 1 (common practice). Levels above the
 * experimental unit get no finding: a term for them only removes variance, and a low guess costs
 * nothing.
 */
import { CONSORT_CLUSTER_2010, DONNER_KLAR_2000, HAYES_MOULTON_2017, SENN_2002 } from '@/lib/citations';
import { comparedWithin, designFacts, type DesignFacts, givenIccs, type IccValue, type LevelInfo, withinCorrelation } from '@/lib/design/facts';
import type { Design } from '@/lib/design/schema';
import { clusteringEffect, plausibleIccRange } from './clustering';
import { sourcePhrase, treatmentName } from './phrases';
import { cap, dec, noun, num, numbers } from './text';
import type { Finding, Rule } from './types';

const ID = 'uncertain-icc';

export const uncertainIcc: Rule = {
  id: ID,
  title: 'ICC missing or uncertain',
  severity: 'warning',
  check(design) {
    const f = designFacts(design);
    const B = f.bottom;
    if (!B) return [];
    const out: Finding[] = [];
    const others = givenIccs(f);
    if (f.subject && !f.subject.icc) {
      const r = withinCorrelation(f, f.subject);
      if (r) others.set(f.subject.level.id, r.value);
    }
    for (const L of f.levels) {
      if (!L.groupsObservations) continue;
      // The unit measured over time may have its correlation given as the occasion correlation instead.
      const icc = withinCorrelation(f, L);
      const weak = icc && (icc.source.kind === 'none' || icc.source.kind === 'expert' || icc.source.certainty === 'low');
      if (icc && !weak) continue;
      if (comparedWithin(f, L)) {
        // Above the experimental unit the ICC only says how much a term for the level removes: no design effect, no risk in a low guess.
        if (L === f.eu) out.push(withinFinding(design, f, L, icc));
        continue;
      }
      const restSum = [...others].filter(([id]) => id !== L.level.id).reduce((s, [, v]) => s + v, 0);
      const upper = Math.max(0, 1 - restSum);
      const [pLo, pHi] = plausibleIccRange(f, L);
      const lo = icc ? icc.value / 2 : Math.min(pLo, upper);
      const hi = icc ? Math.min(2 * icc.value, upper) : Math.min(pHi, upper);
      const at = (v: number) => clusteringEffect(f, L.index, B.index, new Map([...others, [L.level.id, v]]));
      const low = at(lo);
      const high = at(hi);
      const mid = icc ? at(icc.value) : undefined;
      if (!low || !high) continue;
      const ratio = high.designEffect / low.designEffect;
      const per = `${dec(L.obsPerUnit)} ${noun(B.level, true)} per ${noun(L.level)}`;
      out.push({
        ruleId: ID,
        key: L.level.id,
        severity: icc ? 'advice' : 'warning',
        title: icc ? `The ICC for ${noun(L.level, true)} is uncertain` : `No ICC for ${noun(L.level, true)}`,
        found: icc
          ? `The ICC for ${noun(L.level, true)} (${dec(icc.value, 3)}${L.icc ? '' : `, taken from the correlation between occasions of one ${noun(L.level)}`}) comes from ${sourcePhrase(icc.source)}.`
          : `No ICC is given for ${noun(L.level, true)}, which hold ${per}.`,
        why:
          `The ICC drives the design effect and so the number of ${noun(L.level, true)} needed. With ${per}, the design effect is ${dec(low.designEffect, 2)} at an ICC of ${dec(lo, 3)}` +
          (mid ? `, ${dec(mid.designEffect, 2)} at ${dec(icc!.value, 3)}` : '') +
          ` and ${dec(high.designEffect, 2)} at ${dec(hi, 3)}: the sample needed differs by a factor of ${dec(ratio, 1)} across this range` +
          (icc ? ' (half to twice the value given, a common sensitivity range).' : ' (a range common in practice, not a value for this study).') +
          ' ICCs estimated from small pilots are very imprecise, and one guessed too low leaves the study underpowered.',
        todo: `Look for published ICCs for this outcome in similar settings (trial reports and reviews give them; CONSORT's extension for cluster trials asks trials to report them), record the source, plan for the upper part of the range, and show the sample size over the range on the Plan tab.`,
        numbers: numbers({ icc: icc?.value, iccLow: lo, iccHigh: hi, designEffectLow: low.designEffect, designEffect: mid?.designEffect, designEffectHigh: high.designEffect, sampleSizeRatio: ratio }),
        citations: [DONNER_KLAR_2000, HAYES_MOULTON_2017, CONSORT_CLUSTER_2010],
        levelIds: [L.level.id],
      });
    }
    return out;
  },
};

/** The experimental unit receives every arm: a higher correlation within it helps the comparison. */
function withinFinding(design: Design, f: DesignFacts, L: LevelInfo, icc: IccValue | undefined): Finding {
  const [pLo, pHi] = plausibleIccRange(f, L);
  // Capped at 0.95, so that 1 − ρ (and the ratio) stays finite for a correlation given as 1.
  const hi = Math.min(icc ? (1 + icc.value) / 2 : pHi, 0.95);
  const lo = Math.min(icc ? icc.value / 2 : pLo, hi);
  const ratio = (1 - lo) / (1 - hi);
  const who = noun(L.level);
  const whoPlural = noun(L.level, true);
  return {
    ruleId: ID,
    key: L.level.id,
    severity: icc ? 'advice' : 'warning',
    title: icc ? `The correlation within ${whoPlural} is uncertain` : `No correlation within ${whoPlural}`,
    found: icc
      ? `The ${L.icc ? 'ICC' : 'occasion correlation'} for ${whoPlural} (${dec(icc.value, 3)}), the correlation between two measurements of one ${who}, comes from ${sourcePhrase(icc.source)}.`
      : `No ICC is given for ${whoPlural}: the correlation between two measurements of one ${who} is unknown.`,
    why:
      `${cap(treatmentName(design))} is compared within ${whoPlural}: each of the ${num(L.total)} ${whoPlural} receives every arm, so differences between ${whoPlural} drop out and no design effect applies. ` +
      `Here a higher correlation helps: the variance of the within-${who} comparison is proportional to 1 − ρ, which is ${dec(1 - lo, 2)} at a correlation of ${dec(lo, 3)}${icc ? `, ${dec(1 - icc.value, 2)} at ${dec(icc.value, 3)}` : ''} and ${dec(1 - hi, 2)} at ${dec(hi, 3)}: the number of ${whoPlural} needed differs by a factor of ${dec(ratio, 1)} across this range` +
      (icc ? ' (from half the value given to halfway between it and 1, a common-practice range).' : ' (a range common in practice for repeated measurements of one unit, not a value for this study).') +
      ` A correlation guessed too high leaves the study underpowered; one guessed too low only makes it cautious.`,
    todo: `Take the correlation from a pilot or published data on the same measurement repeated within ${whoPlural}, record the source, plan for the lower part of the range, and show the sample size over the range on the Plan tab.`,
    numbers: numbers({ icc: icc?.value, iccLow: lo, iccHigh: hi, varianceFactorLow: 1 - lo, varianceFactor: icc ? 1 - icc.value : undefined, varianceFactorHigh: 1 - hi, sampleSizeRatio: ratio }),
    citations: [SENN_2002],
    levelIds: [L.level.id],
  };
}
