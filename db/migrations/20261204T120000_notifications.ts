/**
 * Notifications by e-mail (issue 12): what review events told whom, and how each person wants
 * to hear about each kind.
 *
 * `notifications`: one row per recipient of an event (lib/notifications/notify.ts), unique on
 * (recipient, dedupe_key) so that a cause repeated or retried tells a person once. `delivery` is
 * the recipient's choice when the event happened: `immediate` rows name the message that carried
 * them (`mail_id`); `digest` rows wait until the daily digest takes them (`delivered_at`, and the
 * digest's message in `mail_id`); `none` rows are kept for the record and never sent.
 *
 * `notification_settings`: a person's choice per kind; no row means the kind's default.
 *
 * `mail.headers`: extra header lines of a message (List-Unsubscribe for notifications).
 */
import { sql, type Kysely } from 'kysely';

export async function up(db: Kysely<unknown>): Promise<void> {
  await db.schema.alterTable('mail').addColumn('headers', 'jsonb').execute();

  await db.schema
    .createTable('notifications')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('recipient_id', 'uuid', (c) => c.notNull().references('User.id').onDelete('cascade'))
    .addColumn('study_id', 'uuid', (c) => c.notNull().references('studies.id').onDelete('cascade'))
    .addColumn('actor_id', 'uuid', (c) => c.references('User.id').onDelete('set null'))
    .addColumn('kind', 'text', (c) => c.notNull())
    .addColumn('subject', 'text', (c) => c.notNull())
    .addColumn('text', 'text', (c) => c.notNull())
    .addColumn('path', 'text', (c) => c.notNull())
    .addColumn('dedupe_key', 'text', (c) => c.notNull())
    .addColumn('delivery', 'text', (c) => c.notNull())
    .addColumn('mail_id', 'uuid', (c) => c.references('mail.id').onDelete('set null'))
    .addColumn('delivered_at', 'timestamptz')
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addUniqueConstraint('notifications_recipient_dedupe_key', ['recipient_id', 'dedupe_key'])
    .addCheckConstraint('notifications_delivery_check', sql`delivery in ('immediate', 'digest', 'none')`)
    .addCheckConstraint('notifications_kind_length', sql`char_length(kind) between 1 and 40`)
    .execute();
  // The digest job's question: whose digest notifications are still waiting.
  await db.schema
    .createIndex('notifications_waiting_digest_idx')
    .on('notifications')
    .columns(['recipient_id', 'created_at'])
    .where(sql.ref('delivery'), '=', 'digest')
    .where(sql.ref('delivered_at'), 'is', null)
    .execute();

  await db.schema
    .createTable('notification_settings')
    .addColumn('user_id', 'uuid', (c) => c.notNull().references('User.id').onDelete('cascade'))
    .addColumn('kind', 'text', (c) => c.notNull())
    .addColumn('delivery', 'text', (c) => c.notNull())
    .addColumn('updated_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addPrimaryKeyConstraint('notification_settings_pkey', ['user_id', 'kind'])
    .addCheckConstraint('notification_settings_delivery_check', sql`delivery in ('immediate', 'digest', 'none')`)
    .execute();
}

export async function down(db: Kysely<unknown>): Promise<void> {
  await db.schema.dropTable('notification_settings').execute();
  await db.schema.dropTable('notifications').execute();
  await db.schema.alterTable('mail').dropColumn('headers').execute();
}
