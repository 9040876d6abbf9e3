import 'server-only';
import {
  deleteStudyMember,
  findStudyMemberRole,
  insertRevision,
  insertStudy,
  listStudiesForUser,
  listStudyMembers as listMembersRow,
  setStudyMemberRole,
  updateStudyRow,
  upsertStudyMember,
  type Study,
  type StudyMember,
  type StudyWithRole,
} from '@/db/repositories/studies';
import { listStudyActivity as listActivityRows, logActivity, type ActivityItem } from '@/db/repositories/activity';
import type { StudyRole } from '@/db/schema';
import type { Actor } from '@/lib/auth/session';
import { db } from '@/lib/db';
import { AppError, notFound } from '@/lib/errors';
import type { MemberRoleUpdateInput } from '@/lib/validation/member';
import type { StudyCreateInput, StudyListQuery, StudyUpdateInput } from '@/lib/validation/study';
import { requireStudy, requireWorkspace } from './access';
import { transaction } from './transaction';

/** An empty design: the design wizard (a later part of the product) fills it in. */
export const EMPTY_DESIGN = { schemaVersion: 1 } as const;

export async function listStudies(
  actor: Actor | null,
  query: StudyListQuery,
): Promise<{ items: StudyWithRole[]; total: number; page: number; pageSize: number }> {
  const { actor: a } = await requireWorkspace(actor, query.workspaceId, 'workspace.read');
  const { items, total } = await listStudiesForUser(db(), { ...query, userId: a.id });
  return { items, total, page: query.page, pageSize: query.pageSize };
}

/** The creator's membership is checked with the workspace's row shared, so removing them waits. */
export async function createStudy(actor: Actor | null, input: StudyCreateInput): Promise<StudyWithRole> {
  return transaction(async (trx) => {
    const { actor: a } = await requireWorkspace(actor, input.workspaceId, 'study.create', { trx, lock: 'share' });
    const study = await insertStudy(trx, { ...input, createdBy: a.id });
    await upsertStudyMember(trx, study.id, a.id, 'owner');
    await insertRevision(trx, { studyId: study.id, number: 1, design: EMPTY_DESIGN, authorId: a.id, note: 'Study created' });
    await logActivity(trx, { workspaceId: study.workspaceId, studyId: study.id, actorId: a.id, action: 'study.created', details: { title: study.title } });
    return { ...study, currentRevision: 1, role: 'owner' as const };
  });
}

export async function getStudy(actor: Actor | null, studyId: string): Promise<StudyWithRole> {
  const { study, role } = await requireStudy(actor, studyId, 'study.read');
  return { ...study, role };
}

export async function updateStudy(actor: Actor | null, studyId: string, input: StudyUpdateInput): Promise<StudyWithRole> {
  return transaction(async (trx) => {
    const { actor: a, study, role } = await requireStudy(actor, studyId, 'study.update', { trx, lock: 'update' });
    const updated = await updateStudyRow(trx, studyId, input);
    await logActivity(trx, {
      workspaceId: study.workspaceId,
      studyId,
      actorId: a.id,
      action: 'study.updated',
      details: { fields: Object.keys(input) },
    });
    return { ...updated, role };
  });
}

export async function setStudyArchived(actor: Actor | null, studyId: string, archived: boolean): Promise<StudyWithRole> {
  return transaction(async (trx) => {
    const { actor: a, study, role } = await requireStudy(actor, studyId, 'study.archive', { trx, lock: 'update' });
    if ((study.status === 'archived') === archived) return { ...study, role };
    const updated = await updateStudyRow(trx, studyId, archived ? { status: 'archived', archived_at: new Date() } : { status: 'draft', archived_at: null });
    await logActivity(trx, { workspaceId: study.workspaceId, studyId, actorId: a.id, action: archived ? 'study.archived' : 'study.restored' });
    return { ...updated, role };
  });
}

export async function listStudyMembers(actor: Actor | null, studyId: string): Promise<StudyMember[]> {
  await requireStudy(actor, studyId, 'members.read');
  return listMembersRow(db(), studyId);
}

export async function changeStudyMemberRole(
  actor: Actor | null,
  studyId: string,
  userId: string,
  input: MemberRoleUpdateInput,
): Promise<StudyMember[]> {
  return transaction(async (trx) => {
    const { actor: a, study } = await requireStudy(actor, studyId, 'members.manage', { trx, lock: 'update' });
    const current = await findStudyMemberRole(trx, studyId, userId);
    if (!current) throw notFound('That member');
    if (current === 'owner') throw new AppError('conflict', 'The owner keeps the owner role. Ownership cannot be changed here.');
    await setStudyMemberRole(trx, studyId, userId, input.role);
    await logActivity(trx, { workspaceId: study.workspaceId, studyId, actorId: a.id, action: 'member.role-changed', details: { userId, from: current, to: input.role } });
    return listMembersRow(trx, studyId);
  });
}

export async function removeStudyMember(actor: Actor | null, studyId: string, userId: string): Promise<void> {
  await transaction(async (trx) => {
    const { actor: a, study } = await requireStudy(actor, studyId, 'members.manage', { trx, lock: 'update' });
    const current: StudyRole | undefined = await findStudyMemberRole(trx, studyId, userId);
    if (!current) throw notFound('That member');
    if (current === 'owner') throw new AppError('conflict', 'The owner cannot be removed from the study.');
    await deleteStudyMember(trx, studyId, userId);
    await logActivity(trx, { workspaceId: study.workspaceId, studyId, actorId: a.id, action: 'member.removed', details: { userId, role: current } });
  });
}

export async function listStudyActivity(actor: Actor | null, studyId: string): Promise<ActivityItem[]> {
  await requireStudy(actor, studyId, 'activity.read');
  return listActivityRows(db(), studyId);
}

export type { Study, StudyWithRole, StudyMember };
