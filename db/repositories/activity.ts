import type { Kysely, Transaction } from 'kysely';
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
