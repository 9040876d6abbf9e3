/**
 * The design API: revisions are appended, never overwritten; simultaneous edits are merged
 * when they touch different parts and refused with a clear conflict when they touch the same
 * part; hostile input gets field errors and saves nothing.
 */
import { describe, expect, it } from 'vitest';
import { db } from '@/lib/db';
import * as design from '@/app/api/v1/studies/[studyId]/design/route';
import * as checks from '@/app/api/v1/studies/[studyId]/checks/route';
import * as notes from '@/app/api/v1/studies/[studyId]/finding-notes/route';
import { CLASSROOM_DESIGN } from '@/db/demo/designs';
import { ctx, makeWorld, request, type TestUser } from '../support/fixtures';

type World = Awaited<ReturnType<typeof makeWorld>>;

async function put(w: World, user: TestUser, body: unknown) {
  const res = await design.PUT(request('PUT', `/api/v1/studies/${w.studyId}/design`, { user, body }), ctx({ studyId: w.studyId }));
  return { status: res.status, body: await res.json() };
}

async function revisions(w: World) {
  return db().selectFrom('study_revisions').select(['number', 'design']).where('study_id', '=', w.studyId).orderBy('number').execute();
}

describe('saving the design', () => {
  it('appends a revision with its author and the checks computed from it', async () => {
    const w = await makeWorld();
    const r = await put(w, w.byRole.owner, { baseRevision: 1, design: CLASSROOM_DESIGN });
    expect(r.status).toBe(200);
    expect(r.body).toMatchObject({ revision: 2, merged: false, readable: true });
    const rows = await db().selectFrom('study_revisions').selectAll().where('study_id', '=', w.studyId).orderBy('number').execute();
    expect(rows.map((x) => x.number)).toEqual([1, 2]);
    expect(rows[1]!.author_id).toBe(w.byRole.owner.id);
    const stored = rows[1]!.checks as { findings: { ruleId: string; severity: string }[] };
    expect(stored.findings.some((f) => f.ruleId === 'unit-of-analysis' && f.severity === 'blocker')).toBe(true);

    const got = await design.GET(request('GET', `/api/v1/studies/${w.studyId}/design`, { user: w.byRole.viewer }), ctx({ studyId: w.studyId }));
    const body = await got.json();
    expect(body.revision).toBe(2);
    expect(body.design.structure.levels.map((l: { id: string }) => l.id)).toEqual(['classroom', 'pupil']);
  });

  it('merges two edits of different parts made from the same revision', async () => {
    const w = await makeWorld();
    await put(w, w.byRole.owner, { baseRevision: 1, design: CLASSROOM_DESIGN });
    const a = await put(w, w.byRole.owner, { baseRevision: 2, design: { ...CLASSROOM_DESIGN, outcome: { ...CLASSROOM_DESIGN.outcome, name: 'Reading age' } } });
    expect(a.status).toBe(200);
    const b = await put(w, w.byRole.editor, { baseRevision: 2, design: { ...CLASSROOM_DESIGN, analysis: { method: 'mixed-model', randomIntercepts: ['classroom'], unitOfAnalysisLevelId: 'pupil' } } });
    expect(b.status).toBe(200);
    expect(b.body.merged).toBe(true);
    expect(b.body.revision).toBe(4);
    expect(b.body.design.outcome.name).toBe('Reading age');
    expect(b.body.design.analysis.method).toBe('mixed-model');
  });

  it('refuses a second edit of the same part with a conflict that names who saved, and saves nothing', async () => {
    const w = await makeWorld();
    await put(w, w.byRole.owner, { baseRevision: 1, design: CLASSROOM_DESIGN });
    await put(w, w.byRole.owner, { baseRevision: 2, design: { ...CLASSROOM_DESIGN, outcome: { ...CLASSROOM_DESIGN.outcome, name: 'Reading age' } } });
    const before = await revisions(w);
    const c = await put(w, w.byRole.editor, { baseRevision: 2, design: { ...CLASSROOM_DESIGN, outcome: { ...CLASSROOM_DESIGN.outcome, name: 'Fluency' } } });
    expect(c.status).toBe(409);
    expect(c.body.error.message).toMatch(/owner \d+ saved revision 3/);
    expect(c.body.error.message).toMatch(/Outcome/);
    expect(await revisions(w)).toEqual(before);
  });

  it('does not let a viewer or consultant save', async () => {
    const w = await makeWorld();
    expect((await put(w, w.byRole.consultant, { baseRevision: 1, design: CLASSROOM_DESIGN })).status).toBe(403);
    expect((await put(w, w.byRole.viewer, { baseRevision: 1, design: CLASSROOM_DESIGN })).status).toBe(403);
  });
});

describe('hostile and malformed input', () => {
  const cases: [string, unknown, string][] = [
    ['wrong types', { baseRevision: 1, design: { structure: { levels: 'many' } } }, 'design.structure.levels'],
    ['10,000 levels', { baseRevision: 1, design: { structure: { levels: Array.from({ length: 10_000 }, (_, i) => ({ id: `l${i}`, name: `L${i}`, kind: 'grouping', count: 2 })) } } }, 'design.structure.levels'],
    ['a huge count', { baseRevision: 1, design: { structure: { levels: [{ id: 'a', name: 'A', kind: 'independent', count: 1e300 }] } } }, 'design.structure.levels.0.count'],
    ['a negative SD', { baseRevision: 1, design: { assumptions: { outcomeSd: { value: -1 } } } }, 'design.assumptions.outcomeSd.value'],
    ['a dangling level reference', { baseRevision: 1, design: { assignment: { levelId: 'nowhere' } } }, 'design.assignment.levelId'],
    ['an ICC above 1', { baseRevision: 1, design: { structure: { levels: [{ id: 'a', name: 'A', kind: 'grouping', count: 3 }] }, assumptions: { iccs: [{ levelId: 'a', value: 1.5 }] } } }, 'design.assumptions.iccs.0.value'],
    ['control characters in a name', { baseRevision: 1, design: { outcome: { name: 'a\u0000b' } } }, 'design.outcome.name'],
    ['a missing base revision', { design: {} }, 'baseRevision'],
  ];
  it.each(cases)('%s → 400 with a field error, nothing saved', async (_label, body, field) => {
    const w = await makeWorld();
    const before = await revisions(w);
    const r = await put(w, w.byRole.owner, body);
    expect(r.status).toBe(400);
    expect(Object.keys(r.body.error.fields)).toContain(field);
    expect(await revisions(w)).toEqual(before);
  });

  it('keeps script in text fields as text', async () => {
    const w = await makeWorld();
    const r = await put(w, w.byRole.owner, { baseRevision: 1, design: { outcome: { name: '<script>alert(1)</script>' } } });
    expect(r.status).toBe(200);
    expect(r.body.design.outcome.name).toBe('<script>alert(1)</script>');
  });

  it('drops deeply nested junk without crashing or storing it', async () => {
    let deep: unknown = 'x';
    for (let i = 0; i < 2000; i++) deep = { a: deep };
    const w = await makeWorld();
    const r = await put(w, w.byRole.owner, { baseRevision: 1, design: { outcome: deep } });
    expect([200, 400]).toContain(r.status);
    const stored = JSON.stringify((await revisions(w)).at(-1)!.design);
    expect(stored.length).toBeLessThan(5_000);
  });
});

describe('checks and addressed findings', () => {
  it('runs the checks on a posted design without saving it', async () => {
    const w = await makeWorld();
    const res = await checks.POST(request('POST', `/api/v1/studies/${w.studyId}/checks`, { user: w.byRole.viewer, body: { design: CLASSROOM_DESIGN } }), ctx({ studyId: w.studyId }));
    expect(res.status).toBe(200);
    const body = await res.json();
    expect(body.findings.find((f: { ruleId: string }) => f.ruleId === 'unit-of-analysis').numbers.designEffect).toBeGreaterThan(4);
    expect(body.recommendation.model).toMatch(/\(1 \| classroom\)/);
    expect(await revisions(w)).toHaveLength(1);
  });

  it('keeps the history of addressed and reopened notes, newest first', async () => {
    const w = await makeWorld();
    const post = (user: TestUser, status: string, reason: string) =>
      notes.POST(request('POST', `/api/v1/studies/${w.studyId}/finding-notes`, { user, body: { ruleId: 'unit-of-analysis', key: 'classroom', status, reason } }), ctx({ studyId: w.studyId }));
    expect((await post(w.byRole.editor, 'addressed', 'Planned a random intercept per classroom.')).status).toBe(201);
    expect((await post(w.byRole.consultant, 'reopened', 'The df method is still missing.')).status).toBe(201);
    const list = await (await notes.GET(request('GET', `/api/v1/studies/${w.studyId}/finding-notes`, { user: w.byRole.viewer }), ctx({ studyId: w.studyId }))).json();
    expect(list.items.map((n: { status: string }) => n.status)).toEqual(['reopened', 'addressed']);
    expect((await post(w.byRole.writer, 'addressed', 'x')).status).toBe(403);
    expect((await post(w.byRole.owner, 'addressed', '')).status).toBe(400);
  });
});
