/**
 * Versions and sign-off (issue 12, points 1, 2 and 5): autosaves grouped into versions with the
 * time injected (never waited for), names, restores, the comparison of known version pairs, and
 * sign-off → edit → changed since sign-off → withdrawal, with the study's derived status.
 */
import { describe, expect, it } from 'vitest';
import { CLASSROOM_DESIGN } from '@/db/demo/designs';
import * as designRoute from '@/app/api/v1/studies/[studyId]/design/route';
import * as versionsRoute from '@/app/api/v1/studies/[studyId]/versions/route';
import * as compareRoute from '@/app/api/v1/studies/[studyId]/versions/compare/route';
import * as restoreRoute from '@/app/api/v1/studies/[studyId]/versions/[version]/restore/route';
import * as signoffsRoute from '@/app/api/v1/studies/[studyId]/signoffs/route';
import * as studiesRoute from '@/app/api/v1/studies/route';
import { saveDesign } from '@/lib/data/designs';
import { createSuggestion } from '@/lib/data/suggestions';
import { closeMyVersion, compareStudyVersions, getVersion, listSignoffs, listVersions, nameVersion, restoreVersion, signOff, withdrawSignoff } from '@/lib/data/versions';
import { designSchema, type Design } from '@/lib/design/schema';
import { db } from '@/lib/db';
import { ctx, makeWorld, request, type TestUser, type World } from '../support/fixtures';
import plans from '@/lib/plan/fixtures/demo_plans.json';

const classroom = designSchema.parse(CLASSROOM_DESIGN);
const actor = (u: TestUser) => ({ id: u.id, email: u.email, name: null });
const minutes = (n: number) => n * 60_000;

/** A clock well after the study was created (its first revision is then idle). */
function clock() {
  const t0 = Date.now() + minutes(60);
  return (m: number) => new Date(t0 + minutes(m));
}

async function save(w: World, u: TestUser, design: Design, at: Date, options: { coAuthorId?: string; suggestionId?: string } = {}) {
  const current = await db().selectFrom('studies').select('current_revision').where('id', '=', w.studyId).executeTakeFirstOrThrow();
  return saveDesign(actor(u), w.studyId, { baseRevision: current.current_revision, design }, { ...options, now: at });
}

const edit = (d: Design, f: (x: Design) => void): Design => {
  const copy = structuredClone(d);
  f(copy);
  return designSchema.parse(copy);
};

describe('grouping autosaves into versions', () => {
  it('one person’s saves less than 20 minutes apart are one version; a pause or another person starts the next', async () => {
    const w = await makeWorld();
    const at = clock();
    const owner = w.byRole.owner;
    const a = await save(w, owner, classroom, at(0));
    const b = await save(w, owner, edit(classroom, (d) => void (d.outcome.unit = 'score points')), at(5));
    const c = await save(w, owner, edit(classroom, (d) => void (d.outcome.unit = 'points')), at(19));
    expect([a.version, b.version, c.version]).toEqual([2, 2, 2]);
    // 20 minutes after the last save the version is idle: the next save opens a new one.
    const d = await save(w, owner, classroom, at(39));
    expect(d.version).toBe(3);
    const e = await save(w, w.byRole.editor, edit(classroom, (x) => void (x.outcome.name = 'Reading age')), at(40));
    expect(e.version).toBe(4);

    const list = await listVersions(actor(owner), w.studyId, { now: at(41) });
    const byNumber = new Map(list.items.map((v) => [v.number, v]));
    expect(list.items.map((v) => v.number)).toEqual([4, 3, 2, 1]);
    expect(byNumber.get(2)).toMatchObject({ saves: 3, firstRevision: 2, lastRevision: 4, closeReason: 'idle', open: false, closedAt: at(39).toISOString() });
    expect(new Date(byNumber.get(2)!.closedAt!).getTime()).toBe(at(19).getTime() + minutes(20));
    expect(byNumber.get(3)).toMatchObject({ saves: 1, closeReason: 'other-author', open: false });
    expect(byNumber.get(4)).toMatchObject({ saves: 1, closeReason: null, open: true });
    // Still open by the record, but idle by the clock: shown closed.
    const later = await listVersions(actor(owner), w.studyId, { now: at(61) });
    expect(later.items[0]).toMatchObject({ number: 4, open: false, closedAt: null });

    // Every save is kept underneath, for recovery.
    const detail = await getVersion(actor(owner), w.studyId, 2);
    expect(detail.revisions.map((r) => r.number)).toEqual([2, 3, 4]);
  });

  it('leaving the wizard closes only the leaver’s own open version', async () => {
    const w = await makeWorld();
    const at = clock();
    await save(w, w.byRole.owner, classroom, at(0));
    expect(await closeMyVersion(actor(w.byRole.editor), w.studyId, { now: at(1) })).toEqual({ closed: false });
    expect(await closeMyVersion(actor(w.byRole.owner), w.studyId, { now: at(1) })).toEqual({ closed: true });
    const next = await save(w, w.byRole.owner, edit(classroom, (d) => void (d.outcome.unit = 'pts')), at(2));
    expect(next.version).toBe(3);
    const v2 = (await listVersions(actor(w.byRole.owner), w.studyId, { now: at(3) })).items.find((v) => v.number === 2);
    expect(v2).toMatchObject({ closeReason: 'left', saves: 1 });
  });

  it('an accepted suggestion is a version of its own, by both people', async () => {
    const w = await makeWorld();
    const at = clock();
    await save(w, w.byRole.owner, classroom, at(0));
    const icc = classroom.assumptions.iccs[0]!;
    const suggestion = await createSuggestion(actor(w.byRole.consultant), w.studyId, { path: `assumptions.iccs[${icc.levelId}].value`, value: 0.2, reason: 'The published ICC for reading scores is nearer 0.2.' });
    const accepted = await save(w, w.byRole.owner, edit(classroom, (d) => void (d.assumptions.iccs[0]!.value = 0.2)), at(1), { coAuthorId: w.byRole.consultant.id, suggestionId: suggestion.id });
    expect(accepted.version).toBe(3);
    const after = await save(w, w.byRole.owner, edit(classroom, (d) => void (d.outcome.unit = 'pts')), at(2));
    expect(after.version).toBe(4);
    const v3 = (await getVersion(actor(w.byRole.viewer), w.studyId, 3, { now: at(3) }));
    expect(v3).toMatchObject({ saves: 1, closeReason: 'suggestion', suggestionId: suggestion.id, authorName: expect.stringContaining('owner'), coAuthorName: expect.stringContaining('consultant') });
  });
});

describe('naming and restoring versions', () => {
  it('naming the open version closes it; a closed version keeps its saves', async () => {
    const w = await makeWorld();
    const at = clock();
    await save(w, w.byRole.owner, classroom, at(0));
    const named = await nameVersion(actor(w.byRole.consultant), w.studyId, 2, { name: 'Sent to the funder' }, { now: at(1) });
    expect(named).toMatchObject({ number: 2, name: 'Sent to the funder', closeReason: 'named', open: false });
    const next = await save(w, w.byRole.owner, edit(classroom, (d) => void (d.outcome.unit = 'pts')), at(2));
    expect(next.version).toBe(3);
    expect((await getVersion(actor(w.byRole.owner), w.studyId, 2)).lastRevision).toBe(2);
    const log = await db().selectFrom('activity_log').select(['action', 'details']).where('study_id', '=', w.studyId).where('action', '=', 'version.named').execute();
    expect(log[0]!.details).toMatchObject({ version: 2, name: 'Sent to the funder', previous: null });
  });

  it('restoring an old version creates a new version with its design, and rewrites nothing', async () => {
    const w = await makeWorld();
    const at = clock();
    await save(w, w.byRole.owner, classroom, at(0));
    const changed = edit(classroom, (d) => void (d.structure.levels[0]!.count = 30));
    await save(w, w.byRole.owner, changed, at(30));
    const before = await db().selectFrom('study_versions').selectAll().where('study_id', '=', w.studyId).orderBy('number').execute();

    const res = await restoreRoute.POST(request('POST', `/api/v1/studies/${w.studyId}/versions/2/restore`, { user: w.byRole.editor }), ctx({ studyId: w.studyId, version: '2' }));
    expect(res.status).toBe(201);
    const restored = await res.json();
    expect(restored).toMatchObject({ number: 4, restoredFrom: 2, closeReason: 'restore', saves: 1 });
    const v4 = await getVersion(actor(w.byRole.owner), w.studyId, 4);
    expect(v4.design).toEqual(classroom);
    const after = await db().selectFrom('study_versions').selectAll().where('study_id', '=', w.studyId).orderBy('number').execute();
    // Versions 1 and 2 are as they were; 3 (open until the restore) was closed, not given the restore's save.
    expect(after.slice(0, 2)).toEqual(before.slice(0, 2));
    expect(after[2]).toMatchObject({ first_revision: 3, last_revision: 3, close_reason: 'restore' });
    expect((await compareStudyVersions(actor(w.byRole.viewer), w.studyId, 2, 4)).changes).toEqual([]);
  });

  it('a consultant cannot restore or save the design', async () => {
    const w = await makeWorld();
    const put = await designRoute.PUT(request('PUT', `/api/v1/studies/${w.studyId}/design`, { user: w.byRole.consultant, body: { baseRevision: 1, design: CLASSROOM_DESIGN } }), ctx({ studyId: w.studyId }));
    expect(put.status).toBe(403);
    const res = await restoreRoute.POST(request('POST', `/api/v1/studies/${w.studyId}/versions/1/restore`, { user: w.byRole.consultant }), ctx({ studyId: w.studyId, version: '1' }));
    expect(res.status).toBe(403);
    await expect(restoreVersion(actor(w.byRole.writer), w.studyId, 1)).rejects.toMatchObject({ code: 'forbidden' });
  });

  it('non-members get 404 for the versions and sign-offs of a study', async () => {
    const w = await makeWorld();
    for (const user of [w.outsider, w.workspaceOnly]) {
      const res = await versionsRoute.GET(request('GET', `/api/v1/studies/${w.studyId}/versions`, { user }), ctx({ studyId: w.studyId }));
      expect(res.status).toBe(404);
      const s = await signoffsRoute.GET(request('GET', `/api/v1/studies/${w.studyId}/signoffs`, { user }), ctx({ studyId: w.studyId }));
      expect(s.status).toBe(404);
    }
  });
});

describe('comparing two versions', () => {
  it('lists the changed fields in the wizard’s words, the findings that cleared, and the Plan’s size and power before and after', async () => {
    const w = await makeWorld();
    const at = clock();
    await save(w, w.byRole.owner, classroom, at(0));
    // 72 classrooms: 36 per arm, the size the Plan asks for.
    const bigger = edit(classroom, (d) => {
      d.structure.levels[0]!.count = 72;
      d.analysis.method = 'mixed-model';
      d.analysis.randomIntercepts = ['classroom'];
      d.analysis.unitOfAnalysisLevelId = 'classroom';
    });
    await save(w, w.byRole.owner, bigger, at(30));
    const res = await compareRoute.GET(request('GET', `/api/v1/studies/${w.studyId}/versions/compare?from=2&to=3`, { user: w.byRole.viewer }), ctx({ studyId: w.studyId }));
    expect(res.status).toBe(200);
    const c = await res.json();
    expect(c.changes).toEqual([
      { path: 'structure.levels[classroom].count', label: 'Level “Classroom” — Number in the study', step: 'structure', before: '20', after: '72' },
      { path: 'analysis.method', label: 'Planned analysis', step: 'analysis', before: 't-test comparing the arms', after: 'Linear mixed model (random effects)' },
      { path: 'analysis.unitOfAnalysisLevelId', label: 'Unit counted as n', step: 'analysis', before: 'Pupil', after: 'Classroom' },
      { path: 'analysis.randomIntercepts', label: 'Random intercepts for', step: 'analysis', before: 'none', after: 'Classroom' },
    ]);
    expect(c.findings.cleared.map((f: { ruleId: string }) => f.ruleId)).toContain('unit-of-analysis');
    expect(c.findings.appeared.map((f: { ruleId: string }) => f.ruleId)).not.toContain('unit-of-analysis');
    // R 4.2.2, stats::pt (lib/plan/fixtures/demo_plans.json): 36 classrooms per arm needed; power 0.2997 with the planned 10, 0.8087 with 36.
    const ref = plans.plans.classroom;
    expect(c.plan.before).toMatchObject({ kind: 'cluster-means', requiredSize: ref.value, plannedSize: ref.planned, targetPower: 0.8 });
    expect(c.plan.before.powerAtPlanned).toBeCloseTo(ref.plannedPower, 6);
    expect(c.plan.after).toMatchObject({ requiredSize: ref.value, plannedSize: 36 });
    expect(c.plan.after.powerAtPlanned).toBeCloseTo(ref.power, 6);
    expect(c.stress).toBeNull();
  });

  it('an unknown version is a 404', async () => {
    const w = await makeWorld();
    const res = await compareRoute.GET(request('GET', `/api/v1/studies/${w.studyId}/versions/compare?from=1&to=9`, { user: w.byRole.viewer }), ctx({ studyId: w.studyId }));
    expect(res.status).toBe(404);
  });
});

describe('sign-off', () => {
  async function status(w: World, user: TestUser) {
    const res = await studiesRoute.GET(request('GET', `/api/v1/studies?workspaceId=${w.workspaceId}`, { user }), ctx({}));
    const body = await res.json();
    return body.items.find((s: { id: string }) => s.id === w.studyId).status as string;
  }

  it('sign-off → edit → changed since sign-off → withdrawal, and the status follows', async () => {
    const w = await makeWorld();
    const at = clock();
    const owner = w.byRole.owner;
    const consultant = actor(w.byRole.consultant);
    await save(w, owner, classroom, at(0));
    expect(await status(w, owner)).toBe('draft');

    // A version is signed off by name.
    await expect(signOff(consultant, w.studyId, { version: 2, statement: 'Reviewed the design.' }, { now: at(1) })).rejects.toMatchObject({ code: 'bad_request' });
    const res = await signoffsRoute.POST(
      request('POST', `/api/v1/studies/${w.studyId}/signoffs`, { user: w.byRole.consultant, body: { version: 2, name: 'Ethics board v2', statement: 'Reviewed the design, the checks and the Plan.', conditions: 'Report the ICC used.' } }),
      ctx({ studyId: w.studyId }),
    );
    expect(res.status).toBe(201);
    const signed = await res.json();
    expect(signed).toMatchObject({ version: 2, versionName: 'Ethics board v2', revision: 2, conditions: 'Report the ICC used.', withdrawnAt: null });
    expect(await status(w, owner)).toBe('signed-off');
    let review = (await listSignoffs(actor(owner), w.studyId)).review;
    expect(review).toMatchObject({ status: 'signed-off', changedSinceSignoff: false, signoff: { id: signed.id } });

    // The sign-off closed the open version: the next save is a new version, and a change since.
    const next = await save(w, owner, edit(classroom, (d) => void (d.assumptions.iccs[0]!.value = 0.05)), at(2));
    expect(next.version).toBe(3);
    review = (await listVersions(actor(owner), w.studyId, { now: at(3) })).review;
    expect(review).toMatchObject({ status: 'in-review', changedSinceSignoff: true, latestVersion: 3 });
    expect(await status(w, owner)).toBe('in-review');
    const filtered = await (await studiesRoute.GET(request('GET', `/api/v1/studies?workspaceId=${w.workspaceId}&status=in-review`, { user: owner }), ctx({}))).json();
    expect(filtered.items.map((s: { id: string }) => s.id)).toContain(w.studyId);

    // The signed-off version keeps its name.
    await expect(nameVersion(actor(owner), w.studyId, 2, { name: 'Renamed' })).rejects.toMatchObject({ code: 'conflict' });

    const withdrawn = await withdrawSignoff(consultant, w.studyId, signed.id, { reason: 'The ICC changed.' }, { now: at(4) });
    expect(withdrawn).toMatchObject({ withdrawalReason: 'The ICC changed.', withdrawnByName: expect.stringContaining('consultant') });
    review = (await listSignoffs(actor(owner), w.studyId)).review;
    expect(review).toMatchObject({ status: 'in-review', signoff: null, changedSinceSignoff: false });
    await expect(withdrawSignoff(consultant, w.studyId, signed.id, { reason: 'Again.' })).rejects.toMatchObject({ code: 'conflict' });

    const actions = (await db().selectFrom('activity_log').select('action').where('study_id', '=', w.studyId).orderBy('id').execute()).map((r) => r.action);
    expect(actions).toEqual(expect.arrayContaining(['version.named', 'signoff.created', 'signoff.withdrawn']));
  });

  it('only consultants sign off', async () => {
    const w = await makeWorld();
    for (const role of ['owner', 'editor', 'writer', 'viewer'] as const) {
      await expect(signOff(actor(w.byRole[role]), w.studyId, { version: 1, name: 'v1', statement: 'Fine.' })).rejects.toMatchObject({ code: 'forbidden' });
    }
  });
});
