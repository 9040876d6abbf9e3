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
 */
import { CONSORT_CLUSTER_2010, DONNER_KLAR_2000, HAYES_MOULTON_2017 } from '@/lib/citations';
import { designFacts, givenIccs, iccOf } from '@/lib/design/facts';
import { clusteringEffect, plausibleIccRange } from './clustering';
import { sourcePhrase } from './phrases';
import { dec, noun, numbers } from './text';
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
    for (const L of f.levels) {
      if (!L.groupsObservations) continue;
      const icc = iccOf(f, L.level.id);
      const weak = icc && (icc.source.kind === 'none' || icc.source.kind === 'expert' || icc.source.certainty === 'low');
      if (icc && !weak) continue;
      const restSum = [...others].filter(([id]) => id !== L.level.id).reduce((s, [, v]) => s + v, 0);
      const cap = Math.max(0, 1 - restSum);
      const [pLo, pHi] = plausibleIccRange(L.level);
      const lo = icc ? icc.value / 2 : Math.min(pLo, cap);
      const hi = icc ? Math.min(2 * icc.value, cap) : Math.min(pHi, cap);
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
          ? `The ICC for ${noun(L.level, true)} (${dec(icc.value, 3)}) comes from ${sourcePhrase(icc.source)}.`
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
