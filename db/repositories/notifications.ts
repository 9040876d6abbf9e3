import { sql, type Kysely, type Transaction } from 'kysely';
import type { Database, NotificationDelivery } from '../schema';

type Db = Kysely<Database> | Transaction<Database>;

/** A person's stored choices (kinds without a row keep their default). */
export async function findNotificationSettings(db: Db, userId: string): Promise<Record<string, NotificationDelivery>> {
  const rows = await db.selectFrom('notification_settings').select(['kind', 'delivery']).where('user_id', '=', userId).execute();
  return Object.fromEntries(rows.map((r) => [r.kind, r.delivery]));
}

/** Several people's stored choices for one kind. */
export async function findDeliveries(db: Db, userIds: string[], kind: string): Promise<Map<string, NotificationDelivery>> {
  if (!userIds.length) return new Map();
  const rows = await db
    .selectFrom('notification_settings')
    .select(['user_id', 'delivery'])
    .where('user_id', 'in', userIds)
    .where('kind', '=', kind)
    .execute();
  return new Map(rows.map((r) => [r.user_id, r.delivery]));
}

export async function upsertNotificationSettings(db: Db, userId: string, choices: [kind: string, delivery: NotificationDelivery][]): Promise<void> {
  if (!choices.length) return;
  await db
    .insertInto('notification_settings')
    .values(choices.map(([kind, delivery]) => ({ user_id: userId, kind, delivery })))
    .onConflict((oc) => oc.columns(['user_id', 'kind']).doUpdateSet({ delivery: (eb) => eb.ref('excluded.delivery'), updated_at: sql`now()` }))
    .execute();
}

/** Of `userIds`, those who are members of the study now. */
export async function currentMembers(db: Db, studyId: string, userIds: string[]): Promise<{ id: string; email: string; name: string | null }[]> {
  if (!userIds.length) return [];
  return db
    .selectFrom('study_members')
    .innerJoin('User', 'User.id', 'study_members.user_id')
    .select(['User.id', 'User.email', 'User.name'])
    .where('study_members.study_id', '=', studyId)
    .where('study_members.user_id', 'in', userIds)
    .execute();
}

export interface NewNotification {
  recipientId: string;
  studyId: string;
  actorId: string | null;
  kind: string;
  subject: string;
  text: string;
  path: string;
  dedupeKey: string;
  delivery: NotificationDelivery;
}

/** Inserts a notification; undefined when this recipient was told of this cause before. */
export async function insertNotification(db: Db, n: NewNotification): Promise<string | undefined> {
  const row = await db
    .insertInto('notifications')
    .values({
      recipient_id: n.recipientId,
      study_id: n.studyId,
      actor_id: n.actorId,
      kind: n.kind,
      subject: n.subject,
      text: n.text,
      path: n.path,
      dedupe_key: n.dedupeKey,
      delivery: n.delivery,
    })
    .onConflict((oc) => oc.constraint('notifications_recipient_dedupe_key').doNothing())
    .returning('id')
    .executeTakeFirst();
  return row?.id;
}

export async function markNotificationsDelivered(db: Db, ids: string[], mailId: string | null, at: Date): Promise<void> {
  if (!ids.length) return;
  await db.updateTable('notifications').set({ mail_id: mailId, delivered_at: at }).where('id', 'in', ids).execute();
}

/** People with digest notifications made before `before` that no digest has taken yet. */
export async function listDigestRecipients(db: Db, before: Date): Promise<string[]> {
  const rows = await db
    .selectFrom('notifications')
    .select('recipient_id')
    .distinct()
    .where('delivery', '=', 'digest')
    .where('delivered_at', 'is', null)
    .where('created_at', '<', before)
    .execute();
  return rows.map((r) => r.recipient_id);
}

export interface WaitingDigestItem {
  id: string;
  kind: string;
  subject: string;
  path: string;
  studyId: string;
  studyTitle: string;
  createdAt: Date;
  /** Whether the recipient is still a member of the study. */
  member: boolean;
}

/**
 * A person's waiting digest notifications, locked for this transaction; rows another digest
 * run holds are skipped (that run sends them). Ordered by study, then time.
 */
export async function takeWaitingDigest(trx: Transaction<Database>, recipientId: string, before: Date): Promise<WaitingDigestItem[]> {
  const rows = await trx
    .selectFrom('notifications as n')
    .innerJoin('studies as s', 's.id', 'n.study_id')
    .leftJoin('study_members as m', (j) => j.onRef('m.study_id', '=', 'n.study_id').onRef('m.user_id', '=', 'n.recipient_id'))
    .select(['n.id', 'n.kind', 'n.subject', 'n.path', 'n.study_id', 's.title', 'n.created_at', 'm.user_id as member_id'])
    .where('n.recipient_id', '=', recipientId)
    .where('n.delivery', '=', 'digest')
    .where('n.delivered_at', 'is', null)
    .where('n.created_at', '<', before)
    .orderBy('s.title')
    .orderBy('n.study_id')
    .orderBy('n.created_at')
    .orderBy('n.id')
    .forUpdate('n')
    .skipLocked()
    .execute();
  return rows.map((r) => ({
    id: r.id,
    kind: r.kind,
    subject: r.subject,
    path: r.path,
    studyId: r.study_id,
    studyTitle: r.title,
    createdAt: r.created_at,
    member: r.member_id !== null,
  }));
}
