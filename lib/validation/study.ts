import { z } from 'zod';
import { STUDY_STATUSES } from '@/db/schema';
import { text } from '@/lib/text-schema';
import { idSchema } from './common';

const title = text('Title', 1, 200).meta({ example: 'Reading-support programme, randomised by classroom' });
const description = text('Description', 0, 2000);

export const studyCreateSchema = z
  .object({ workspaceId: idSchema, title, description: description.default('') })
  .meta({ id: 'StudyCreate' });
export type StudyCreateInput = z.infer<typeof studyCreateSchema>;

/**
 * A partial update: a field left out is left as it is (no defaults here, or `{}` would reset
 * them); `description: null` clears the description. The title cannot be cleared.
 */
export const studyUpdateSchema = z
  .object({
    title: title.optional(),
    description: description
      .nullable()
      .transform((v) => v ?? '')
      .optional()
      .meta({ description: 'null clears the description.' }),
  })
  .refine((v) => v.title !== undefined || v.description !== undefined, {
    message: 'Send at least one of title or description.',
  })
  .meta({ id: 'StudyUpdate' });
export type StudyUpdateInput = z.infer<typeof studyUpdateSchema>;

export const STUDY_SORTS = ['title', 'status', 'role', 'updated', 'created'] as const;

export const studyListQuerySchema = z
  .object({
    workspaceId: idSchema,
    q: text('The search', 0, 200).optional(),
    status: z.enum(['active', 'archived', 'all', ...STUDY_STATUSES]).default('active'),
    sort: z.enum(STUDY_SORTS).default('updated'),
    dir: z.enum(['asc', 'desc']).default('desc'),
    page: z.coerce.number().int().min(1).max(10_000).default(1),
    pageSize: z.coerce.number().int().min(1).max(100).default(20),
  })
  .meta({ id: 'StudyListQuery' });
export type StudyListQuery = z.infer<typeof studyListQuerySchema>;
