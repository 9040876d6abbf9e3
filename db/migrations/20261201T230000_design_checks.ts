/**
 * Design checks: each revision keeps the findings and recommendation computed from it, and a
 * history of notes that mark a finding addressed (with a reason) or reopen it.
 */
import { sql, type Kysely } from 'kysely';

export async function up(db: Kysely<unknown>): Promise<void> {
  await db.schema.alterTable('study_revisions').addColumn('checks', 'jsonb').execute();
  await db.schema
    .createTable('finding_notes')
    .addColumn('id', 'bigserial', (c) => c.primaryKey())
    .addColumn('study_id', 'uuid', (c) => c.notNull().references('studies.id').onDelete('cascade'))
    .addColumn('rule_id', 'text', (c) => c.notNull())
    .addColumn('finding_key', 'text', (c) => c.notNull())
    .addColumn('status', 'text', (c) => c.notNull())
    .addColumn('reason', 'text', (c) => c.notNull())
    .addColumn('revision_number', 'integer', (c) => c.notNull())
    .addColumn('actor_id', 'uuid', (c) => c.references('User.id').onDelete('set null'))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addCheckConstraint('finding_notes_status_check', sql`status in ('addressed', 'reopened')`)
    .addCheckConstraint('finding_notes_reason_length', sql`char_length(reason) between 1 and 2000`)
    .execute();
  await db.schema
    .createIndex('finding_notes_study_idx')
    .on('finding_notes')
    .columns(['study_id', 'rule_id', 'finding_key', 'id'])
    .execute();
}

export async function down(db: Kysely<unknown>): Promise<void> {
  await db.schema.dropTable('finding_notes').ifExists().execute();
  await db.schema.alterTable('study_revisions').dropColumn('checks').execute();
}
