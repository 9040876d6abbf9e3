/**
 * Plan results: a calculation saved to a study from the Plan tab, kept with the revision of the
 * design it was computed from. The request is what the calculation was given; the output is
 * what the server computed from it (never numbers sent by a browser).
 */
import { sql, type Kysely } from 'kysely';

export async function up(db: Kysely<unknown>): Promise<void> {
  await db.schema
    .createTable('plan_results')
    .addColumn('id', 'bigserial', (c) => c.primaryKey())
    .addColumn('study_id', 'uuid', (c) => c.notNull().references('studies.id').onDelete('cascade'))
    .addColumn('revision_number', 'integer', (c) => c.notNull())
    .addColumn('kind', 'text', (c) => c.notNull())
    .addColumn('request', 'jsonb', (c) => c.notNull())
    .addColumn('output', 'jsonb', (c) => c.notNull())
    .addColumn('note', 'text')
    .addColumn('created_by', 'uuid', (c) => c.references('User.id').onDelete('set null'))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addCheckConstraint('plan_results_revision_check', sql`revision_number >= 0`)
    .addCheckConstraint('plan_results_kind_length', sql`char_length(kind) between 1 and 40`)
    .addCheckConstraint('plan_results_note_length', sql`note is null or char_length(note) <= 2000`)
    .execute();
  await db.schema.createIndex('plan_results_study_idx').on('plan_results').columns(['study_id', 'id']).execute();
}

export async function down(db: Kysely<unknown>): Promise<void> {
  await db.schema.dropTable('plan_results').ifExists().execute();
}
