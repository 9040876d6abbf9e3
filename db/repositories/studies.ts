import { sql, type Kysely, type Transaction } from 'kysely';
import type { Database, StudyRole, StudyStatus } from '../schema';
import { placeRevision } from './versions';
import type { RowLock } from './workspaces';

type Db = Kysely<Database> | Transaction<Database>;

export interface Study {
  id: string;
  workspaceId: string;
  title: string;
  description: string;
  status: StudyStatus;
  currentRevision: number;
  createdAt: Date;
  updatedAt: Date;
  archivedAt: Date | null;
}

export interface StudyWithRole extends Study {
  role: StudyRole;
}

/** Activity that puts a study in review (issue 12): comments, suggestions and their decisions, sign-offs. */
export const REVIEW_ACTIONS = [
  'comment.created',
  'comment.replied',
  'comment.resolved',
  'comment.reopened',
  'suggestion.created',
  'suggestion.accepted',
  'suggestion.declined',
  'signoff.created',
  'signoff.withdrawn',
] as const;

/**
 * The study's status, derived on read, never chosen: archived when archived; signed off when a
 * sign-off that is not withdrawn covers the newest revision; in review once anyone commented,
 * suggested or signed off (a change after a sign-off brings it back to in review); else draft.
 */
export const studyStatusSql = sql<StudyStatus>`(case
  when studies.status = 'archived' then 'archived'
  when exists (select 1 from study_signoffs s where s.study_id = studies.id and s.withdrawn_at is null and s.revision_number = studies.current_revision) then 'signed-off'
  when exists (select 1 from activity_log a where a.study_id = studies.id and a.action in (${sql.join(REVIEW_ACTIONS.map((a) => sql.lit(a)))})) then 'in-review'
  else 'draft'
end)`;

/**
 * The study with its derived status, read by a query of its own: the row's own query may hold a
 * lock, and stays short and plain.
 */
async function withDerivedStatus(db: Db, study: Study): Promise<Study> {
  if (study.status === 'archived') return study;
  const row = await db.selectFrom('studies').select(studyStatusSql.as('status')).where('studies.id', '=', study.id).executeTakeFirstOrThrow();
  return { ...study, status: row.status };
}

const STUDY_COLUMNS = [
  'studies.id',
  'studies.workspace_id',
  'studies.title',
  'studies.description',
  'studies.status',
  'studies.current_revision',
  'studies.created_at',
  'studies.updated_at',
  'studies.archived_at',
] as const;

type StudyColumns = {
  id: string;
  workspace_id: string;
  title: string;
  description: string;
  status: StudyStatus;
  current_revision: number;
  created_at: Date;
  updated_at: Date;
  archived_at: Date | null;
};

export function rowToStudy(r: StudyColumns): Study {
  return {
    id: r.id,
    workspaceId: r.workspace_id,
    title: r.title,
    description: r.description,
    status: r.status,
    currentRevision: r.current_revision,
    createdAt: r.created_at,
    updatedAt: r.updated_at,
    archivedAt: r.archived_at,
  };
}

/** The workspace a study belongs to (it never changes), or undefined when there is no such study. */
export async function findStudyWorkspaceId(db: Db, studyId: string): Promise<string | undefined> {
  const row = await db.selectFrom('studies').select('workspace_id').where('id', '=', studyId).executeTakeFirst();
  return row?.workspace_id;
}

/** Locks the study's row until the transaction ends (lib/data/access.ts: after its workspace's). */
export async function lockStudy(trx: Transaction<Database>, studyId: string, mode: RowLock): Promise<boolean> {
  const q = trx.selectFrom('studies').select('id').where('id', '=', studyId);
  const row = await (mode === 'share' ? q.forShare() : q.forNoKeyUpdate()).executeTakeFirst();
  return row !== undefined;
}

/**
 * The study and the role of `userId` on it (null when not a member), with the workspace role.
 * With `lock` (in a transaction) the study's row stays locked until the transaction ends.
 */
export async function findStudyForUser(
  db: Db,
  studyId: string,
  userId: string,
  lock?: RowLock,
): Promise<{ study: Study; role: StudyRole | null; workspaceRole: 'admin' | 'member' | null } | undefined> {
  const query = db
    .selectFrom('studies')
    .leftJoin('study_members', (j) => j.onRef('study_members.study_id', '=', 'studies.id').on('study_members.user_id', '=', userId))
    .leftJoin('workspace_members', (j) =>
      j.onRef('workspace_members.workspace_id', '=', 'studies.workspace_id').on('workspace_members.user_id', '=', userId),
    )
    .select([...STUDY_COLUMNS, 'study_members.role as role', 'workspace_members.role as workspace_role'])
    .where('studies.id', '=', studyId);
  const locked = lock === 'share' ? query.forShare('studies') : lock === 'update' ? query.forNoKeyUpdate('studies') : query;
  const row = await locked.executeTakeFirst();
  if (!row) return undefined;
  return { study: await withDerivedStatus(db, rowToStudy(row)), role: row.role, workspaceRole: row.workspace_role };
}

export interface StudyListFilter {
  workspaceId: string;
  userId: string;
  q?: string;
  status: 'active' | 'archived' | 'all' | StudyStatus;
  sort: 'title' | 'status' | 'role' | 'updated' | 'created';
  dir: 'asc' | 'desc';
  page: number;
  pageSize: number;
}

export async function listStudiesForUser(db: Db, f: StudyListFilter): Promise<{ items: StudyWithRole[]; total: number }> {
  let q = db
    .selectFrom('studies')
    .innerJoin('study_members', 'study_members.study_id', 'studies.id')
    .where('studies.workspace_id', '=', f.workspaceId)
    .where('study_members.user_id', '=', f.userId);
  if (f.status === 'active') q = q.where('studies.status', '!=', 'archived');
  else if (f.status !== 'all') q = q.where(sql<boolean>`${studyStatusSql} = ${f.status}`);
  if (f.q) {
    const pattern = `%${f.q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
    q = q.where((eb) => eb.or([eb('studies.title', 'ilike', pattern), eb('studies.description', 'ilike', pattern)]));
  }
  const totalRow = await q.select((eb) => eb.fn.countAll<string>().as('n')).executeTakeFirstOrThrow();
  const sortColumn = {
    title: sql`lower(studies.title)`,
    status: studyStatusSql,
    role: sql`array_position(array['owner','editor','consultant','writer','viewer'], study_members.role)`,
    updated: sql`studies.updated_at`,
    created: sql`studies.created_at`,
  }[f.sort];
  const rows = await q
    .select([...STUDY_COLUMNS.filter((c) => c !== 'studies.status'), studyStatusSql.as('status'), 'study_members.role as role'])
    .orderBy(sortColumn, f.dir)
    .orderBy('studies.id')
    .limit(f.pageSize)
    .offset((f.page - 1) * f.pageSize)
    .execute();
  return { items: rows.map((r) => ({ ...rowToStudy(r), role: r.role })), total: Number(totalRow.n) };
}

export async function insertStudy(
  db: Db,
  input: { workspaceId: string; title: string; description: string; createdBy: string },
): Promise<Study> {
  const row = await db
    .insertInto('studies')
    .values({ workspace_id: input.workspaceId, title: input.title, description: input.description, created_by: input.createdBy })
    .returningAll()
    .executeTakeFirstOrThrow();
  return rowToStudy(row);
}

export async function updateStudyRow(
  db: Db,
  studyId: string,
  patch: { title?: string; description?: string; status?: StudyStatus; archived_at?: Date | null },
): Promise<Study> {
  const row = await db
    .updateTable('studies')
    .set({ ...patch, updated_at: new Date() })
    .where('id', '=', studyId)
    .returning('id')
    .executeTakeFirstOrThrow();
  // Read back through the derived status (an update does not choose it).
  return withDerivedStatus(db, rowToStudy(await db.selectFrom('studies').select(STUDY_COLUMNS).where('studies.id', '=', row.id).executeTakeFirstOrThrow()));
}

export async function upsertStudyMember(db: Db, studyId: string, userId: string, role: StudyRole): Promise<void> {
  // The owner keeps the owner role whatever an invitation says.
  await db
    .insertInto('study_members')
    .values({ study_id: studyId, user_id: userId, role })
    .onConflict((oc) =>
      oc.columns(['study_id', 'user_id']).doUpdateSet({
        role: sql<StudyRole>`case when study_members.role = 'owner' then 'owner' else excluded.role end`,
      }),
    )
    .execute();
}

export interface StudyMember {
  userId: string;
  name: string | null;
  email: string;
  role: StudyRole;
  since: Date;
}

export async function listStudyMembers(db: Db, studyId: string): Promise<StudyMember[]> {
  const rows = await db
    .selectFrom('study_members')
    .innerJoin('User', 'User.id', 'study_members.user_id')
    .select(['User.id', 'User.name', 'User.email', 'study_members.role', 'study_members.created_at'])
    .where('study_members.study_id', '=', studyId)
    .orderBy(sql`array_position(array['owner','editor','consultant','writer','viewer'], study_members.role)`)
    .orderBy('User.name')
    .execute();
  return rows.map((r) => ({ userId: r.id, name: r.name, email: r.email, role: r.role, since: r.created_at }));
}

export async function findStudyMemberRole(db: Db, studyId: string, userId: string): Promise<StudyRole | undefined> {
  const row = await db
    .selectFrom('study_members')
    .select('role')
    .where('study_id', '=', studyId)
    .where('user_id', '=', userId)
    .executeTakeFirst();
  return row?.role;
}

export async function setStudyMemberRole(db: Db, studyId: string, userId: string, role: StudyRole): Promise<void> {
  await db.updateTable('study_members').set({ role }).where('study_id', '=', studyId).where('user_id', '=', userId).execute();
}

export async function deleteStudyMember(db: Db, studyId: string, userId: string): Promise<void> {
  await db.deleteFrom('study_members').where('study_id', '=', studyId).where('user_id', '=', userId).execute();
}

export async function countStudiesOwnedInWorkspace(db: Db, workspaceId: string, userId: string): Promise<number> {
  const row = await db
    .selectFrom('study_members')
    .innerJoin('studies', 'studies.id', 'study_members.study_id')
    .select((eb) => eb.fn.countAll<string>().as('n'))
    .where('studies.workspace_id', '=', workspaceId)
    .where('study_members.user_id', '=', userId)
    .where('study_members.role', '=', 'owner')
    .executeTakeFirstOrThrow();
  return Number(row.n);
}

/** Appends a revision; the unique (study, number) constraint rejects a concurrent save. */
export async function insertRevision(
  db: Db,
  input: { studyId: string; number: number; design: unknown; authorId: string; note?: string | null; checks?: unknown; at?: Date },
): Promise<void> {
  const at = input.at ?? new Date();
  const version = await placeRevision(db, { studyId: input.studyId, revision: input.number, authorId: input.authorId, at });
  await db
    .insertInto('study_revisions')
    .values({
      created_at: at,
      version_number: version,
      study_id: input.studyId,
      number: input.number,
      design: JSON.stringify(input.design),
      checks: input.checks === undefined ? null : JSON.stringify(input.checks),
      author_id: input.authorId,
      note: input.note ?? null,
    })
    .execute();
  await db.updateTable('studies').set({ current_revision: input.number, updated_at: new Date() }).where('id', '=', input.studyId).execute();
}
