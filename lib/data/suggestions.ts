import 'server-only';
import { isDeepStrictEqual } from 'node:util';
import { logActivity } from '@/db/repositories/activity';
import { insertSuggestion, listSuggestions as listSuggestionRows, type ReviewSuggestion } from '@/db/repositories/reviews';
import type { SuggestionDto } from '@/lib/api/review';
import { canStudy } from '@/lib/auth/permissions';
import type { Actor } from '@/lib/auth/session';
import { db } from '@/lib/db';
import { fieldValue, formatFieldValue, listFields, withFieldValue } from '@/lib/design/fields';
import { designSchema, type Design } from '@/lib/design/schema';
import { AppError, notFound } from '@/lib/errors';
import { notify } from '@/lib/notifications/notify';
import { excerpt } from '@/lib/review/mentions';
import type { SuggestionAcceptInput, SuggestionCreateInput, SuggestionDeclineInput, SuggestionListQuery } from '@/lib/validation/review';
import { requireStudy } from './access';
import { saveDesign } from './designs';
import { personName, reviewContext, type ReviewContext } from './review-context';
import { recordDecision } from './suggestion-decisions';
import { transaction } from './transaction';

/**
 * Suggestions (issue 12, point 4): a member with `suggestion.create` (consultant, owner, editor)
 * proposes a new value for one field, with a reason; the new value must make a valid design. An
 * owner or editor (`suggestion.decide`) accepts it — through saveDesign, so it becomes a revision
 * of its own attributed to both — or declines it with a reason. The consultant never edits the
 * design directly: accepting is the owner's or editor's act.
 *
 * A suggestion whose field changed since it was made ("changed since") is not applied blindly:
 * accepting it needs the field's current value confirmed by the person accepting
 * (`confirmedCurrentValue`), otherwise the answer is a conflict that shows both values.
 */

type FieldValue = string | number | boolean | null;

function asValue(v: unknown): FieldValue {
  return typeof v === 'string' || typeof v === 'number' || typeof v === 'boolean' ? v : null;
}

function hasField(design: Design, path: string): boolean {
  return listFields(design).some((f) => f.path === path);
}

function suggestionDto(s: ReviewSuggestion, ctx: ReviewContext): SuggestionDto {
  const present = hasField(ctx.design, s.path);
  const current = present ? asValue(fieldValue(ctx.design, s.path)) : null;
  return {
    id: s.id,
    path: s.path,
    label: s.label,
    oldValue: asValue(s.oldValue),
    newValue: asValue(s.newValue),
    oldText: formatFieldValue(ctx.design, s.path, s.oldValue),
    newText: formatFieldValue(ctx.design, s.path, s.newValue),
    currentValue: current,
    currentText: present ? formatFieldValue(ctx.design, s.path, current) : null,
    changedSince: s.status === 'pending' && (!present || !isDeepStrictEqual(current, asValue(s.oldValue))),
    reason: s.reason,
    revision: s.revision,
    status: s.status,
    createdById: s.createdBy,
    createdByName: s.createdByName,
    createdAt: s.createdAt.toISOString(),
    decidedByName: s.decidedByName,
    decidedAt: s.decidedAt?.toISOString() ?? null,
    decisionReason: s.decisionReason,
    acceptedRevision: s.acceptedRevision,
  };
}

export async function listSuggestions(actor: Actor | null, studyId: string, query: SuggestionListQuery = {}): Promise<SuggestionDto[]> {
  const { study } = await requireStudy(actor, studyId, 'study.read');
  const ctx = await reviewContext(db(), study);
  return (await listSuggestionRows(db(), { studyId, status: query.state })).map((s) => suggestionDto(s, ctx));
}

async function readSuggestion(studyId: string, id: string, ctx: ReviewContext, trx: Parameters<typeof listSuggestionRows>[0] = db()): Promise<SuggestionDto> {
  const [s] = await listSuggestionRows(trx, { studyId, id });
  if (!s) throw notFound('The suggestion');
  return suggestionDto(s, ctx);
}

/** The design with the field set to `value`, or a refusal that says what is wrong with the value. */
function applied(design: Design, path: string, value: FieldValue, label: string): Design {
  const parsed = designSchema.safeParse(withFieldValue(design, path, value));
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    const message = issue?.message ? `${label}: ${issue.message}` : `That value does not fit ${label}.`;
    throw new AppError('bad_request', message, { fields: { value: [message] } });
  }
  return parsed.data;
}

export async function createSuggestion(actor: Actor | null, studyId: string, input: SuggestionCreateInput): Promise<SuggestionDto> {
  return transaction(async (trx) => {
    const { actor: a, study } = await requireStudy(actor, studyId, 'suggestion.create', { trx, lock: 'share' });
    const ctx = await reviewContext(trx, study);
    const field = listFields(ctx.design).find((f) => f.path === input.path);
    if (!field) throw new AppError('bad_request', 'The design has no such field. Choose a field from the design.', { fields: { path: ['Choose a field of the design.'] } });
    const current = fieldValue(ctx.design, input.path);
    if (current !== undefined && current !== null && typeof current === 'object') {
      throw new AppError('bad_request', `${field.label} holds a list; a suggestion changes one value. Start a thread on the field instead.`, { fields: { path: ['Choose a field with one value.'] } });
    }
    const old = asValue(current);
    if (isDeepStrictEqual(old, input.value)) {
      throw new AppError('bad_request', `${field.label} already has that value. Suggest a different one.`, { fields: { value: ['This is the current value.'] } });
    }
    applied(ctx.design, input.path, input.value, field.label);
    const id = await insertSuggestion(trx, {
      studyId,
      path: input.path,
      label: field.label,
      oldValue: old,
      newValue: input.value,
      reason: input.reason,
      revision: ctx.revision,
      createdBy: a.id,
    });
    const change = `${field.label}: ${formatFieldValue(ctx.design, input.path, old)} → ${formatFieldValue(ctx.design, input.path, input.value)}`;
    await logActivity(trx, {
      workspaceId: study.workspaceId,
      studyId,
      actorId: a.id,
      action: 'suggestion.created',
      details: { suggestionId: id, path: input.path, label: field.label, revision: ctx.revision, excerpt: excerpt(input.reason) },
    });
    const deciders = ctx.members.filter((m) => m.userId !== a.id && canStudy(m.role as Parameters<typeof canStudy>[0], 'suggestion.decide')).map((m) => m.userId);
    if (deciders.length > 0) {
      await notify(trx, {
        kind: 'suggestion',
        recipientIds: deciders,
        studyId,
        actorId: a.id,
        subject: `${personName(a)} suggested a change on ${study.title}`,
        text: `${personName(a)} suggests changing ${change}.\n\nReason: ${input.reason}`,
        path: `/studies/${studyId}/review?suggestion=${id}`,
        dedupeKey: `suggestion:${id}:created`,
      });
    }
    return readSuggestion(studyId, id, ctx, trx);
  });
}

export async function acceptSuggestion(actor: Actor | null, studyId: string, suggestionId: string, input: SuggestionAcceptInput = {}): Promise<SuggestionDto> {
  const { study } = await requireStudy(actor, studyId, 'suggestion.decide');
  const ctx = await reviewContext(db(), study);
  const s = await readSuggestion(studyId, suggestionId, ctx);
  if (s.status !== 'pending') throw new AppError('conflict', `This suggestion was already ${s.status}. Reload to see the decision.`);
  if (s.currentText === null) {
    throw new AppError('conflict', `The design no longer has the field "${s.label}", so this suggestion cannot be applied. Decline it with a reason.`);
  }
  if (isDeepStrictEqual(s.currentValue, s.newValue)) {
    throw new AppError('conflict', `${s.label} already has the suggested value (${s.newText}). Decline the suggestion, saying it is already done.`);
  }
  if (s.changedSince && (input.confirmedCurrentValue === undefined || !isDeepStrictEqual(input.confirmedCurrentValue, s.currentValue))) {
    throw new AppError(
      'conflict',
      `${s.label} changed since the suggestion was made: it was ${s.oldText} and is ${s.currentText} now. Check that changing it to ${s.newText} still makes sense, then confirm against the current value.`,
      { fields: { confirmedCurrentValue: ['Confirm the current value to accept.'] } },
    );
  }
  const design = applied(ctx.design, s.path, s.newValue, s.label);
  // saveDesign checks that the design is still at this revision (or merges edits of other parts) and marks the suggestion accepted with the revision.
  await saveDesign(actor, studyId, { baseRevision: ctx.revision, design, note: `Suggestion by ${s.createdByName ?? 'a former member'}: ${s.label}` }, { coAuthorId: s.createdById ?? undefined, suggestionId });
  const { study: after } = await requireStudy(actor, studyId, 'study.read');
  return readSuggestion(studyId, suggestionId, await reviewContext(db(), after));
}

export async function declineSuggestion(actor: Actor | null, studyId: string, suggestionId: string, input: SuggestionDeclineInput): Promise<SuggestionDto> {
  return transaction(async (trx) => {
    const { actor: a, study } = await requireStudy(actor, studyId, 'suggestion.decide', { trx, lock: 'share' });
    await recordDecision(trx, a, study, suggestionId, { status: 'declined', reason: input.reason });
    return readSuggestion(studyId, suggestionId, await reviewContext(trx, study), trx);
  });
}
