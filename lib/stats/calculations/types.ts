/**
 * What every calculation returns: the API's body (`result`, `method`, `references`,
 * `warnings`) plus what the Plan tab and the calculator pages show beside the number.
 */
import type { CalculationKind } from './request';

export type ResultValue = number | string | boolean | null | number[];

/** 'ok'; 'unreachable' when no size or effect in range reaches the target (the nearest is given);
 * 'already-met' when the smallest allowed size already exceeds the target power. */
export type Feasibility = 'ok' | 'unreachable' | 'already-met';

export interface CalculationOutput {
  kind: CalculationKind;
  /** The quantity that was solved for ('power', 'nPerGroup', 'delta', …), or null (design-effect). */
  solvedFor: string | null;
  /** Every input (after defaults) and every solved or derived value, by the API's names. */
  result: Record<string, ResultValue>;
  feasibility: Feasibility;
  /** One line naming the method, e.g. 'Exact power of the two-sided two-sample t test (noncentral t, df = n1 + n2 − 2).' */
  method: string;
  /** The formula in words, for the Plan tab and the justification. */
  formula: string;
  /** Full references, as in lib/citations.ts `full`. */
  references: string[];
  /** Plain sentences: impossible targets, approximations in use, adjustments applied. */
  warnings: string[];
}
