/**
 * What the API sends back: each response shape declared once, as a zod schema with an id that
 * names it in the OpenAPI document (lib/api/openapi.ts), and its builder typed by the schema's
 * output, so a builder that drifts from the document does not compile. The integration suite
 * checks every 2xx body against the schema the document names (tests/support/api-contract.ts).
 */
import { z } from 'zod';
import type { Invitation, InvitationState } from '@/db/repositories/invitations';
import type { FindingNote } from '@/db/repositories/designs';
import type { StudyMember, StudyWithRole } from '@/db/repositories/studies';
import type { WorkspaceMember } from '@/db/repositories/workspaces';
import type { ActivityItem } from '@/db/repositories/activity';
import { UNSUBSCRIBE_SCOPES } from '@/lib/notifications/kinds';
import { actorWords, describeActivity } from '@/lib/activity/words';
import { notificationSettingsSchema } from '@/lib/validation/notifications';
import { STUDY_ROLES, STUDY_STATUSES, WORKSPACE_ROLES, type MailStatus } from '@/db/schema';
import { analysisSchema, designSchema } from '@/lib/design/schema';
import { calculationOutputSchema } from '@/lib/stats/calculations/types';
import { calculationSchema } from '@/lib/stats/calculations/request';
import { simulationSpecSchema } from '@/lib/sim/spec';

const iso = z.string().meta({ format: 'date-time' });

/** `{ items: [...] }`, the envelope of every list. */
export const list = <T extends z.ZodType>(item: T) => z.object({ items: z.array(item) });

// Workspaces and studies.

export const workspaceDtoSchema = z
  .object({ id: z.uuid(), name: z.string(), slug: z.string(), role: z.enum(WORKSPACE_ROLES) })
  .meta({ id: 'Workspace' });
export type WorkspaceDto = z.output<typeof workspaceDtoSchema>;

export const studyDtoSchema = z
  .object({
    id: z.uuid(),
    workspaceId: z.uuid(),
    title: z.string(),
    description: z.string(),
    status: z.enum(STUDY_STATUSES),
    currentRevision: z.number().int(),
    role: z.enum(STUDY_ROLES),
    createdAt: iso,
    updatedAt: iso,
    archivedAt: iso.nullable(),
  })
  .meta({ id: 'Study' });
export type StudyDto = z.output<typeof studyDtoSchema>;

export function studyDto(s: StudyWithRole): StudyDto {
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

export const studyPageSchema = z
  .object({ items: z.array(studyDtoSchema), total: z.number().int(), page: z.number().int(), pageSize: z.number().int() })
  .meta({ id: 'StudyPage' });
export type StudyPage = z.output<typeof studyPageSchema>;

// Members: one shape, with the roles of a study or of a workspace.

const memberSchema = z.object({ userId: z.uuid(), name: z.string().nullable(), email: z.string(), since: iso });

export const studyMemberDtoSchema = memberSchema.extend({ role: z.enum(STUDY_ROLES) }).meta({ id: 'StudyMember' });
export const workspaceMemberDtoSchema = memberSchema.extend({ role: z.enum(WORKSPACE_ROLES) }).meta({ id: 'WorkspaceMember' });
export type StudyMemberDto = z.output<typeof studyMemberDtoSchema>;
export type WorkspaceMemberDto = z.output<typeof workspaceMemberDtoSchema>;
export type MemberDto = StudyMemberDto | WorkspaceMemberDto;

/** A study member gets a StudyMember, a workspace member a WorkspaceMember (the role says which). */
export function memberDto<M extends StudyMember | WorkspaceMember>(m: M): z.output<typeof memberSchema> & { role: M['role'] } {
  return { userId: m.userId, name: m.name, email: m.email, role: m.role, since: m.since.toISOString() };
}

// Invitations.

/** How far the message with an invitation's link got, in the words the list shows. */
export const INVITATION_DELIVERIES = ['sending', 'sent', 'retrying', 'failed'] as const;
export type InvitationDelivery = (typeof INVITATION_DELIVERIES)[number];

function invitationDelivery(status: MailStatus | null): InvitationDelivery | null {
  if (status === 'queued' || status === 'sending') return 'sending';
  if (status === 'sent' || status === 'retrying' || status === 'failed') return status;
  return null;
}

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
export type InvitationDto = z.output<typeof invitationDtoSchema>;

export function invitationDto(i: Invitation & { state: InvitationState }): InvitationDto {
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

export const invitationAcceptedSchema = z.object({ workspaceId: z.uuid(), studyId: z.uuid().nullable() }).meta({ id: 'InvitationAccepted' });
export type InvitationAccepted = z.output<typeof invitationAcceptedSchema>;

// Activity.

export const activityDtoSchema = z
  .object({
    id: z.string(),
    action: z.string(),
    details: z.record(z.string(), z.unknown()),
    actor: z.string().nullable(),
    summary: z.string().meta({ description: 'What happened, in words: the person’s name and what they did.' }),
    createdAt: iso,
  })
  .meta({ id: 'ActivityItem' });
export type ActivityDto = z.output<typeof activityDtoSchema>;

export function activityDto(a: ActivityItem): ActivityDto {
  return {
    id: a.id,
    action: a.action,
    details: a.details,
    actor: a.actorName ?? a.actorEmail,
    summary: `${actorWords(a)} ${describeActivity(a)}`,
    createdAt: a.createdAt.toISOString(),
  };
}

export const activityPageSchema = z
  .object({
    items: z.array(activityDtoSchema),
    total: z.number().int().meta({ description: 'Entries that match the filters in all.' }),
    page: z.number().int(),
    pageSize: z.number().int(),
  })
  .meta({ id: 'ActivityPage' });

// Notification settings and unsubscribe links.

export const unsubscribedSchema = z
  .object({
    scope: z.enum(UNSUBSCRIBE_SCOPES).meta({ description: 'A kind of notification, or digest: every kind the person received in the daily digest.' }),
    settings: notificationSettingsSchema,
  })
  .meta({ id: 'Unsubscribed' });
export type Unsubscribed = z.output<typeof unsubscribedSchema>;

// Errors.

export const errorSchema = z
  .object({
    error: z.object({
      code: z.enum(['bad_request', 'unauthorized', 'forbidden', 'not_found', 'conflict', 'gone', 'payload_too_large', 'rate_limited', 'internal', 'unavailable']),
      message: z.string(),
      fields: z.record(z.string(), z.array(z.string())).optional(),
    }),
  })
  .meta({ id: 'Error' });

// The design, its checks and the notes on findings.

export const designStateSchema = z
  .object({
    revision: z.number().int(),
    design: designSchema,
    savedAt: iso.nullable(),
    savedBy: z.string().nullable(),
    readable: z.boolean().meta({ description: 'False when the stored design did not match the current schema and an empty one is shown.' }),
  })
  .meta({ id: 'DesignState' });
export type DesignState = z.output<typeof designStateSchema>;

export const designSavedSchema = designStateSchema
  .extend({
    merged: z.boolean().meta({ description: 'True when the edit was merged onto a revision someone saved meanwhile.' }),
    version: z.number().int().meta({ description: 'The version the save belongs to: one person’s continuous editing (see /versions).' }),
  })
  .meta({ id: 'DesignSaved' });
export type DesignSaved = z.output<typeof designSavedSchema>;

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

const recommendationSchema = z
  .object({
    method: analysisSchema.shape.method.unwrap(),
    model: z.string().meta({ description: 'Standard model notation.' }),
    family: analysisSchema.shape.glmFamily.optional(),
    link: z.enum(['identity', 'logit', 'log']).optional(),
    standardErrors: analysisSchema.shape.standardErrors.unwrap().optional(),
    dfMethod: analysisSchema.shape.dfMethod.unwrap(),
    adjustments: z.array(z.string()),
    unitOfAnalysis: z
      .object({ levelId: z.string(), name: z.string(), total: z.number(), perArm: z.number().optional() })
      .optional()
      .meta({ description: 'Absent while the structure has no levels.' }),
    randomIntercepts: z.array(z.string()),
    analysisPatch: z.record(z.string(), z.unknown()).meta({ description: 'The analysis-plan fields that carry out this recommendation (merge into design.analysis).' }),
    explanation: z.string(),
    citations: z.array(citationSchema),
  })
  .meta({ id: 'Recommendation', description: 'The recommended analysis: method, model, df method, unit of analysis, citations.' });

export const checkResultSchema = z
  .object({ revision: z.number().int(), findings: z.array(findingDtoSchema), recommendation: recommendationSchema })
  .meta({ id: 'CheckResult' });
export type CheckResultDto = z.output<typeof checkResultSchema>;

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
export type FindingNoteDto = z.output<typeof findingNoteDtoSchema>;

export function findingNoteDto(n: FindingNote): FindingNoteDto {
  return { id: n.id, ruleId: n.ruleId, key: n.key, status: n.status, reason: n.reason, revision: n.revision, actorName: n.actorName, createdAt: n.createdAt.toISOString() };
}

// Plan tab: results saved to a study.

export const planResultDtoSchema = z
  .object({
    id: z.string(),
    studyId: z.uuid(),
    revision: z.number().int().meta({ description: 'The design revision the result was computed from.' }),
    kind: z.string(),
    request: calculationSchema,
    output: calculationOutputSchema,
    note: z.string().nullable(),
    createdBy: z.uuid().nullable(),
    createdByName: z.string().nullable(),
    createdAt: iso,
  })
  .meta({ id: 'PlanResult' });
export type PlanResultDto = z.output<typeof planResultDtoSchema>;

export function planResultDto(r: Omit<PlanResultDto, 'createdAt'> & { createdAt: Date }): PlanResultDto {
  return {
    id: r.id,
    studyId: r.studyId,
    revision: r.revision,
    kind: r.kind,
    request: r.request,
    output: r.output,
    note: r.note,
    createdBy: r.createdBy,
    createdByName: r.createdByName,
    createdAt: r.createdAt.toISOString(),
  };
}

// Stress tests: the specification a study's design gives (the runs are in ./simulations.ts).

export const simulationSpecDerivedSchema = z
  .object({ revision: z.number().int(), spec: simulationSpecSchema.nullable(), missing: z.array(z.string()), unsupported: z.array(z.string()) })
  .meta({ id: 'SimulationSpecFromDesign' });
export type SimulationSpecDerived = z.output<typeof simulationSpecDerivedSchema>;

/** GET /api/health: the app and its database answer (200), or the database does not (503). */
export const healthSchema = z.object({ status: z.literal('ok'), database: z.literal('ok') }).meta({ id: 'Health' });
export const healthDegradedSchema = z.object({ status: z.literal('degraded'), database: z.literal('unreachable') }).meta({ id: 'HealthDegraded' });
