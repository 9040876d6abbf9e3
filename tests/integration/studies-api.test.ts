/** The studies API beyond permissions: listing, search, sort, paging, archive, validation, conflicts. */
import { describe, expect, it } from 'vitest';
import { db } from '@/lib/db';
import * as studies from '@/app/api/v1/studies/route';
import * as study from '@/app/api/v1/studies/[studyId]/route';
import * as archive from '@/app/api/v1/studies/[studyId]/archive/route';
import * as studyMember from '@/app/api/v1/studies/[studyId]/members/[userId]/route';
import * as wsMember from '@/app/api/v1/workspaces/[workspaceId]/members/[userId]/route';
import * as health from '@/app/api/health/route';
import { recordResponse } from '../support/api-contract';
import { ctx, makeWorld, request } from '../support/fixtures';

async function create(w: Awaited<ReturnType<typeof makeWorld>>, title: string, description = '') {
  const res = await studies.POST(request('POST', '/api/v1/studies', { user: w.byRole.owner, body: { workspaceId: w.workspaceId, title, description } }), ctx({}));
  expect(res.status).toBe(201);
  return res.json();
}

async function list(w: Awaited<ReturnType<typeof makeWorld>>, query: Record<string, string>) {
  const qs = new URLSearchParams({ workspaceId: w.workspaceId, ...query });
  const res = await studies.GET(request('GET', `/api/v1/studies?${qs}`, { user: w.byRole.owner }), ctx({}));
  expect(res.status).toBe(200);
  return res.json();
}

describe('creating a study', () => {
  it('makes the creator owner and writes revision 1 and an activity entry', async () => {
    const w = await makeWorld();
    const s = await create(w, 'Greenhouse trial of two substrates');
    expect(s).toMatchObject({ role: 'owner', status: 'draft', currentRevision: 1 });
    const rev = await db().selectFrom('study_revisions').selectAll().where('study_id', '=', s.id).execute();
    expect(rev).toHaveLength(1);
    const act = await db().selectFrom('activity_log').select('action').where('study_id', '=', s.id).execute();
    expect(act.map((a) => a.action)).toEqual(['study.created']);
  });

  it('refuses a blank title, unknown fields are ignored, and nothing is saved', async () => {
    const w = await makeWorld();
    const before = await db().selectFrom('studies').selectAll().execute();
    const res = await studies.POST(request('POST', '/api/v1/studies', { user: w.byRole.owner, body: { workspaceId: w.workspaceId, title: '   ' } }), ctx({}));
    expect(res.status).toBe(400);
    expect((await res.json()).error.fields.title).toEqual(['Title is required.']);
    expect(await db().selectFrom('studies').selectAll().execute()).toHaveLength(before.length);
  });

  it('keeps markup as plain text', async () => {
    const w = await makeWorld();
    const s = await create(w, '<img src=x onerror=alert(1)>');
    expect(s.title).toBe('<img src=x onerror=alert(1)>');
  });
});

describe('listing', () => {
  it('searches, sorts and pages in the database', async () => {
    const w = await makeWorld();
    for (const t of ['Sleep timing study', 'Greenhouse trial', 'Another greenhouse run']) await create(w, t);
    const found = await list(w, { q: 'greenhouse', sort: 'title', dir: 'asc' });
    expect(found.items.map((s: { title: string }) => s.title)).toEqual(['Another greenhouse run', 'Greenhouse trial']);
    expect(found.total).toBe(2);

    const page2 = await list(w, { sort: 'title', dir: 'asc', pageSize: '2', page: '2' });
    expect(page2.total).toBe(4);
    expect(page2.items.map((s: { title: string }) => s.title)).toEqual(['Reading-support programme', 'Sleep timing study']);
  });

  it('treats % and _ in a search as plain characters', async () => {
    const w = await makeWorld();
    await create(w, '100% of trays');
    expect((await list(w, { q: '%' })).items.map((s: { title: string }) => s.title)).toEqual(['100% of trays']);
    expect((await list(w, { q: '_' })).total).toBe(0);
  });

  it('hides archived studies from the current list and shows them under archived', async () => {
    const w = await makeWorld();
    const res = await archive.POST(request('POST', `/api/v1/studies/${w.studyId}/archive`, { user: w.byRole.owner }), ctx({ studyId: w.studyId }));
    expect((await res.json()).status).toBe('archived');
    expect((await list(w, {})).total).toBe(0);
    expect((await list(w, { status: 'archived' })).total).toBe(1);
    const edit = await study.PATCH(request('PATCH', `/api/v1/studies/${w.studyId}`, { user: w.byRole.owner, body: { title: 'x' } }), ctx({ studyId: w.studyId }));
    expect(edit.status).toBe(409);
  });

  it('answers a bad query with field errors', async () => {
    const w = await makeWorld();
    const res = await studies.GET(request('GET', `/api/v1/studies?workspaceId=${w.workspaceId}&sort=secret&pageSize=0`, { user: w.byRole.owner }), ctx({}));
    expect(res.status).toBe(400);
    expect(Object.keys((await res.json()).error.fields).sort()).toEqual(['pageSize', 'sort']);
  });
});

describe('membership rules', () => {
  it('never removes or demotes the study owner', async () => {
    const w = await makeWorld();
    const owner = w.byRole.owner;
    const del = await studyMember.DELETE(request('DELETE', `/api/v1/studies/${w.studyId}/members/${owner.id}`, { user: owner }), ctx({ studyId: w.studyId, userId: owner.id }));
    expect(del.status).toBe(409);
    const patch = await studyMember.PATCH(request('PATCH', `/api/v1/studies/${w.studyId}/members/${owner.id}`, { user: owner, body: { role: 'viewer' } }), ctx({ studyId: w.studyId, userId: owner.id }));
    expect(patch.status).toBe(409);
  });

  it('keeps at least one workspace admin, and does not remove people who own studies', async () => {
    const w = await makeWorld();
    const demote = await wsMember.PATCH(request('PATCH', `/api/v1/workspaces/${w.workspaceId}/members/${w.byRole.owner.id}`, { user: w.byRole.owner, body: { role: 'member' } }), ctx({ workspaceId: w.workspaceId, userId: w.byRole.owner.id }));
    expect(demote.status).toBe(409);
    await wsMember.PATCH(request('PATCH', `/api/v1/workspaces/${w.workspaceId}/members/${w.byRole.editor.id}`, { user: w.byRole.owner, body: { role: 'admin' } }), ctx({ workspaceId: w.workspaceId, userId: w.byRole.editor.id }));
    const removeOwner = await wsMember.DELETE(request('DELETE', `/api/v1/workspaces/${w.workspaceId}/members/${w.byRole.owner.id}`, { user: w.byRole.editor }), ctx({ workspaceId: w.workspaceId, userId: w.byRole.owner.id }));
    expect(removeOwner.status).toBe(409);
    expect((await removeOwner.json()).error.message).toMatch(/owns studies/);
  });

  it('removing someone from the workspace also ends their study roles there', async () => {
    const w = await makeWorld();
    const res = await wsMember.DELETE(request('DELETE', `/api/v1/workspaces/${w.workspaceId}/members/${w.byRole.viewer.id}`, { user: w.byRole.owner }), ctx({ workspaceId: w.workspaceId, userId: w.byRole.viewer.id }));
    expect(res.status).toBe(204);
    const read = await study.GET(request('GET', `/api/v1/studies/${w.studyId}`, { user: w.byRole.viewer }), ctx({ studyId: w.studyId }));
    expect(read.status).toBe(404);
  });
});

describe('health', () => {
  it('reports the database as reachable', async () => {
    const res = await health.GET();
    // Not built with api(), so the contract check is called here (tests/support/api-contract.ts).
    await recordResponse(new Request('http://localhost/api/health'), res);
    expect(res.status).toBe(200);
    expect(await res.json()).toEqual({ status: 'ok', database: 'ok' });
  });
});
