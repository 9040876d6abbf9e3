import type { Kysely, Transaction } from 'kysely';
import type { Database, FindingNoteStatus } from '../schema';
import { placeRevision, type Placement } from './versions';

type Db = Kysely<Database> | Transaction<Database>;

export interface RevisionRow {
  number: number;
  design: unknown;
  checks: unknown | null;
  note: string | null;
  authorName: string | null;
  createdAt: Date;
}

export async function findRevision(db: Db, studyId: string, number: number): Promise<RevisionRow | undefined> {
  const r = await db
    .selectFrom('study_revisions')
    .leftJoin('User', 'User.id', 'study_revisions.author_id')
    .select(['study_revisions.number', 'study_revisions.design', 'study_revisions.checks', 'study_revisions.note', 'study_revisions.created_at', 'User.name', 'User.email'])
    .where('study_revisions.study_id', '=', studyId)
    .where('study_revisions.number', '=', number)
    .executeTakeFirst();
  if (!r) return undefined;
  return { number: r.number, design: r.design, checks: r.checks, note: r.note, authorName: r.name ?? r.email, createdAt: r.created_at };
}

/**
 * Appends revision `expected + 1`, but only if the study is still at `expected`: the compare-and-
 * set on studies.current_revision is what turns two simultaneous saves into one save and one
 * conflict instead of a silent overwrite. The revision joins a version (db/repositories/versions.ts).
 * Returns the new number and its version, or undefined on conflict.
 */
export async function appendRevision(
  db: Db,
  input: { studyId: string; expected: number; design: unknown; checks: unknown; authorId: string; note?: string | null; at?: Date } & Pick<
    Placement,
    'coAuthorId' | 'suggestionId' | 'restoredFrom'
  >,
): Promise<{ number: number; version: number } | undefined> {
  const at = input.at ?? new Date();
  const claimed = await db
    .updateTable('studies')
    .set({ current_revision: input.expected + 1, updated_at: at })
    .where('id', '=', input.studyId)
    .where('current_revision', '=', input.expected)
    .returning('current_revision')
    .executeTakeFirst();
  if (!claimed) return undefined;
  const number = claimed.current_revision;
  const version = await placeRevision(db, {
    studyId: input.studyId,
    revision: number,
    authorId: input.authorId,
    at,
    coAuthorId: input.coAuthorId,
    suggestionId: input.suggestionId,
    restoredFrom: input.restoredFrom,
  });
  await db
    .insertInto('study_revisions')
    .values({
      study_id: input.studyId,
      number,
      design: JSON.stringify(input.design),
      checks: JSON.stringify(input.checks),
      author_id: input.authorId,
      note: input.note ?? null,
      created_at: at,
      version_number: version,
    })
    .execute();
  return { number, version };
}

export interface FindingNote {
  id: string;
  ruleId: string;
  key: string;
  status: FindingNoteStatus;
  reason: string;
  revision: number;
  actorName: string | null;
  createdAt: Date;
}

export async function insertFindingNote(
  db: Db,
  note: { studyId: string; ruleId: string; key: string; status: FindingNoteStatus; reason: string; revision: number; actorId: string },
): Promise<void> {
  await db
    .insertInto('finding_notes')
    .values({
      study_id: note.studyId,
      rule_id: note.ruleId,
      finding_key: note.key,
      status: note.status,
      reason: note.reason,
      revision_number: note.revision,
      actor_id: note.actorId,
    })
    .execute();
}

/** Every note on the study's findings, newest first: the first per (rule, key) is its state. */
export async function listFindingNotes(db: Db, studyId: string): Promise<FindingNote[]> {
  const rows = await db
    .selectFrom('finding_notes')
    .leftJoin('User', 'User.id', 'finding_notes.actor_id')
    .select([
      'finding_notes.id',
      'finding_notes.rule_id',
      'finding_notes.finding_key',
      'finding_notes.status',
      'finding_notes.reason',
      'finding_notes.revision_number',
      'finding_notes.created_at',
      'User.name',
      'User.email',
    ])
    .where('finding_notes.study_id', '=', studyId)
    .orderBy('finding_notes.id', 'desc')
    .limit(500)
    .execute();
  return rows.map((r) => ({
    id: r.id,
    ruleId: r.rule_id,
    key: r.finding_key,
    status: r.status,
    reason: r.reason,
    revision: r.revision_number,
    actorName: r.name ?? r.email,
    createdAt: r.created_at,
  }));
}
