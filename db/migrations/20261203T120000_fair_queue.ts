/**
 * Fair scheduling of stress-test runs between people (lib/jobs/queue.ts): each run gets a place
 * in a round-robin of turns when it is queued. Its k-th chunk is served at turn `first_turn + k`,
 * and the queue serves lower turns first. Null for runs queued before this migration (their chunks
 * keep the queue's default order and are served first).
 *
 * The partial index serves the look-up of the queued and running runs that placing a new run
 * needs, however many finished runs the table holds.
 */
import { sql, type Kysely } from 'kysely';

export async function up(db: Kysely<unknown>): Promise<void> {
  await db.schema.alterTable('simulations').addColumn('first_turn', 'integer').execute();
  await db.schema.alterTable('simulations').addCheckConstraint('simulations_first_turn_check', sql`first_turn >= 0`).execute();
  await db.schema
    .createIndex('simulations_active_idx')
    .on('simulations')
    .columns(['created_by'])
    .where(sql.ref('status'), 'in', ['queued', 'running'])
    .execute();
}

export async function down(db: Kysely<unknown>): Promise<void> {
  await db.schema.dropIndex('simulations_active_idx').ifExists().execute();
  await db.schema.alterTable('simulations').dropConstraint('simulations_first_turn_check').execute();
  await db.schema.alterTable('simulations').dropColumn('first_turn').execute();
}
