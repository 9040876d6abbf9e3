import { sql, type Kysely, type Transaction } from 'kysely';
import type { Database, VersionCloseReason } from '../schema';

type Db = Kysely<Database> | Transaction<Database>;

/**
 * Versions: one person's continuous editing of a design. Every save stays a revision (kept for
 * recovery); `placeRevision` puts each new revision into a version by this rule:
 *
 * - it continues the study's open version when the same person saved it last, less than
 *   VERSION_IDLE_MINUTES ago;
 * - otherwise the open version is closed (idle since its last save, or someone else saved) and
 *   the revision opens a new version;
 * - a restore and an accepted suggestion are each a version of their own, closed at once.
 *
 * A version is also closed when it is named or signed off and when its author leaves the
 * wizard (`closeVersion`). A closed version is never reopened nor given more revisions.
 *
 * 20 minutes: the wizard saves a moment after every change, so a person at work saves every
 * minute or two; a pause of 20 minutes is a meeting, a meal or the end of the session, not a
 * look at a reference. Shorter splits one sitting into several versions; longer merges the
 * morning's and the afternoon's work. The same rule grouped the revisions stored before versions
 * existed (migration 20261204T100000).
 */
export const VERSION_IDLE_MINUTES = 20;
const IDLE_MS = VERSION_IDLE_MINUTES * 60_000;

export interface OpenVersion {
  number: number;
  authorId: string | null;
  lastSavedAt: Date;
}

/** Whether a save by `authorId` at `at` continues the open version. */
export function continuesVersion(open: OpenVersion, authorId: string, at: Date): boolean {
  return open.authorId === authorId && at.getTime() - open.lastSavedAt.getTime() < IDLE_MS;
}

/** Whether a version with no close recorded is still open at `now` (its author saved within the idle time). */
export function isOpenAt(v: { closedAt: Date | null; lastSavedAt: Date }, now: Date): boolean {
  return v.closedAt === null && now.getTime() - v.lastSavedAt.getTime() < IDLE_MS;
}

export async function findOpenVersion(db: Db, studyId: string): Promise<OpenVersion | undefined> {
  const row = await db
    .selectFrom('study_versions')
    .select(['number', 'author_id', 'last_saved_at'])
    .where('study_id', '=', studyId)
    .where('closed_at', 'is', null)
    .executeTakeFirst();
  return row ? { number: row.number, authorId: row.author_id, lastSavedAt: row.last_saved_at } : undefined;
}

/** Closes the open version at `at` (at its last save + the idle time when it went idle before). */
export async function closeVersion(db: Db, studyId: string, open: OpenVersion, at: Date, reason: VersionCloseReason): Promise<void> {
  const idleSince = new Date(open.lastSavedAt.getTime() + IDLE_MS);
  const closedAt = idleSince < at ? idleSince : at;
  await db
    .updateTable('study_versions')
    .set({ closed_at: closedAt, close_reason: idleSince < at ? 'idle' : reason })
    .where('study_id', '=', studyId)
    .where('number', '=', open.number)
    .where('closed_at', 'is', null)
    .execute();
}

export interface Placement {
  studyId: string;
  revision: number;
  authorId: string;
  at: Date;
  /** An accepted suggestion: who proposed it. */
  coAuthorId?: string;
  suggestionId?: string;
  /** A restore: the version whose design the revision takes again. */
  restoredFrom?: number;
}

/** Puts a new revision into a version (the rule above) and returns the version's number. Call with the study's row locked. */
export async function placeRevision(db: Db, p: Placement): Promise<number> {
  const open = await findOpenVersion(db, p.studyId);
  const own = p.coAuthorId !== undefined || p.restoredFrom !== undefined;
  if (open && !own && continuesVersion(open, p.authorId, p.at)) {
    await db
      .updateTable('study_versions')
      .set((eb) => ({ last_revision: p.revision, saves: eb('saves', '+', 1), last_saved_at: p.at }))
      .where('study_id', '=', p.studyId)
      .where('number', '=', open.number)
      .execute();
    return open.number;
  }
  const ownReason: VersionCloseReason = p.coAuthorId !== undefined ? 'suggestion' : 'restore';
  if (open) await closeVersion(db, p.studyId, open, p.at, own ? ownReason : open.authorId === p.authorId ? 'idle' : 'other-author');
  const last = await db.selectFrom('study_versions').select((eb) => eb.fn.max('number').as('n')).where('study_id', '=', p.studyId).executeTakeFirst();
  const number = (last?.n ?? 0) + 1;
  await db
    .insertInto('study_versions')
    .values({
      study_id: p.studyId,
      number,
      first_revision: p.revision,
      last_revision: p.revision,
      saves: 1,
      author_id: p.authorId,
      co_author_id: p.coAuthorId ?? null,
      suggestion_id: p.suggestionId ?? null,
      restored_from: p.restoredFrom ?? null,
      opened_at: p.at,
      last_saved_at: p.at,
      closed_at: own ? p.at : null,
      close_reason: own ? ownReason : null,
    })
    .execute();
  return number;
}

export interface VersionRow {
  number: number;
  firstRevision: number;
  lastRevision: number;
  saves: number;
  authorId: string | null;
  authorName: string | null;
  coAuthorId: string | null;
  coAuthorName: string | null;
  suggestionId: string | null;
  restoredFrom: number | null;
  name: string | null;
  namedByName: string | null;
  namedAt: Date | null;
  openedAt: Date;
  lastSavedAt: Date;
  closedAt: Date | null;
  closeReason: VersionCloseReason | null;
  /** Findings of the checks stored with the version's last revision (null when none were stored). */
  findings: number | null;
}

function versionQuery(db: Db, studyId: string) {
  return db
    .selectFrom('study_versions as v')
    .leftJoin('User as author', 'author.id', 'v.author_id')
    .leftJoin('User as co', 'co.id', 'v.co_author_id')
    .leftJoin('User as namer', 'namer.id', 'v.named_by')
    .leftJoin('study_revisions as r', (j) => j.onRef('r.study_id', '=', 'v.study_id').onRef('r.number', '=', 'v.last_revision'))
    .select([
      'v.number',
      'v.first_revision',
      'v.last_revision',
      'v.saves',
      'v.author_id',
      'v.co_author_id',
      'v.suggestion_id',
      'v.restored_from',
      'v.name',
      'v.named_at',
      'v.opened_at',
      'v.last_saved_at',
      'v.closed_at',
      'v.close_reason',
      sql<string | null>`coalesce(author.name, author.email)`.as('author_name'),
      sql<string | null>`coalesce(co.name, co.email)`.as('co_author_name'),
      sql<string | null>`coalesce(namer.name, namer.email)`.as('named_by_name'),
      sql<number | null>`case when jsonb_typeof(r.checks->'findings') = 'array' then jsonb_array_length(r.checks->'findings') end`.as('findings'),
    ])
    .where('v.study_id', '=', studyId);
}

type Raw = Awaited<ReturnType<ReturnType<typeof versionQuery>['executeTakeFirstOrThrow']>>;

function rowToVersion(r: Raw): VersionRow {
  return {
    number: r.number,
    firstRevision: r.first_revision,
    lastRevision: r.last_revision,
    saves: r.saves,
    authorId: r.author_id,
    authorName: r.author_name,
    coAuthorId: r.co_author_id,
    coAuthorName: r.co_author_name,
    suggestionId: r.suggestion_id,
    restoredFrom: r.restored_from,
    name: r.name,
    namedByName: r.named_by_name,
    namedAt: r.named_at,
    openedAt: r.opened_at,
    lastSavedAt: r.last_saved_at,
    closedAt: r.closed_at,
    closeReason: r.close_reason,
    findings: r.findings === null ? null : Number(r.findings),
  };
}

/** The study's versions, newest first. */
export async function listVersions(db: Db, studyId: string): Promise<VersionRow[]> {
  const rows = await versionQuery(db, studyId).orderBy('v.number', 'desc').execute();
  return rows.map(rowToVersion);
}

export async function findVersion(db: Db, studyId: string, number: number): Promise<VersionRow | undefined> {
  const row = await versionQuery(db, studyId).where('v.number', '=', number).executeTakeFirst();
  return row ? rowToVersion(row) : undefined;
}

/** The version a revision belongs to. */
export async function versionOfRevision(db: Db, studyId: string, revision: number): Promise<number | undefined> {
  const row = await db
    .selectFrom('study_versions')
    .select('number')
    .where('study_id', '=', studyId)
    .where('first_revision', '<=', revision)
    .where('last_revision', '>=', revision)
    .executeTakeFirst();
  return row?.number;
}

export async function setVersionName(db: Db, studyId: string, number: number, name: string | null, by: string, at: Date): Promise<void> {
  await db
    .updateTable('study_versions')
    .set({ name, named_by: name === null ? null : by, named_at: name === null ? null : at })
    .where('study_id', '=', studyId)
    .where('number', '=', number)
    .execute();
}

/** The saves of a version, oldest first (for recovery). */
export async function listVersionRevisions(db: Db, studyId: string, v: { firstRevision: number; lastRevision: number }): Promise<{ number: number; authorName: string | null; createdAt: Date }[]> {
  const rows = await db
    .selectFrom('study_revisions')
    .leftJoin('User', 'User.id', 'study_revisions.author_id')
    .select(['study_revisions.number', 'study_revisions.created_at', 'User.name', 'User.email'])
    .where('study_revisions.study_id', '=', studyId)
    .where('study_revisions.number', '>=', v.firstRevision)
    .where('study_revisions.number', '<=', v.lastRevision)
    .orderBy('study_revisions.number')
    .execute();
  return rows.map((r) => ({ number: r.number, authorName: r.name ?? r.email, createdAt: r.created_at }));
}

/** The newest finished stress test run on one of the revisions first..last, with its specification and results. */
export async function findFinishedRun(db: Db, studyId: string, v: { firstRevision: number; lastRevision: number }): Promise<{ id: string; spec: unknown; results: unknown } | undefined> {
  return db
    .selectFrom('simulations')
    .select(['id', 'spec', 'results'])
    .where('study_id', '=', studyId)
    .where('status', '=', 'done')
    .where('revision_number', '>=', v.firstRevision)
    .where('revision_number', '<=', v.lastRevision)
    .orderBy('finished_at', 'desc')
    .orderBy('created_at', 'desc')
    .limit(1)
    .executeTakeFirst();
}
