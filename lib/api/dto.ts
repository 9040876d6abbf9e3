/**
 * What the API sends back: domain objects turned into JSON with ISO dates. The zod schemas
 * here document the shapes in the OpenAPI file; the functions build them.
 */
import { z } from 'zod';
import type { Invitation, InvitationState } from '@/db/repositories/invitations';
import type { StudyMember, StudyWithRole } from '@/db/repositories/studies';
import type { WorkspaceMember } from '@/db/repositories/workspaces';
import type { ActivityItem } from '@/db/repositories/activity';
import { STUDY_ROLES, WORKSPACE_ROLES, type MailStatus } from '@/db/schema';
import { designSchema } from '@/lib/design/schema';

export function studyDto(s: StudyWithRole) {
  return {
    id: s.id,
    workspaceId: s.workspaceId,
    title: s.title,
    description: s.description,
    status: s.status,
    currentRevision: s.currentRevision,
    role: s.role,
    createdAt: s.createdAt.toISOString(),
    updatedAt: s.updatedAt.toISOString(),
    archivedAt: s.archivedAt ? s.archivedAt.toISOString() : null,
  };
}
export type StudyDto = ReturnType<typeof studyDto>;

export function memberDto(m: StudyMember | WorkspaceMember) {
  return { userId: m.userId, name: m.name, email: m.email, role: m.role, since: m.since.toISOString() };
}

/** How far the message with an invitation's link got, in the words the list shows. */
export const INVITATION_DELIVERIES = ['sending', 'sent', 'retrying', 'failed'] as const;
export type InvitationDelivery = (typeof INVITATION_DELIVERIES)[number];

function invitationDelivery(status: MailStatus | null): InvitationDelivery | null {
  if (status === 'queued' || status === 'sending') return 'sending';
  if (status === 'sent' || status === 'retrying' || status === 'failed') return status;
  return null;
}

export function invitationDto(i: Invitation & { state: InvitationState }) {
  return {
    id: i.id,
    workspaceId: i.workspaceId,
    studyId: i.studyId,
    email: i.email,
    workspaceRole: i.workspaceRole,
    studyRole: i.studyRole,
    state: i.state,
    delivery: invitationDelivery(i.mailStatus),
    invitedBy: i.invitedByName,
    expiresAt: i.expiresAt.toISOString(),
    createdAt: i.createdAt.toISOString(),
  };
}

export function activityDto(a: ActivityItem) {
  return { id: a.id, action: a.action, details: a.details, actor: a.actorName ?? a.actorEmail, createdAt: a.createdAt.toISOString() };
}

const iso = z.string().meta({ format: 'date-time' });

export const studyMemberDtoSchema = z
  .object({ userId: z.uuid(), name: z.string().nullable(), email: z.string(), role: z.enum(STUDY_ROLES), since: iso })
  .meta({ id: 'StudyMember' });

export const workspaceMemberDtoSchema = z
  .object({ userId: z.uuid(), name: z.string().nullable(), email: z.string(), role: z.enum(WORKSPACE_ROLES), since: iso })
  .meta({ id: 'WorkspaceMember' });

export const invitationDtoSchema = z
  .object({
    id: z.uuid(),
    workspaceId: z.uuid(),
    studyId: z.uuid().nullable(),
    email: z.string(),
    workspaceRole: z.enum(WORKSPACE_ROLES),
    studyRole: z.enum(STUDY_ROLES).nullable(),
    state: z.enum(['pending', 'accepted', 'revoked', 'expired']),
    delivery: z.enum(INVITATION_DELIVERIES).nullable().meta({
      description:
        'The e-mail with the link: sending, sent, retrying (an attempt failed; the server tries again with growing delays for about an hour) or failed (send it again). Null when no message is known.',
    }),
    invitedBy: z.string().nullable(),
    expiresAt: iso,
    createdAt: iso,
  })
  .meta({ id: 'Invitation' });

export const activityDtoSchema = z
  .object({ id: z.string(), action: z.string(), details: z.record(z.string(), z.unknown()), actor: z.string().nullable(), createdAt: iso })
  .meta({ id: 'ActivityItem' });

export const errorSchema = z
  .object({
    error: z.object({
      code: z.enum(['bad_request', 'unauthorized', 'forbidden', 'not_found', 'conflict', 'gone', 'payload_too_large', 'rate_limited', 'internal', 'unavailable']),
      message: z.string(),
      fields: z.record(z.string(), z.array(z.string())).optional(),
    }),
  })
  .meta({ id: 'Error' });

export const designStateSchema = z
  .object({
    revision: z.number().int(),
    design: designSchema,
    savedAt: iso.nullable(),
    savedBy: z.string().nullable(),
    readable: z.boolean(),
  })
  .meta({ id: 'DesignState' });

const citationSchema = z.object({ short: z.string(), full: z.string() });

export const findingDtoSchema = z
  .object({
    ruleId: z.string(),
    key: z.string(),
    severity: z.enum(['blocker', 'warning', 'advice']),
    title: z.string(),
    found: z.string(),
    why: z.string(),
    todo: z.string(),
    model: z.string().optional(),
    numbers: z.record(z.string(), z.number()).optional(),
    citations: z.array(citationSchema),
    levelIds: z.array(z.string()).optional(),
  })
  .meta({ id: 'Finding' });

export const checkResultSchema = z
  .object({
    revision: z.number().int(),
    findings: z.array(findingDtoSchema),
    recommendation: z.record(z.string(), z.unknown()).meta({ description: 'The recommended analysis: method, model, df method, unit of analysis, citations.' }),
  })
  .meta({ id: 'CheckResult' });

export const findingNoteDtoSchema = z
  .object({
    id: z.string(),
    ruleId: z.string(),
    key: z.string(),
    status: z.enum(['addressed', 'reopened']),
    reason: z.string(),
    revision: z.number().int(),
    actorName: z.string().nullable(),
    createdAt: iso,
  })
  .meta({ id: 'FindingNoteEntry' });
