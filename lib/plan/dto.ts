/**
 * The JSON shape of a saved Plan tab result, for the API and its OpenAPI document.
 */
import { z } from 'zod';
import { calculationSchema } from '@/lib/stats/calculations/request';

const resultValue = z.union([z.number(), z.string(), z.boolean(), z.null(), z.array(z.number())]);

export const calculationOutputDtoSchema = z
  .object({
    kind: z.string(),
    solvedFor: z.string().nullable(),
    result: z.record(z.string(), resultValue),
    feasibility: z.enum(['ok', 'unreachable', 'already-met']),
    method: z.string(),
    formula: z.string(),
    references: z.array(z.string()),
    warnings: z.array(z.string()),
  })
  .meta({ id: 'CalculationOutput' });

export const planResultDtoSchema = z
  .object({
    id: z.string(),
    studyId: z.uuid(),
    revision: z.number().int().meta({ description: 'The design revision the result was computed from.' }),
    kind: z.string(),
    request: calculationSchema,
    output: calculationOutputDtoSchema,
    note: z.string().nullable(),
    createdBy: z.uuid().nullable(),
    createdByName: z.string().nullable(),
    createdAt: z.iso.datetime(),
  })
  .meta({ id: 'PlanResult' });
