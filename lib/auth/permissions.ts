/**
 * The permission matrix: which study role may do what, and which workspace role may do what.
 * This file is the only place where roles are turned into rights; the data-access layer asks
 * `can…` before every read and write, and the integration tests walk this table.
 *
 * Study roles (PRODUCT.md): owner drafts and runs everything and manages members; editor edits the
 * design and runs calculations; consultant reads everything, comments, suggests changes and signs
 * off, but never edits the design itself; writer reads, comments, edits the justification narrative
 * and exports it; viewer reads.
 */
import type { StudyRole, WorkspaceRole } from '@/db/schema';

export const STUDY_ACTIONS = [
  'study.read',
  'study.update',
  'study.archive',
  'design.edit',
  'finding.address',
  'calculation.save',
  'simulation.run',
  'comment.create',
  'comment.resolve',
  'suggestion.create',
  'suggestion.decide',
  'study.signoff',
  'version.name',
  'justification.edit',
  'justification.export',
  'members.read',
  'members.manage',
  'activity.read',
] as const;
export type StudyAction = (typeof STUDY_ACTIONS)[number];

const Y = true;
const N = false;

/** Rows: actions. Columns: owner, editor, consultant, writer, viewer. */
const STUDY_MATRIX: Record<StudyAction, [boolean, boolean, boolean, boolean, boolean]> = {
  //                      owner editor consult writer viewer
  'study.read':           [Y,    Y,     Y,      Y,     Y],
  'study.update':         [Y,    Y,     N,      N,     N],
  'study.archive':        [Y,    N,     N,      N,     N],
  'design.edit':          [Y,    Y,     N,      N,     N],
  'finding.address':      [Y,    Y,     Y,      N,     N],
  'calculation.save':     [Y,    Y,     N,      N,     N],
  'simulation.run':       [Y,    Y,     Y,      N,     N],
  'comment.create':       [Y,    Y,     Y,      Y,     N],
  // Resolving or reopening any thread; the author of a thread may always resolve and reopen it.
  'comment.resolve':      [Y,    Y,     Y,      N,     N],
  // Proposing a change to one field; deciding it is editing the design, so only owner and editor.
  'suggestion.create':    [Y,    Y,     Y,      N,     N],
  'suggestion.decide':    [Y,    Y,     N,      N,     N],
  'study.signoff':        [N,    N,     Y,      N,     N],
  'version.name':         [Y,    Y,     Y,      N,     N],
  'justification.edit':   [Y,    Y,     N,      Y,     N],
  'justification.export': [Y,    Y,     Y,      Y,     Y],
  'members.read':         [Y,    Y,     Y,      Y,     Y],
  'members.manage':       [Y,    N,     N,      N,     N],
  'activity.read':        [Y,    Y,     Y,      Y,     Y],
};

const ROLE_COLUMN: Record<StudyRole, number> = { owner: 0, editor: 1, consultant: 2, writer: 3, viewer: 4 };

export function canStudy(role: StudyRole | null | undefined, action: StudyAction): boolean {
  if (!role) return false;
  return STUDY_MATRIX[action][ROLE_COLUMN[role]] ?? false;
}

/** Resolving or reopening a thread: `comment.resolve`, or a member who may comment and started the thread. */
export function canResolveThread(role: StudyRole | null | undefined, isAuthor: boolean): boolean {
  return canStudy(role, 'comment.resolve') || (isAuthor && canStudy(role, 'comment.create'));
}

export const WORKSPACE_ACTIONS = [
  'workspace.read',
  'study.create',
  'workspace.members.read',
  'workspace.members.manage',
  'workspace.invite',
] as const;
export type WorkspaceAction = (typeof WORKSPACE_ACTIONS)[number];

const WORKSPACE_MATRIX: Record<WorkspaceAction, [boolean, boolean]> = {
  //                           admin member
  'workspace.read':            [Y,    Y],
  'study.create':              [Y,    Y],
  'workspace.members.read':    [Y,    Y],
  'workspace.members.manage':  [Y,    N],
  'workspace.invite':          [Y,    N],
};

export function canWorkspace(role: WorkspaceRole | null | undefined, action: WorkspaceAction): boolean {
  if (!role) return false;
  return WORKSPACE_MATRIX[action][role === 'admin' ? 0 : 1] ?? false;
}

/** Roles an owner may hand out through an invitation or a role change (there is one owner). */
export const ASSIGNABLE_STUDY_ROLES = ['editor', 'consultant', 'writer', 'viewer'] as const satisfies readonly StudyRole[];

export const STUDY_ROLE_LABELS: Record<StudyRole, string> = {
  owner: 'Owner',
  editor: 'Editor',
  consultant: 'Consultant',
  writer: 'Writer',
  viewer: 'Viewer',
};

export const STUDY_ROLE_DESCRIPTIONS: Record<StudyRole, string> = {
  owner: 'Drafts the design, runs calculations and stress tests, manages members.',
  editor: 'Edits the design and runs calculations.',
  consultant: 'Reads everything, comments on any section and signs off a version.',
  writer: 'Reads, edits the justification narrative and exports it.',
  viewer: 'Reads.',
};
