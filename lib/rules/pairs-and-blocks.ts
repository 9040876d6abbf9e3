/**
 * Pairs, matched sets, blocks, strata, families or twins that the analysis ignores.
 *
 * Triggers:
 * - `blocking`: randomisation is paired, matched, blocked or stratified and the factor is not in
 *   the analysis. The analysis carries it when the Assignment step says so, when the planned model
 *   has a fixed or random term for it (`analysis.blockEffect`, or a random intercept or fixed
 *   effect for a level of that name), when a paired t-test pairs on it, or — with no analysis
 *   planned yet — when the recommended model has the term (it always does: `model.ts`). Warning for pairs and matched sets (the pairing is the design's main source of
 *   precision), advice for blocks and strata (leaving them out makes the test conservative and
 *   wastes the precision they bought). Donner & Klar 2000; Hayes & Moulton 2017.
 * - a grouping level of type pair or family (twins, siblings) that holds several units and is
 *   not accounted for: warning; members are correlated, so the analysis is paired or has a random
 *   intercept for the pair (Bates et al. 2015).
 */
import { BATES_2015, DONNER_KLAR_2000, HAYES_MOULTON_2017 } from '@/lib/citations';
import { accountsFor, designFacts } from '@/lib/design/facts';
import { modelPlan } from './model';
import type { Design } from '@/lib/design/schema';
import { cap, count, identifier, noun, num } from './text';
import type { Finding, Rule } from './types';

const ID = 'pairs-and-blocks';

export const pairsAndBlocks: Rule = {
  id: ID,
  title: 'Pairs, matched sets or blocks not in the analysis',
  severity: 'warning',
  check(design) {
    const f = designFacts(design);
    const b = design.assignment.blocking;
    const out: Finding[] = [];
    const plan = modelPlan(design);
    const model = plan.formula;
    if (b.kind !== 'none' && !blockingInAnalysis(design)) {
      const paired = b.kind === 'paired' || b.kind === 'matched';
      const factor = b.factor ? b.factor.trim() : undefined;
      const factorText = factor ? ` by ${factor[0]!.toLowerCase() + factor.slice(1)}` : '';
      out.push({
        ruleId: ID,
        key: 'blocking',
        severity: paired ? 'warning' : 'advice',
        title: paired ? 'Matching not used in the analysis' : 'Stratification or blocking not in the analysis',
        found: `Randomisation is ${b.kind}${factorText}, but the analysis plan does not include ${factor ? 'this factor' : 'the pairs or blocks'}.`,
        why: paired
          ? `Matching makes the members of a pair alike on purpose, so a paired analysis removes the variance between pairs. An unpaired analysis throws that precision away; in cluster trials with few pairs, the choice between a paired and an unpaired analysis also changes the degrees of freedom and the power markedly (${DONNER_KLAR_2000.short}).`
          : `Stratified or blocked randomisation balances the arms on the stratification factor, and the analysis should reflect how the arms were formed. Leaving the factor out makes the standard errors too large — the test is conservative — and wastes the precision the stratification bought (${HAYES_MOULTON_2017.short}).`,
        todo: paired
          ? `Analyse the pairs: a paired analysis, or a random intercept (or fixed effect) for the pair in the model: \`${model}\`.`
          : `Include ${factor ? factor[0]!.toLowerCase() + factor.slice(1) : 'the stratification factor'} as a fixed effect (with few strata) or a random intercept (with many): \`${model}\`.`,
        model,
        citations: [DONNER_KLAR_2000, HAYES_MOULTON_2017],
      });
    }
    for (const L of f.levels) {
      if (L.level.kind !== 'grouping' || (L.level.groupingType !== 'pair' && L.level.groupingType !== 'family') || !L.groupsObservations) continue;
      if (f.planGiven && accountsFor(f, L)) continue;
      const child = f.levels[L.index + 1]!;
      const kind = L.level.groupingType === 'pair' ? 'pair' : 'family';
      out.push({
        ruleId: ID,
        key: L.level.id,
        severity: 'warning',
        title: `${cap(noun(child.level, true))} come in ${kind === 'pair' ? 'pairs' : 'families'}`,
        found: `The ${count(L.total, L.level)} each contribute ${num(child.perParent)} ${noun(child.level, child.perParent !== 1)}${f.planGiven ? ', and the analysis plan does not account for them' : ''}.`,
        why: `Members of a ${kind} share genes, upbringing, matching variables or environment, so their outcomes are correlated. Treated as independent, the comparison is wrong in one direction or the other: precision is overstated for effects that differ between ${kind === 'pair' ? 'pairs' : 'families'}, and the gain from comparing within them is lost.`,
        todo: `Use a paired analysis, or a random intercept for ${noun(L.level)}: \`${model}\`.`,
        model,
        citations: [BATES_2015, DONNER_KLAR_2000],
        levelIds: [L.level.id],
      });
    }
    return out;
  },
};

/** Does the planned (or, with none planned, the recommended) model carry the blocking factor? */
function blockingInAnalysis(design: Design): boolean {
  const b = design.assignment.blocking;
  const a = design.analysis;
  if (b.inAnalysis || a.blockEffect !== undefined) return true;
  if (a.method === undefined) return modelPlan(design).blockEffect !== undefined;
  if (a.method === 'paired-t-test' && (b.kind === 'paired' || b.kind === 'matched')) return true;
  const name = identifier(b.factor, b.kind === 'paired' || b.kind === 'matched' ? 'pair' : 'block');
  const f = designFacts(design);
  const level = f.levels.find((l) => identifier(l.level.name, '') === name);
  return level !== undefined && f.planGiven && accountsFor(f, level) && (a.randomIntercepts.includes(level.level.id) || (a.fixedEffectLevels ?? []).includes(level.level.id));
}
