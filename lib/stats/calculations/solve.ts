/**
 * Solving for the one missing quantity: which one it is, the smallest whole size that reaches a
 * target power (bounded doubling, then bisection) and the effect that gives it (Brent's method).
 */
import { brentRoot } from '@/lib/stats/root';
import type { Feasibility } from './types';
import { inputError } from './errors';

import { givenEffects, type ProportionEffectInput } from './proportion-effect';
import { formatNumber, SENTENCE_DIGITS } from '@/lib/format';

/**
 * The quantity to solve for: the one of `solvable` that is missing (`present[name]` false), or
 * the one named in `solveFor` (its value, if given, is ignored). Throws CalculationInputError
 * when none or several are missing, or when `solveFor` names something else.
 */
export function findUnknown(solvable: readonly string[], present: Record<string, boolean>, solveFor: string | undefined): string {
  const list = solvable.join(', ');
  if (solveFor !== undefined) {
    if (!solvable.includes(solveFor)) {
      throw inputError(`solveFor must be one of ${list}.`, ['solveFor']);
    }
    const missing = solvable.filter((name) => name !== solveFor && !present[name]);
    if (missing.length > 0) {
      throw inputError(`Give ${missing.join(' and ')} to solve for ${solveFor}.`, missing);
    }
    return solveFor;
  }
  const missing = solvable.filter((name) => !present[name]);
  if (missing.length === 1) return missing[0]!;
  if (missing.length === 0) {
    throw inputError(`Leave out one of ${list} (or name it in solveFor) to solve for it.`, [...solvable]);
  }
  throw inputError(`Only one of ${list} can be solved for; ${missing.join(', ')} are all missing. Give all but one.`, missing);
}

/**
 * Refuses a target power at or below the adjusted significance level: a two-sided test that
 * counts both tails has that power with no effect at all, so no size or effect is needed to
 * reach it (for the one-tail normal formulas the floor is α/2; α is kept as the one rule for
 * every kind). The schema keeps power below 1.
 */
export function requireTargetPower(power: number, alphaAdjusted: number): void {
  if (!(power > alphaAdjusted)) {
    throw inputError(
      `power (${formatNumber(power, SENTENCE_DIGITS)}) must be above the significance level the test is planned at (${formatNumber(alphaAdjusted, SENTENCE_DIGITS)}): ` +
        'a test has that much power with no effect at all.',
      ['power'],
    );
  }
}

export interface SizeSolution {
  size: number;
  /** Power at `size`. */
  power: number;
  feasibility: Feasibility;
}

/**
 * The smallest whole n in [min, max] with powerAt(n) ≥ target, for a power that does not
 * decrease with n.
 *
 * Search: powerAt(min) ≥ target → 'already-met' at min. Otherwise a bracket lo < n ≤ hi with
 * powerAt(lo) < target ≤ powerAt(hi) is grown by doubling steps — from min, or outwards from
 * `guess` (e.g. the normal-approximation size) when one is given — and bisection then closes it
 * to hi = lo + 1: at most about 2·log2(max) + 2 evaluations, a handful with a close guess.
 * powerAt(max) < target → 'unreachable' with max and its power.
 */
export function solveSize(powerAt: (n: number) => number, target: number, min: number, max: number, guess?: number): SizeSolution {
  const first = powerAt(min);
  if (first >= target) return { size: min, power: first, feasibility: 'already-met' };
  let lo = min;
  let hi = min;
  let hiPower = first;
  const start = guess === undefined || !Number.isFinite(guess) ? min : Math.min(max, Math.max(min, Math.ceil(guess)));
  if (start > min) {
    const startPower = powerAt(start);
    if (startPower >= target) {
      // Step down from the guess until the power falls short (it does at min).
      hi = start;
      hiPower = startPower;
      for (let step = 1; ; step *= 2) {
        const candidate = Math.max(min, hi - step);
        const candidatePower = candidate === min ? first : powerAt(candidate);
        if (candidatePower < target) {
          lo = candidate;
          break;
        }
        hi = candidate;
        hiPower = candidatePower;
      }
      return bisect(powerAt, target, lo, hi, hiPower);
    }
    lo = start;
    hi = start;
    hiPower = startPower;
  }
  for (let step = Math.max(1, lo === min ? min : 1); hiPower < target; step *= 2) {
    if (hi >= max) return { size: max, power: hiPower, feasibility: 'unreachable' };
    lo = hi;
    hi = Math.min(max, hi + step);
    hiPower = powerAt(hi);
  }
  return bisect(powerAt, target, lo, hi, hiPower);
}

/** Bisection on whole numbers keeping powerAt(lo) < target ≤ powerAt(hi) = hiPower. */
function bisect(powerAt: (n: number) => number, target: number, lo: number, hi: number, hiPower: number): SizeSolution {
  while (hi - lo > 1) {
    const mid = Math.floor((lo + hi) / 2);
    const p = powerAt(mid);
    if (p >= target) {
      hi = mid;
      hiPower = p;
    } else {
      lo = mid;
    }
  }
  return { size: hi, power: hiPower, feasibility: 'ok' };
}

export interface EffectSolution {
  effect: number;
  power: number;
  feasibility: Feasibility;
}

/** Relative accuracy of solved effects. */
export const EFFECT_RELATIVE_TOLERANCE = 1e-10;

/** Halvings or doublings allowed while bracketing an effect: covers every double. */
const MAX_BRACKET_STEPS = 2100;

/**
 * The effect e > 0 with powerAt(e) = target, for a power that increases with e from below the
 * target (at e → 0 it is the false-positive rate). Starts at `guess`, halves or doubles until
 * the root is bracketed within a factor of 2 (bounded), then Brent's method to
 * 1e-10 relative (xTolerance = 1e-11 × the bracket's upper end, which is at most twice the root).
 *
 * With a finite `upper` (an effect cannot pass it, e.g. a proportion below 1): powerAt(upper)
 * < target → 'unreachable' with upper and its power.
 */
export function solveEffect(powerAt: (e: number) => number, target: number, guess: number, upper = Infinity): EffectSolution {
  let lo = Math.min(guess, upper / 2);
  let hi = lo;
  let loPower = powerAt(lo);
  if (loPower >= target) {
    for (let step = 0; loPower >= target; step++) {
      if (step > MAX_BRACKET_STEPS) throw new Error('solveEffect: no effect size small enough was found; the power function is not valid.');
      hi = lo;
      lo /= 2;
      loPower = powerAt(lo);
    }
  } else {
    let hiPower = loPower;
    for (let step = 0; hiPower < target; step++) {
      if (hi >= upper) {
        return { effect: upper, power: hiPower, feasibility: 'unreachable' };
      }
      if (step > MAX_BRACKET_STEPS) throw new Error('solveEffect: no effect size large enough was found; the power function is not valid.');
      lo = hi;
      hi = Math.min(upper, hi * 2);
      hiPower = powerAt(hi);
    }
  }
  const effect = brentRoot((e) => powerAt(e) - target, lo, hi, { xTolerance: hi * EFFECT_RELATIVE_TOLERANCE * 0.1, maxIterations: 200 });
  return { effect, power: powerAt(effect), feasibility: 'ok' };
}

/** Names present in a request: given and not undefined. */
export function presence(request: object, names: readonly string[]): Record<string, boolean> {
  const record = request as Record<string, unknown>;
  return Object.fromEntries(names.map((name) => [name, record[name] !== undefined]));
}

/** As `presence`, with p2 present when the effect is given in any of its forms (p2, difference, riskRatio, oddsRatio). */
export function effectPresence(request: ProportionEffectInput, names: readonly string[]): Record<string, boolean> {
  return { ...presence(request, names), p2: givenEffects(request).length > 0 };
}

