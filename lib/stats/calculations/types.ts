/**
 * What every calculation returns: the API's body (`result`, `method`, `references`,
 * `warnings`) plus what the Plan tab and the calculator pages show beside the number. Declared
 * once, as a zod schema: the engine's functions are typed by it, the public calculation endpoint
 * and a saved Plan result send it, and the API document names it `CalculationResult`.
 */
import { z } from 'zod';
import { CALCULATION_KINDS, type CalculationKind } from './request';

const resultValueSchema = z.union([z.number(), z.string(), z.boolean(), z.null(), z.array(z.number())]);
export type ResultValue = z.output<typeof resultValueSchema>;

const feasibilitySchema = z.enum(['ok', 'unreachable', 'already-met']).meta({
  description:
    'unreachable: no size or effect in range reaches the target (the nearest achievable value is given); already-met: the smallest allowed size already exceeds the target power.',
});
export type Feasibility = z.output<typeof feasibilitySchema>;

export const calculationOutputSchema = z
  .object({
    kind: z.enum(CALCULATION_KINDS as [CalculationKind, ...CalculationKind[]]),
    solvedFor: z.string().nullable().meta({
      description: "The quantity that was solved for ('power', 'nPerGroup', 'delta', …), or null when the kind solves nothing (design-effect).",
    }),
    result: z.record(z.string(), resultValueSchema).meta({
      description: 'Every input after defaults and every solved or derived value, by the request’s names (e.g. nPerGroup, power, clustersPerArm, designEffect).',
    }),
    feasibility: feasibilitySchema,
    method: z.string().meta({ description: 'One line naming the method, e.g. "Exact power of the two-sided two-sample t test (noncentral t, df = n1 + n2 − 2)."' }),
    formula: z.string().meta({ description: 'The formula in words, for the Plan tab and the justification.' }),
    references: z.array(z.string()).meta({ description: 'Full references.' }),
    warnings: z.array(z.string()).meta({ description: 'Plain sentences: impossible targets, approximations in use, adjustments applied.' }),
  })
  .meta({ id: 'CalculationResult' });

export type CalculationOutput = z.output<typeof calculationOutputSchema>;
