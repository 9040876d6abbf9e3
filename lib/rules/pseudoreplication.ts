/**
 * Pseudoreplication: technical replicates or sub-samples of one unit (leaves of a plant, wells
 * of a sample, sections of a brain) counted as if they were independent units.
 *
 * Triggers: a replicate level with more than one replicate per unit. Warning when the analysis
 * counts the replicates as n (unit of analysis at the replicate level, or a plan that does not
 * account for the replicated unit); advice otherwise, since the replicates still do not add units.
 *
 * Quantified: the correlation between two replicates of one unit is the sum of the ICCs of that
 * unit and of the levels above it (they share all those effects); the design effect of k
 * replicates is 1 + ((cv² + 1)·k − 1)·ρ (Kish 1965; Eldridge et al. 2006 for unequal numbers), so
 * k replicates are worth k/DE independent measurements (Hurlbert 1984; Lazic 2010). Without an
 * ICC, over a plausible range 0.2–0.8 (common practice), said to be a range.
 */
import { designEffect } from '@/lib/stats/design-effect';
import { HURLBERT_1984, KISH_1965, LAZIC_2010 } from '@/lib/citations';
import { accountsFor, designFacts, iccOf, sizeCv } from '@/lib/design/facts';
import { modelPlan } from './model';
import { range } from './phrases';
import { cap, count, dec, list, noun, num, numbers } from './text';
import type { Finding, Rule } from './types';

const ID = 'pseudoreplication';

export const pseudoreplication: Rule = {
  id: ID,
  title: 'Technical replicates or sub-samples counted as n',
  severity: 'warning',
  check(design) {
    const f = designFacts(design);
    const out: Finding[] = [];
    for (const R of f.levels) {
      if (R.level.kind !== 'replicate' || R.index === 0 || !(R.perParent > 1)) continue;
      const P = f.levels[R.index - 1]!;
      const k = R.perParent;
      const cv = sizeCv(f, P.index, R.index);
      const counted = f.unitOfAnalysis ? f.unitOfAnalysis.index >= R.index : f.planGiven && !accountsFor(f, P);
      const E = f.eu && f.eu.index < P.index ? f.eu : undefined;

      const ancestors = f.levels.slice(0, P.index + 1).filter((l) => iccOf(f, l.level.id));
      const rho = ancestors.reduce((s, l) => s + iccOf(f, l.level.id)!.value, 0);
      let quant: string;
      let nums: Record<string, number>;
      if (ancestors.length > 0 && rho <= 1) {
        const de = designEffect({ clusterSize: k, icc: rho, cv });
        const from = list(ancestors.map((l) => `${dec(iccOf(f, l.level.id)!.value, 3)} for ${noun(l.level, true)}`));
        quant =
          `Two ${noun(R.level, true)} of the same ${noun(P.level)} correlate about ${dec(rho, 2)} (the ICCs ${from} added up: they share all those effects). ` +
          `The design effect of ${dec(k)} ${noun(R.level, true)} per ${noun(P.level)} is ${dec(de)}, so they are worth about ${dec(k / de)} independent ${noun(R.level, true)}, not ${dec(k)}.`;
        nums = numbers({ replicatesPerUnit: k, units: P.total, measurements: R.total, withinUnitCorrelation: rho, designEffect: de, effectiveReplicatesPerUnit: k / de });
      } else {
        const lo = designEffect({ clusterSize: k, icc: 0.2, cv });
        const hi = designEffect({ clusterSize: k, icc: 0.8, cv });
        quant = `No ICC is given for ${noun(P.level, true)}. Over a plausible correlation of 0.2 to 0.8 between ${noun(R.level, true)} of one ${noun(P.level)} (common in practice, not a value for this study), the design effect is ${range(lo, hi)}: the ${dec(k)} ${noun(R.level, true)} are worth ${range(k / lo, k / hi)} independent ones.`;
        nums = numbers({ replicatesPerUnit: k, units: P.total, measurements: R.total, designEffectLow: lo, designEffectHigh: hi });
      }
      const model = modelPlan(design).formula;
      out.push({
        ruleId: ID,
        key: R.level.id,
        severity: counted ? 'warning' : 'advice',
        title: `${cap(noun(R.level, true))} are sub-samples of a ${noun(P.level)}, not independent units`,
        found:
          `Each ${noun(P.level)} gives ${num(k)} ${noun(R.level, k !== 1)}: ${num(R.total)} measurements from ${count(P.total, P.level)}.` +
          (counted ? ` The plan counts the ${num(R.total)} ${noun(R.level, true)} as n.` : ''),
        why:
          `${cap(noun(R.level, true))} of one ${noun(P.level)} share everything that happened to that ${noun(P.level)}; counting them as independent is pseudoreplication, and it makes standard errors too small and p-values too low (${HURLBERT_1984.short}; ${LAZIC_2010.short}). ${quant} ` +
          `More ${noun(R.level, true)} make each ${noun(P.level)}'s value more precise; they do not add ${noun(P.level, true)}.` +
          (E ? ` And since ${noun(E.level, true)}, not ${noun(P.level, true)}, receive the treatment, the ${count(E.total, E.level)} are what counts for the comparison.` : ''),
        todo:
          `Count ${E ? noun(E.level, true) : noun(P.level, true)} as n: average the ${noun(R.level, true)} of each ${noun(P.level)}, or model them with a random intercept for ${noun(P.level)}${E ? ` nested in ${noun(E.level)}` : ''}, \`${model}\`. ` +
          `Use the replicates to judge measurement error, and plan the number of ${E ? noun(E.level, true) : noun(P.level, true)}, not of ${noun(R.level, true)}.`,
        model,
        numbers: nums,
        citations: [HURLBERT_1984, LAZIC_2010, KISH_1965],
        levelIds: [P.level.id, R.level.id],
      });
    }
    return out;
  },
};
