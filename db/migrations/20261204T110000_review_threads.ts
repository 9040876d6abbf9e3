/**
 * Review threads and suggestions (issue 12). A thread is anchored to one thing of a study — a
 * wizard section or field, a finding, a saved Plan result or a stress-test run — and keeps the
 * revision it was started on and a fingerprint of what it was anchored to, so that the page can say
 * when that changed since. Its comments are rows of their own (the first one opens the thread);
 * mentions are user ids. A suggestion proposes a new value for one field of the design; it is
 * decided once (accepted into a new revision, or declined with a reason).
 */
import { sql, type Kysely } from 'kysely';

export async function up(db: Kysely<unknown>): Promise<void> {
  await db.schema
    .createTable('review_threads')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('study_id', 'uuid', (c) => c.notNull().references('studies.id').onDelete('cascade'))
    .addColumn('anchor_kind', 'text', (c) => c.notNull())
    // The anchor in one string (`field:outcome.name`, `finding:<rule>:<key>`, …): markers count by it.
    .addColumn('anchor_key', 'text', (c) => c.notNull())
    .addColumn('anchor', 'jsonb', (c) => c.notNull())
    // What the anchor was called when the thread started (a finding can disappear later).
    .addColumn('anchor_label', 'text', (c) => c.notNull())
    // A fingerprint of the anchored content at the start; null where there is none (results).
    .addColumn('anchor_fingerprint', 'text')
    .addColumn('revision_number', 'integer', (c) => c.notNull())
    .addColumn('status', 'text', (c) => c.notNull().defaultTo('open'))
    .addColumn('created_by', 'uuid', (c) => c.references('User.id').onDelete('set null'))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('resolved_by', 'uuid', (c) => c.references('User.id').onDelete('set null'))
    .addColumn('resolved_at', 'timestamptz')
    .addColumn('last_activity_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addCheckConstraint('review_threads_status_check', sql`status in ('open', 'resolved')`)
    .addCheckConstraint('review_threads_anchor_kind_check', sql`anchor_kind in ('section', 'field', 'finding', 'plan', 'simulation')`)
    .execute();
  await db.schema.createIndex('review_threads_study_idx').on('review_threads').columns(['study_id', 'last_activity_at']).execute();

  await db.schema
    .createTable('review_comments')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('thread_id', 'uuid', (c) => c.notNull().references('review_threads.id').onDelete('cascade'))
    // Orders the comments of a thread: two replies at the same moment both land, one after the other.
    .addColumn('seq', 'bigserial', (c) => c.notNull())
    .addColumn('author_id', 'uuid', (c) => c.references('User.id').onDelete('set null'))
    .addColumn('body', 'text', (c) => c.notNull())
    .addColumn('mentions', sql`uuid[]`, (c) => c.notNull().defaultTo(sql`'{}'::uuid[]`))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addCheckConstraint('review_comments_body_length', sql`char_length(body) between 1 and 5000`)
    .execute();
  await db.schema.createIndex('review_comments_thread_idx').on('review_comments').columns(['thread_id', 'seq']).execute();

  await db.schema
    .createTable('review_suggestions')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('study_id', 'uuid', (c) => c.notNull().references('studies.id').onDelete('cascade'))
    .addColumn('field_path', 'text', (c) => c.notNull())
    .addColumn('field_label', 'text', (c) => c.notNull())
    // The field's value when the suggestion was made, and the proposed one (JSON).
    .addColumn('old_value', 'jsonb', (c) => c.notNull())
    .addColumn('new_value', 'jsonb', (c) => c.notNull())
    .addColumn('reason', 'text', (c) => c.notNull())
    .addColumn('revision_number', 'integer', (c) => c.notNull())
    .addColumn('status', 'text', (c) => c.notNull().defaultTo('pending'))
    .addColumn('created_by', 'uuid', (c) => c.references('User.id').onDelete('set null'))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('decided_by', 'uuid', (c) => c.references('User.id').onDelete('set null'))
    .addColumn('decided_at', 'timestamptz')
    .addColumn('decision_reason', 'text')
    // The revision an accepted suggestion became.
    .addColumn('accepted_revision', 'integer')
    .addCheckConstraint('review_suggestions_status_check', sql`status in ('pending', 'accepted', 'declined')`)
    .addCheckConstraint('review_suggestions_reason_length', sql`char_length(reason) between 1 and 2000`)
    .execute();
  await db.schema.createIndex('review_suggestions_study_idx').on('review_suggestions').columns(['study_id', 'created_at']).execute();
}

export async function down(db: Kysely<unknown>): Promise<void> {
  await db.schema.dropTable('review_suggestions').ifExists().execute();
  await db.schema.dropTable('review_comments').ifExists().execute();
  await db.schema.dropTable('review_threads').ifExists().execute();
}
