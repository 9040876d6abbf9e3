import { z } from 'zod';
import { ACTIVITY_KIND_IDS } from '@/lib/activity/words';

/** Entries per page of the activity view and the API. */
export const ACTIVITY_PAGE_SIZE = 25;

const day = (label: string) =>
  z
    .string()
    .regex(/^\d{4}-\d{2}-\d{2}$/, { error: `${label} must be a date such as 2026-12-04.` })
    .refine((s) => !Number.isNaN(Date.parse(`${s}T00:00:00Z`)) && new Date(`${s}T00:00:00Z`).toISOString().startsWith(s), {
      error: `${label} must be a real date such as 2026-12-04.`,
    });

/**
 * Filters of the activity log, as query parameters of the API and of the activity page's URL.
 * Dates are whole days in UTC, both ends included.
 */
export const activityQuerySchema = z
  .object({
    kind: z.enum(ACTIVITY_KIND_IDS, { error: 'Choose one of the kinds of event in the list.' }).optional(),
    actor: z.uuid({ error: 'Choose a person from the list.' }).optional(),
    from: day('The first day').optional(),
    to: day('The last day').optional(),
    page: z.coerce.number().int().min(1).max(10_000).default(1),
  })
  .refine((q) => !q.from || !q.to || q.from <= q.to, { error: 'The first day must not be after the last day.', path: ['to'] })
  .meta({ id: 'ActivityQuery' });
export type ActivityQuery = z.infer<typeof activityQuerySchema>;

/** The export takes the same filters; it is not paged. */
export const activityExportQuerySchema = activityQuerySchema.meta({ id: 'ActivityExportQuery' });
