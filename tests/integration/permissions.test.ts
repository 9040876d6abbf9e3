/**
 * The whole permission matrix, walked through the real route handlers against PostgreSQL:
 * every /api/v1 route × every study role, a workspace member outside the study, a user of
 * another workspace and an anonymous caller. The expected answer comes from
 * lib/auth/permissions.ts, so this test fails if a handler forgets its check or checks the
 * wrong right.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { canStudy, canWorkspace, type StudyAction, type WorkspaceAction } from '@/lib/auth/permissions';
import { insertInvitation } from '@/db/repositories/invitations';
import { insertSimulation } from '@/db/repositories/simulations';
import { stopBoss } from '@/lib/jobs/boss';
import { db } from '@/lib/db';
import { makeWorld, request, ctx, type TestUser, type World } from '../support/fixtures';
import * as workspaces from '@/app/api/v1/workspaces/route';
import * as wsMembers from '@/app/api/v1/workspaces/[workspaceId]/members/route';
import * as wsMember from '@/app/api/v1/workspaces/[workspaceId]/members/[userId]/route';
import * as wsInvitations from '@/app/api/v1/workspaces/[workspaceId]/invitations/route';
import * as studies from '@/app/api/v1/studies/route';
import * as study from '@/app/api/v1/studies/[studyId]/route';
import * as archive from '@/app/api/v1/studies/[studyId]/archive/route';
import * as restore from '@/app/api/v1/studies/[studyId]/restore/route';
import * as studyMembers from '@/app/api/v1/studies/[studyId]/members/route';
import * as studyMember from '@/app/api/v1/studies/[studyId]/members/[userId]/route';
import * as studyInvitations from '@/app/api/v1/studies/[studyId]/invitations/route';
import * as activity from '@/app/api/v1/studies/[studyId]/activity/route';
import * as activityExport from '@/app/api/v1/studies/[studyId]/activity/export/route';
import * as notificationSettings from '@/app/api/v1/me/notification-settings/route';
import * as unsubscribeRoute from '@/app/api/v1/unsubscribe/[token]/route';
import { unsubscribeToken } from '@/lib/notifications/unsubscribe-token';
import * as invitation from '@/app/api/v1/invitations/[invitationId]/route';
import * as invitationResend from '@/app/api/v1/invitations/[invitationId]/resend/route';
import * as design from '@/app/api/v1/studies/[studyId]/design/route';
import * as checks from '@/app/api/v1/studies/[studyId]/checks/route';
import * as findingNotes from '@/app/api/v1/studies/[studyId]/finding-notes/route';
import * as simulations from '@/app/api/v1/simulations/route';
import * as simulation from '@/app/api/v1/simulations/[simulationId]/route';
import * as studySimulations from '@/app/api/v1/studies/[studyId]/simulations/route';
import * as simulationSpec from '@/app/api/v1/studies/[studyId]/simulations/spec/route';
import * as plans from '@/app/api/v1/studies/[studyId]/plans/route';
import * as calculations from '@/app/api/v1/calculations/route';
import * as threads from '@/app/api/v1/studies/[studyId]/threads/route';
import * as thread from '@/app/api/v1/studies/[studyId]/threads/[threadId]/route';
import * as threadReplies from '@/app/api/v1/studies/[studyId]/threads/[threadId]/replies/route';
import * as threadResolve from '@/app/api/v1/studies/[studyId]/threads/[threadId]/resolve/route';
import * as threadReopen from '@/app/api/v1/studies/[studyId]/threads/[threadId]/reopen/route';
import * as suggestions from '@/app/api/v1/studies/[studyId]/suggestions/route';
import * as suggestionAccept from '@/app/api/v1/studies/[studyId]/suggestions/[suggestionId]/accept/route';
import * as suggestionDecline from '@/app/api/v1/studies/[studyId]/suggestions/[suggestionId]/decline/route';
import { createThread, resolveThread } from '@/lib/data/threads';
import { createSuggestion } from '@/lib/data/suggestions';
import * as versions from '@/app/api/v1/studies/[studyId]/versions/route';
import * as version from '@/app/api/v1/studies/[studyId]/versions/[version]/route';
import * as versionRestore from '@/app/api/v1/studies/[studyId]/versions/[version]/restore/route';
import * as versionCompare from '@/app/api/v1/studies/[studyId]/versions/compare/route';
import * as versionClose from '@/app/api/v1/studies/[studyId]/versions/close/route';
import * as signoffs from '@/app/api/v1/studies/[studyId]/signoffs/route';
import * as signoffWithdraw from '@/app/api/v1/studies/[studyId]/signoffs/[signoffId]/withdraw/route';
import { insertSignoff } from '@/db/repositories/signoffs';

type Handler = (req: Request, c: { params: Promise<Record<string, string>> }) => Promise<Response>;

type Rule =
  | { kind: 'public' }
  | { kind: 'signed-in' }
  | { kind: 'workspace'; action: WorkspaceAction }
  | { kind: 'study'; action: StudyAction }
  | { kind: 'revoke' };

interface RouteCase {
  name: string;
  method: string;
  handler: Handler;
  path: (w: World) => string;
  params: (w: World, extra: Extra) => Record<string, string>;
  body?: (w: World) => unknown;
  rule: Rule;
  ok: number;
}

interface Extra {
  invitationId: string;
  simulationId: string;
  /** Open, started by the owner. */
  threadId: string;
  /** Resolved by the owner, who started it. */
  resolvedThreadId: string;
  /** Pending, made by the owner. */
  suggestionId: string;
  signoffId: string;
}

/** A stress test small enough to queue in every case below (no worker runs here). */
const SMALL_SPEC = { design: { arms: 2, unitsPerArm: 10 }, truth: { effect: 1, sd: 1 }, scenarios: [{ violation: 'none' }], analyses: ['ols'], replicates: 10, seed: 1 };

const ROUTES: RouteCase[] = [
  { name: 'list workspaces', method: 'GET', handler: workspaces.GET as Handler, path: () => '/api/v1/workspaces', params: () => ({}), rule: { kind: 'signed-in' }, ok: 200 },
  { name: 'create workspace', method: 'POST', handler: workspaces.POST as Handler, path: () => '/api/v1/workspaces', params: () => ({}), body: () => ({ name: 'New lab' }), rule: { kind: 'signed-in' }, ok: 201 },
  { name: 'list workspace members', method: 'GET', handler: wsMembers.GET as Handler, path: (w) => `/api/v1/workspaces/${w.workspaceId}/members`, params: (w) => ({ workspaceId: w.workspaceId }), rule: { kind: 'workspace', action: 'workspace.members.read' }, ok: 200 },
  { name: 'change workspace member role', method: 'PATCH', handler: wsMember.PATCH as Handler, path: (w) => `/api/v1/workspaces/${w.workspaceId}/members/${w.target.id}`, params: (w) => ({ workspaceId: w.workspaceId, userId: w.target.id }), body: () => ({ role: 'admin' }), rule: { kind: 'workspace', action: 'workspace.members.manage' }, ok: 200 },
  { name: 'remove workspace member', method: 'DELETE', handler: wsMember.DELETE as Handler, path: (w) => `/api/v1/workspaces/${w.workspaceId}/members/${w.target.id}`, params: (w) => ({ workspaceId: w.workspaceId, userId: w.target.id }), rule: { kind: 'workspace', action: 'workspace.members.manage' }, ok: 204 },
  { name: 'list workspace invitations', method: 'GET', handler: wsInvitations.GET as Handler, path: (w) => `/api/v1/workspaces/${w.workspaceId}/invitations`, params: (w) => ({ workspaceId: w.workspaceId }), rule: { kind: 'workspace', action: 'workspace.invite' }, ok: 200 },
  { name: 'invite to workspace', method: 'POST', handler: wsInvitations.POST as Handler, path: (w) => `/api/v1/workspaces/${w.workspaceId}/invitations`, params: (w) => ({ workspaceId: w.workspaceId }), body: () => ({ email: 'new.person@test.example', role: 'member' }), rule: { kind: 'workspace', action: 'workspace.invite' }, ok: 201 },
  { name: 'list studies', method: 'GET', handler: studies.GET as Handler, path: (w) => `/api/v1/studies?workspaceId=${w.workspaceId}`, params: () => ({}), rule: { kind: 'workspace', action: 'workspace.read' }, ok: 200 },
  { name: 'create study', method: 'POST', handler: studies.POST as Handler, path: () => '/api/v1/studies', params: () => ({}), body: (w) => ({ workspaceId: w.workspaceId, title: 'Greenhouse trial' }), rule: { kind: 'workspace', action: 'study.create' }, ok: 201 },
  { name: 'read study', method: 'GET', handler: study.GET as Handler, path: (w) => `/api/v1/studies/${w.studyId}`, params: (w) => ({ studyId: w.studyId }), rule: { kind: 'study', action: 'study.read' }, ok: 200 },
  { name: 'update study', method: 'PATCH', handler: study.PATCH as Handler, path: (w) => `/api/v1/studies/${w.studyId}`, params: (w) => ({ studyId: w.studyId }), body: () => ({ title: 'Renamed' }), rule: { kind: 'study', action: 'study.update' }, ok: 200 },
  { name: 'archive study', method: 'POST', handler: archive.POST as Handler, path: (w) => `/api/v1/studies/${w.studyId}/archive`, params: (w) => ({ studyId: w.studyId }), rule: { kind: 'study', action: 'study.archive' }, ok: 200 },
  { name: 'restore study', method: 'POST', handler: restore.POST as Handler, path: (w) => `/api/v1/studies/${w.studyId}/restore`, params: (w) => ({ studyId: w.studyId }), rule: { kind: 'study', action: 'study.archive' }, ok: 200 },
  { name: 'list study members', method: 'GET', handler: studyMembers.GET as Handler, path: (w) => `/api/v1/studies/${w.studyId}/members`, params: (w) => ({ studyId: w.studyId }), rule: { kind: 'study', action: 'members.read' }, ok: 200 },
  { name: 'change study member role', method: 'PATCH', handler: studyMember.PATCH as Handler, path: (w) => `/api/v1/studies/${w.studyId}/members/${w.target.id}`, params: (w) => ({ studyId: w.studyId, userId: w.target.id }), body: () => ({ role: 'viewer' }), rule: { kind: 'study', action: 'members.manage' }, ok: 200 },
  { name: 'remove study member', method: 'DELETE', handler: studyMember.DELETE as Handler, path: (w) => `/api/v1/studies/${w.studyId}/members/${w.target.id}`, params: (w) => ({ studyId: w.studyId, userId: w.target.id }), rule: { kind: 'study', action: 'members.manage' }, ok: 204 },
  { name: 'list study invitations', method: 'GET', handler: studyInvitations.GET as Handler, path: (w) => `/api/v1/studies/${w.studyId}/invitations`, params: (w) => ({ studyId: w.studyId }), rule: { kind: 'study', action: 'members.manage' }, ok: 200 },
  { name: 'invite to study', method: 'POST', handler: studyInvitations.POST as Handler, path: (w) => `/api/v1/studies/${w.studyId}/invitations`, params: (w) => ({ studyId: w.studyId }), body: () => ({ email: 'lena@test.example', role: 'consultant' }), rule: { kind: 'study', action: 'members.manage' }, ok: 201 },
  { name: 'study activity', method: 'GET', handler: activity.GET as Handler, path: (w) => `/api/v1/studies/${w.studyId}/activity`, params: (w) => ({ studyId: w.studyId }), rule: { kind: 'study', action: 'activity.read' }, ok: 200 },
  { name: 'activity as CSV', method: 'GET', handler: activityExport.GET as Handler, path: (w) => `/api/v1/studies/${w.studyId}/activity/export`, params: (w) => ({ studyId: w.studyId }), rule: { kind: 'study', action: 'activity.read' }, ok: 200 },
  { name: 'read my notification settings', method: 'GET', handler: notificationSettings.GET as Handler, path: () => '/api/v1/me/notification-settings', params: () => ({}), rule: { kind: 'signed-in' }, ok: 200 },
  { name: 'change my notification settings', method: 'PUT', handler: notificationSettings.PUT as Handler, path: () => '/api/v1/me/notification-settings', params: () => ({}), body: () => ({ reply: 'none' }), rule: { kind: 'signed-in' }, ok: 200 },
  { name: 'one-click unsubscribe (the token is the credential)', method: 'POST', handler: unsubscribeRoute.POST as Handler, path: (w) => `/api/v1/unsubscribe/${unsubscribeToken(w.byRole.viewer.id, 'reply')}`, params: (w) => ({ token: unsubscribeToken(w.byRole.viewer.id, 'reply') }), rule: { kind: 'public' }, ok: 200 },
  { name: 'read design', method: 'GET', handler: design.GET as Handler, path: (w) => `/api/v1/studies/${w.studyId}/design`, params: (w) => ({ studyId: w.studyId }), rule: { kind: 'study', action: 'study.read' }, ok: 200 },
  { name: 'save design', method: 'PUT', handler: design.PUT as Handler, path: (w) => `/api/v1/studies/${w.studyId}/design`, params: (w) => ({ studyId: w.studyId }), body: () => ({ baseRevision: 1, design: { outcome: { name: 'Reading score' } } }), rule: { kind: 'study', action: 'design.edit' }, ok: 200 },
  { name: 'run checks', method: 'POST', handler: checks.POST as Handler, path: (w) => `/api/v1/studies/${w.studyId}/checks`, params: (w) => ({ studyId: w.studyId }), body: () => ({}), rule: { kind: 'study', action: 'study.read' }, ok: 200 },
  { name: 'list finding notes', method: 'GET', handler: findingNotes.GET as Handler, path: (w) => `/api/v1/studies/${w.studyId}/finding-notes`, params: (w) => ({ studyId: w.studyId }), rule: { kind: 'study', action: 'study.read' }, ok: 200 },
  { name: 'mark finding addressed', method: 'POST', handler: findingNotes.POST as Handler, path: (w) => `/api/v1/studies/${w.studyId}/finding-notes`, params: (w) => ({ studyId: w.studyId }), body: () => ({ ruleId: 'unit-of-analysis', key: 'classroom', status: 'addressed', reason: 'Analysed with a random intercept per classroom.' }), rule: { kind: 'study', action: 'finding.address' }, ok: 201 },
  { name: 'calculate', method: 'POST', handler: calculations.POST as Handler, path: () => '/api/v1/calculations', params: () => ({}), body: () => ({ kind: 'two-group-means', delta: 3, sd: 10, power: 0.8 }), rule: { kind: 'public' }, ok: 200 },
  { name: 'list plan results', method: 'GET', handler: plans.GET as Handler, path: (w) => `/api/v1/studies/${w.studyId}/plans`, params: (w) => ({ studyId: w.studyId }), rule: { kind: 'study', action: 'study.read' }, ok: 200 },
  { name: 'save plan result', method: 'POST', handler: plans.POST as Handler, path: (w) => `/api/v1/studies/${w.studyId}/plans`, params: (w) => ({ studyId: w.studyId }), body: () => ({ request: { kind: 'two-group-means', delta: 5, sd: 10, power: 0.8 } }), rule: { kind: 'study', action: 'calculation.save' }, ok: 201 },
  { name: 'start stress test on a study', method: 'POST', handler: simulations.POST as Handler, path: () => '/api/v1/simulations', params: () => ({}), body: (w) => ({ studyId: w.studyId, spec: SMALL_SPEC }), rule: { kind: 'study', action: 'simulation.run' }, ok: 202 },
  { name: 'start stress test from a specification', method: 'POST', handler: simulations.POST as Handler, path: () => '/api/v1/simulations', params: () => ({}), body: () => ({ spec: SMALL_SPEC }), rule: { kind: 'signed-in' }, ok: 202 },
  { name: 'read stress test', method: 'GET', handler: simulation.GET as Handler, path: () => '/api/v1/simulations/x', params: (_w, e) => ({ simulationId: e.simulationId }), rule: { kind: 'study', action: 'study.read' }, ok: 200 },
  { name: 'cancel stress test', method: 'DELETE', handler: simulation.DELETE as Handler, path: () => '/api/v1/simulations/x', params: (_w, e) => ({ simulationId: e.simulationId }), rule: { kind: 'study', action: 'simulation.run' }, ok: 200 },
  { name: 'stress-test specification from the design', method: 'GET', handler: simulationSpec.GET as Handler, path: (w) => `/api/v1/studies/${w.studyId}/simulations/spec`, params: (w) => ({ studyId: w.studyId }), rule: { kind: 'study', action: 'study.read' }, ok: 200 },
  { name: 'list stress tests of a study', method: 'GET', handler: studySimulations.GET as Handler, path: (w) => `/api/v1/studies/${w.studyId}/simulations`, params: (w) => ({ studyId: w.studyId }), rule: { kind: 'study', action: 'study.read' }, ok: 200 },
  { name: 'list threads', method: 'GET', handler: threads.GET as Handler, path: (w) => `/api/v1/studies/${w.studyId}/threads?state=open`, params: (w) => ({ studyId: w.studyId }), rule: { kind: 'study', action: 'study.read' }, ok: 200 },
  { name: 'start a thread', method: 'POST', handler: threads.POST as Handler, path: (w) => `/api/v1/studies/${w.studyId}/threads`, params: (w) => ({ studyId: w.studyId }), body: () => ({ anchor: { kind: 'section', part: 'outcome' }, body: 'Which outcome is primary?' }), rule: { kind: 'study', action: 'comment.create' }, ok: 201 },
  { name: 'read a thread', method: 'GET', handler: thread.GET as Handler, path: (w) => `/api/v1/studies/${w.studyId}/threads/x`, params: (w, e) => ({ studyId: w.studyId, threadId: e.threadId }), rule: { kind: 'study', action: 'study.read' }, ok: 200 },
  { name: 'reply in a thread', method: 'POST', handler: threadReplies.POST as Handler, path: (w) => `/api/v1/studies/${w.studyId}/threads/x/replies`, params: (w, e) => ({ studyId: w.studyId, threadId: e.threadId }), body: () => ({ body: 'Agreed.' }), rule: { kind: 'study', action: 'comment.create' }, ok: 201 },
  { name: 'resolve a thread started by another', method: 'POST', handler: threadResolve.POST as Handler, path: (w) => `/api/v1/studies/${w.studyId}/threads/x/resolve`, params: (w, e) => ({ studyId: w.studyId, threadId: e.threadId }), body: () => ({}), rule: { kind: 'study', action: 'comment.resolve' }, ok: 200 },
  { name: 'reopen a thread started by another', method: 'POST', handler: threadReopen.POST as Handler, path: (w) => `/api/v1/studies/${w.studyId}/threads/x/reopen`, params: (w, e) => ({ studyId: w.studyId, threadId: e.resolvedThreadId }), rule: { kind: 'study', action: 'comment.resolve' }, ok: 200 },
  { name: 'list suggestions', method: 'GET', handler: suggestions.GET as Handler, path: (w) => `/api/v1/studies/${w.studyId}/suggestions`, params: (w) => ({ studyId: w.studyId }), rule: { kind: 'study', action: 'study.read' }, ok: 200 },
  { name: 'suggest a change', method: 'POST', handler: suggestions.POST as Handler, path: (w) => `/api/v1/studies/${w.studyId}/suggestions`, params: (w) => ({ studyId: w.studyId }), body: () => ({ path: 'outcome.unit', value: 'points', reason: 'Name the unit of the score.' }), rule: { kind: 'study', action: 'suggestion.create' }, ok: 201 },
  { name: 'accept a suggestion', method: 'POST', handler: suggestionAccept.POST as Handler, path: (w) => `/api/v1/studies/${w.studyId}/suggestions/x/accept`, params: (w, e) => ({ studyId: w.studyId, suggestionId: e.suggestionId }), body: () => ({}), rule: { kind: 'study', action: 'suggestion.decide' }, ok: 200 },
  { name: 'decline a suggestion', method: 'POST', handler: suggestionDecline.POST as Handler, path: (w) => `/api/v1/studies/${w.studyId}/suggestions/x/decline`, params: (w, e) => ({ studyId: w.studyId, suggestionId: e.suggestionId }), body: () => ({ reason: 'Already settled.' }), rule: { kind: 'study', action: 'suggestion.decide' }, ok: 200 },
  { name: 'list versions', method: 'GET', handler: versions.GET as Handler, path: (w) => `/api/v1/studies/${w.studyId}/versions`, params: (w) => ({ studyId: w.studyId }), rule: { kind: 'study', action: 'study.read' }, ok: 200 },
  { name: 'read a version', method: 'GET', handler: version.GET as Handler, path: (w) => `/api/v1/studies/${w.studyId}/versions/1`, params: (w) => ({ studyId: w.studyId, version: '1' }), rule: { kind: 'study', action: 'study.read' }, ok: 200 },
  { name: 'name a version', method: 'PATCH', handler: version.PATCH as Handler, path: (w) => `/api/v1/studies/${w.studyId}/versions/1`, params: (w) => ({ studyId: w.studyId, version: '1' }), body: () => ({ name: 'Sent to the funder' }), rule: { kind: 'study', action: 'version.name' }, ok: 200 },
  { name: 'restore a version', method: 'POST', handler: versionRestore.POST as Handler, path: (w) => `/api/v1/studies/${w.studyId}/versions/1/restore`, params: (w) => ({ studyId: w.studyId, version: '1' }), rule: { kind: 'study', action: 'design.edit' }, ok: 201 },
  { name: 'compare versions', method: 'GET', handler: versionCompare.GET as Handler, path: (w) => `/api/v1/studies/${w.studyId}/versions/compare?from=1&to=1`, params: (w) => ({ studyId: w.studyId }), rule: { kind: 'study', action: 'study.read' }, ok: 200 },
  { name: 'close my version', method: 'POST', handler: versionClose.POST as Handler, path: (w) => `/api/v1/studies/${w.studyId}/versions/close`, params: (w) => ({ studyId: w.studyId }), rule: { kind: 'study', action: 'design.edit' }, ok: 200 },
  { name: 'list sign-offs', method: 'GET', handler: signoffs.GET as Handler, path: (w) => `/api/v1/studies/${w.studyId}/signoffs`, params: (w) => ({ studyId: w.studyId }), rule: { kind: 'study', action: 'study.read' }, ok: 200 },
  { name: 'sign off a version', method: 'POST', handler: signoffs.POST as Handler, path: (w) => `/api/v1/studies/${w.studyId}/signoffs`, params: (w) => ({ studyId: w.studyId }), body: () => ({ version: 1, name: 'Sent to the funder', statement: 'Reviewed the design and the Plan.' }), rule: { kind: 'study', action: 'study.signoff' }, ok: 201 },
  { name: 'withdraw a sign-off', method: 'POST', handler: signoffWithdraw.POST as Handler, path: (w) => `/api/v1/studies/${w.studyId}/signoffs/x/withdraw`, params: (w, e) => ({ studyId: w.studyId, signoffId: e.signoffId }), body: () => ({ reason: 'The ICC source was wrong.' }), rule: { kind: 'study', action: 'study.signoff' }, ok: 200 },
  { name: 'revoke invitation', method: 'DELETE', handler: invitation.DELETE as Handler, path: (_w) => '/api/v1/invitations/x', params: (_w, e) => ({ invitationId: e.invitationId }), rule: { kind: 'revoke' }, ok: 204 },
  { name: 'send invitation again', method: 'POST', handler: invitationResend.POST as Handler, path: (_w) => '/api/v1/invitations/x/resend', params: (_w, e) => ({ invitationId: e.invitationId }), rule: { kind: 'revoke' }, ok: 200 },
];

type Principal = 'owner' | 'editor' | 'consultant' | 'writer' | 'viewer' | 'workspace member, not in study' | 'other workspace' | 'anonymous';
const PRINCIPALS: Principal[] = ['owner', 'editor', 'consultant', 'writer', 'viewer', 'workspace member, not in study', 'other workspace', 'anonymous'];

function who(w: World, p: Principal): TestUser | null {
  if (p === 'anonymous') return null;
  if (p === 'other workspace') return w.outsider;
  if (p === 'workspace member, not in study') return w.workspaceOnly;
  return w.byRole[p];
}

function expected(route: RouteCase, p: Principal): number {
  const rule = route.rule;
  if (rule.kind === 'public') return route.ok;
  if (p === 'anonymous') return 401;
  if (rule.kind === 'signed-in') return route.ok;
  if (p === 'other workspace') return 404;
  if (rule.kind === 'workspace') {
    const wsRole = p === 'owner' ? 'admin' : 'member';
    return canWorkspace(wsRole, rule.action) ? route.ok : 403;
  }
  if (p === 'workspace member, not in study') return rule.kind === 'revoke' ? 403 : 404;
  if (rule.kind === 'revoke') return p === 'owner' ? route.ok : 403;
  return canStudy(p, rule.action) ? route.ok : 403;
}

// Starting a stress test starts this process's pg-boss (to queue the chunks); stop it after.
afterAll(() => stopBoss());

describe.each(ROUTES)('$method $name', (route) => {
  it.each(PRINCIPALS)('as %s', async (principal) => {
    const w = await makeWorld();
    const inv = await insertInvitation(db(), {
      workspaceId: w.workspaceId,
      studyId: w.studyId,
      email: 'pending@test.example',
      workspaceRole: 'member',
      studyRole: 'viewer',
      tokenHash: `hash-${Math.random()}`,
      invitedBy: w.byRole.owner.id,
      expiresAt: new Date(Date.now() + 86_400_000),
    });
    const sim = await insertSimulation(db(), {
      studyId: w.studyId,
      revisionNumber: 1,
      createdBy: w.byRole.owner.id,
      spec: SMALL_SPEC,
      replicatesTotal: 10,
      chunkSize: 10,
      chunkCount: 1,
    });
    const owner = { id: w.byRole.owner.id, email: w.byRole.owner.email, name: null };
    const { id: threadId } = await createThread(owner, w.studyId, { anchor: { kind: 'section', part: 'assumptions' }, body: 'Where does the ICC come from?' });
    const { id: resolvedThreadId } = await createThread(owner, w.studyId, { anchor: { kind: 'section', part: 'analysis' }, body: 'Settled.' });
    await resolveThread(owner, w.studyId, resolvedThreadId);
    const { id: suggestionId } = await createSuggestion(owner, w.studyId, { path: 'outcome.name', value: 'Reading score', reason: 'Name the primary outcome.' });
    // A sign-off to withdraw (only there: a signed-off version keeps its name).
    const signoffId = route.name !== 'withdraw a sign-off' ? '00000000-0000-4000-8000-000000000000' : await insertSignoff(db(), { studyId: w.studyId, versionNumber: 1, revisionNumber: 1, signerId: w.byRole.owner.id, statement: 'Reviewed.', conditions: null, at: new Date() });
    const user = who(w, principal);
    const res = await route.handler(
      request(route.method, route.path(w), { user, body: route.body?.(w) }),
      ctx(route.params(w, { invitationId: inv.id, simulationId: sim.id, threadId, resolvedThreadId, suggestionId, signoffId })),
    );
    const want = expected(route, principal);
    const body = res.status === 204 ? null : (res.headers.get('content-type') ?? '').includes('json') ? await res.json() : await res.text();
    expect(res.status, `${route.method} ${route.name} as ${principal}: ${JSON.stringify(body)}`).toBe(want);
    if (want >= 400) {
      expect(body.error.code).toBe({ 401: 'unauthorized', 403: 'forbidden', 404: 'not_found' }[want as 401 | 403 | 404]);
      expect(typeof body.error.message).toBe('string');
    }
  });
});

describe('the 404 for another workspace does not depend on whether the study exists', () => {
  it('answers the same for a real study and a made-up id', async () => {
    const w = await makeWorld();
    const real = await study.GET(request('GET', `/api/v1/studies/${w.studyId}`, { user: w.outsider }), ctx({ studyId: w.studyId }));
    const fake = '00000000-0000-4000-8000-000000000000';
    const made = await study.GET(request('GET', `/api/v1/studies/${fake}`, { user: w.outsider }), ctx({ studyId: fake }));
    expect(real.status).toBe(404);
    expect(made.status).toBe(404);
    expect(await real.json()).toEqual(await made.json());
  });
});
