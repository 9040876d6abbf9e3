/**
 * The check that every 2xx response of the suite matches the API document
 * (tests/support/api-contract.ts) cannot pass silently: a body that lacks a required field or
 * carries an undeclared one, a status or route the document does not declare, and a body where
 * the document declares none are all caught, and every handler made with `api()` is checked.
 */
import { describe, expect, it } from 'vitest';
import { api } from '@/lib/api/handler';
import { checkResponse, takeProblems } from '../support/api-contract';
import { BASE, ctx, makeWorld, request } from '../support/fixtures';
import * as study from '@/app/api/v1/studies/[studyId]/route';
import * as studyMember from '@/app/api/v1/studies/[studyId]/members/[userId]/route';

const STUDY_ID = '6f1c2a7e-3b7d-4c55-9a0e-2f8d1e4b5c6a';
const url = (path: string) => `${BASE}${path}`;
const studyBody = {
  id: STUDY_ID,
  workspaceId: '0b6e8f3a-94c1-4d2e-8a5b-7c3d9e1f2a4b',
  title: 'Reading-support programme',
  description: '',
  status: 'draft',
  currentRevision: 1,
  role: 'owner',
  createdAt: '2026-12-03T12:00:00.000Z',
  updatedAt: '2026-12-03T12:00:00.000Z',
  archivedAt: null,
};
const check = (body: unknown, { method = 'GET', path = `/api/v1/studies/${STUDY_ID}`, status = 200 } = {}) =>
  checkResponse(method, url(path), status, body === undefined ? '' : JSON.stringify(body));

describe('checking responses against the API document', () => {
  it('accepts a body that the document describes, and names the route template it matched', () => {
    expect(check(studyBody)).toEqual({ key: `GET /api/v1/studies/{studyId} 200`, problems: [] });
  });

  it('catches a body that lacks a required field', () => {
    const { title: _title, ...withoutTitle } = studyBody;
    const { problems } = check(withoutTitle);
    expect(problems).toHaveLength(1);
    expect(problems[0]).toMatch(/^GET \/api\/v1\/studies\/\S+ → 200: title: /);
  });

  it('catches a field of the wrong type, and one the document does not declare', () => {
    expect(check({ ...studyBody, currentRevision: '1' }).problems[0]).toMatch(/currentRevision/);
    expect(check({ ...studyBody, secret: 'x' }).problems).toEqual([`GET /api/v1/studies/${STUDY_ID} → 200: secret is sent but not declared in the document`]);
    expect(check({ items: [{ ...studyBody, extra: 1 }], total: 1, page: 1, pageSize: 20 }, { path: '/api/v1/studies' }).problems[0]).toMatch(/items\[0\]\.extra is sent but not declared/);
  });

  it('fails a status, a route or a method that the document does not declare', () => {
    expect(check(studyBody, { status: 201 }).problems[0]).toMatch(/does not declare status 201 for GET \/api\/v1\/studies\/\{studyId\}/);
    expect(check(studyBody, { path: '/api/v1/nowhere' }).problems[0]).toMatch(/no route of the API document matches/);
    expect(check(studyBody, { method: 'PUT' }).problems[0]).toMatch(/no route of the API document matches/);
  });

  it('fails a body sent with a status that declares none', () => {
    const path = `/api/v1/studies/${STUDY_ID}/members/${STUDY_ID}`;
    expect(check(undefined, { method: 'DELETE', path, status: 204 }).problems).toEqual([]);
    expect(check({ ok: true }, { method: 'DELETE', path, status: 204 }).problems[0]).toMatch(/declares no body/);
  });

  it('prefers a literal path segment over a parameter', () => {
    expect(check({ workspaceId: STUDY_ID, studyId: null }, { method: 'POST', path: '/api/v1/invitations/accept' }).key).toBe('POST /api/v1/invitations/accept 200');
  });

  it('checks every handler made with api(): a drifted body is recorded against the test', async () => {
    const drifted = api(async () => ({ ...studyBody, title: undefined, role: 'admin' }), { public: true });
    const res = await drifted(request('GET', `/api/v1/studies/${STUDY_ID}`), ctx({}));
    expect(res.status).toBe(200);
    const problems = takeProblems(); // taken here, so that this test's own check passes
    expect(problems.map((p) => p.replace(/^.*→ 200: /, ''))).toEqual([expect.stringMatching(/^title: /), expect.stringMatching(/^role: /)]);
  });

  it('checks the real routes as the suite calls them', async () => {
    const w = await makeWorld();
    const res = await study.GET(request('GET', `/api/v1/studies/${w.studyId}`, { user: w.byRole.viewer }), ctx({ studyId: w.studyId }));
    expect(res.status).toBe(200);
    const removed = await studyMember.DELETE(
      request('DELETE', `/api/v1/studies/${w.studyId}/members/${w.target.id}`, { user: w.byRole.owner }),
      ctx({ studyId: w.studyId, userId: w.target.id }),
    );
    expect(removed.status).toBe(204);
    expect(takeProblems()).toEqual([]);
  });
});
