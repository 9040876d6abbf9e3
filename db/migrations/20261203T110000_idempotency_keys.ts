/**
 * Idempotency keys: a write sent with an `Idempotency-Key` header (lib/api/idempotency.ts) is
 * stored here with its answer, in the same transaction as the write, so that a retry whose first
 * answer was lost gets that answer again instead of writing twice. A key belongs to one person
 * (two people may use the same key) and is kept for 24 hours.
 */
import { sql, type Kysely } from 'kysely';

export async function up(db: Kysely<unknown>): Promise<void> {
  await db.schema
    .createTable('idempotency_keys')
    .addColumn('user_id', 'uuid', (c) => c.notNull().references('User.id').onDelete('cascade'))
    .addColumn('key', 'text', (c) => c.notNull())
    .addColumn('method', 'text', (c) => c.notNull())
    .addColumn('path', 'text', (c) => c.notNull())
    // SHA-256 (hex) of method, path and body: a reused key with another request is refused.
    .addColumn('request_hash', 'text', (c) => c.notNull())
    // Set in the same transaction as the row is claimed, so a committed row always has them.
    .addColumn('response_status', 'integer')
    .addColumn('response_body', 'text')
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addPrimaryKeyConstraint('idempotency_keys_pkey', ['user_id', 'key'])
    .addCheckConstraint('idempotency_keys_key_length', sql`char_length(key) between 1 and 255`)
    .execute();
  await db.schema.createIndex('idempotency_keys_created_at_idx').on('idempotency_keys').column('created_at').execute();
}

export async function down(db: Kysely<unknown>): Promise<void> {
  await db.schema.dropTable('idempotency_keys').ifExists().execute();
}
