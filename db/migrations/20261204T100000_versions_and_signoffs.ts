/**
 * Versions and sign-offs (issue 12). Every autosave stays a revision (study_revisions, kept for
 * recovery); one person's continuous editing is grouped into a version (study_versions), which a
 * consultant can sign off (study_signoffs) and anyone with the right can name.
 *
 * Backfill: the revisions already stored are grouped by the rule new saves follow
 * (db/repositories/versions.ts): a version is one author's run of revisions, each saved less
 * than 20 minutes after the one before. Every backfilled version is closed (its author's session
 * ended long ago); the study's next save opens a new one.
 */
import { sql, type Kysely } from 'kysely';

export async function up(db: Kysely<unknown>): Promise<void> {
  await db.schema
    .createTable('study_versions')
    .addColumn('study_id', 'uuid', (c) => c.notNull().references('studies.id').onDelete('cascade'))
    .addColumn('number', 'integer', (c) => c.notNull())
    .addColumn('first_revision', 'integer', (c) => c.notNull())
    .addColumn('last_revision', 'integer', (c) => c.notNull())
    .addColumn('saves', 'integer', (c) => c.notNull().defaultTo(1))
    .addColumn('author_id', 'uuid', (c) => c.references('User.id').onDelete('set null'))
    // An accepted suggestion: the person who proposed it (the author is who accepted it).
    .addColumn('co_author_id', 'uuid', (c) => c.references('User.id').onDelete('set null'))
    .addColumn('suggestion_id', 'text')
    // A restore: the version whose design this one takes again.
    .addColumn('restored_from', 'integer')
    .addColumn('name', 'text')
    .addColumn('named_by', 'uuid', (c) => c.references('User.id').onDelete('set null'))
    .addColumn('named_at', 'timestamptz')
    .addColumn('opened_at', 'timestamptz', (c) => c.notNull())
    .addColumn('last_saved_at', 'timestamptz', (c) => c.notNull())
    .addColumn('closed_at', 'timestamptz')
    .addColumn('close_reason', 'text')
    .addPrimaryKeyConstraint('study_versions_pkey', ['study_id', 'number'])
    .addCheckConstraint('study_versions_revisions', sql`first_revision <= last_revision and number >= 1`)
    .addCheckConstraint('study_versions_name_length', sql`name is null or char_length(name) between 1 and 120`)
    .addCheckConstraint('study_versions_closed', sql`(closed_at is null) = (close_reason is null)`)
    .execute();
  // At most one version of a study is open.
  await db.schema.createIndex('study_versions_one_open_idx').on('study_versions').column('study_id').unique().where(sql.ref('closed_at'), 'is', null).execute();

  await db.schema.alterTable('study_revisions').addColumn('version_number', 'integer').execute();
  await db.schema.createIndex('study_revisions_version_idx').on('study_revisions').columns(['study_id', 'version_number']).execute();

  await db.schema
    .createTable('study_signoffs')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('study_id', 'uuid', (c) => c.notNull())
    .addColumn('version_number', 'integer', (c) => c.notNull())
    // The version's last revision when it was signed off: a later revision is a change since.
    .addColumn('revision_number', 'integer', (c) => c.notNull())
    .addColumn('signer_id', 'uuid', (c) => c.references('User.id').onDelete('set null'))
    .addColumn('statement', 'text', (c) => c.notNull())
    .addColumn('conditions', 'text')
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('withdrawn_at', 'timestamptz')
    .addColumn('withdrawn_by', 'uuid', (c) => c.references('User.id').onDelete('set null'))
    .addColumn('withdrawal_reason', 'text')
    .addForeignKeyConstraint('study_signoffs_version_fkey', ['study_id', 'version_number'], 'study_versions', ['study_id', 'number'], (c) => c.onDelete('cascade'))
    .addCheckConstraint('study_signoffs_statement_length', sql`char_length(statement) between 1 and 4000`)
    .addCheckConstraint('study_signoffs_withdrawal', sql`(withdrawn_at is null) = (withdrawal_reason is null)`)
    .execute();
  await db.schema.createIndex('study_signoffs_study_idx').on('study_signoffs').columns(['study_id', 'created_at']).execute();

  // Backfill: one version per author's run of revisions with less than 20 minutes between saves.
  await sql`
    with ordered as (
      select study_id, number, author_id, created_at,
        case
          when lag(number) over w is null then 1
          when lag(author_id) over w is distinct from author_id then 1
          when created_at - lag(created_at) over w >= interval '20 minutes' then 1
          else 0
        end as starts
      from study_revisions
      window w as (partition by study_id order by number)
    ),
    grouped as (
      select *, sum(starts) over (partition by study_id order by number) as version
      from ordered
    ),
    inserted as (
      insert into study_versions (study_id, number, first_revision, last_revision, saves, author_id, opened_at, last_saved_at, closed_at, close_reason)
      select study_id, version, min(number), max(number), count(*), (array_agg(author_id order by number))[1], min(created_at), max(created_at), max(created_at), 'backfill'
      from grouped
      group by study_id, version
      returning study_id
    )
    update study_revisions r set version_number = g.version
    from grouped g
    where g.study_id = r.study_id and g.number = r.number
  `.execute(db);
}

export async function down(db: Kysely<unknown>): Promise<void> {
  await db.schema.dropTable('study_signoffs').ifExists().execute();
  await db.schema.alterTable('study_revisions').dropColumn('version_number').execute();
  await db.schema.dropTable('study_versions').ifExists().execute();
}
