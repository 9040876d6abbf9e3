/**
 * Saving Plan tab results: the server recomputes the result from the request and keeps it with
 * the design revision it was computed from; a role without 'calculation.save' is refused;
 * invalid requests get field errors; a refused save writes nothing (no result, no activity).
 */
import { describe, expect, it } from 'vitest';
import { db } from '@/lib/db';
import * as plans from '@/app/api/v1/studies/[studyId]/plans/route';
import * as design from '@/app/api/v1/studies/[studyId]/design/route';
import { CLASSROOM_DESIGN } from '@/db/demo/designs';
import { calculate } from '@/lib/stats/calculations';
import { calculationSchema } from '@/lib/stats/calculations/request';
import { ctx, makeWorld, request, type TestUser } from '../support/fixtures';

type World = Awaited<ReturnType<typeof makeWorld>>;

const CLUSTER_REQUEST = { kind: 'cluster-means', delta: 3, sd: 10, icc: 0.15, clusterSize: 25, cv: 0.25, dropout: 0.08, alpha: 0.05, power: 0.8 } as const;

async function post(w: World, user: TestUser, body: unknown) {
  const res = await plans.POST(request('POST', `/api/v1/studies/${w.studyId}/plans`, { user, body }), ctx({ studyId: w.studyId }));
  return { status: res.status, body: await res.json() };
}

async function list(w: World, user: TestUser) {
  const res = await plans.GET(request('GET', `/api/v1/studies/${w.studyId}/plans`, { user }), ctx({ studyId: w.studyId }));
  return { status: res.status, body: await res.json() };
}

async function counts(w: World) {
  const results = await db().selectFrom('plan_results').select(db().fn.countAll<string>().as('n')).where('study_id', '=', w.studyId).executeTakeFirstOrThrow();
  const activity = await db().selectFrom('activity_log').select(db().fn.countAll<string>().as('n')).where('study_id', '=', w.studyId).where('action', '=', 'plan.saved').executeTakeFirstOrThrow();
  return { results: Number(results.n), activity: Number(activity.n) };
}

describe('saving a result', () => {
  it('stores the server’s own result with the current revision, logs it, and lists it for a viewer', async () => {
    const w = await makeWorld();
    const r = await post(w, w.byRole.owner, { request: CLUSTER_REQUEST, revision: 1, note: 'First look' });
    expect(r.status, JSON.stringify(r.body)).toBe(201);
    const expected = calculate(calculationSchema.parse(CLUSTER_REQUEST));
    expect(r.body).toMatchObject({ revision: 1, kind: 'cluster-means', note: 'First look', createdBy: w.byRole.owner.id });
    expect(r.body.output.solvedFor).toBe('clustersPerArm');
    expect(r.body.output.result.clustersPerArm).toBe(expected.result.clustersPerArm);
    expect(r.body.output).toEqual(JSON.parse(JSON.stringify(expected)));
    expect(await counts(w)).toEqual({ results: 1, activity: 1 });

    const l = await list(w, w.byRole.viewer);
    expect(l.status).toBe(200);
    expect(l.body.items).toHaveLength(1);
    expect(l.body.items[0]).toMatchObject({ id: r.body.id, revision: 1, createdByName: expect.any(String) });
    expect(l.body.items[0].output.result.clustersPerArm).toBe(expected.result.clustersPerArm);
  });

  it('keeps each result with the revision it was computed from, newest first', async () => {
    const w = await makeWorld();
    await post(w, w.byRole.owner, { request: CLUSTER_REQUEST });
    const saved = await design.PUT(request('PUT', `/api/v1/studies/${w.studyId}/design`, { user: w.byRole.owner, body: { baseRevision: 1, design: CLASSROOM_DESIGN } }), ctx({ studyId: w.studyId }));
    expect(saved.status).toBe(200);
    const second = await post(w, w.byRole.editor, { request: { ...CLUSTER_REQUEST, icc: 0.05 }, revision: 2 });
    expect(second.status).toBe(201);
    const l = await list(w, w.byRole.consultant);
    expect(l.body.items.map((x: { revision: number }) => x.revision)).toEqual([2, 1]);
    expect(l.body.items[0].request.icc).toBe(0.05);
  });

  it('ignores numbers sent by the browser', async () => {
    const w = await makeWorld();
    const r = await post(w, w.byRole.owner, { request: CLUSTER_REQUEST, output: { result: { clustersPerArm: 2 } } });
    expect(r.status).toBe(201);
    const row = await db().selectFrom('plan_results').select('output').where('study_id', '=', w.studyId).executeTakeFirstOrThrow();
    expect((row.output as { result: { clustersPerArm: number } }).result.clustersPerArm).toBe(calculate(calculationSchema.parse(CLUSTER_REQUEST)).result.clustersPerArm);
    expect((row.output as { result: { clustersPerArm: number } }).result.clustersPerArm).not.toBe(2);
  });
});

describe('refused saves write nothing', () => {
  it.each(['viewer', 'writer', 'consultant'] as const)('a %s gets 403', async (role) => {
    const w = await makeWorld();
    const r = await post(w, w.byRole[role], { request: CLUSTER_REQUEST });
    expect(r.status).toBe(403);
    expect(r.body.error.code).toBe('forbidden');
    expect(await counts(w)).toEqual({ results: 0, activity: 0 });
  });

  const invalid: [string, unknown, string][] = [
    ['a negative SD', { request: { ...CLUSTER_REQUEST, sd: -1 } }, 'request.sd'],
    ['an unknown kind', { request: { kind: 'anova', n: 3 } }, 'request.kind'],
    ['an ICC above 1', { request: { ...CLUSTER_REQUEST, icc: 1.5 } }, 'request.icc'],
    ['a note with control characters', { request: CLUSTER_REQUEST, note: 'a\u0007b' }, 'note'],
    ['two unknowns (no effect, no size)', { request: { kind: 'two-group-means', sd: 10, power: 0.8 } }, 'request.'],
  ];
  it.each(invalid)('%s: 400 with the field', async (_label, body, field) => {
    const w = await makeWorld();
    const r = await post(w, w.byRole.owner, body);
    expect(r.status, JSON.stringify(r.body)).toBe(400);
    expect(r.body.error.code).toBe('bad_request');
    const keys = Object.keys(r.body.error.fields ?? {});
    expect(keys.some((k) => k.startsWith(field)), `fields ${keys.join(', ')} should include ${field}`).toBe(true);
    expect(await counts(w)).toEqual({ results: 0, activity: 0 });
  });

  it('a result computed from an older revision gets 409', async () => {
    const w = await makeWorld();
    await design.PUT(request('PUT', `/api/v1/studies/${w.studyId}/design`, { user: w.byRole.owner, body: { baseRevision: 1, design: CLASSROOM_DESIGN } }), ctx({ studyId: w.studyId }));
    const r = await post(w, w.byRole.owner, { request: CLUSTER_REQUEST, revision: 1 });
    expect(r.status).toBe(409);
    expect(r.body.error.message).toMatch(/revision 2/);
    expect(await counts(w)).toEqual({ results: 0, activity: 0 });
  });
});
