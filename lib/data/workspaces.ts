import 'server-only';
import {
  countAdmins,
  deleteWorkspaceMember,
  insertWorkspace,
  listWorkspaceMembers as listMembersRows,
  listWorkspacesOfUser,
  setWorkspaceMemberRole,
  upsertWorkspaceMember,
  type Workspace,
  type WorkspaceMember,
} from '@/db/repositories/workspaces';
import { countStudiesOwnedInWorkspace } from '@/db/repositories/studies';
import { logActivity } from '@/db/repositories/activity';
import type { WorkspaceRole } from '@/db/schema';
import type { Actor } from '@/lib/auth/session';
import { db } from '@/lib/db';
import { AppError, notFound } from '@/lib/errors';
import type { WorkspaceCreateInput } from '@/lib/validation/workspace';
import { requireActor, requireWorkspace } from './access';
import { transaction } from './transaction';

export async function listMyWorkspaces(actor: Actor | null): Promise<Workspace[]> {
  const a = requireActor(actor);
  return listWorkspacesOfUser(db(), a.id);
}

export async function createWorkspace(actor: Actor | null, input: WorkspaceCreateInput): Promise<Workspace> {
  const a = requireActor(actor);
  return transaction(async (trx) => {
    const ws = await insertWorkspace(trx, { name: input.name, createdBy: a.id });
    await upsertWorkspaceMember(trx, ws.id, a.id, 'admin');
    await logActivity(trx, { workspaceId: ws.id, actorId: a.id, action: 'workspace.created', details: { name: input.name } });
    return { id: ws.id, slug: ws.slug, name: input.name, role: 'admin' as const };
  });
}

export async function getWorkspace(actor: Actor | null, workspaceId: string): Promise<Workspace> {
  const { actor: a } = await requireWorkspace(actor, workspaceId, 'workspace.read');
  const ws = (await listWorkspacesOfUser(db(), a.id)).find((w) => w.id === workspaceId);
  if (!ws) throw notFound('The workspace');
  return ws;
}

export async function listWorkspaceMembers(actor: Actor | null, workspaceId: string): Promise<WorkspaceMember[]> {
  await requireWorkspace(actor, workspaceId, 'workspace.members.read');
  return listMembersRows(db(), workspaceId);
}

const LAST_ADMIN = 'A workspace needs at least one admin. Make someone else admin first.';

/**
 * Both checks below (is the actor still admin? would the workspace be left without one?) and the
 * write run with the workspace's row locked, so two admins demoting or removing each other at
 * the same moment take turns: the second finds they are no longer admin.
 */
export async function changeWorkspaceMemberRole(
  actor: Actor | null,
  workspaceId: string,
  userId: string,
  role: WorkspaceRole,
): Promise<WorkspaceMember[]> {
  return transaction(async (trx) => {
    const { actor: a } = await requireWorkspace(actor, workspaceId, 'workspace.members.manage', { trx, lock: 'update' });
    const members = await listMembersRows(trx, workspaceId);
    const target = members.find((m) => m.userId === userId);
    if (!target) throw notFound('That member');
    if (role === 'member' && target.role === 'admin' && (await countAdmins(trx, workspaceId)) <= 1) throw new AppError('conflict', LAST_ADMIN);
    await setWorkspaceMemberRole(trx, workspaceId, userId, role);
    await logActivity(trx, { workspaceId, actorId: a.id, action: 'workspace.member-role-changed', details: { userId, role } });
    return listMembersRows(trx, workspaceId);
  });
}

/** Also checks, under the same lock, that the person owns no study here (a study needs its owner). */
export async function removeWorkspaceMember(actor: Actor | null, workspaceId: string, userId: string): Promise<void> {
  await transaction(async (trx) => {
    const { actor: a } = await requireWorkspace(actor, workspaceId, 'workspace.members.manage', { trx, lock: 'update' });
    const target = (await listMembersRows(trx, workspaceId)).find((m) => m.userId === userId);
    if (!target) throw notFound('That member');
    if (target.role === 'admin' && (await countAdmins(trx, workspaceId)) <= 1) throw new AppError('conflict', LAST_ADMIN);
    if ((await countStudiesOwnedInWorkspace(trx, workspaceId, userId)) > 0) {
      throw new AppError('conflict', 'This person owns studies in the workspace. Archive or hand over those studies first.');
    }
    await deleteWorkspaceMember(trx, workspaceId, userId);
    await logActivity(trx, { workspaceId, actorId: a.id, action: 'workspace.member-removed', details: { userId } });
  });
}

export type { Workspace, WorkspaceMember };
