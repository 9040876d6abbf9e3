/**
 * The effect on a yes-or-no outcome, in the four ways researchers state it: the proportion p2
 * expected under the intervention, the difference p2 − p1, the risk ratio p2/p1 or the odds
 * ratio [p2/(1 − p2)] / [p1/(1 − p1)]. Each determines p2 from p1:
 *   difference d:  p2 = p1 + d
 *   risk ratio r:  p2 = r·p1
 *   odds ratio ψ:  p2 = ψ·p1 / (1 − p1 + ψ·p1)
 * (definitions; e.g. Fleiss, Levin & Paik 2003, ch. 7). The calculations work on p2; their
 * results report all four.
 *
 * Valid range: 0 < p1 < 1; a difference or risk ratio that puts p2 at or beyond 0 or 1 is refused
 * with a CalculationInputError naming the field (an odds ratio in (0, ∞) always gives 0 < p2 < 1).
 */
import { inputError } from './errors';
import { formatNumber, SENTENCE_DIGITS } from '@/lib/format';

export const EFFECT_FIELDS = ['p2', 'difference', 'riskRatio', 'oddsRatio'] as const;
export type ProportionEffectField = (typeof EFFECT_FIELDS)[number];

export interface ProportionEffectInput {
  p1: number;
  p2?: number;
  difference?: number;
  riskRatio?: number;
  oddsRatio?: number;
}

/** The effect fields that are given. */
export function givenEffects(input: ProportionEffectInput): ProportionEffectField[] {
  return EFFECT_FIELDS.filter((name) => input[name] !== undefined);
}

/**
 * p2 from whichever one effect field is given, or undefined when none is. Throws when several
 * are given, or when the one given puts p2 outside (0, 1).
 */
export function p2FromEffect(input: ProportionEffectInput): number | undefined {
  const given = givenEffects(input);
  if (given.length > 1) {
    throw inputError(`Give the effect one way only: ${given.join(' or ')}, not both.`, given);
  }
  const field = given[0];
  if (field === undefined) return undefined;
  if (field === 'p2') return input.p2;
  const { p1 } = input;
  const p2 =
    field === 'difference'
      ? p1 + input.difference!
      : field === 'riskRatio'
        ? p1 * input.riskRatio!
        : (input.oddsRatio! * p1) / (1 - p1 + input.oddsRatio! * p1);
  if (!(p2 > 0 && p2 < 1)) {
    throw inputError(`With p1 = ${p1}, this ${field} puts the second proportion at ${formatNumber(p2, SENTENCE_DIGITS)}; it must lie between 0 and 1.`, [field]);
  }
  return p2;
}

export interface EffectMeasures {
  difference: number;
  riskRatio: number;
  oddsRatio: number;
}

/** The difference, risk ratio and odds ratio of p2 against p1. */
export function effectMeasures(p1: number, p2: number): EffectMeasures {
  return { difference: p2 - p1, riskRatio: p2 / p1, oddsRatio: (p2 / (1 - p2)) / (p1 / (1 - p1)) };
}
