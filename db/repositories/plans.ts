import type { Kysely, Transaction } from 'kysely';
import type { Database } from '../schema';

type Db = Kysely<Database> | Transaction<Database>;

/** A saved Plan tab result: the request, the output computed from it on the server, who and when. */
export interface PlanResult {
  id: string;
  studyId: string;
  revision: number;
  kind: string;
  request: unknown;
  output: unknown;
  note: string | null;
  createdBy: string | null;
  createdByName: string | null;
  createdAt: Date;
}

export async function insertPlanResult(
  db: Db,
  row: { studyId: string; revision: number; kind: string; request: unknown; output: unknown; note: string | null; createdBy: string },
): Promise<string> {
  const r = await db
    .insertInto('plan_results')
    .values({
      study_id: row.studyId,
      revision_number: row.revision,
      kind: row.kind,
      request: JSON.stringify(row.request),
      output: JSON.stringify(row.output),
      note: row.note,
      created_by: row.createdBy,
    })
    .returning('id')
    .executeTakeFirstOrThrow();
  return r.id;
}

/** The study's saved results, newest first (at most `limit`). */
export async function listPlanResults(db: Db, studyId: string, limit = 100): Promise<PlanResult[]> {
  const rows = await db
    .selectFrom('plan_results')
    .leftJoin('User', 'User.id', 'plan_results.created_by')
    .select([
      'plan_results.id',
      'plan_results.study_id',
      'plan_results.revision_number',
      'plan_results.kind',
      'plan_results.request',
      'plan_results.output',
      'plan_results.note',
      'plan_results.created_by',
      'plan_results.created_at',
      'User.name',
      'User.email',
    ])
    .where('plan_results.study_id', '=', studyId)
    .orderBy('plan_results.id', 'desc')
    .limit(limit)
    .execute();
  return rows.map((r) => ({
    id: r.id,
    studyId: r.study_id,
    revision: r.revision_number,
    kind: r.kind,
    request: r.request,
    output: r.output,
    note: r.note,
    createdBy: r.created_by,
    createdByName: r.name ?? r.email,
    createdAt: r.created_at,
  }));
}
