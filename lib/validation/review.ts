/**
 * Review threads and suggestions (issue 12): where a thread is anchored, what a comment may say,
 * how the Review tab's list is filtered, and what a suggestion proposes.
 */
import { z } from 'zod';
import { THREAD_ANCHOR_KINDS, THREAD_STATUSES, SUGGESTION_STATUSES } from '@/db/schema';
import { DESIGN_STEPS } from '@/lib/design/schema';
import { rawText, text } from '@/lib/text-schema';

const PARTS = DESIGN_STEPS.map((s) => s.part) as [(typeof DESIGN_STEPS)[number]['part'], ...(typeof DESIGN_STEPS)[number]['part'][]];

/** A field's path as lib/design/fields.ts names it, e.g. `structure.levels[classroom].count`. */
export const fieldPathSchema = rawText('Field').regex(/^[A-Za-z][A-Za-z0-9_.[\]-]{0,199}$/, 'Choose a field of the design.');

export const threadAnchorSchema = z
  .discriminatedUnion('kind', [
    z.object({ kind: z.literal('section'), part: z.enum(PARTS, { error: 'Choose a step of the design.' }) }),
    z.object({ kind: z.literal('field'), path: fieldPathSchema }),
    z.object({
      kind: z.literal('finding'),
      ruleId: rawText('ruleId').regex(/^[a-z0-9-]{1,60}$/, 'Unknown rule id.'),
      key: rawText('key').min(1, 'key is required.').max(200, 'key can be at most 200 characters.'),
    }),
    z.object({ kind: z.literal('plan'), planResultId: rawText('planResultId').regex(/^[1-9][0-9]{0,17}$/, 'Choose a saved Plan result.') }),
    z.object({ kind: z.literal('simulation'), simulationId: z.uuid({ error: 'Choose a stress test of this study.' }) }),
  ])
  .meta({ id: 'ThreadAnchor', description: 'What a thread is about: a step (section) or field of the design, a finding, a saved Plan result or a stress test.' });
export type ThreadAnchor = z.infer<typeof threadAnchorSchema>;

/** Mentions are written `<@user id>` in the text; only members of the study can be mentioned. */
const commentBody = text('Comment', 1, 5000);

export const threadCreateSchema = z
  .object({ anchor: threadAnchorSchema, body: commentBody })
  .meta({ id: 'ThreadCreate', description: 'Starts a thread with its first comment. Mention a member by writing <@their user id>.' });
export type ThreadCreateInput = z.infer<typeof threadCreateSchema>;

export const replyCreateSchema = z.object({ body: commentBody }).meta({ id: 'ReplyCreate' });
export type ReplyCreateInput = z.infer<typeof replyCreateSchema>;

export const threadResolveSchema = z
  .object({
    /** The newest comment the person resolving has seen: a reply after it means they have not read everything, and the thread stays open. */
    seenCommentId: z.uuid({ error: 'The comment you last read is not recognised: reload the thread and try again.' }).optional(),
  })
  .meta({ id: 'ThreadResolve', description: 'Send the id of the newest comment you have read: a reply that came after it keeps the thread open (409).' });
export type ThreadResolveInput = z.infer<typeof threadResolveSchema>;

export const threadListQuerySchema = z
  .object({
    anchorKind: z.enum(THREAD_ANCHOR_KINDS, { error: 'Choose one of: section, field, finding, plan, simulation.' }).optional(),
    /** Exactly one anchor, as its key (`field:outcome.name`, `finding:<rule>:<key>`). */
    anchor: rawText('anchor').max(300, 'anchor can be at most 300 characters.').optional(),
    author: z.uuid({ error: 'author must be the id of a member.' }).optional(),
    state: z.enum(THREAD_STATUSES, { error: 'Choose open or resolved.' }).optional(),
  })
  .meta({ id: 'ThreadListQuery' });
export type ThreadListQuery = z.infer<typeof threadListQuerySchema>;

/** The value of one field: fields of a design hold text, numbers, yes/no, or nothing. */
export const fieldValueSchema = z
  .union([rawText('Value').max(2000, 'The value can be at most 2000 characters.'), z.number(), z.boolean(), z.null()])
  .meta({ id: 'FieldValue', description: 'Text, a number, true/false, or null for an empty field.' });

export const suggestionCreateSchema = z
  .object({ path: fieldPathSchema, value: fieldValueSchema, reason: text('Reason', 1, 2000) })
  .meta({ id: 'SuggestionCreate', description: 'Proposes a new value for one field of the design, with the reason.' });
export type SuggestionCreateInput = z.infer<typeof suggestionCreateSchema>;

export const suggestionAcceptSchema = z
  .object({
    /** Needed when the field changed since the suggestion: the field's current value, as read by the person accepting. */
    confirmedCurrentValue: fieldValueSchema.optional(),
  })
  .meta({
    id: 'SuggestionAccept',
    description: 'When the field changed since the suggestion was made, send its current value as you read it to confirm that the suggestion still applies; without it, or with another value, the answer is 409.',
  });
export type SuggestionAcceptInput = z.infer<typeof suggestionAcceptSchema>;

export const suggestionDeclineSchema = z.object({ reason: text('Reason', 1, 2000) }).meta({ id: 'SuggestionDecline' });
export type SuggestionDeclineInput = z.infer<typeof suggestionDeclineSchema>;

export const suggestionListQuerySchema = z
  .object({ state: z.enum(SUGGESTION_STATUSES, { error: 'Choose pending, accepted or declined.' }).optional() })
  .meta({ id: 'SuggestionListQuery' });
export type SuggestionListQuery = z.infer<typeof suggestionListQuerySchema>;
