/**
 * The public calculation endpoint's shape: the request is `calculationSchema`
 * (lib/stats/calculations/request.ts), the answer is the engine's `CalculationOutput` as it is.
 * `runCalculation` is the one place where the engine's cross-field errors (two unknowns left
 * out, a target that contradicts an input) become a 400 with field errors, like a zod failure.
 */
import { z } from 'zod';
import { calculate } from '@/lib/stats/calculations';
import { CalculationInputError } from '@/lib/stats/calculations/errors';
import type { CalculationOutput } from '@/lib/stats/calculations/types';
import { AppError } from '@/lib/errors';
import { CALCULATION_KINDS, type CalculationRequest } from '@/lib/stats/calculations/request';

const resultValueSchema = z.union([z.number(), z.string(), z.boolean(), z.null(), z.array(z.number())]);

export const calculationResponseSchema = z
  .object({
    kind: z.enum(CALCULATION_KINDS as [string, ...string[]]),
    solvedFor: z.string().nullable().meta({ description: 'The quantity that was solved for, or null when the kind solves nothing (design-effect).' }),
    result: z.record(z.string(), resultValueSchema).meta({
      description: 'Every input after defaults and every solved or derived value, by the request’s names (e.g. nPerGroup, power, clustersPerArm, designEffect).',
    }),
    feasibility: z.enum(['ok', 'unreachable', 'already-met']).meta({
      description: 'unreachable: no size or effect in range reaches the target (the nearest achievable value is given); already-met: the smallest allowed size already exceeds the target power.',
    }),
    method: z.string(),
    formula: z.string().meta({ description: 'The formula in words.' }),
    references: z.array(z.string()),
    warnings: z.array(z.string()),
  })
  .meta({ id: 'CalculationResult' });

export type CalculationResponse = z.infer<typeof calculationResponseSchema>;

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
