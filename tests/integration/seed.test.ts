/**
 * The demo seed (db/seed.ts), as `npm start` runs it on every start: the whole demo into an empty
 * database, and into a database seeded before a demo study was added, that study alone — once,
 * and not again after the team renamed it. A database without the demo gets nothing.
 */
import { describe, expect, it } from 'vitest';
import { DEMO_ADMINS, DEMO_STUDIES, DEMO_WORKSPACE } from '@/db/demo/studies';
import { seedDemo } from '@/db/seed';
import { db } from '@/lib/db';
import { makeUser } from '../support/fixtures';
import { listThreads } from '@/lib/data/threads';
import { listSuggestions } from '@/lib/data/suggestions';

const PASSWORD = 'demo-password-for-tests';
const FALLS = 'Falls-prevention programme, randomised by care home';

async function demoStudies() {
  return db()
    .selectFrom('studies')
    .innerJoin('workspaces', 'workspaces.id', 'studies.workspace_id')
    .where('workspaces.name', '=', DEMO_WORKSPACE)
    .select(['studies.id', 'studies.title'])
    .orderBy('studies.created_at')
    .orderBy('studies.title')
    .execute();
}

async function membersOf(studyId: string): Promise<Record<string, string>> {
  const rows = await db()
    .selectFrom('study_members')
    .innerJoin('User', 'User.id', 'study_members.user_id')
    .where('study_members.study_id', '=', studyId)
    .select(['User.email', 'study_members.role'])
    .execute();
  return Object.fromEntries(rows.map((r) => [r.email, r.role]));
}

describe('demo seed', () => {
  it('seeds every demo study, with its members and a first revision with its checks, into an empty database', async () => {
    expect(await seedDemo(db(), PASSWORD)).toEqual({ created: true });
    const studies = await demoStudies();
    expect(studies.map((s) => s.title).sort()).toEqual(DEMO_STUDIES.map((s) => s.title).sort());
    expect(studies).toHaveLength(4);
    for (const s of studies) {
      const demo = DEMO_STUDIES.find((d) => d.title === s.title)!;
      expect(await membersOf(s.id)).toEqual(demo.members);
      const revision = await db().selectFrom('study_revisions').select(['number', 'checks']).where('study_id', '=', s.id).executeTakeFirstOrThrow();
      expect(revision.number).toBe(1);
      expect((revision.checks as { findings: unknown[] }).findings.length).toBeGreaterThan(0);
    }
  });

  it('seeds a named, signed-off version on the greenhouse study: signed off by the consultant, the study signed off', async () => {
    await seedDemo(db(), PASSWORD);
    const greenhouse = (await demoStudies()).find((s) => s.title.startsWith('Greenhouse'))!;
    const signoff = await db()
      .selectFrom('study_signoffs')
      .innerJoin('User', 'User.id', 'study_signoffs.signer_id')
      .innerJoin('study_versions', (j) => j.onRef('study_versions.study_id', '=', 'study_signoffs.study_id').onRef('study_versions.number', '=', 'study_signoffs.version_number'))
      .select(['User.email', 'study_versions.name', 'study_versions.close_reason', 'study_signoffs.withdrawn_at'])
      .where('study_signoffs.study_id', '=', greenhouse.id)
      .executeTakeFirstOrThrow();
    expect(signoff).toMatchObject({ email: 'lena.vogel@harrowvale.example', name: 'Sent to the funder', close_reason: 'signoff', withdrawn_at: null });
    const { findStudyForUser } = await import('@/db/repositories/studies');
    const owner = await db().selectFrom('User').select('id').where('email', '=', DEMO_ADMINS[0]!).executeTakeFirstOrThrow();
    expect((await findStudyForUser(db(), greenhouse.id, owner.id))!.study.status).toBe('signed-off');
    const others = (await demoStudies()).filter((s) => s.id !== greenhouse.id);
    expect(await db().selectFrom('study_signoffs').select('id').where('study_id', 'in', others.map((s) => s.id)).execute()).toEqual([]);
  });

  it('adds a demo study that a database seeded before it lacks, once', async () => {
    const before = DEMO_STUDIES.filter((s) => s.title !== FALLS);
    expect(await seedDemo(db(), PASSWORD, before)).toEqual({ created: true });
    expect(await demoStudies()).toHaveLength(3);

    expect(await seedDemo(db(), PASSWORD)).toEqual({ created: false, added: [FALLS] });
    const studies = await demoStudies();
    expect(studies).toHaveLength(4);
    const falls = studies.find((s) => s.title === FALLS)!;
    expect(await membersOf(falls.id)).toEqual(DEMO_STUDIES.find((s) => s.title === FALLS)!.members);

    expect(await seedDemo(db(), PASSWORD)).toEqual({ created: false, added: [] });
    expect(await demoStudies()).toHaveLength(4);
  });

  it('does not add a demo study again after the team renamed it', async () => {
    await seedDemo(db(), PASSWORD);
    await db().updateTable('studies').set({ title: 'Falls in care homes (our version)' }).where('title', '=', FALLS).execute();
    expect(await seedDemo(db(), PASSWORD)).toEqual({ created: false, added: [] });
    expect(await demoStudies()).toHaveLength(4);
  });

  it('adds the study without a demo member who has left the workspace', async () => {
    await seedDemo(db(), PASSWORD, DEMO_STUDIES.filter((s) => s.title !== FALLS));
    const ada = await db().selectFrom('User').select('id').where('email', '=', 'ada.brennan@harrowvale.example').executeTakeFirstOrThrow();
    await db().deleteFrom('workspace_members').where('user_id', '=', ada.id).execute();
    expect(await seedDemo(db(), PASSWORD)).toEqual({ created: false, added: [FALLS] });
    const falls = (await demoStudies()).find((s) => s.title === FALLS)!;
    expect(Object.keys(await membersOf(falls.id)).sort()).toEqual(['lena.vogel@harrowvale.example', 'priya.nair@harrowvale.example', 'tom.okafor@harrowvale.example']);
  });

  it('adds nothing to a database without the demo', async () => {
    await makeUser('someone');
    expect(await seedDemo(db(), PASSWORD)).toEqual({ created: false, added: [] });
    expect(await demoStudies()).toHaveLength(0);
    expect(DEMO_ADMINS).toHaveLength(1);
  });

  it('seeds a review in progress on the classroom study: an open thread on the unit-of-analysis finding, a resolved one, a pending suggestion from the consultant', async () => {
    await seedDemo(db(), PASSWORD);
    const classroom = (await demoStudies()).find((s) => s.title.startsWith('Reading-support'))!;
    const priya = await db().selectFrom('User').select(['id', 'name', 'email']).where('email', '=', DEMO_ADMINS[0]!).executeTakeFirstOrThrow();
    const lena = await db().selectFrom('User').select(['id', 'name', 'email']).where('email', '=', 'lena.vogel@harrowvale.example').executeTakeFirstOrThrow();
    const asPriya = { id: priya.id, name: priya.name, email: priya.email };
    const threads = await listThreads(asPriya, classroom.id);
    expect(threads.map((t) => [t.anchorKey, t.status, t.changedSince])).toEqual(
      expect.arrayContaining([
        ['finding:unit-of-analysis:classroom', 'open', false],
        ['field:assumptions.iccs[classroom].value', 'resolved', false],
      ]),
    );
    expect(threads).toHaveLength(2);
    const unit = threads.find((t) => t.status === 'open')!;
    expect(unit.comments[0]!).toMatchObject({ authorId: lena.id, mentions: [{ id: priya.id, name: 'Priya Nair' }] });
    expect(unit.comments[0]!.text).toMatch(/^@Priya Nair the programme is given to whole classrooms/);
    const suggestions = await listSuggestions(asPriya, classroom.id);
    expect(suggestions).toEqual([expect.objectContaining({ status: 'pending', createdById: lena.id, path: 'analysis.adjustsForBaseline', oldValue: false, newValue: true, changedSince: false })]);
    const others = (await demoStudies()).filter((s) => s.id !== classroom.id).map((s) => s.id);
    expect(await db().selectFrom('review_threads').select('id').where('study_id', 'in', others).execute()).toEqual([]);
  });

  it('adds the demo review to a classroom study seeded before it, once', async () => {
    const withoutReview = DEMO_STUDIES.map(({ review: _review, ...s }) => s);
    await seedDemo(db(), PASSWORD, withoutReview);
    expect(await db().selectFrom('review_threads').select('id').execute()).toEqual([]);
    await seedDemo(db(), PASSWORD);
    expect(await db().selectFrom('review_threads').select('id').execute()).toHaveLength(2);
    expect(await db().selectFrom('review_suggestions').select('id').execute()).toHaveLength(1);
    await seedDemo(db(), PASSWORD);
    expect(await db().selectFrom('review_threads').select('id').execute()).toHaveLength(2);
  });
});
