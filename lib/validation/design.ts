import { z } from 'zod';
import { FINDING_NOTE_STATUSES } from '@/db/schema';
import { designSchema } from '@/lib/design/schema';
import { rawText, text } from '@/lib/text-schema';

export const designSaveSchema = z
  .object({
    /** The revision the edit started from; a save against an older one is merged or refused. */
    baseRevision: z.number().int().min(0),
    design: designSchema,
    note: text('Note', 0, 500).optional(),
  })
  .meta({ id: 'DesignSave' });
export type DesignSaveInput = z.infer<typeof designSaveSchema>;

export const checkRunSchema = z
  .object({ design: designSchema.optional() })
  .meta({ id: 'CheckRun', description: 'Leave out `design` to check the saved design.' });

export const findingNoteSchema = z
  .object({
    ruleId: rawText('ruleId').regex(/^[a-z0-9-]{1,60}$/, 'Unknown rule id.'),
    /** The finding's key within its rule, as the checks report it (kept exactly as sent). */
    key: rawText('key').min(1, 'key is required.').max(200, 'key can be at most 200 characters.'),
    status: z.enum(FINDING_NOTE_STATUSES, { error: 'Choose addressed or reopened.' }),
    reason: text('Reason', 1, 2000),
  })
  .meta({ id: 'FindingNote' });
export type FindingNoteInput = z.infer<typeof findingNoteSchema>;
