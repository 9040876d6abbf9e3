import type { Kysely, Transaction } from 'kysely';
import type { Database, MailStatus, StudyRole, WorkspaceRole } from '../schema';

type Db = Kysely<Database> | Transaction<Database>;

export interface Invitation {
  id: string;
  workspaceId: string;
  workspaceName: string;
  studyId: string | null;
  studyTitle: string | null;
  email: string;
  workspaceRole: WorkspaceRole;
  studyRole: StudyRole | null;
  invitedByName: string | null;
  expiresAt: Date;
  acceptedAt: Date | null;
  revokedAt: Date | null;
  createdAt: Date;
  /** Where the message with the current link is (lib/mail/queue.ts); null without one. */
  mailStatus: MailStatus | null;
}

export type InvitationState = 'pending' | 'accepted' | 'revoked' | 'expired';

export function invitationState(i: Pick<Invitation, 'acceptedAt' | 'revokedAt' | 'expiresAt'>, now = new Date()): InvitationState {
  if (i.acceptedAt) return 'accepted';
  if (i.revokedAt) return 'revoked';
  if (i.expiresAt <= now) return 'expired';
  return 'pending';
}

function baseQuery(db: Db) {
  return db
    .selectFrom('invitations')
    .innerJoin('workspaces', 'workspaces.id', 'invitations.workspace_id')
    .leftJoin('studies', 'studies.id', 'invitations.study_id')
    .leftJoin('User as inviter', 'inviter.id', 'invitations.invited_by')
    .leftJoin('mail', 'mail.id', 'invitations.mail_id')
    .select([
      'invitations.id',
      'invitations.workspace_id',
      'workspaces.name as workspace_name',
      'invitations.study_id',
      'studies.title as study_title',
      'invitations.email',
      'invitations.workspace_role',
      'invitations.study_role',
      'inviter.name as inviter_name',
      'invitations.expires_at',
      'invitations.accepted_at',
      'invitations.revoked_at',
      'invitations.created_at',
      'mail.status as mail_status',
    ]);
}

type Row = Awaited<ReturnType<ReturnType<typeof baseQuery>['executeTakeFirstOrThrow']>>;

function rowToInvitation(r: Row): Invitation {
  return {
    id: r.id,
    workspaceId: r.workspace_id,
    workspaceName: r.workspace_name,
    studyId: r.study_id,
    studyTitle: r.study_title,
    email: r.email,
    workspaceRole: r.workspace_role,
    studyRole: r.study_role,
    invitedByName: r.inviter_name,
    expiresAt: r.expires_at,
    acceptedAt: r.accepted_at,
    revokedAt: r.revoked_at,
    createdAt: r.created_at,
    mailStatus: r.mail_status,
  };
}

export async function insertInvitation(
  db: Db,
  input: {
    workspaceId: string;
    studyId: string | null;
    email: string;
    workspaceRole: WorkspaceRole;
    studyRole: StudyRole | null;
    tokenHash: string;
    invitedBy: string;
    expiresAt: Date;
  },
): Promise<Invitation> {
  const { id } = await db
    .insertInto('invitations')
    .values({
      workspace_id: input.workspaceId,
      study_id: input.studyId,
      email: input.email,
      workspace_role: input.workspaceRole,
      study_role: input.studyRole,
      token_hash: input.tokenHash,
      invited_by: input.invitedBy,
      expires_at: input.expiresAt,
    })
    .returning('id')
    .executeTakeFirstOrThrow();
  return rowToInvitation(await baseQuery(db).where('invitations.id', '=', id).executeTakeFirstOrThrow());
}

export async function findInvitationById(db: Db, id: string): Promise<Invitation | undefined> {
  const r = await baseQuery(db).where('invitations.id', '=', id).executeTakeFirst();
  return r && rowToInvitation(r);
}

export async function findInvitationByTokenHash(db: Db, hash: string): Promise<Invitation | undefined> {
  const r = await baseQuery(db).where('invitations.token_hash', '=', hash).executeTakeFirst();
  return r && rowToInvitation(r);
}

export async function listInvitations(db: Db, filter: { workspaceId: string; studyId?: string }): Promise<Invitation[]> {
  let q = baseQuery(db).where('invitations.workspace_id', '=', filter.workspaceId);
  q = filter.studyId ? q.where('invitations.study_id', '=', filter.studyId) : q.where('invitations.study_id', 'is', null);
  const rows = await q.orderBy('invitations.created_at', 'desc').limit(200).execute();
  return rows.map(rowToInvitation);
}

/** Claims a pending invitation in one statement; a second use, revoked or expired link gets nothing. */
export async function claimInvitation(db: Db, hash: string, userId: string): Promise<string | undefined> {
  const row = await db
    .updateTable('invitations')
    .set({ accepted_at: new Date(), accepted_by: userId })
    .where('token_hash', '=', hash)
    .where('accepted_at', 'is', null)
    .where('revoked_at', 'is', null)
    .where('expires_at', '>', new Date())
    .returning('id')
    .executeTakeFirst();
  return row?.id;
}

/** Points a pending invitation at the message that carries its link. */
export async function setInvitationMail(db: Db, id: string, mailId: string): Promise<void> {
  await db.updateTable('invitations').set({ mail_id: mailId }).where('id', '=', id).execute();
}

/**
 * Gives a pending invitation a new link (the old one stops working) and a new expiry, for
 * sending it again. Returns false when it is no longer pending.
 */
export async function renewInvitationLink(db: Db, id: string, tokenHash: string, expiresAt: Date): Promise<boolean> {
  const r = await db
    .updateTable('invitations')
    .set({ token_hash: tokenHash, expires_at: expiresAt })
    .where('id', '=', id)
    .where('accepted_at', 'is', null)
    .where('revoked_at', 'is', null)
    .where('expires_at', '>', new Date())
    .executeTakeFirst();
  return Number(r.numUpdatedRows) > 0;
}

export async function revokeInvitationRow(db: Db, id: string): Promise<boolean> {
  const r = await db
    .updateTable('invitations')
    .set({ revoked_at: new Date() })
    .where('id', '=', id)
    .where('accepted_at', 'is', null)
    .where('revoked_at', 'is', null)
    .executeTakeFirst();
  return Number(r.numUpdatedRows) > 0;
}
