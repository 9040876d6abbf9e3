/**
 * PATCH changes only what it names: `PATCH /api/v1/studies/{id}` with `{}` used to empty the
 * description (the update schema inherited the create schema's default of ''). A field left out is
 * left alone; `description: null` clears the description; the title cannot be cleared.
 */
import { describe, expect, it } from 'vitest';
import { db } from '@/lib/db';
import * as studies from '@/app/api/v1/studies/route';
import * as study from '@/app/api/v1/studies/[studyId]/route';
import { ctx, makeWorld, request, type World } from '../support/fixtures';

async function withDescription(w: World) {
  const res = await studies.POST(
    request('POST', '/api/v1/studies', { user: w.byRole.owner, body: { workspaceId: w.workspaceId, title: 'Greenhouse trial', description: 'Trays share light.' } }),
    ctx({}),
  );
  return (await res.json()).id as string;
}

async function patch(w: World, id: string, body: unknown) {
  const res = await study.PATCH(request('PATCH', `/api/v1/studies/${id}`, { user: w.byRole.owner, body }), ctx({ studyId: id }));
  return { status: res.status, body: await res.json() };
}

const stored = (id: string) => db().selectFrom('studies').select(['title', 'description']).where('id', '=', id).executeTakeFirstOrThrow();
const updates = async (id: string) => (await db().selectFrom('activity_log').select('action').where('study_id', '=', id).where('action', '=', 'study.updated').execute()).length;

describe('PATCH /api/v1/studies/{id}', () => {
  it('with {} changes nothing and says what to send', async () => {
    const w = await makeWorld();
    const id = await withDescription(w);
    const r = await patch(w, id, {});
    expect(r.status).toBe(400);
    expect(r.body.error.message).toMatch(/Send at least one of title or description/);
    expect(await stored(id)).toEqual({ title: 'Greenhouse trial', description: 'Trays share light.' });
    expect(await updates(id)).toBe(0);
  });

  it('with only unknown fields changes nothing either', async () => {
    const w = await makeWorld();
    const id = await withDescription(w);
    expect((await patch(w, id, { descripton: 'typo' })).status).toBe(400);
    expect(await stored(id)).toEqual({ title: 'Greenhouse trial', description: 'Trays share light.' });
  });

  it('with one field changes that field only', async () => {
    const w = await makeWorld();
    const id = await withDescription(w);
    const r = await patch(w, id, { title: 'Greenhouse trial, second season' });
    expect(r.status).toBe(200);
    expect(r.body).toMatchObject({ title: 'Greenhouse trial, second season', description: 'Trays share light.' });
    expect(await stored(id)).toEqual({ title: 'Greenhouse trial, second season', description: 'Trays share light.' });
    expect((await patch(w, id, { description: 'Trays rotate weekly.' })).status).toBe(200);
    expect(await stored(id)).toEqual({ title: 'Greenhouse trial, second season', description: 'Trays rotate weekly.' });
  });

  it('with null clears the description, and refuses to clear the title', async () => {
    const w = await makeWorld();
    const id = await withDescription(w);
    const refused = await patch(w, id, { title: null });
    expect(refused.status).toBe(400);
    expect(Object.keys(refused.body.error.fields)).toEqual(['title']);
    expect((await patch(w, id, { description: null })).status).toBe(200);
    expect(await stored(id)).toEqual({ title: 'Greenhouse trial', description: '' });
  });
});
