import 'server-only';
import type { Transaction } from 'kysely';
import type { Database } from '@/db/schema';
import { logActivity } from '@/db/repositories/activity';
import {
  countOpenThreads as countOpenRows,
  insertComment,
  insertThread,
  latestCommentId,
  listThreads as listThreadRows,
  lockThread,
  setThreadStatus,
  threadAuthors,
  touchThread,
  type ReviewThread,
} from '@/db/repositories/reviews';
import { findSimulation } from '@/db/repositories/simulations';
import type { Study } from '@/db/repositories/studies';
import type { CommentDto, ThreadDto } from '@/lib/api/review';
import { canResolveThread } from '@/lib/auth/permissions';
import type { Actor } from '@/lib/auth/session';
import { db } from '@/lib/db';
import { AppError, forbidden, notFound } from '@/lib/errors';
import { formatDateTime } from '@/lib/format';
import { notify } from '@/lib/notifications/notify';
import { fieldStep } from '@/lib/design/fields';
import { anchorFingerprint, anchorKey, anchorLabel, threadChanged } from '@/lib/review/anchors';
import { commentText, excerpt, mentionedIds } from '@/lib/review/mentions';
import { logger } from '@/lib/log';
import type { ReplyCreateInput, ThreadAnchor, ThreadCreateInput, ThreadListQuery, ThreadResolveInput } from '@/lib/validation/review';
import { requireStudy } from './access';
import { personName, reviewContext, threadPath, type ReviewContext } from './review-context';
import { transaction } from './transaction';

/**
 * Review threads (issue 12, point 3): a thread is anchored to a step or field of the design, a
 * finding, a saved Plan result or a stress test, and holds comments with @mentions of members.
 *
 * Who may: members with `comment.create` (owner, editor, consultant, writer) start threads and
 * reply; resolving and reopening needs `comment.resolve` (owner, editor, consultant) or being the
 * thread's author. Viewers read; non-members get 404 (lib/data/access.ts).
 *
 * Two people at once (point 9): every write holds the thread's row (after the study's, the fixed
 * lock order) until it commits, so writes to one thread take turns and none is lost. Two replies
 * at the same moment both land, in the order they took the row. A reply to a resolved thread
 * reopens it, so a reply is never buried under "resolved". Resolving names the newest comment the
 * person has read (`seenCommentId`); when someone replied after it, the thread stays open and the
 * answer (409) says who replied, so nobody resolves a reply they have not seen.
 */

const log = logger('threads');

function anchorHref(studyId: string, t: ReviewThread): string {
  const a = t.anchor as ThreadAnchor;
  const base = `/studies/${studyId}`;
  switch (a.kind) {
    case 'section':
      return `${base}/design/${a.part}`;
    case 'field': {
      const step = fieldStep(a.path);
      return step ? `${base}/design/${step}` : `${base}/design`;
    }
    case 'finding':
      return `${base}/checks#finding-${a.ruleId}-${a.key}`;
    case 'plan':
      return `${base}/plan#plan-result-${a.planResultId}`;
    case 'simulation':
      return `${base}/stress-test#run-${a.simulationId}`;
  }
}

function commentDto(c: ReviewThread['comments'][number], names: Map<string, string>): CommentDto {
  return {
    id: c.id,
    authorId: c.authorId,
    authorName: c.authorName,
    body: c.body,
    text: commentText(c.body, names),
    mentions: c.mentions.map((id) => ({ id, name: names.get(id) ?? 'someone' })),
    createdAt: c.createdAt.toISOString(),
  };
}

function threadDto(t: ReviewThread, ctx: ReviewContext): ThreadDto {
  const anchor = t.anchor as ThreadAnchor;
  return {
    id: t.id,
    anchor,
    anchorKey: t.anchorKey,
    anchorLabel: t.anchorLabel,
    revision: t.revision,
    changedSince: threadChanged({ anchor, fingerprint: t.fingerprint, revision: t.revision }, ctx),
    status: t.status,
    createdById: t.createdBy,
    createdByName: t.createdByName,
    createdAt: t.createdAt.toISOString(),
    resolvedByName: t.resolvedByName,
    resolvedAt: t.resolvedAt?.toISOString() ?? null,
    lastActivityAt: t.lastActivityAt.toISOString(),
    anchorHref: anchorHref(t.studyId, t),
    comments: t.comments.map((c) => commentDto(c, ctx.names)),
  };
}

export async function listThreads(actor: Actor | null, studyId: string, query: ThreadListQuery = {}): Promise<ThreadDto[]> {
  const { study } = await requireStudy(actor, studyId, 'study.read');
  const ctx = await reviewContext(db(), study);
  const rows = await listThreadRows(db(), { studyId, anchorKind: query.anchorKind, anchorKey: query.anchor, author: query.author, status: query.state });
  return rows.map((t) => threadDto(t, ctx));
}

export async function getThread(actor: Actor | null, studyId: string, threadId: string): Promise<ThreadDto> {
  const { study } = await requireStudy(actor, studyId, 'study.read');
  return readThread(db(), study, threadId);
}

async function readThread(trx: Parameters<typeof listThreadRows>[0], study: Study, threadId: string): Promise<ThreadDto> {
  const [t] = await listThreadRows(trx, { studyId: study.id, threadId });
  if (!t) throw notFound('The thread');
  return threadDto(t, await reviewContext(trx, study));
}

/** Open threads of the study: the count on the Review tab. */
export async function countOpenThreads(actor: Actor | null, studyId: string): Promise<number> {
  await requireStudy(actor, studyId, 'study.read');
  return countOpenRows(db(), studyId);
}

/** The anchor's name, fingerprint and revision now; refuses an anchor the study does not have. */
async function readAnchor(trx: Transaction<Database>, study: Study, anchor: ThreadAnchor, ctx: ReviewContext) {
  if (anchor.kind === 'plan') {
    const r = await trx
      .selectFrom('plan_results')
      .select(['revision_number', 'created_at'])
      .where('id', '=', anchor.planResultId)
      .where('study_id', '=', study.id)
      .executeTakeFirst();
    if (!r) throw new AppError('bad_request', 'That Plan result is not saved in this study.', { fields: { 'anchor.planResultId': ['Choose a saved Plan result of this study.'] } });
    return { label: `Plan result saved ${formatDateTime(r.created_at)}`, fingerprint: null, revision: r.revision_number };
  }
  if (anchor.kind === 'simulation') {
    const s = await findSimulation(trx, anchor.simulationId);
    if (!s || s.studyId !== study.id) throw new AppError('bad_request', 'That stress test does not belong to this study.', { fields: { 'anchor.simulationId': ['Choose a stress test of this study.'] } });
    return { label: `Stress test started ${formatDateTime(s.createdAt)}`, fingerprint: null, revision: s.revisionNumber ?? ctx.revision };
  }
  const label = anchorLabel(anchor, ctx.design, ctx.findings);
  const fingerprint = anchorFingerprint(anchor, ctx.design, ctx.findings);
  if (label === undefined || fingerprint === undefined) {
    const what = anchor.kind === 'finding' ? 'That finding is not among the current findings of the design.' : 'The design has no such field.';
    throw new AppError('bad_request', what, { fields: { anchor: [what] } });
  }
  return { label, fingerprint, revision: ctx.revision };
}

/** The mentioned ids, refused unless each is a member of the study. */
function checkMentions(body: string, ctx: ReviewContext): string[] {
  const ids = mentionedIds(body);
  const outsiders = ids.filter((id) => !ctx.names.has(id));
  if (outsiders.length > 0) {
    throw new AppError('bad_request', 'Only members of this study can be mentioned. Pick people from the list that appears when you type @.', {
      fields: { body: ['Mention only members of this study.'] },
    });
  }
  return ids;
}

async function tellMentioned(trx: Transaction<Database>, a: Actor, study: Study, threadId: string, commentId: string, mentions: string[], text: string): Promise<void> {
  for (const id of mentions.filter((m) => m !== a.id)) {
    await notify(trx, {
      kind: 'mention',
      recipientIds: [id],
      studyId: study.id,
      actorId: a.id,
      subject: `${personName(a)} mentioned you on ${study.title}`,
      text: `${personName(a)} wrote:\n\n${text}`,
      path: threadPath(study.id, threadId),
      dedupeKey: `comment:${commentId}:mention:${id}`,
    });
  }
}

export async function createThread(actor: Actor | null, studyId: string, input: ThreadCreateInput): Promise<ThreadDto> {
  return transaction(async (trx) => {
    const { actor: a, study } = await requireStudy(actor, studyId, 'comment.create', { trx, lock: 'share' });
    const ctx = await reviewContext(trx, study);
    const { label, fingerprint, revision } = await readAnchor(trx, study, input.anchor, ctx);
    const mentions = checkMentions(input.body, ctx);
    const key = anchorKey(input.anchor);
    const threadId = await insertThread(trx, { studyId, anchorKind: input.anchor.kind, anchorKey: key, anchor: input.anchor, anchorLabel: label, fingerprint, revision, createdBy: a.id });
    const commentId = await insertComment(trx, { threadId, authorId: a.id, body: input.body, mentions });
    const text = commentText(input.body, ctx.names);
    await logActivity(trx, {
      workspaceId: study.workspaceId,
      studyId,
      actorId: a.id,
      action: 'comment.created',
      details: { threadId, commentId, anchor: key, anchorLabel: label, excerpt: excerpt(text) },
    });
    await tellMentioned(trx, a, study, threadId, commentId, mentions, text);
    log.debug('thread started', { studyId, threadId, anchor: key });
    return readThread(trx, study, threadId);
  });
}

export async function replyToThread(actor: Actor | null, studyId: string, threadId: string, input: ReplyCreateInput): Promise<ThreadDto> {
  return transaction(async (trx) => {
    const { actor: a, study } = await requireStudy(actor, studyId, 'comment.create', { trx, lock: 'share' });
    const thread = await lockThread(trx, studyId, threadId);
    if (!thread) throw notFound('The thread');
    const ctx = await reviewContext(trx, study);
    const mentions = checkMentions(input.body, ctx);
    if (thread.status === 'resolved') {
      await setThreadStatus(trx, threadId, 'open', a.id);
      await logActivity(trx, { workspaceId: study.workspaceId, studyId, actorId: a.id, action: 'comment.reopened', details: { threadId, anchor: thread.anchorKey, anchorLabel: thread.anchorLabel, byReply: true } });
    }
    const others = (await threadAuthors(trx, threadId)).filter((id) => id !== a.id && !mentions.includes(id) && ctx.names.has(id));
    const commentId = await insertComment(trx, { threadId, authorId: a.id, body: input.body, mentions });
    await touchThread(trx, threadId);
    const text = commentText(input.body, ctx.names);
    await logActivity(trx, {
      workspaceId: study.workspaceId,
      studyId,
      actorId: a.id,
      action: 'comment.replied',
      details: { threadId, commentId, anchor: thread.anchorKey, anchorLabel: thread.anchorLabel, excerpt: excerpt(text) },
    });
    if (others.length > 0) {
      await notify(trx, {
        kind: 'reply',
        recipientIds: others,
        studyId,
        actorId: a.id,
        subject: `${personName(a)} replied on ${study.title}: ${thread.anchorLabel}`,
        text: `${personName(a)} replied in a thread on ${thread.anchorLabel}:\n\n${text}`,
        path: threadPath(studyId, threadId),
        dedupeKey: `comment:${commentId}:reply`,
      });
    }
    await tellMentioned(trx, a, study, threadId, commentId, mentions, text);
    return readThread(trx, study, threadId);
  });
}

async function setStatus(actor: Actor | null, studyId: string, threadId: string, to: 'open' | 'resolved', seenCommentId?: string): Promise<ThreadDto> {
  return transaction(async (trx) => {
    const { actor: a, study, role } = await requireStudy(actor, studyId, 'comment.create', { trx, lock: 'share' });
    const thread = await lockThread(trx, studyId, threadId);
    if (!thread) throw notFound('The thread');
    if (!canResolveThread(role, thread.createdBy === a.id)) throw forbidden('resolve or reopen threads started by others');
    if (thread.status !== to) {
      if (to === 'resolved' && seenCommentId) {
        const newest = await latestCommentId(trx, threadId);
        if (newest !== seenCommentId) {
          const [t] = await listThreadRows(trx, { studyId, threadId });
          const last = t?.comments.at(-1);
          throw new AppError('conflict', `${last?.authorName ?? 'Someone'} replied in this thread after the comment you last read. Read the new reply, then resolve the thread if it is still settled.`);
        }
      }
      await setThreadStatus(trx, threadId, to, a.id);
      await logActivity(trx, {
        workspaceId: study.workspaceId,
        studyId,
        actorId: a.id,
        action: to === 'resolved' ? 'comment.resolved' : 'comment.reopened',
        details: { threadId, anchor: thread.anchorKey, anchorLabel: thread.anchorLabel },
      });
    }
    return readThread(trx, study, threadId);
  });
}

export async function resolveThread(actor: Actor | null, studyId: string, threadId: string, input: ThreadResolveInput = {}): Promise<ThreadDto> {
  return setStatus(actor, studyId, threadId, 'resolved', input.seenCommentId);
}

export async function reopenThread(actor: Actor | null, studyId: string, threadId: string): Promise<ThreadDto> {
  return setStatus(actor, studyId, threadId, 'open');
}
