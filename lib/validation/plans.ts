/**
 * Saving a Plan tab result: the calculation's request (the server recomputes the output from
 * it), the revision the browser computed it from, and an optional note.
 */
import { z } from 'zod';
import { text } from '@/lib/text-schema';
import { calculationSchema } from '@/lib/stats/calculations/request';

export const planResultSaveSchema = z
  .object({
    request: calculationSchema,
    /** The design revision shown when the result was computed; a newer saved design is a conflict. */
    revision: z.number({ error: 'revision must be a number.' }).int('revision must be a whole number.').min(0, 'revision is at least 0.').optional(),
    note: text('Note', 0, 2000).optional(),
  })
  .meta({ id: 'PlanResultSave', description: 'A calculation to save with the study’s current design revision; the server computes the result.' });

export type PlanResultSaveInput = z.infer<typeof planResultSaveSchema>;
