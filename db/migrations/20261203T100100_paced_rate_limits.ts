/**
 * Rate limits as paced allowances (the generic cell rate algorithm) instead of fixed windows.
 * A key's row holds one time, `paced_until`: where its attempts so far reach when each is spaced
 * window/limit apart. An attempt is allowed while that time, plus one more spacing, lies at most
 * one window ahead; a refused attempt changes nothing, so the refusal is answered from a read. A
 * row whose `paced_until` has passed means the same as no row, so old rows can be deleted at any
 * time (by the index on `paced_until`). The counts of the old table are short-lived by nature and
 * are not carried over.
 */
import { sql, type Kysely } from 'kysely';

export async function up(db: Kysely<unknown>): Promise<void> {
  await db.schema.dropTable('rate_limits').execute();
  await db.schema
    .createTable('rate_limits')
    .addColumn('key', 'text', (c) => c.primaryKey())
    .addColumn('paced_until', 'timestamptz', (c) => c.notNull())
    .addColumn('window_seconds', 'integer', (c) => c.notNull())
    .addCheckConstraint('rate_limits_window_check', sql`window_seconds > 0`)
    .execute();
  await db.schema.createIndex('rate_limits_paced_until_idx').on('rate_limits').column('paced_until').execute();
}

export async function down(db: Kysely<unknown>): Promise<void> {
  await db.schema.dropTable('rate_limits').execute();
  await db.schema
    .createTable('rate_limits')
    .addColumn('key', 'text', (c) => c.primaryKey())
    .addColumn('window_start', 'timestamptz', (c) => c.notNull())
    .addColumn('count', 'integer', (c) => c.notNull())
    .execute();
}
