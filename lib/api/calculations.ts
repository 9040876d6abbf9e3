/**
 * The public calculation endpoint's shape: the request is `calculationSchema`
 * (lib/stats/calculations/request.ts), the answer is the engine's `CalculationOutput` as it is
 * (its schema, `calculationOutputSchema`, lives with the engine in lib/stats/calculations/types.ts).
 * `runCalculation` is the one place where the engine's cross-field errors (two unknowns left
 * out, a target that contradicts an input) become a 400 with field errors, like a zod failure.
 */
import { calculate } from '@/lib/stats/calculations';
import { CalculationInputError } from '@/lib/stats/calculations/errors';
import type { CalculationOutput } from '@/lib/stats/calculations/types';
import { AppError } from '@/lib/errors';
import type { CalculationRequest } from '@/lib/stats/calculations/request';

/** The engine's CalculationInputError as an AppError (400, `error.fields`); anything else is rethrown. */
export function toCalculationAppError(err: unknown): unknown {
  if (err instanceof CalculationInputError) {
    return new AppError('bad_request', err.message, { fields: err.fields });
  }
  return err;
}

export function runCalculation(request: CalculationRequest): CalculationOutput {
  try {
    return calculate(request);
  } catch (err) {
    throw toCalculationAppError(err);
  }
}
