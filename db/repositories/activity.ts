import { sql, type Kysely, type Transaction } from 'kysely';
import type { Database } from '../schema';

type Db = Kysely<Database> | Transaction<Database>;

export interface ActivityEntry {
  workspaceId?: string | null;
  studyId?: string | null;
  actorId?: string | null;
  action: string;
  details?: Record<string, unknown>;
}

export async function logActivity(db: Db, entry: ActivityEntry): Promise<void> {
  await db
    .insertInto('activity_log')
    .values({
      workspace_id: entry.workspaceId ?? null,
      study_id: entry.studyId ?? null,
      actor_id: entry.actorId ?? null,
      action: entry.action,
      details: JSON.stringify(entry.details ?? {}),
    })
    .execute();
}

export interface ActivityItem {
  id: string;
  action: string;
  details: Record<string, unknown>;
  actorName: string | null;
  actorEmail: string | null;
  createdAt: Date;
}

export async function listStudyActivity(db: Db, studyId: string, limit = 50): Promise<ActivityItem[]> {
  const rows = await db
    .selectFrom('activity_log')
    .leftJoin('User', 'User.id', 'activity_log.actor_id')
    .select([
      'activity_log.id',
      'activity_log.action',
      'activity_log.details',
      'activity_log.created_at',
      'User.name as actor_name',
      'User.email as actor_email',
    ])
    .where('activity_log.study_id', '=', studyId)
    .orderBy('activity_log.id', 'desc')
    .limit(limit)
    .execute();
  return rows.map((r) => ({
    id: r.id,
    action: r.action,
    details: r.details,
    actorName: r.actor_name,
    actorEmail: r.actor_email,
    createdAt: r.created_at,
  }));
}

export interface ActivityFilter {
  /** SQL LIKE patterns on the action (one kind of event); none: every action. */
  patterns?: readonly string[];
  actorId?: string;
  /** From this instant, inclusive. */
  from?: Date;
  /** Before this instant. */
  before?: Date;
}

/** One page of a study's activity, newest first, with how many entries match in all. */
export async function findStudyActivity(
  db: Db,
  studyId: string,
  filter: ActivityFilter,
  page: { limit: number; offset: number },
): Promise<{ items: ActivityItem[]; total: number }> {
  let q = db.selectFrom('activity_log').where('activity_log.study_id', '=', studyId);
  if (filter.patterns?.length) q = q.where(sql<boolean>`activity_log.action like any(${sql.val([...filter.patterns])}::text[])`);
  if (filter.actorId) q = q.where('activity_log.actor_id', '=', filter.actorId);
  if (filter.from) q = q.where('activity_log.created_at', '>=', filter.from);
  if (filter.before) q = q.where('activity_log.created_at', '<', filter.before);
  const [rows, count] = await Promise.all([
    q
      .leftJoin('User', 'User.id', 'activity_log.actor_id')
      .select([
        'activity_log.id',
        'activity_log.action',
        'activity_log.details',
        'activity_log.created_at',
        'User.name as actor_name',
        'User.email as actor_email',
      ])
      .orderBy('activity_log.created_at', 'desc')
      .orderBy('activity_log.id', 'desc')
      .limit(page.limit)
      .offset(page.offset)
      .execute(),
    q.select((eb) => eb.fn.countAll<string>().as('n')).executeTakeFirstOrThrow(),
  ]);
  return {
    items: rows.map((r) => ({
      id: r.id,
      action: r.action,
      details: r.details,
      actorName: r.actor_name,
      actorEmail: r.actor_email,
      createdAt: r.created_at,
    })),
    total: Number(count.n),
  };
}

/** The people who appear in a study's activity, for the filter by person. */
export async function listActivityActors(db: Db, studyId: string): Promise<{ id: string; name: string | null; email: string }[]> {
  return db
    .selectFrom('User')
    .select(['User.id', 'User.name', 'User.email'])
    .where((eb) =>
      eb.or([
        eb('User.id', 'in', eb.selectFrom('activity_log').select('actor_id').where('study_id', '=', studyId).where('actor_id', 'is not', null).$narrowType<{ actor_id: string }>()),
        eb('User.id', 'in', eb.selectFrom('study_members').select('user_id').where('study_id', '=', studyId)),
      ]),
    )
    .orderBy('User.name')
    .orderBy('User.email')
    .execute();
}
