/**
 * The whole permission matrix, walked through the real route handlers against PostgreSQL:
 * every /api/v1 route × every study role, a workspace member outside the study, a user of
 * another workspace and an anonymous caller. The expected answer comes from
 * lib/auth/permissions.ts, so this test fails if a handler forgets its check or checks the
 * wrong right.
 */
import { describe, expect, it } from 'vitest';
import { canStudy, canWorkspace, type StudyAction, type WorkspaceAction } from '@/lib/auth/permissions';
import { insertInvitation } from '@/db/repositories/invitations';
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
import * as invitation from '@/app/api/v1/invitations/[invitationId]/route';
import * as design from '@/app/api/v1/studies/[studyId]/design/route';
import * as checks from '@/app/api/v1/studies/[studyId]/checks/route';
import * as findingNotes from '@/app/api/v1/studies/[studyId]/finding-notes/route';

type Handler = (req: Request, c: { params: Promise<Record<string, string>> }) => Promise<Response>;

type Rule =
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
}

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
  { name: 'read design', method: 'GET', handler: design.GET as Handler, path: (w) => `/api/v1/studies/${w.studyId}/design`, params: (w) => ({ studyId: w.studyId }), rule: { kind: 'study', action: 'study.read' }, ok: 200 },
  { name: 'save design', method: 'PUT', handler: design.PUT as Handler, path: (w) => `/api/v1/studies/${w.studyId}/design`, params: (w) => ({ studyId: w.studyId }), body: () => ({ baseRevision: 1, design: { outcome: { name: 'Reading score' } } }), rule: { kind: 'study', action: 'design.edit' }, ok: 200 },
  { name: 'run checks', method: 'POST', handler: checks.POST as Handler, path: (w) => `/api/v1/studies/${w.studyId}/checks`, params: (w) => ({ studyId: w.studyId }), body: () => ({}), rule: { kind: 'study', action: 'study.read' }, ok: 200 },
  { name: 'list finding notes', method: 'GET', handler: findingNotes.GET as Handler, path: (w) => `/api/v1/studies/${w.studyId}/finding-notes`, params: (w) => ({ studyId: w.studyId }), rule: { kind: 'study', action: 'study.read' }, ok: 200 },
  { name: 'mark finding addressed', method: 'POST', handler: findingNotes.POST as Handler, path: (w) => `/api/v1/studies/${w.studyId}/finding-notes`, params: (w) => ({ studyId: w.studyId }), body: () => ({ ruleId: 'unit-of-analysis', key: 'classroom', status: 'addressed', reason: 'Analysed with a random intercept per classroom.' }), rule: { kind: 'study', action: 'finding.address' }, ok: 201 },
  { name: 'revoke invitation', method: 'DELETE', handler: invitation.DELETE as Handler, path: (_w) => '/api/v1/invitations/x', params: (_w, e) => ({ invitationId: e.invitationId }), rule: { kind: 'revoke' }, ok: 204 },
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
  if (p === 'anonymous') return 401;
  const rule = route.rule;
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
    const user = who(w, principal);
    const res = await route.handler(
      request(route.method, route.path(w), { user, body: route.body?.(w) }),
      ctx(route.params(w, { invitationId: inv.id })),
    );
    const want = expected(route, principal);
    const body = res.status === 204 ? null : await res.json();
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
