/**
 * Many or unequally spaced occasions: the correlation between occasions needs a structure, and
 * a trajectory over time may not be a straight line.
 *
 * Triggers: at least 4 occasions, or 3 or more that are unequally spaced.
 * - `covariance` (advice): no covariance structure chosen yet (or independence). Exchangeable
 *   (one correlation for all pairs, what a random intercept implies) and AR(1) (correlation ρ^lag)
 *   need 2 parameters, unstructured needs T(T + 1)/2; AR(1) assumes equal spacing, otherwise a
 *   continuous-time (exponential) correlation. Diggle et al. 2002.
 * - `time-trend` (advice): the trajectory is of interest and time is modelled as a straight line
 *   (or not at all): splines or polynomial terms, and a random slope for time (Diggle et al. 2002).
 */
import { DIGGLE_2002 } from '@/lib/citations';
import { designFacts } from '@/lib/design/facts';
import { modelPlan } from './model';
import { cap, dec, noun, num, numbers } from './text';
import type { Finding, Rule } from './types';

const ID = 'many-occasions';

export const manyOccasions: Rule = {
  id: ID,
  title: 'Many or unequally spaced occasions',
  severity: 'advice',
  check(design) {
    const f = designFacts(design);
    const times = f.occasions.map((o) => o.time);
    const T = times.length;
    const gaps = times.slice(1).map((t, i) => t - times[i]!);
    const unequal = gaps.length >= 2 && gaps.some((g) => Math.abs(g - gaps[0]!) > 1e-9 * Math.max(1, Math.abs(gaps[0]!)));
    if (T < 4 && !(T >= 3 && unequal)) return [];
    const unitName = design.occasions.timeUnit;
    const unitFor = (n: number) => (Math.abs(n) === 1 && unitName.endsWith('s') ? unitName.slice(0, -1) : unitName);
    const S = f.subject ?? f.bottom;
    const who = S ? noun(S.level) : 'unit';
    const units = S?.total;
    const a = design.analysis;
    const unstructured = (T * (T + 1)) / 2;
    const spacing = unequal
      ? `at ${times.map((t) => dec(t, 2)).join(', ')} ${unitName} (unequally spaced)`
      : `from ${dec(times[0]!, 2)} to ${dec(times[T - 1]!, 2)} ${unitName}, ${dec(gaps[0] ?? 0, 2)} ${unitFor(gaps[0] ?? 0)} apart`;
    const found = `${cap(who === 'unit' ? 'each unit' : `each ${who}`)} is measured on ${num(T)} occasions, ${spacing}.`;
    const expected = design.occasions.correlationStructure;
    const out: Finding[] = [];

    if (a.covarianceStructure === 'not-applicable' || a.covarianceStructure === 'independence') {
      out.push({
        ruleId: ID,
        key: 'covariance',
        severity: 'advice',
        title: 'Choose how the occasions are correlated',
        found: found + (expected !== 'unknown' ? ` The design expects ${expected === 'ar1' ? 'an AR(1)' : 'an exchangeable'} correlation, but the analysis plan does not specify one.` : ' The analysis plan does not specify how the occasions are correlated.'),
        why:
          `Measurements close in time are usually more alike than distant ones, so one correlation for every pair of occasions is an assumption, not a given. ` +
          `Exchangeable correlation (the same for all pairs; what a random intercept alone implies) needs 2 parameters; AR(1) (correlation ρ, ρ², ρ³ … as occasions lie further apart) also needs 2; unstructured needs T(T + 1)/2 = ${num(unstructured)}` +
          (units !== undefined ? `, which ${units < 3 * unstructured ? `is a lot to estimate from ${num(units)} ${S ? noun(S.level, true) : 'units'}` : `${num(units)} ${S ? noun(S.level, true) : 'units'} can support`}` : '') +
          `. A wrong structure usually leaves the estimated effect close to right with complete data, but misstates its standard error and weakens the protection a mixed model gives when data are missing (${DIGGLE_2002.short}).` +
          (unequal ? ' AR(1) assumes equally spaced occasions; with unequal spacing use a continuous-time (exponential) correlation in the actual times.' : ''),
        todo: `Pre-specify the covariance structure${expected === 'ar1' ? ' (AR(1), as the design expects, on top of the random intercept)' : expected === 'exchangeable' ? ' (exchangeable, as the design expects)' : ''} and a sensitivity analysis under another structure, or robust standard errors.`,
        model: modelPlan(design).formula,
        numbers: numbers({ occasions: T, unstructuredParameters: unstructured, units }),
        citations: [DIGGLE_2002],
      });
    }

    if (design.occasions.trajectoryOfInterest && T >= 4 && (a.timeModel === 'not-applicable' || a.timeModel === 'linear')) {
      out.push({
        ruleId: ID,
        key: 'time-trend',
        severity: 'advice',
        title: 'The trajectory may not be a straight line',
        found: `${found} The trajectory over time is of interest, and the plan ${a.timeModel === 'linear' ? 'models time as a straight line' : 'does not say how time is modelled'}.`,
        why:
          `With ${num(T)} occasions a straight line is a strong assumption: growth often levels off, and responses often rise and fall. A linear term then misdescribes the trajectory and the comparison of arms over time. ` +
          `A natural cubic spline (here with 3 degrees of freedom) or a quadratic term lets the curve bend while keeping few parameters; a random slope for time lets each ${who} follow their own trajectory (${DIGGLE_2002.short}).`,
        todo: `Model time with a spline or polynomial term, with a random slope for time: \`${modelPlan(design).formula}\`. Fix the number of spline degrees of freedom in the protocol.`,
        model: modelPlan(design).formula,
        numbers: numbers({ occasions: T, splineDf: 3 }),
        citations: [DIGGLE_2002],
      });
    }
    return out;
  },
};
