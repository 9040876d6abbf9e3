/**
 * Stress-test runs: one row per Monte Carlo run (its compact specification, status, progress and,
 * when done, the aggregated results), and one row per finished chunk of replicates with the
 * per-replicate results in a compact binary form. The chunk's primary key (run, scenario, chunk)
 * is what makes a retried chunk harmless: a second insert of the same chunk does nothing, and
 * progress is always the sum over the stored chunks.
 *
 * The job queue itself (pg-boss) keeps its own schema, `pgboss`, created by pg-boss's own
 * migration when a process first starts it (lib/jobs/boss.ts).
 */
import { sql, type Kysely } from 'kysely';

export async function up(db: Kysely<unknown>): Promise<void> {
  await db.schema
    .createTable('simulations')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    // A run from a compact specification without a study belongs to its creator alone.
    .addColumn('study_id', 'uuid', (c) => c.references('studies.id').onDelete('cascade'))
    .addColumn('revision_number', 'integer')
    .addColumn('created_by', 'uuid', (c) => c.references('User.id').onDelete('set null'))
    .addColumn('spec', 'jsonb', (c) => c.notNull())
    .addColumn('status', 'text', (c) => c.notNull().defaultTo('queued'))
    .addColumn('replicates_total', 'integer', (c) => c.notNull())
    .addColumn('replicates_done', 'integer', (c) => c.notNull().defaultTo(0))
    .addColumn('chunk_size', 'integer', (c) => c.notNull())
    .addColumn('chunk_count', 'integer', (c) => c.notNull())
    // pg-boss job ids of the chunks, so that cancelling can withdraw the ones still waiting.
    .addColumn('job_ids', sql`uuid[]`, (c) => c.notNull().defaultTo(sql`'{}'::uuid[]`))
    .addColumn('error', 'text')
    .addColumn('results', 'jsonb')
    .addColumn('started_at', 'timestamptz')
    .addColumn('finished_at', 'timestamptz')
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addCheckConstraint('simulations_status_check', sql`status in ('queued', 'running', 'done', 'failed', 'cancelled')`)
    .addCheckConstraint('simulations_replicates_check', sql`replicates_total > 0 and replicates_done between 0 and replicates_total`)
    .addCheckConstraint('simulations_chunks_check', sql`chunk_size > 0 and chunk_count > 0`)
    .addCheckConstraint('simulations_revision_check', sql`revision_number is null or study_id is not null`)
    .execute();
  await db.schema.createIndex('simulations_study_idx').on('simulations').columns(['study_id', 'created_at']).execute();
  await db.schema.createIndex('simulations_creator_status_idx').on('simulations').columns(['created_by', 'status']).execute();

  await db.schema
    .createTable('simulation_chunks')
    .addColumn('simulation_id', 'uuid', (c) => c.notNull().references('simulations.id').onDelete('cascade'))
    .addColumn('scenario_index', 'integer', (c) => c.notNull())
    .addColumn('chunk_index', 'integer', (c) => c.notNull())
    .addColumn('replicate_from', 'integer', (c) => c.notNull())
    .addColumn('replicate_to', 'integer', (c) => c.notNull())
    .addColumn('results', 'bytea', (c) => c.notNull())
    .addColumn('finished_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addPrimaryKeyConstraint('simulation_chunks_pkey', ['simulation_id', 'scenario_index', 'chunk_index'])
    .addCheckConstraint('simulation_chunks_range_check', sql`replicate_from >= 0 and replicate_to > replicate_from`)
    .execute();
}

export async function down(db: Kysely<unknown>): Promise<void> {
  await db.schema.dropTable('simulation_chunks').ifExists().execute();
  await db.schema.dropTable('simulations').ifExists().execute();
}
