/**
 * The mail queue: every message the app sends is a row here, written in the transaction of the
 * action that causes it, and sent by a pg-boss job (lib/mail/queue.ts). `idempotency_key` names
 * the cause (e.g. the token the message carries), so a cause queues its message once. The
 * bodies can hold single-use links, so they are erased once the message is sent.
 *
 * Status: queued → sending → sent; a failed attempt → retrying (sent again with growing delays);
 * retries used up → failed. `suppressed`: written so that an unknown address costs the same work
 * as a known one (password reset), never sent. An invitation points at the message of its link.
 */
import { sql, type Kysely } from 'kysely';

export async function up(db: Kysely<unknown>): Promise<void> {
  await db.schema
    .createTable('mail')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('idempotency_key', 'text', (c) => c.notNull())
    .addColumn('kind', 'text', (c) => c.notNull())
    .addColumn('recipient', 'text', (c) => c.notNull())
    .addColumn('subject', 'text', (c) => c.notNull())
    .addColumn('text', 'text')
    .addColumn('html', 'text')
    .addColumn('status', 'text', (c) => c.notNull().defaultTo('queued'))
    .addColumn('attempts', 'integer', (c) => c.notNull().defaultTo(0))
    .addColumn('last_error', 'text')
    .addColumn('claimed_at', 'timestamptz')
    .addColumn('sent_at', 'timestamptz')
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('updated_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addUniqueConstraint('mail_idempotency_key_key', ['idempotency_key'])
    .addCheckConstraint('mail_status_check', sql`status in ('queued', 'sending', 'sent', 'retrying', 'failed', 'suppressed')`)
    .addCheckConstraint('mail_kind_length', sql`char_length(kind) between 1 and 40`)
    .addCheckConstraint('mail_attempts_check', sql`attempts >= 0`)
    .execute();
  await db.schema.createIndex('mail_status_created_idx').on('mail').columns(['status', 'created_at']).execute();
  await db.schema
    .alterTable('invitations')
    .addColumn('mail_id', 'uuid', (c) => c.references('mail.id').onDelete('set null'))
    .execute();
}

export async function down(db: Kysely<unknown>): Promise<void> {
  await db.schema.alterTable('invitations').dropColumn('mail_id').execute();
  await db.schema.dropTable('mail').execute();
}
