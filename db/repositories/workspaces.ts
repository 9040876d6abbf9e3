import { sql, type Kysely, type Transaction } from 'kysely';
import type { Database, WorkspaceRole } from '../schema';

type Db = Kysely<Database> | Transaction<Database>;

/**
 * How a transaction holds a row it checks before writing (lib/data/access.ts explains the order):
 * 'share' lets others share it but keeps out anyone who holds it for 'update' (FOR SHARE);
 * 'update' holds it alone (FOR NO KEY UPDATE, which still lets other transactions insert rows
 * that reference it).
 */
export type RowLock = 'share' | 'update';

/** Locks the workspace's row until the transaction ends; false when there is no such workspace. */
export async function lockWorkspace(trx: Transaction<Database>, workspaceId: string, mode: RowLock): Promise<boolean> {
  const q = trx.selectFrom('workspaces').select('id').where('id', '=', workspaceId);
  const row = await (mode === 'share' ? q.forShare() : q.forNoKeyUpdate()).executeTakeFirst();
  return row !== undefined;
}

export interface Workspace {
  id: string;
  name: string;
  slug: string;
  role: WorkspaceRole;
}

export interface WorkspaceMember {
  userId: string;
  name: string | null;
  email: string;
  role: WorkspaceRole;
  since: Date;
}

export function slugify(name: string): string {
  const base = name
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '')
    .slice(0, 40);
  return base || 'workspace';
}

export async function insertWorkspace(db: Db, input: { name: string; createdBy: string | null }): Promise<{ id: string; slug: string }> {
  const base = slugify(input.name);
  for (let attempt = 0; attempt < 5; attempt++) {
    const slug = attempt === 0 ? base : `${base}-${Math.random().toString(36).slice(2, 7)}`;
    const row = await db
      .insertInto('workspaces')
      .values({ name: input.name, slug, created_by: input.createdBy })
      .onConflict((oc) => oc.constraint('workspaces_slug_key').doNothing())
      .returning(['id', 'slug'])
      .executeTakeFirst();
    if (row) return row;
  }
  throw new Error('Could not find a free workspace slug');
}

export async function upsertWorkspaceMember(db: Db, workspaceId: string, userId: string, role: WorkspaceRole): Promise<void> {
  // An existing admin stays admin when a member invitation is accepted.
  await db
    .insertInto('workspace_members')
    .values({ workspace_id: workspaceId, user_id: userId, role })
    .onConflict((oc) =>
      oc.columns(['workspace_id', 'user_id']).doUpdateSet({
        role: sql<WorkspaceRole>`case when workspace_members.role = 'admin' then 'admin' else excluded.role end`,
      }),
    )
    .execute();
}

export async function findMembership(db: Db, workspaceId: string, userId: string): Promise<WorkspaceRole | undefined> {
  const row = await db
    .selectFrom('workspace_members')
    .select('role')
    .where('workspace_id', '=', workspaceId)
    .where('user_id', '=', userId)
    .executeTakeFirst();
  return row?.role;
}

export async function findWorkspace(db: Db, workspaceId: string): Promise<{ id: string; name: string; slug: string } | undefined> {
  return db.selectFrom('workspaces').select(['id', 'name', 'slug']).where('id', '=', workspaceId).executeTakeFirst();
}

export async function listWorkspacesOfUser(db: Db, userId: string): Promise<Workspace[]> {
  return db
    .selectFrom('workspaces')
    .innerJoin('workspace_members', 'workspace_members.workspace_id', 'workspaces.id')
    .select(['workspaces.id', 'workspaces.name', 'workspaces.slug', 'workspace_members.role'])
    .where('workspace_members.user_id', '=', userId)
    .orderBy('workspaces.name')
    .execute();
}

export async function listWorkspaceMembers(db: Db, workspaceId: string): Promise<WorkspaceMember[]> {
  const rows = await db
    .selectFrom('workspace_members')
    .innerJoin('User', 'User.id', 'workspace_members.user_id')
    .select(['User.id', 'User.name', 'User.email', 'workspace_members.role', 'workspace_members.created_at'])
    .where('workspace_members.workspace_id', '=', workspaceId)
    .orderBy('User.name')
    .execute();
  return rows.map((r) => ({ userId: r.id, name: r.name, email: r.email, role: r.role, since: r.created_at }));
}

export async function countAdmins(db: Db, workspaceId: string): Promise<number> {
  const row = await db
    .selectFrom('workspace_members')
    .select((eb) => eb.fn.countAll<string>().as('n'))
    .where('workspace_id', '=', workspaceId)
    .where('role', '=', 'admin')
    .executeTakeFirstOrThrow();
  return Number(row.n);
}

export async function setWorkspaceMemberRole(db: Db, workspaceId: string, userId: string, role: WorkspaceRole): Promise<boolean> {
  const r = await db
    .updateTable('workspace_members')
    .set({ role })
    .where('workspace_id', '=', workspaceId)
    .where('user_id', '=', userId)
    .executeTakeFirst();
  return Number(r.numUpdatedRows) > 0;
}

export async function deleteWorkspaceMember(db: Db, workspaceId: string, userId: string): Promise<boolean> {
  // Leaving a workspace also ends every study membership inside it.
  await db
    .deleteFrom('study_members')
    .where('user_id', '=', userId)
    .where('study_id', 'in', (eb) => eb.selectFrom('studies').select('id').where('workspace_id', '=', workspaceId))
    .execute();
  const r = await db.deleteFrom('workspace_members').where('workspace_id', '=', workspaceId).where('user_id', '=', userId).executeTakeFirst();
  return Number(r.numDeletedRows) > 0;
}
