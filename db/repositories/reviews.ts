import type { Kysely, Transaction } from 'kysely';
import type { Database, SuggestionStatus, ThreadAnchorKind, ThreadStatus } from '../schema';

type Db = Kysely<Database> | Transaction<Database>;

export interface ReviewComment {
  id: string;
  threadId: string;
  authorId: string | null;
  authorName: string | null;
  body: string;
  mentions: string[];
  createdAt: Date;
}

export interface ReviewThread {
  id: string;
  studyId: string;
  anchorKind: ThreadAnchorKind;
  anchorKey: string;
  anchor: Record<string, unknown>;
  anchorLabel: string;
  fingerprint: string | null;
  revision: number;
  status: ThreadStatus;
  createdBy: string | null;
  createdByName: string | null;
  createdAt: Date;
  resolvedByName: string | null;
  resolvedAt: Date | null;
  lastActivityAt: Date;
  comments: ReviewComment[];
}

export interface ThreadFilter {
  studyId: string;
  threadId?: string;
  anchorKind?: ThreadAnchorKind;
  anchorKey?: string;
  author?: string;
  status?: ThreadStatus;
}

export async function insertThread(
  db: Db,
  row: { studyId: string; anchorKind: ThreadAnchorKind; anchorKey: string; anchor: unknown; anchorLabel: string; fingerprint: string | null; revision: number; createdBy: string },
): Promise<string> {
  const r = await db
    .insertInto('review_threads')
    .values({
      study_id: row.studyId,
      anchor_kind: row.anchorKind,
      anchor_key: row.anchorKey,
      anchor: JSON.stringify(row.anchor),
      anchor_label: row.anchorLabel,
      anchor_fingerprint: row.fingerprint,
      revision_number: row.revision,
      created_by: row.createdBy,
    })
    .returning('id')
    .executeTakeFirstOrThrow();
  return r.id;
}

export async function insertComment(db: Db, row: { threadId: string; authorId: string; body: string; mentions: string[] }): Promise<string> {
  const r = await db
    .insertInto('review_comments')
    .values({ thread_id: row.threadId, author_id: row.authorId, body: row.body, mentions: row.mentions })
    .returning('id')
    .executeTakeFirstOrThrow();
  return r.id;
}

/** Holds the thread's row until the transaction ends: replies, resolving and reopening take turns. */
export async function lockThread(
  trx: Transaction<Database>,
  studyId: string,
  threadId: string,
): Promise<{ id: string; status: ThreadStatus; createdBy: string | null; anchorLabel: string; anchorKey: string } | undefined> {
  const r = await trx
    .selectFrom('review_threads')
    .select(['id', 'status', 'created_by', 'anchor_label', 'anchor_key'])
    .where('id', '=', threadId)
    .where('study_id', '=', studyId)
    .forUpdate()
    .executeTakeFirst();
  return r && { id: r.id, status: r.status, createdBy: r.created_by, anchorLabel: r.anchor_label, anchorKey: r.anchor_key };
}

export async function setThreadStatus(db: Db, threadId: string, status: ThreadStatus, by: string, now = new Date()): Promise<void> {
  await db
    .updateTable('review_threads')
    .set(status === 'resolved' ? { status, resolved_by: by, resolved_at: now, last_activity_at: now } : { status, resolved_by: null, resolved_at: null, last_activity_at: now })
    .where('id', '=', threadId)
    .execute();
}

export async function touchThread(db: Db, threadId: string, now = new Date()): Promise<void> {
  await db.updateTable('review_threads').set({ last_activity_at: now }).where('id', '=', threadId).execute();
}

/** The newest comment of a thread (the one with the highest sequence number). */
export async function latestCommentId(db: Db, threadId: string): Promise<string | undefined> {
  const r = await db.selectFrom('review_comments').select('id').where('thread_id', '=', threadId).orderBy('seq', 'desc').limit(1).executeTakeFirst();
  return r?.id;
}

/** Everyone who wrote in the thread. */
export async function threadAuthors(db: Db, threadId: string): Promise<string[]> {
  const rows = await db.selectFrom('review_comments').select('author_id').distinct().where('thread_id', '=', threadId).where('author_id', 'is not', null).execute();
  return rows.map((r) => r.author_id!);
}

/** Threads with their comments, the most recently active first. */
export async function listThreads(db: Db, f: ThreadFilter): Promise<ReviewThread[]> {
  let q = db
    .selectFrom('review_threads as t')
    .leftJoin('User as c', 'c.id', 't.created_by')
    .leftJoin('User as r', 'r.id', 't.resolved_by')
    .select([
      't.id',
      't.study_id',
      't.anchor_kind',
      't.anchor_key',
      't.anchor',
      't.anchor_label',
      't.anchor_fingerprint',
      't.revision_number',
      't.status',
      't.created_by',
      't.created_at',
      't.resolved_at',
      't.last_activity_at',
      'c.name as creator_name',
      'c.email as creator_email',
      'r.name as resolver_name',
      'r.email as resolver_email',
    ])
    .where('t.study_id', '=', f.studyId);
  if (f.threadId) q = q.where('t.id', '=', f.threadId);
  if (f.anchorKind) q = q.where('t.anchor_kind', '=', f.anchorKind);
  if (f.anchorKey) q = q.where('t.anchor_key', '=', f.anchorKey);
  if (f.status) q = q.where('t.status', '=', f.status);
  if (f.author) {
    const author = f.author;
    q = q.where((eb) => eb.exists(eb.selectFrom('review_comments as a').select('a.id').whereRef('a.thread_id', '=', 't.id').where('a.author_id', '=', author)));
  }
  const rows = await q.orderBy('t.last_activity_at', 'desc').orderBy('t.id').limit(500).execute();
  if (rows.length === 0) return [];
  const comments = await db
    .selectFrom('review_comments as m')
    .leftJoin('User as u', 'u.id', 'm.author_id')
    .select(['m.id', 'm.thread_id', 'm.author_id', 'm.body', 'm.mentions', 'm.created_at', 'u.name', 'u.email'])
    .where(
      'm.thread_id',
      'in',
      rows.map((r) => r.id),
    )
    .orderBy('m.seq')
    .execute();
  const byThread = new Map<string, ReviewComment[]>();
  for (const c of comments) {
    const list = byThread.get(c.thread_id) ?? [];
    list.push({ id: c.id, threadId: c.thread_id, authorId: c.author_id, authorName: c.name ?? c.email, body: c.body, mentions: c.mentions, createdAt: c.created_at });
    byThread.set(c.thread_id, list);
  }
  return rows.map((r) => ({
    id: r.id,
    studyId: r.study_id,
    anchorKind: r.anchor_kind,
    anchorKey: r.anchor_key,
    anchor: r.anchor,
    anchorLabel: r.anchor_label,
    fingerprint: r.anchor_fingerprint,
    revision: r.revision_number,
    status: r.status,
    createdBy: r.created_by,
    createdByName: r.creator_name ?? r.creator_email,
    createdAt: r.created_at,
    resolvedByName: r.status === 'resolved' ? (r.resolver_name ?? r.resolver_email) : null,
    resolvedAt: r.status === 'resolved' ? r.resolved_at : null,
    lastActivityAt: r.last_activity_at,
    comments: byThread.get(r.id) ?? [],
  }));
}

export async function countOpenThreads(db: Db, studyId: string): Promise<number> {
  const r = await db
    .selectFrom('review_threads')
    .select((eb) => eb.fn.countAll<string>().as('n'))
    .where('study_id', '=', studyId)
    .where('status', '=', 'open')
    .executeTakeFirstOrThrow();
  return Number(r.n);
}

// Suggestions.

export interface ReviewSuggestion {
  id: string;
  studyId: string;
  path: string;
  label: string;
  oldValue: unknown;
  newValue: unknown;
  reason: string;
  revision: number;
  status: SuggestionStatus;
  createdBy: string | null;
  createdByName: string | null;
  createdAt: Date;
  decidedByName: string | null;
  decidedAt: Date | null;
  decisionReason: string | null;
  acceptedRevision: number | null;
}

export async function insertSuggestion(
  db: Db,
  row: { studyId: string; path: string; label: string; oldValue: unknown; newValue: unknown; reason: string; revision: number; createdBy: string },
): Promise<string> {
  const r = await db
    .insertInto('review_suggestions')
    .values({
      study_id: row.studyId,
      field_path: row.path,
      field_label: row.label,
      old_value: JSON.stringify(row.oldValue ?? null),
      new_value: JSON.stringify(row.newValue ?? null),
      reason: row.reason,
      revision_number: row.revision,
      created_by: row.createdBy,
    })
    .returning('id')
    .executeTakeFirstOrThrow();
  return r.id;
}

export async function listSuggestions(db: Db, f: { studyId: string; id?: string; status?: SuggestionStatus }): Promise<ReviewSuggestion[]> {
  let q = db
    .selectFrom('review_suggestions as s')
    .leftJoin('User as c', 'c.id', 's.created_by')
    .leftJoin('User as d', 'd.id', 's.decided_by')
    .selectAll('s')
    .select(['c.name as creator_name', 'c.email as creator_email', 'd.name as decider_name', 'd.email as decider_email'])
    .where('s.study_id', '=', f.studyId);
  if (f.id) q = q.where('s.id', '=', f.id);
  if (f.status) q = q.where('s.status', '=', f.status);
  const rows = await q.orderBy('s.created_at', 'desc').orderBy('s.id').limit(500).execute();
  return rows.map((r) => ({
    id: r.id,
    studyId: r.study_id,
    path: r.field_path,
    label: r.field_label,
    oldValue: r.old_value,
    newValue: r.new_value,
    reason: r.reason,
    revision: r.revision_number,
    status: r.status,
    createdBy: r.created_by,
    createdByName: r.creator_name ?? r.creator_email,
    createdAt: r.created_at,
    decidedByName: r.decider_name ?? r.decider_email,
    decidedAt: r.decided_at,
    decisionReason: r.decision_reason,
    acceptedRevision: r.accepted_revision,
  }));
}

/** Holds a suggestion's row until the transaction ends, so that it is decided once. */
export async function lockSuggestion(trx: Transaction<Database>, studyId: string, id: string): Promise<{ status: SuggestionStatus } | undefined> {
  return trx.selectFrom('review_suggestions').select('status').where('id', '=', id).where('study_id', '=', studyId).forUpdate().executeTakeFirst();
}

export async function decideSuggestion(
  db: Db,
  id: string,
  d: { status: 'accepted' | 'declined'; by: string; reason: string | null; acceptedRevision: number | null; now?: Date },
): Promise<boolean> {
  const r = await db
    .updateTable('review_suggestions')
    .set({ status: d.status, decided_by: d.by, decided_at: d.now ?? new Date(), decision_reason: d.reason, accepted_revision: d.acceptedRevision })
    .where('id', '=', id)
    .where('status', '=', 'pending')
    .executeTakeFirst();
  return Number(r.numUpdatedRows) === 1;
}
