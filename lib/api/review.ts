/**
 * What the review routes answer (threads, comments, suggestions), declared once: the OpenAPI
 * document names these schemas, and lib/data/threads.ts and lib/data/suggestions.ts build their
 * answers typed by them.
 */
import { z } from 'zod';
import { SUGGESTION_STATUSES, THREAD_ANCHOR_KINDS, THREAD_STATUSES } from '@/db/schema';

const iso = z.string().meta({ format: 'date-time' });

const anchorOutSchema = z
  .object({
    kind: z.enum(THREAD_ANCHOR_KINDS),
    part: z.string().optional(),
    path: z.string().optional(),
    ruleId: z.string().optional(),
    key: z.string().optional(),
    planResultId: z.string().optional(),
    simulationId: z.string().optional(),
  })
  .meta({ id: 'ThreadAnchorEntry', description: 'The anchor as it was sent when the thread started.' });

const personSchema = z.object({ id: z.string(), name: z.string() });

export const commentDtoSchema = z
  .object({
    id: z.uuid(),
    authorId: z.string().nullable(),
    authorName: z.string().nullable(),
    /** As stored: mentions are `<@user id>`. */
    body: z.string(),
    /** The comment with mentions written "@Name". */
    text: z.string(),
    mentions: z.array(personSchema),
    createdAt: iso,
  })
  .meta({ id: 'Comment' });
export type CommentDto = z.output<typeof commentDtoSchema>;

export const threadDtoSchema = z
  .object({
    id: z.uuid(),
    anchor: anchorOutSchema,
    anchorKey: z.string(),
    anchorLabel: z.string(),
    /** The design revision the anchor was read from when the thread started. */
    revision: z.number().int(),
    /** The anchored field, step or finding differs from what it was when the thread started (for a result: the design was saved since it was computed). */
    changedSince: z.boolean(),
    status: z.enum(THREAD_STATUSES),
    createdById: z.string().nullable(),
    createdByName: z.string().nullable(),
    createdAt: iso,
    resolvedByName: z.string().nullable(),
    resolvedAt: iso.nullable(),
    lastActivityAt: iso,
    /** Where the thread's anchor is shown in the app. */
    anchorHref: z.string(),
    comments: z.array(commentDtoSchema),
  })
  .meta({ id: 'Thread' });
export type ThreadDto = z.output<typeof threadDtoSchema>;

const fieldValueOut = z.union([z.string(), z.number(), z.boolean(), z.null()]);

export const suggestionDtoSchema = z
  .object({
    id: z.uuid(),
    path: z.string(),
    label: z.string(),
    oldValue: fieldValueOut,
    newValue: fieldValueOut,
    oldText: z.string(),
    newText: z.string(),
    /** The field's value in the newest revision (null when the design no longer has the field). */
    currentValue: fieldValueOut,
    currentText: z.string().nullable(),
    /** The field changed since the suggestion was made: accepting it needs the current value confirmed. */
    changedSince: z.boolean(),
    reason: z.string(),
    revision: z.number().int(),
    status: z.enum(SUGGESTION_STATUSES),
    createdById: z.string().nullable(),
    createdByName: z.string().nullable(),
    createdAt: iso,
    decidedByName: z.string().nullable(),
    decidedAt: iso.nullable(),
    decisionReason: z.string().nullable(),
    /** The revision an accepted suggestion became. */
    acceptedRevision: z.number().int().nullable(),
  })
  .meta({ id: 'Suggestion' });
export type SuggestionDto = z.output<typeof suggestionDtoSchema>;
