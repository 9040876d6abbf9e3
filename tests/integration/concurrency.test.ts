/**
 * Invariants under concurrency. Each test fires conflicting requests together through the real
 * route handlers (Promise.all: each request takes its own pool connection), a fixed number of
 * times, and checks the invariant after every trial. Without the row locks in lib/data these
 * fail in most trials (the counts are in the assertion messages).
 *
 *   - a workspace keeps at least one admin (two admins demoting or removing each other);
 *   - every study member, the owner first, is a member of the study's workspace (a member removed
 *     while creating a study or accepting a study invitation);
 *   - an invitation is used once, never after it was revoked;
 *   - a Plan result is saved only against the newest design revision, and two design saves of
 *     different parts are both kept (merged), of the same part one is kept and one refused;
 *   - nothing changes an archived study;
 *   - nobody has more stress tests queued or running than the limit.
 */
import { sql } from 'kysely';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { insertInvitation } from '@/db/repositories/invitations';
import { insertRevision, insertStudy, upsertStudyMember } from '@/db/repositories/studies';
import { countAdmins, insertWorkspace, upsertWorkspaceMember } from '@/db/repositories/workspaces';
import { CLASSROOM_DESIGN } from '@/db/demo/designs';
import type { StudyRole, WorkspaceRole } from '@/db/schema';
import { newToken } from '@/lib/auth/tokens';
import { db } from '@/lib/db';
import { getBoss, stopBoss } from '@/lib/jobs/boss';
import { jobsConfig } from '@/lib/jobs/config';
import * as acceptRoute from '@/app/api/v1/invitations/accept/route';
import * as invitationRoute from '@/app/api/v1/invitations/[invitationId]/route';
import * as simulationsRoute from '@/app/api/v1/simulations/route';
import * as studiesRoute from '@/app/api/v1/studies/route';
import * as studyRoute from '@/app/api/v1/studies/[studyId]/route';
import * as archiveRoute from '@/app/api/v1/studies/[studyId]/archive/route';
import * as designRoute from '@/app/api/v1/studies/[studyId]/design/route';
import * as notesRoute from '@/app/api/v1/studies/[studyId]/finding-notes/route';
import * as plansRoute from '@/app/api/v1/studies/[studyId]/plans/route';
import * as wsMemberRoute from '@/app/api/v1/workspaces/[workspaceId]/members/[userId]/route';
import { ctx, makeUser, request, type TestUser } from '../support/fixtures';

const TRIALS = 25;

/**
 * Runs `trial` TRIALS times, one after another. A trial returns what broke (a short sentence) or
 * nothing; the result lists each problem with the trials it happened in, empty when all held.
 */
async function runTrials(trial: (i: number) => Promise<string | undefined>): Promise<string[]> {
  const seen = new Map<string, number[]>();
  for (let i = 0; i < TRIALS; i++) {
    const problem = await trial(i);
    if (problem) seen.set(problem, [...(seen.get(problem) ?? []), i]);
  }
  return [...seen].map(([problem, trials]) => `${trials.length} of ${TRIALS} trials: ${problem} (trials ${trials.join(', ')})`);
}

function statuses(...answers: Response[]): string {
  return answers.map((r) => r.status).join(',');
}

async function workspaceWith(members: [TestUser, WorkspaceRole][]): Promise<string> {
  const ws = await insertWorkspace(db(), { name: 'Harrow Vale Institute', createdBy: members[0]![0].id });
  for (const [u, role] of members) await upsertWorkspaceMember(db(), ws.id, u.id, role);
  return ws.id;
}

async function studyWith(workspaceId: string, members: [TestUser, StudyRole][]): Promise<string> {
  const s = await insertStudy(db(), { workspaceId, title: 'Reading-support programme', description: '', createdBy: members[0]![0].id });
  for (const [u, role] of members) await upsertStudyMember(db(), s.id, u.id, role);
  await insertRevision(db(), { studyId: s.id, number: 1, design: { schemaVersion: 1 }, authorId: members[0]![0].id });
  return s.id;
}

/** Study members (owners included) who are not members of the study's workspace: must be none. */
async function membersOutsideWorkspace(): Promise<{ study_id: string; user_id: string; role: string }[]> {
  const { rows } = await sql<{ study_id: string; user_id: string; role: string }>`
    select sm.study_id, sm.user_id, sm.role from study_members sm join studies s on s.id = sm.study_id
    where not exists (select 1 from workspace_members wm where wm.workspace_id = s.workspace_id and wm.user_id = sm.user_id)`.execute(db());
  return rows;
}

/** Studies without an owner: nobody could manage them. */
async function studiesWithoutOwner(): Promise<string[]> {
  const { rows } = await sql<{ id: string }>`
    select s.id from studies s where not exists (select 1 from study_members sm where sm.study_id = s.id and sm.role = 'owner')`.execute(db());
  return rows.map((r) => r.id);
}

async function newestRevision(studyId: string) {
  return db().selectFrom('study_revisions').select(['number', 'design']).where('study_id', '=', studyId).orderBy('number', 'desc').executeTakeFirstOrThrow();
}

/** The study's activity, in the order it was written. */
async function activity(studyId: string): Promise<{ id: number; action: string; details: Record<string, unknown> }[]> {
  const rows = await db().selectFrom('activity_log').select(['id', 'action', 'details']).where('study_id', '=', studyId).orderBy('id').execute();
  return rows.map((r) => ({ id: Number(r.id), action: r.action, details: r.details }));
}

function patchWsMember(by: TestUser, workspaceId: string, userId: string, role: WorkspaceRole) {
  return wsMemberRoute.PATCH(
    request('PATCH', `/api/v1/workspaces/${workspaceId}/members/${userId}`, { user: by, body: { role } }),
    ctx({ workspaceId, userId }),
  );
}

function deleteWsMember(by: TestUser, workspaceId: string, userId: string) {
  return wsMemberRoute.DELETE(request('DELETE', `/api/v1/workspaces/${workspaceId}/members/${userId}`, { user: by }), ctx({ workspaceId, userId }));
}

function acceptInvitation(by: TestUser, token: string) {
  return acceptRoute.POST(request('POST', '/api/v1/invitations/accept', { user: by, body: { token } }), ctx({}));
}

function saveDesign(by: TestUser, studyId: string, baseRevision: number, design: unknown) {
  return designRoute.PUT(request('PUT', `/api/v1/studies/${studyId}/design`, { user: by, body: { baseRevision, design } }), ctx({ studyId }));
}

/** A study with an owner and an editor whose design was saved once (revision 2). */
async function studyAtRevision2() {
  const [owner, editor] = [await makeUser('owner'), await makeUser('editor')];
  const ws = await workspaceWith([[owner, 'admin'], [editor, 'member']]);
  const study = await studyWith(ws, [[owner, 'owner'], [editor, 'editor']]);
  expect((await saveDesign(owner, study, 1, CLASSROOM_DESIGN)).status).toBe(200);
  return { owner, editor, study };
}

const CLUSTER_REQUEST = { kind: 'cluster-means', delta: 3, sd: 10, icc: 0.15, clusterSize: 25, cv: 0.25, dropout: 0.08, alpha: 0.05, power: 0.8 } as const;

function savePlan(by: TestUser, studyId: string, revision: number) {
  return plansRoute.POST(request('POST', `/api/v1/studies/${studyId}/plans`, { user: by, body: { request: CLUSTER_REQUEST, revision } }), ctx({ studyId }));
}

/** A pending invitation, stored directly (its e-mail is not what these tests are about). */
async function pendingInvitation(workspaceId: string, studyId: string | null, email: string, invitedBy: string) {
  const { token, hash } = newToken();
  const inv = await insertInvitation(db(), {
    workspaceId,
    studyId,
    email,
    workspaceRole: 'member',
    studyRole: studyId ? 'editor' : null,
    tokenHash: hash,
    invitedBy,
    expiresAt: new Date(Date.now() + 24 * 3600_000),
  });
  return { token, id: inv.id };
}

describe('a workspace keeps an admin', () => {
  it('when two admins demote each other at the same moment', async () => {
    const problems = await runTrials(async () => {
      const [a, b] = [await makeUser('admin-a'), await makeUser('admin-b')];
      const ws = await workspaceWith([[a, 'admin'], [b, 'admin']]);
      const answers = await Promise.all([patchWsMember(a, ws, b.id, 'member'), patchWsMember(b, ws, a.id, 'member')]);
      if ((await countAdmins(db(), ws)) === 0) return 'the workspace was left without an admin';
      // One demotion lands; the other's author is no longer admin (403).
      if (statuses(...answers.sort((x, y) => x.status - y.status)) !== '200,403') return `answered ${statuses(...answers)}`;
    });
    expect(problems).toEqual([]);
  });

  it('when two admins remove each other at the same moment', async () => {
    const problems = await runTrials(async () => {
      const [a, b] = [await makeUser('admin-a'), await makeUser('admin-b')];
      const ws = await workspaceWith([[a, 'admin'], [b, 'admin']]);
      const answers = await Promise.all([deleteWsMember(a, ws, b.id), deleteWsMember(b, ws, a.id)]);
      if ((await countAdmins(db(), ws)) === 0) return 'the workspace was left without an admin';
      // One removal lands; the other's author is no longer a member (404).
      if (statuses(...answers.sort((x, y) => x.status - y.status)) !== '204,404') return `answered ${statuses(...answers)}`;
    });
    expect(problems).toEqual([]);
  });
});

describe('every study member is a member of its workspace', () => {
  it('when a member is removed while creating a study', async () => {
    const problems = await runTrials(async (i) => {
      const [admin, member] = [await makeUser('admin'), await makeUser('member')];
      const ws = await workspaceWith([[admin, 'admin'], [member, 'member']]);
      const answers = await Promise.all([
        deleteWsMember(admin, ws, member.id),
        studiesRoute.POST(request('POST', '/api/v1/studies', { user: member, body: { workspaceId: ws, title: `Trial ${i}` } }), ctx({})),
      ]);
      if ((await membersOutsideWorkspace()).length > 0) return 'a study owner was left outside the workspace';
      if ((await studiesWithoutOwner()).length > 0) return 'a study was left without an owner';
      // Either the study came first (the owner of a study cannot be removed: 409) or the removal
      // did (a former member cannot create a study there: 404).
      if (!['204,404', '409,201'].includes(statuses(...answers))) return `answered ${statuses(...answers)}`;
    });
    expect(problems).toEqual([]);
  });

  it('when a member is removed while accepting a study invitation', async () => {
    const problems = await runTrials(async () => {
      const [admin, member] = [await makeUser('admin'), await makeUser('member')];
      const ws = await workspaceWith([[admin, 'admin'], [member, 'member']]);
      const study = await studyWith(ws, [[admin, 'owner']]);
      const { token } = await pendingInvitation(ws, study, member.email, admin.id);
      const answers = await Promise.all([deleteWsMember(admin, ws, member.id), acceptInvitation(member, token)]);
      if ((await membersOutsideWorkspace()).length > 0) return 'a study member was left outside the workspace';
      if (statuses(...answers) !== '204,200') return `answered ${statuses(...answers)}`;
    });
    expect(problems).toEqual([]);
  });
});

describe('an invitation is used once', () => {
  it('when it is accepted twice at the same moment', async () => {
    const problems = await runTrials(async () => {
      const [admin, guest] = [await makeUser('admin'), await makeUser('guest')];
      const ws = await workspaceWith([[admin, 'admin']]);
      const { token } = await pendingInvitation(ws, null, guest.email, admin.id);
      const answers = await Promise.all([acceptInvitation(guest, token), acceptInvitation(guest, token)]);
      const used = await db().selectFrom('activity_log').select('id').where('action', '=', 'invitation.accepted').where('workspace_id', '=', ws).execute();
      if (used.length !== 1) return `it was used ${used.length} times`;
      if (statuses(...answers.sort((x, y) => x.status - y.status)) !== '200,410') return `answered ${statuses(...answers)}`;
    });
    expect(problems).toEqual([]);
  });

  it('when it is accepted and revoked at the same moment', async () => {
    const problems = await runTrials(async () => {
      const [admin, guest] = [await makeUser('admin'), await makeUser('guest')];
      const ws = await workspaceWith([[admin, 'admin']]);
      const { token, id } = await pendingInvitation(ws, null, guest.email, admin.id);
      const answers = await Promise.all([
        acceptInvitation(guest, token),
        invitationRoute.DELETE(request('DELETE', `/api/v1/invitations/${id}`, { user: admin }), ctx({ invitationId: id })),
      ]);
      const row = await db().selectFrom('invitations').select(['accepted_at', 'revoked_at']).where('id', '=', id).executeTakeFirstOrThrow();
      const joined = await db().selectFrom('workspace_members').select('role').where('workspace_id', '=', ws).where('user_id', '=', guest.id).executeTakeFirst();
      if (row.accepted_at && row.revoked_at) return 'it was both accepted and revoked';
      if (row.revoked_at && joined) return 'a revoked invitation let the person in';
      if (!['200,409', '410,204'].includes(statuses(...answers))) return `answered ${statuses(...answers)}`;
    });
    expect(problems).toEqual([]);
  });
});

describe('saves against a revision', () => {
  it('keep Plan results only with the newest revision when the design is saved at the same moment', async () => {
    const problems = await runTrials(async () => {
      const owner = await makeUser('owner');
      const ws = await workspaceWith([[owner, 'admin']]);
      const study = await studyWith(ws, [[owner, 'owner']]);
      const [saved, ...plans] = await Promise.all([
        saveDesign(owner, study, 1, CLASSROOM_DESIGN),
        ...Array.from({ length: 4 }, () => savePlan(owner, study, 1)),
      ]);
      // The activity log is written in the same transactions as the saves: a result for revision
      // 1 logged after revision 2 was checked against a revision that was no longer the newest.
      const log = await activity(study);
      const designSaved = log.find((e) => e.action === 'design.saved');
      if (designSaved && log.some((e) => e.action === 'plan.saved' && e.details.revision === 1 && e.id > designSaved.id)) {
        return 'a result was saved against revision 1 after revision 2 was saved';
      }
      if (saved!.status !== 200 || plans.some((r) => r.status !== 201 && r.status !== 409)) return `answered ${statuses(saved!, ...plans)}`;
    });
    expect(problems).toEqual([]);
  });

  it('merge two design saves of different parts made at the same moment', async () => {
    const problems = await runTrials(async () => {
      const { owner, editor, study } = await studyAtRevision2();
      const outcome = { ...CLASSROOM_DESIGN, outcome: { ...CLASSROOM_DESIGN.outcome, name: 'Reading age' } };
      const analysis = { ...CLASSROOM_DESIGN, analysis: { method: 'mixed-model', randomIntercepts: ['classroom'], unitOfAnalysisLevelId: 'pupil' } };
      const answers = await Promise.all([saveDesign(owner, study, 2, outcome), saveDesign(editor, study, 2, analysis)]);
      if (statuses(...answers) !== '200,200') return `answered ${statuses(...answers)}`;
      const newest = await newestRevision(study);
      const d = newest.design as typeof CLASSROOM_DESIGN & { analysis: { method: string } };
      if (newest.number !== 4 || d.outcome?.name !== 'Reading age' || d.analysis.method !== 'mixed-model') return 'an edit was lost';
    });
    expect(problems).toEqual([]);
  });

  it('keep one of two design saves of the same part made at the same moment and refuse the other', async () => {
    const problems = await runTrials(async () => {
      const { owner, editor, study } = await studyAtRevision2();
      const names = ['Reading age', 'Fluency'];
      const answers = await Promise.all(
        names.map((name, k) => saveDesign(k === 0 ? owner : editor, study, 2, { ...CLASSROOM_DESIGN, outcome: { ...CLASSROOM_DESIGN.outcome, name } })),
      );
      if (!['200,409', '409,200'].includes(statuses(...answers))) return `answered ${statuses(...answers)}`;
      const newest = await newestRevision(study);
      const winner = answers.findIndex((r) => r.status === 200);
      if (newest.number !== 3 || (newest.design as typeof CLASSROOM_DESIGN).outcome?.name !== names[winner]) return 'the kept revision is not the accepted edit';
    });
    expect(problems).toEqual([]);
  });
});

describe('nothing changes an archived study', () => {
  it('when it is archived while being edited', async () => {
    const problems = await runTrials(async (i) => {
      const owner = await makeUser('owner');
      const ws = await workspaceWith([[owner, 'admin']]);
      const study = await studyWith(ws, [[owner, 'owner']]);
      const p = { studyId: study };
      await Promise.all([
        archiveRoute.POST(request('POST', `/api/v1/studies/${study}/archive`, { user: owner }), ctx(p)),
        studyRoute.PATCH(request('PATCH', `/api/v1/studies/${study}`, { user: owner, body: { title: `Edited ${i}` } }), ctx(p)),
        saveDesign(owner, study, 1, CLASSROOM_DESIGN),
        notesRoute.POST(
          request('POST', `/api/v1/studies/${study}/finding-notes`, {
            user: owner,
            body: { ruleId: 'unit-of-analysis', key: 'pupil', status: 'addressed', reason: 'Analysed by classroom.' },
          }),
          ctx(p),
        ),
        savePlan(owner, study, 1),
      ]);
      const log = await activity(study);
      const archived = log.find((e) => e.action === 'study.archived');
      if (!archived) return 'it was not archived';
      const after = log.filter((e) => e.id > archived.id).map((e) => e.action).sort();
      if (after.length > 0) return `it was changed after it was archived (${after.join(', ')})`;
    });
    expect(problems).toEqual([]);
  });
});

describe('stress tests', () => {
  beforeAll(async () => {
    await getBoss();
  });
  afterAll(async () => {
    await stopBoss({ timeout: 5_000 });
  });

  it('nobody has more runs queued or running than the limit, however many start at once', async () => {
    const max = jobsConfig().maxActiveRuns;
    const spec = {
      design: { arms: 2, clustersPerArm: 4, clusterSize: 5 },
      truth: { effect: 0.8, sd: 1, icc: 0.1 },
      scenarios: [{ violation: 'none' }],
      analyses: ['ols'],
      replicates: 20,
      seed: 7,
    };
    const problems = await runTrials(async () => {
      const user = await makeUser('runner');
      const answers = await Promise.all(
        Array.from({ length: max + 2 }, () => simulationsRoute.POST(request('POST', '/api/v1/simulations', { user, body: { spec } }), ctx({}))),
      );
      const active = await db().selectFrom('simulations').select('id').where('created_by', '=', user.id).where('status', 'in', ['queued', 'running']).execute();
      if (active.length > max) return `someone had ${active.length} runs queued or running (the limit is ${max})`;
      if (answers.some((r) => r.status !== 202 && r.status !== 429)) return `answered ${statuses(...answers)}`;
    });
    expect(problems).toEqual([]);
  });
});
