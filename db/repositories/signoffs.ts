import { sql, type Kysely, type Transaction } from 'kysely';
import type { Database } from '../schema';

type Db = Kysely<Database> | Transaction<Database>;

/** A consultant's sign-off of a version: what was reviewed and on what conditions; withdrawn with a reason. */
export interface SignoffRow {
  id: string;
  versionNumber: number;
  revisionNumber: number;
  versionName: string | null;
  signerId: string | null;
  signerName: string | null;
  statement: string;
  conditions: string | null;
  createdAt: Date;
  withdrawnAt: Date | null;
  withdrawnByName: string | null;
  withdrawalReason: string | null;
}

function signoffQuery(db: Db, studyId: string) {
  return db
    .selectFrom('study_signoffs as s')
    .innerJoin('study_versions as v', (j) => j.onRef('v.study_id', '=', 's.study_id').onRef('v.number', '=', 's.version_number'))
    .leftJoin('User as signer', 'signer.id', 's.signer_id')
    .leftJoin('User as w', 'w.id', 's.withdrawn_by')
    .select([
      's.id',
      's.version_number',
      's.revision_number',
      'v.name as version_name',
      's.signer_id',
      's.statement',
      's.conditions',
      's.created_at',
      's.withdrawn_at',
      's.withdrawal_reason',
      sql<string | null>`coalesce(signer.name, signer.email)`.as('signer_name'),
      sql<string | null>`coalesce(w.name, w.email)`.as('withdrawn_by_name'),
    ])
    .where('s.study_id', '=', studyId);
}

type Raw = Awaited<ReturnType<ReturnType<typeof signoffQuery>['executeTakeFirstOrThrow']>>;

const rowToSignoff = (r: Raw): SignoffRow => ({
  id: r.id,
  versionNumber: r.version_number,
  revisionNumber: r.revision_number,
  versionName: r.version_name,
  signerId: r.signer_id,
  signerName: r.signer_name,
  statement: r.statement,
  conditions: r.conditions,
  createdAt: r.created_at,
  withdrawnAt: r.withdrawn_at,
  withdrawnByName: r.withdrawn_by_name,
  withdrawalReason: r.withdrawal_reason,
});

/** The study's sign-offs, newest first. */
export async function listSignoffs(db: Db, studyId: string): Promise<SignoffRow[]> {
  const rows = await signoffQuery(db, studyId).orderBy('s.created_at', 'desc').orderBy('s.id').execute();
  return rows.map(rowToSignoff);
}

export async function findSignoff(db: Db, studyId: string, id: string): Promise<SignoffRow | undefined> {
  const row = await signoffQuery(db, studyId).where('s.id', '=', id).executeTakeFirst();
  return row ? rowToSignoff(row) : undefined;
}

export async function insertSignoff(
  db: Db,
  s: { studyId: string; versionNumber: number; revisionNumber: number; signerId: string; statement: string; conditions: string | null; at: Date },
): Promise<string> {
  const row = await db
    .insertInto('study_signoffs')
    .values({
      study_id: s.studyId,
      version_number: s.versionNumber,
      revision_number: s.revisionNumber,
      signer_id: s.signerId,
      statement: s.statement,
      conditions: s.conditions,
      created_at: s.at,
    })
    .returning('id')
    .executeTakeFirstOrThrow();
  return row.id;
}

/** Withdraws a sign-off that is not withdrawn yet; false when it already was. */
export async function withdrawSignoffRow(db: Db, studyId: string, id: string, by: string, reason: string, at: Date): Promise<boolean> {
  const row = await db
    .updateTable('study_signoffs')
    .set({ withdrawn_at: at, withdrawn_by: by, withdrawal_reason: reason })
    .where('study_id', '=', studyId)
    .where('id', '=', id)
    .where('withdrawn_at', 'is', null)
    .returning('id')
    .executeTakeFirst();
  return row !== undefined;
}
