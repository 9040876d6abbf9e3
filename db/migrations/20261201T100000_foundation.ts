/**
 * Foundation: users and authentication, workspaces and their members, invitations, studies,
 * study members with a role, versioned study revisions, the activity log and rate limits.
 * Self-contained on purpose: migrations never import application code.
 */
import { sql, type Kysely } from 'kysely';

export async function up(db: Kysely<unknown>): Promise<void> {
  await db.schema
    .createTable('User')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('name', 'text')
    .addColumn('email', 'text', (c) => c.notNull())
    .addColumn('emailVerified', 'timestamptz')
    .addColumn('image', 'text')
    .addColumn('createdAt', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addUniqueConstraint('user_email_key', ['email'])
    .addCheckConstraint('user_email_lowercase', sql`email = lower(email)`)
    .execute();

  await db.schema
    .createTable('Account')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('userId', 'uuid', (c) => c.notNull().references('User.id').onDelete('cascade'))
    .addColumn('type', 'text', (c) => c.notNull())
    .addColumn('provider', 'text', (c) => c.notNull())
    .addColumn('providerAccountId', 'text', (c) => c.notNull())
    .addColumn('refresh_token', 'text')
    .addColumn('access_token', 'text')
    .addColumn('expires_at', 'bigint')
    .addColumn('token_type', 'text')
    .addColumn('scope', 'text')
    .addColumn('id_token', 'text')
    .addColumn('session_state', 'text')
    .addUniqueConstraint('account_provider_key', ['provider', 'providerAccountId'])
    .execute();
  await db.schema.createIndex('account_user_id_idx').on('Account').column('userId').execute();

  await db.schema
    .createTable('Session')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('sessionToken', 'text', (c) => c.notNull())
    .addColumn('userId', 'uuid', (c) => c.notNull().references('User.id').onDelete('cascade'))
    .addColumn('expires', 'timestamptz', (c) => c.notNull())
    .addUniqueConstraint('session_token_key', ['sessionToken'])
    .execute();
  await db.schema.createIndex('session_user_id_idx').on('Session').column('userId').execute();

  await db.schema
    .createTable('VerificationToken')
    .addColumn('identifier', 'text', (c) => c.notNull())
    .addColumn('token', 'text', (c) => c.notNull())
    .addColumn('expires', 'timestamptz', (c) => c.notNull())
    .addPrimaryKeyConstraint('verification_token_pkey', ['identifier', 'token'])
    .execute();

  await db.schema
    .createTable('user_credentials')
    .addColumn('user_id', 'uuid', (c) => c.primaryKey().references('User.id').onDelete('cascade'))
    .addColumn('password_hash', 'text', (c) => c.notNull())
    .addColumn('updated_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .execute();

  await db.schema
    .createTable('email_tokens')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('user_id', 'uuid', (c) => c.notNull().references('User.id').onDelete('cascade'))
    .addColumn('purpose', 'text', (c) => c.notNull())
    .addColumn('token_hash', 'text', (c) => c.notNull())
    .addColumn('expires_at', 'timestamptz', (c) => c.notNull())
    .addColumn('used_at', 'timestamptz')
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addUniqueConstraint('email_tokens_token_hash_key', ['token_hash'])
    .addCheckConstraint('email_tokens_purpose_check', sql`purpose in ('verify-email', 'reset-password')`)
    .execute();

  await db.schema
    .createTable('workspaces')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('name', 'text', (c) => c.notNull())
    .addColumn('slug', 'text', (c) => c.notNull())
    .addColumn('created_by', 'uuid', (c) => c.references('User.id').onDelete('set null'))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addUniqueConstraint('workspaces_slug_key', ['slug'])
    .execute();

  await db.schema
    .createTable('workspace_members')
    .addColumn('workspace_id', 'uuid', (c) => c.notNull().references('workspaces.id').onDelete('cascade'))
    .addColumn('user_id', 'uuid', (c) => c.notNull().references('User.id').onDelete('cascade'))
    .addColumn('role', 'text', (c) => c.notNull())
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addPrimaryKeyConstraint('workspace_members_pkey', ['workspace_id', 'user_id'])
    .addCheckConstraint('workspace_members_role_check', sql`role in ('admin', 'member')`)
    .execute();
  await db.schema.createIndex('workspace_members_user_idx').on('workspace_members').column('user_id').execute();

  await db.schema
    .createTable('studies')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('workspace_id', 'uuid', (c) => c.notNull().references('workspaces.id').onDelete('cascade'))
    .addColumn('title', 'text', (c) => c.notNull())
    .addColumn('description', 'text', (c) => c.notNull().defaultTo(''))
    .addColumn('status', 'text', (c) => c.notNull().defaultTo('draft'))
    .addColumn('current_revision', 'integer', (c) => c.notNull().defaultTo(0))
    .addColumn('created_by', 'uuid', (c) => c.references('User.id').onDelete('set null'))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('updated_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('archived_at', 'timestamptz')
    .addCheckConstraint('studies_status_check', sql`status in ('draft', 'in-review', 'signed-off', 'archived')`)
    .addCheckConstraint('studies_title_length', sql`char_length(title) between 1 and 200`)
    .execute();
  await db.schema.createIndex('studies_workspace_idx').on('studies').columns(['workspace_id', 'updated_at']).execute();

  await db.schema
    .createTable('study_members')
    .addColumn('study_id', 'uuid', (c) => c.notNull().references('studies.id').onDelete('cascade'))
    .addColumn('user_id', 'uuid', (c) => c.notNull().references('User.id').onDelete('cascade'))
    .addColumn('role', 'text', (c) => c.notNull())
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addPrimaryKeyConstraint('study_members_pkey', ['study_id', 'user_id'])
    .addCheckConstraint(
      'study_members_role_check',
      sql`role in ('owner', 'editor', 'consultant', 'writer', 'viewer')`,
    )
    .execute();
  await db.schema.createIndex('study_members_user_idx').on('study_members').column('user_id').execute();

  await db.schema
    .createTable('study_revisions')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('study_id', 'uuid', (c) => c.notNull().references('studies.id').onDelete('cascade'))
    .addColumn('number', 'integer', (c) => c.notNull())
    .addColumn('design', 'jsonb', (c) => c.notNull())
    .addColumn('note', 'text')
    .addColumn('author_id', 'uuid', (c) => c.references('User.id').onDelete('set null'))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addUniqueConstraint('study_revisions_study_number_key', ['study_id', 'number'])
    .execute();

  await db.schema
    .createTable('invitations')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('workspace_id', 'uuid', (c) => c.notNull().references('workspaces.id').onDelete('cascade'))
    .addColumn('study_id', 'uuid', (c) => c.references('studies.id').onDelete('cascade'))
    .addColumn('email', 'text', (c) => c.notNull())
    .addColumn('workspace_role', 'text', (c) => c.notNull())
    .addColumn('study_role', 'text')
    .addColumn('token_hash', 'text', (c) => c.notNull())
    .addColumn('invited_by', 'uuid', (c) => c.references('User.id').onDelete('set null'))
    .addColumn('expires_at', 'timestamptz', (c) => c.notNull())
    .addColumn('accepted_at', 'timestamptz')
    .addColumn('accepted_by', 'uuid', (c) => c.references('User.id').onDelete('set null'))
    .addColumn('revoked_at', 'timestamptz')
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addUniqueConstraint('invitations_token_hash_key', ['token_hash'])
    .addCheckConstraint('invitations_workspace_role_check', sql`workspace_role in ('admin', 'member')`)
    .addCheckConstraint(
      'invitations_study_role_check',
      sql`(study_id is null and study_role is null) or (study_id is not null and study_role in ('editor', 'consultant', 'writer', 'viewer'))`,
    )
    .execute();
  await db.schema.createIndex('invitations_workspace_idx').on('invitations').column('workspace_id').execute();

  await db.schema
    .createTable('activity_log')
    .addColumn('id', 'bigserial', (c) => c.primaryKey())
    .addColumn('workspace_id', 'uuid', (c) => c.references('workspaces.id').onDelete('cascade'))
    .addColumn('study_id', 'uuid', (c) => c.references('studies.id').onDelete('cascade'))
    .addColumn('actor_id', 'uuid', (c) => c.references('User.id').onDelete('set null'))
    .addColumn('action', 'text', (c) => c.notNull())
    .addColumn('details', 'jsonb', (c) => c.notNull().defaultTo(sql`'{}'::jsonb`))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .execute();
  await db.schema.createIndex('activity_log_study_idx').on('activity_log').columns(['study_id', 'created_at']).execute();

  await db.schema
    .createTable('rate_limits')
    .addColumn('key', 'text', (c) => c.primaryKey())
    .addColumn('window_start', 'timestamptz', (c) => c.notNull())
    .addColumn('count', 'integer', (c) => c.notNull())
    .execute();
}

export async function down(db: Kysely<unknown>): Promise<void> {
  for (const table of [
    'rate_limits',
    'activity_log',
    'invitations',
    'study_revisions',
    'study_members',
    'studies',
    'workspace_members',
    'workspaces',
    'email_tokens',
    'user_credentials',
    'VerificationToken',
    'Session',
    'Account',
    'User',
  ]) {
    await db.schema.dropTable(table).ifExists().execute();
  }
}
