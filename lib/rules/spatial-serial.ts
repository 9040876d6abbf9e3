/**
 * Units close in space or time (field plots, benches, consecutive days): neighbours are more
 * alike than distant units.
 *
 * Triggers: a level marked as spatial or serial with more than one unit.
 * - Serial (a repeated level): warning when a plan is given without an AR(1) structure, advice
 *   otherwise; silent when AR(1) is planned. With the occasion correlation ρ taken as the
 *   correlation of neighbours, AR(1) gives ρ^k at lag k, against ρ for every pair under a random
 *   intercept alone (Diggle et al. 2002).
 * - Spatial (any other level): advice to randomise and rotate positions, block by position, or
 *   model spatial correlation (Diggle et al. 2002 for correlation structures; Hurlbert 1984 on
 *   segregated layouts).
 */
import { DIGGLE_2002, HURLBERT_1984 } from '@/lib/citations';
import { designFacts } from '@/lib/design/facts';
import { modelPlan } from './model';
import { cap, count, dec, noun, num, numbers } from './text';
import type { Finding, Rule } from './types';

const ID = 'spatial-serial';

export const spatialSerial: Rule = {
  id: ID,
  title: 'Units close in space or time',
  severity: 'warning',
  check(design) {
    const f = designFacts(design);
    const out: Finding[] = [];
    const a = design.analysis;
    for (const L of f.levels) {
      if (!L.level.spatialOrSerial || !(L.total > 1)) continue;
      if (L.level.kind === 'repeated') {
        if (a.covarianceStructure === 'ar1') continue;
        const parent = L.index > 0 ? f.levels[L.index - 1]! : undefined;
        const k = Math.max(1, Math.round(L.perParent) - 1);
        const rho = design.assumptions.occasionCorrelation?.value;
        const lagText =
          rho !== undefined && rho > 0 && rho < 1
            ? ` Taking the occasion correlation ${dec(rho, 2)} as the correlation between neighbouring ${noun(L.level, true)}, an AR(1) structure gives ${dec(rho ** 2, 3)} for ${noun(L.level, true)} two apart and ${dec(rho ** k, 4)} for ${noun(L.level, true)} ${num(k)} apart, where a random intercept alone assumes the same correlation for every pair.`
            : '';
        out.push({
          ruleId: ID,
          key: L.level.id,
          severity: f.planGiven ? 'warning' : 'advice',
          title: `Consecutive ${noun(L.level, true)} are serially correlated`,
          found: `${cap(noun(L.level, true))} follow one another: ${parent ? `each ${noun(parent.level)} has ${num(L.perParent)} consecutive ${noun(L.level, true)}` : `${count(L.total, L.level)} in sequence`}${f.planGiven ? `, and the plan has ${a.covarianceStructure === 'not-applicable' ? 'no' : `an ${a.covarianceStructure}`} correlation structure over them` : ''}.`,
          why: `Measurements close in time are usually more alike than distant ones (serial correlation): a good or bad spell carries over to the next ${noun(L.level)}.${lagText} Ignoring it misstates standard errors, most for effects that change between neighbouring ${noun(L.level, true)}, such as a switch of arm between periods (${DIGGLE_2002.short}).`,
          todo: `Add an AR(1) correlation (or, with unequal spacing, a continuous-time exponential one) between ${noun(L.level, true)}${parent ? ` within ${noun(parent.level)}` : ''} on top of the random intercept — \`${modelPlan(design).formula}\` with AR(1) residuals — and check the conclusion under another structure.`,
          model: modelPlan(design).formula,
          numbers: numbers({ lag1Correlation: rho !== undefined && rho > 0 && rho < 1 ? rho : undefined, maxLag: k, correlationAtMaxLag: rho !== undefined && rho > 0 && rho < 1 ? rho ** k : undefined }),
          citations: [DIGGLE_2002],
          levelIds: [L.level.id],
        });
      } else {
        out.push({
          ruleId: ID,
          key: L.level.id,
          severity: 'advice',
          title: `${cap(noun(L.level, true))} are close together in space`,
          found: `The ${count(L.total, L.level)} are placed close together (for example on benches or in a field), so neighbours share conditions.`,
          why: `Neighbouring units share light, temperature, draughts, soil or handling; gradients along a bench or field make neighbours alike. If the arms are segregated in space, a gradient is confounded with the treatment (${HURLBERT_1984.short}); even when they are interspersed, correlation between neighbours makes the observations less independent than they look.`,
          todo: `Randomise the positions of ${noun(L.level, true)} (and re-randomise or rotate them during the study), block by bench or position and include the block in the model, or model spatial correlation (rows and columns, or distance). Record positions so this can be checked.`,
          citations: [HURLBERT_1984, DIGGLE_2002],
          levelIds: [L.level.id],
        });
      }
    }
    return out;
  },
};
