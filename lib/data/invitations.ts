import 'server-only';
import type { Transaction } from 'kysely';
import type { Database } from '@/db/schema';
import {
  claimInvitation,
  findInvitationById,
  findInvitationByTokenHash,
  insertInvitation,
  invitationState,
  listInvitations,
  renewInvitationLink,
  revokeInvitationRow,
  setInvitationMail,
  type Invitation,
  type InvitationState,
} from '@/db/repositories/invitations';
import { lockStudy, upsertStudyMember } from '@/db/repositories/studies';
import { findMembership, lockWorkspace, upsertWorkspaceMember } from '@/db/repositories/workspaces';
import { logActivity } from '@/db/repositories/activity';
import { canStudy, canWorkspace, STUDY_ROLE_DESCRIPTIONS } from '@/lib/auth/permissions';
import type { InvitationAccepted } from '@/lib/api/dto';
import type { Actor } from '@/lib/auth/session';
import { findStudyForUser } from '@/db/repositories/studies';
import { hashToken, newToken, TOKEN_LIFETIME } from '@/lib/auth/tokens';
import { db } from '@/lib/db';
import { env } from '@/lib/env';
import { AppError, forbidden, notFound } from '@/lib/errors';
import type { Mail } from '@/lib/mail/send';
import { queueMail } from '@/lib/mail/queue';
import { wakeMailSender } from '@/lib/mail/sender';
import { invitationMail } from '@/lib/mail/templates';
import { enforce, LIMITS } from '@/lib/rate-limit';
import type { StudyInvitationCreateInput } from '@/lib/validation/member';
import type { WorkspaceInvitationCreateInput } from '@/lib/validation/workspace';
import { requireActor, requireStudy, requireWorkspace } from './access';
import { afterCommit, transaction } from './transaction';

/**
 * Invitations by e-mail: an expiring (7 days), single-use link. A workspace invitation makes the
 * person a workspace member or admin; a study invitation also gives them a role on one study.
 * Only the invited address can accept. The message with the link is queued in the transaction
 * that stores the invitation (lib/mail/queue.ts), so a mail outage never fails the invitation:
 * the list shows the message as sending, sent, failed and retrying, or failed, and a failed
 * one can be sent again with a new link.
 */

export interface InvitationView extends Invitation {
  state: InvitationState;
}

function view(i: Invitation): InvitationView {
  return { ...i, state: invitationState(i) };
}

function expiry(): Date {
  return new Date(Date.now() + TOKEN_LIFETIME.invitationDays * 24 * 3600_000);
}

export async function inviteToWorkspace(
  actor: Actor | null,
  workspaceId: string,
  input: WorkspaceInvitationCreateInput,
): Promise<InvitationView> {
  const { actor: a } = await requireWorkspace(actor, workspaceId, 'workspace.invite');
  await enforce(db(), `invite:${a.id}`, LIMITS.invitationsPerUser, 'invitations');
  const { token, hash } = newToken();
  const inv = await transaction(async (trx) => {
    await requireWorkspace(a, workspaceId, 'workspace.invite', { trx, lock: 'share' });
    const created = await insertInvitation(trx, {
      workspaceId,
      studyId: null,
      email: input.email,
      workspaceRole: input.role,
      studyRole: null,
      tokenHash: hash,
      invitedBy: a.id,
      expiresAt: expiry(),
    });
    await logActivity(trx, { workspaceId, actorId: a.id, action: 'invitation.created', details: { email: input.email, role: input.role } });
    return queueInvitationMail(trx, created, a, token, hash);
  });
  await afterCommit(async () => wakeMailSender());
  return view(inv);
}

export async function inviteToStudy(actor: Actor | null, studyId: string, input: StudyInvitationCreateInput): Promise<InvitationView> {
  const { actor: a, study } = await requireStudy(actor, studyId, 'members.manage');
  await enforce(db(), `invite:${a.id}`, LIMITS.invitationsPerUser, 'invitations');
  const { token, hash } = newToken();
  const inv = await transaction(async (trx) => {
    await requireStudy(a, studyId, 'members.manage', { trx, lock: 'share' });
    const created = await insertInvitation(trx, {
      workspaceId: study.workspaceId,
      studyId,
      email: input.email,
      workspaceRole: 'member',
      studyRole: input.role,
      tokenHash: hash,
      invitedBy: a.id,
      expiresAt: expiry(),
    });
    await logActivity(trx, { workspaceId: study.workspaceId, studyId, actorId: a.id, action: 'invitation.created', details: { email: input.email, role: input.role } });
    return queueInvitationMail(trx, created, a, token, hash);
  });
  await afterCommit(async () => wakeMailSender());
  return view(inv);
}

function invitationMessage(inv: Invitation, inviter: Actor, token: string): Mail {
  const href = new URL(`/invitations/${token}`, env().APP_URL).toString();
  const from = inviter.name ?? inviter.email;
  if (inv.studyId && inv.studyRole) {
    const roleSentence = `Your role will be ${inv.studyRole}: ${STUDY_ROLE_DESCRIPTIONS[inv.studyRole].toLowerCase()}`;
    return invitationMail(inv.email, from, `the study “${inv.studyTitle}”`, roleSentence, href);
  }
  const roleSentence =
    inv.workspaceRole === 'admin'
      ? 'As a workspace admin you will manage its members and invitations.'
      : 'As a workspace member you can create studies and join the ones you are invited to.';
  return invitationMail(inv.email, from, `the workspace “${inv.workspaceName}”`, roleSentence, href);
}

/** Queues the message with the invitation's link (token `token`, stored as `hash`) in `trx`. */
async function queueInvitationMail(trx: Transaction<Database>, inv: Invitation, inviter: Actor, token: string, hash: string): Promise<Invitation> {
  const mailId = await queueMail(trx, { kind: 'invitation', idempotencyKey: `invitation:${hash}`, mail: invitationMessage(inv, inviter, token) });
  await setInvitationMail(trx, inv.id, mailId);
  return { ...inv, mailStatus: 'queued' };
}

/**
 * Sends a pending invitation again with a new link (the old one stops working) and a new
 * expiry: for a message that failed for good, or one the invited person cannot find. Not while
 * a message is still on its way.
 */
export async function resendInvitation(actor: Actor | null, invitationId: string): Promise<InvitationView> {
  const a = requireActor(actor);
  await enforce(db(), `invite:${a.id}`, LIMITS.invitationsPerUser, 'invitations');
  const { token, hash } = newToken();
  const inv = await transaction(async (trx) => {
    const { invitation } = await requireInvitationManager(trx, a, invitationId, 'send this invitation again');
    if (invitationState(invitation) !== 'pending') {
      throw new AppError('conflict', `This invitation is ${invitationState(invitation)}; only a pending one can be sent again. Invite the person anew.`);
    }
    if (invitation.mailStatus && ['queued', 'sending', 'retrying'].includes(invitation.mailStatus)) {
      throw new AppError('conflict', 'This invitation is still being sent. Wait until it is sent or has failed.');
    }
    if (!(await renewInvitationLink(trx, invitation.id, hash, expiry()))) {
      throw new AppError('conflict', 'This invitation was accepted, revoked or expired meanwhile.');
    }
    const renewed = await findInvitationById(trx, invitation.id);
    await logActivity(trx, {
      workspaceId: invitation.workspaceId,
      studyId: invitation.studyId,
      actorId: a.id,
      action: 'invitation.resent',
      details: { email: invitation.email },
    });
    return queueInvitationMail(trx, renewed!, a, token, hash);
  });
  await afterCommit(async () => wakeMailSender());
  return view(inv);
}

export async function listWorkspaceInvitations(actor: Actor | null, workspaceId: string): Promise<InvitationView[]> {
  await requireWorkspace(actor, workspaceId, 'workspace.invite');
  return (await listInvitations(db(), { workspaceId })).map(view);
}

export async function listStudyInvitations(actor: Actor | null, studyId: string): Promise<InvitationView[]> {
  const { study } = await requireStudy(actor, studyId, 'members.manage');
  return (await listInvitations(db(), { workspaceId: study.workspaceId, studyId })).map(view);
}

/**
 * The invitation, for someone who may manage it: a workspace admin, or for a study invitation a
 * study member whose role manages members. Not a member of its workspace → 404. Read first to
 * find its workspace and study, then read again inside `trx` with those rows locked (workspace,
 * then study, the order every write keeps), so that a revoke, a resend and an acceptance at the
 * same moment take turns; the conditional update of the invitation row decides which one it was.
 */
async function requireInvitationManager(
  trx: Transaction<Database>,
  actor: Actor | null,
  invitationId: string,
  what: string,
): Promise<{ actor: Actor; invitation: Invitation }> {
  const a = requireActor(actor);
  if (!/^[0-9a-f-]{36}$/i.test(invitationId)) throw notFound('The invitation');
  const found = await findInvitationById(trx, invitationId);
  if (!found) throw notFound('The invitation');
  await lockWorkspace(trx, found.workspaceId, 'share');
  if (found.studyId) await lockStudy(trx, found.studyId, 'share');
  const inv = (await findInvitationById(trx, invitationId))!;
  const wsRole = await findMembership(trx, inv.workspaceId, a.id);
  if (!wsRole) throw notFound('The invitation');
  let allowed = canWorkspace(wsRole, 'workspace.invite');
  if (!allowed && inv.studyId) {
    const s = await findStudyForUser(trx, inv.studyId, a.id);
    allowed = canStudy(s?.role, 'members.manage');
  }
  if (!allowed) throw forbidden(what);
  return { actor: a, invitation: inv };
}

export async function revokeInvitation(actor: Actor | null, invitationId: string): Promise<void> {
  await transaction(async (trx) => {
    const { actor: a, invitation: inv } = await requireInvitationManager(trx, actor, invitationId, 'revoke this invitation');
    if (!(await revokeInvitationRow(trx, invitationId))) {
      throw new AppError('conflict', 'This invitation was already accepted or revoked.');
    }
    await logActivity(trx, { workspaceId: inv.workspaceId, studyId: inv.studyId, actorId: a.id, action: 'invitation.revoked', details: { email: inv.email } });
  });
}

/** What the invitation page shows before accepting. Knowing the token is the permission. */
export async function previewInvitation(token: string): Promise<InvitationView | undefined> {
  if (token.length < 20 || token.length > 200) return undefined;
  const inv = await findInvitationByTokenHash(db(), hashToken(token));
  return inv && view(inv);
}

/**
 * Joining adds a workspace (and study) membership, so it holds the workspace's row shared and the
 * study's row alone: removing the person from the workspace at the same moment waits, and then
 * removes the new study membership too. The invitation is claimed by one conditional update, so
 * it is used once, never after it was revoked or expired.
 */
export async function acceptInvitation(actor: Actor | null, token: string): Promise<InvitationAccepted> {
  const a = requireActor(actor);
  const found = await previewInvitation(token);
  if (!found) throw notFound('The invitation');
  return transaction(async (trx) => {
    await lockWorkspace(trx, found.workspaceId, 'share');
    if (found.studyId) await lockStudy(trx, found.studyId, 'update');
    const stored = await findInvitationByTokenHash(trx, hashToken(token));
    if (!stored) throw notFound('The invitation');
    const inv = view(stored);
    if (inv.state !== 'pending') {
      throw new AppError('gone', inv.state === 'accepted' ? 'This invitation was already used.' : `This invitation is ${inv.state}. Ask for a new one.`);
    }
    if (inv.email !== a.email.toLowerCase()) {
      throw new AppError('forbidden', `This invitation was sent to ${inv.email}. Sign in with that address to accept it.`);
    }
    const id = await claimInvitation(trx, hashToken(token), a.id);
    if (!id) throw new AppError('gone', 'This invitation was already used.');
    await upsertWorkspaceMember(trx, inv.workspaceId, a.id, inv.workspaceRole);
    if (inv.studyId && inv.studyRole) await upsertStudyMember(trx, inv.studyId, a.id, inv.studyRole);
    await logActivity(trx, {
      workspaceId: inv.workspaceId,
      studyId: inv.studyId,
      actorId: a.id,
      action: 'invitation.accepted',
      details: { role: inv.studyRole ?? inv.workspaceRole },
    });
    return { workspaceId: inv.workspaceId, studyId: inv.studyId };
  });
}
