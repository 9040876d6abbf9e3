/**
 * Explanatory variable observed over a narrower range than the one conclusions are wanted for.
 *
 * Triggers: a continuous explanatory variable with both its observed and its target range
 * given, where the target range reaches beyond the observed one.
 * Quantified: the share of the target range covered, and how much larger the slope's standard
 * error is than if the same number of values were spread over the target range in the same way
 * (Var(b) = σ²/Σ(x − x̄)², so the SE scales with 1/spread: target width / observed width).
 * A fitted line holds only where there are data (Gelman & Hill 2007, outside PRODUCT.md's list).
 */
import { GELMAN_HILL_2007 } from '@/lib/citations';
import { dec, numbers, pct } from './text';
import type { Finding, Rule } from './types';

const ID = 'narrow-range';

export const narrowRange: Rule = {
  id: ID,
  title: 'Explanatory variable observed over a narrow range',
  severity: 'warning',
  check(design) {
    const out: Finding[] = [];
    const seen = new Set<string>();
    for (const v of design.outcome.explanatoryVariables) {
      // Ids should be unique; if a design repeats one, the second keeps a distinct key.
      const key = seen.has(v.id) ? `${v.id}-${seen.size}` : v.id;
      const { observedMin: oMin, observedMax: oMax, targetMin: tMin, targetMax: tMax } = v;
      if (v.kind !== 'continuous' || oMin === undefined || oMax === undefined || tMin === undefined || tMax === undefined) continue;
      const tol = 1e-9 * Math.max(1, Math.abs(tMax - tMin));
      if (!(tMin < oMin - tol || tMax > oMax + tol)) continue;
      const tWidth = tMax - tMin;
      const oWidth = oMax - oMin;
      const covered = tWidth > 0 ? Math.max(0, Math.min(oMax, tMax) - Math.max(oMin, tMin)) / tWidth : 0;
      const seRatio = oWidth > 0 ? tWidth / oWidth : undefined;
      const name = v.name.length > 1 && v.name[1] === v.name[1]!.toLowerCase() ? v.name[0]!.toLowerCase() + v.name.slice(1) : v.name;
      seen.add(key);
      out.push({
        ruleId: ID,
        key,
        severity: 'warning',
        title: `Conclusions about ${name} wanted beyond the range studied`,
        found: `${v.name} will range from ${dec(oMin, 3)} to ${dec(oMax, 3)} in the study, but conclusions are wanted from ${dec(tMin, 3)} to ${dec(tMax, 3)}: the study covers ${pct(covered)} of the target range.`,
        why:
          `A fitted straight line describes the relationship only where there are data; outside that range the relationship may curve, level off or reverse, and nothing in the data can show it (${GELMAN_HILL_2007.short}). ` +
          (seRatio !== undefined
            ? `A narrow range also costs precision: the slope's standard error scales with 1 / (spread of the values), so spreading the same number of values over the target range in the same way would make it about ${dec(seRatio, 1)} times smaller.`
            : `With a single value of ${name} no slope can be estimated at all.`),
        todo: `Widen the range studied to cover ${dec(tMin, 3)}–${dec(tMax, 3)} if you can (values spread evenly, or more towards the ends); otherwise restrict the conclusions to ${dec(oMin, 3)}–${dec(oMax, 3)} and say so in the protocol.`,
        numbers: numbers({ observedMin: oMin, observedMax: oMax, targetMin: tMin, targetMax: tMax, targetRangeCovered: covered, slopeSeRatio: seRatio }),
        citations: [GELMAN_HILL_2007],
      });
    }
    return out;
  },
};
