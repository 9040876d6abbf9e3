import 'server-only';
import type { Transaction } from 'kysely';
import type { Database, StudyRole, WorkspaceRole } from '@/db/schema';
import { findStudyForUser, findStudyWorkspaceId, type Study } from '@/db/repositories/studies';
import { findMembership, lockWorkspace, type RowLock } from '@/db/repositories/workspaces';
import { canStudy, canWorkspace, type StudyAction, type WorkspaceAction } from '@/lib/auth/permissions';
import type { Actor } from '@/lib/auth/session';
import { db } from '@/lib/db';
import { AppError, forbidden, notFound, unauthorized } from '@/lib/errors';

/**
 * The checks every data-access function makes first. Order matters and is the same everywhere:
 * no actor → 401; a study or workspace the actor does not belong to → 404, so that nobody learns
 * what exists elsewhere; a member whose role lacks the right → 403.
 *
 * A write makes its checks inside its transaction with `{ trx, lock }`: the rows the checks read
 * stay locked until the write commits, so that no other write can change what was checked in
 * between (two admins demoting each other, a member removed while creating a study). Locks are
 * always taken in the same order, so that two writes never each wait for the other (a deadlock):
 * the workspace's row first (shared, for a study), then the study's row, then the rows below it
 * (a person's row; an invitation's row through its conditional update). `lock` is 'update' for a
 * write that changes what others check (roles, memberships, the study's status or revision) and
 * 'share' for one that only depends on it.
 */

export interface Locked {
  trx: Transaction<Database>;
  lock: RowLock;
}

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

export function requireActor(actor: Actor | null): Actor {
  if (!actor) throw unauthorized();
  return actor;
}

const ACTION_WORDS: Partial<Record<StudyAction | WorkspaceAction, string>> = {
  'study.update': 'edit this study',
  'study.archive': 'archive this study',
  'members.manage': 'manage the members of this study',
  'workspace.members.manage': 'manage the members of this workspace',
  'workspace.invite': 'invite people to this workspace',
  'design.edit': 'edit the design',
  'calculation.save': 'save sample-size results',
  'simulation.run': 'run stress tests',
  'comment.create': 'comment on this study',
  'comment.resolve': 'resolve or reopen threads started by others',
  'suggestion.create': 'suggest changes to the design',
  'suggestion.decide': 'accept or decline suggestions',
  'study.signoff': 'sign off this study (consultants do)',
  'version.name': 'name versions',
};

export async function requireStudy(
  actor: Actor | null,
  studyId: string,
  action: StudyAction,
  locked?: Locked,
): Promise<{ actor: Actor; study: Study; role: StudyRole }> {
  const a = requireActor(actor);
  if (!UUID.test(studyId)) throw notFound('The study');
  if (locked) {
    const workspaceId = await findStudyWorkspaceId(locked.trx, studyId);
    if (!workspaceId) throw notFound('The study');
    await lockWorkspace(locked.trx, workspaceId, 'share');
  }
  const found = await findStudyForUser(locked?.trx ?? db(), studyId, a.id, locked?.lock);
  if (!found || !found.role || !found.workspaceRole) throw notFound('The study');
  if (!canStudy(found.role, action)) throw forbidden(ACTION_WORDS[action] ?? 'do that');
  if (found.study.status === 'archived' && action !== 'study.read' && action !== 'study.archive' && action !== 'members.read' && action !== 'activity.read' && action !== 'justification.export') {
    throw new AppError('conflict', 'This study is archived. Restore it before changing it.');
  }
  return { actor: a, study: found.study, role: found.role };
}

export async function requireWorkspace(
  actor: Actor | null,
  workspaceId: string,
  action: WorkspaceAction,
  locked?: Locked,
): Promise<{ actor: Actor; role: WorkspaceRole }> {
  const a = requireActor(actor);
  if (!UUID.test(workspaceId)) throw notFound('The workspace');
  if (locked && !(await lockWorkspace(locked.trx, workspaceId, locked.lock))) throw notFound('The workspace');
  const role = await findMembership(locked?.trx ?? db(), workspaceId, a.id);
  if (!role) throw notFound('The workspace');
  if (!canWorkspace(role, action)) throw forbidden(ACTION_WORDS[action] ?? 'do that');
  return { actor: a, role };
}
