/**
 * Review threads and suggestions through their routes (issue 12, points 3, 4, 6, 7, 9): a thread
 * on the unit-of-analysis finding with a mention, replies and who is told, resolving and
 * reopening, two people at once, "changed since this comment", filters, and suggestions accepted
 * into the right revision, declined, or refused when their field changed meanwhile.
 */
import { beforeEach, describe, expect, it, vi } from 'vitest';
import { db } from '@/lib/db';
import type { NotificationEvent } from '@/lib/notifications/notify';
import { CLASSROOM_DESIGN } from '@/db/demo/designs';
import { insertSimulation } from '@/db/repositories/simulations';
import * as design from '@/app/api/v1/studies/[studyId]/design/route';
import * as threads from '@/app/api/v1/studies/[studyId]/threads/route';
import * as thread from '@/app/api/v1/studies/[studyId]/threads/[threadId]/route';
import * as replies from '@/app/api/v1/studies/[studyId]/threads/[threadId]/replies/route';
import * as resolve from '@/app/api/v1/studies/[studyId]/threads/[threadId]/resolve/route';
import * as reopen from '@/app/api/v1/studies/[studyId]/threads/[threadId]/reopen/route';
import * as suggestions from '@/app/api/v1/studies/[studyId]/suggestions/route';
import * as accept from '@/app/api/v1/studies/[studyId]/suggestions/[suggestionId]/accept/route';
import * as decline from '@/app/api/v1/studies/[studyId]/suggestions/[suggestionId]/decline/route';
import { ctx, makeWorld, request, SMALL_SPEC, type TestUser, type World } from '../support/fixtures';

const sent = vi.hoisted(() => [] as NotificationEvent[]);
vi.mock('@/lib/notifications/notify', async (original) => ({
  ...(await original<typeof import('@/lib/notifications/notify')>()),
  notify: async (_trx: unknown, event: NotificationEvent) => {
    sent.push(event);
  },
}));

beforeEach(() => {
  sent.length = 0;
});

type Body = Record<string, any>; // eslint-disable-line @typescript-eslint/no-explicit-any
type Handler = (req: Request, c: { params: Promise<Record<string, string>> }) => Promise<Response>;

async function call(handler: Handler, method: string, path: string, params: Record<string, string>, user: TestUser, body?: unknown): Promise<{ status: number; body: Body }> {
  const res = await handler(request(method, path, { user, body }), ctx(params));
  return { status: res.status, body: await res.json() };
}

const UNIT_FINDING = { kind: 'finding', ruleId: 'unit-of-analysis', key: 'classroom' } as const;
const ICC = 'assumptions.iccs[classroom].value';

/** A world whose study holds the classroom design (revision 2). */
async function classroom(): Promise<World> {
  const w = await makeWorld();
  const r = await call(design.PUT as Handler, 'PUT', `/api/v1/studies/${w.studyId}/design`, { studyId: w.studyId }, w.byRole.owner, { baseRevision: 1, design: CLASSROOM_DESIGN });
  expect(r.status).toBe(200);
  return w;
}

const base = (w: World) => `/api/v1/studies/${w.studyId}`;

function startThread(w: World, user: TestUser, body: unknown) {
  return call(threads.POST as Handler, 'POST', `${base(w)}/threads`, { studyId: w.studyId }, user, body);
}
function reply(w: World, user: TestUser, threadId: string, text: string) {
  return call(replies.POST as Handler, 'POST', `${base(w)}/threads/${threadId}/replies`, { studyId: w.studyId, threadId }, user, { body: text });
}
function resolveIt(w: World, user: TestUser, threadId: string, body: unknown = {}) {
  return call(resolve.POST as Handler, 'POST', `${base(w)}/threads/${threadId}/resolve`, { studyId: w.studyId, threadId }, user, body);
}
function list(w: World, user: TestUser, query = '') {
  return call(threads.GET as Handler, 'GET', `${base(w)}/threads${query}`, { studyId: w.studyId }, user);
}
function suggest(w: World, user: TestUser, body: unknown) {
  return call(suggestions.POST as Handler, 'POST', `${base(w)}/suggestions`, { studyId: w.studyId }, user, body);
}
function acceptIt(w: World, user: TestUser, suggestionId: string, body: unknown = {}) {
  return call(accept.POST as Handler, 'POST', `${base(w)}/suggestions/${suggestionId}/accept`, { studyId: w.studyId, suggestionId }, user, body);
}
async function actions(w: World): Promise<string[]> {
  const rows = await db().selectFrom('activity_log').select('action').where('study_id', '=', w.studyId).orderBy('id').execute();
  return rows.map((r) => r.action);
}
async function currentDesign(w: World) {
  const r = await call(design.GET as Handler, 'GET', `${base(w)}/design`, { studyId: w.studyId }, w.byRole.viewer);
  return r.body;
}

describe('threads', () => {
  it('a consultant comments on the unit-of-analysis finding and mentions the owner, who is told', async () => {
    const w = await classroom();
    const r = await startThread(w, w.byRole.consultant, { anchor: UNIT_FINDING, body: `<@${w.byRole.owner.id}> the classroom is the unit here, not the pupil.` });
    expect(r.status).toBe(201);
    expect(r.body).toMatchObject({
      anchorKey: 'finding:unit-of-analysis:classroom',
      anchorLabel: expect.stringContaining('assigned per classroom'),
      revision: 2,
      status: 'open',
      changedSince: false,
      anchorHref: `/studies/${w.studyId}/checks#finding-unit-of-analysis-classroom`,
    });
    expect(r.body.comments).toHaveLength(1);
    expect(r.body.comments[0].text).toBe('@owner 1 the classroom is the unit here, not the pupil.'.replace('owner 1', r.body.comments[0].mentions[0].name));
    expect(r.body.comments[0].mentions).toEqual([{ id: w.byRole.owner.id, name: expect.stringMatching(/^owner /) }]);
    expect(sent).toEqual([
      expect.objectContaining({ kind: 'mention', recipientIds: [w.byRole.owner.id], actorId: w.byRole.consultant.id, dedupeKey: `comment:${r.body.comments[0].id}:mention:${w.byRole.owner.id}`, path: `/studies/${w.studyId}/review?thread=${r.body.id}` }),
    ]);
    expect((await actions(w)).at(-1)).toBe('comment.created');
  });

  it('refuses a mention of someone outside the study, a finding the design does not have, and a stress test of another study', async () => {
    const w = await classroom();
    const other = await makeWorld();
    const outsider = await startThread(w, w.byRole.consultant, { anchor: UNIT_FINDING, body: `<@${w.workspaceOnly.id}> see this` });
    expect(outsider.status).toBe(400);
    expect(outsider.body.error.message).toMatch(/Only members of this study can be mentioned/);
    const gone = await startThread(w, w.byRole.consultant, { anchor: { kind: 'finding', ruleId: 'unit-of-analysis', key: 'school' }, body: 'Hm.' });
    expect(gone.status).toBe(400);
    const sim = await insertSimulation(db(), { studyId: other.studyId, revisionNumber: 1, createdBy: other.byRole.owner.id, spec: SMALL_SPEC, replicatesTotal: 10, chunkSize: 10, chunkCount: 1 });
    const foreign = await startThread(w, w.byRole.consultant, { anchor: { kind: 'simulation', simulationId: sim.id }, body: 'Hm.' });
    expect(foreign.status).toBe(400);
    expect(await db().selectFrom('review_threads').select('id').where('study_id', '=', w.studyId).execute()).toEqual([]);
  });

  it('a reply tells the others in the thread (not the replier, not twice a mentioned person)', async () => {
    const w = await classroom();
    const t = (await startThread(w, w.byRole.consultant, { anchor: UNIT_FINDING, body: 'The classroom is the unit.' })).body;
    await reply(w, w.byRole.writer, t.id, 'Noted for the justification.');
    sent.length = 0;
    const r = await reply(w, w.byRole.owner, t.id, `Agreed, <@${w.byRole.writer.id}> please update the text.`);
    expect(r.status).toBe(201);
    expect(r.body.comments.map((c: Body) => c.authorId)).toEqual([w.byRole.consultant.id, w.byRole.writer.id, w.byRole.owner.id]);
    const commentId = r.body.comments[2].id;
    expect(sent).toEqual([
      expect.objectContaining({ kind: 'reply', recipientIds: [w.byRole.consultant.id], dedupeKey: `comment:${commentId}:reply` }),
      expect.objectContaining({ kind: 'mention', recipientIds: [w.byRole.writer.id], dedupeKey: `comment:${commentId}:mention:${w.byRole.writer.id}` }),
    ]);
    expect((await actions(w)).filter((a) => a.startsWith('comment.'))).toEqual(['comment.created', 'comment.replied', 'comment.replied']);
  });

  it('two replies at the same moment both land', async () => {
    const w = await classroom();
    const t = (await startThread(w, w.byRole.consultant, { anchor: UNIT_FINDING, body: 'First.' })).body;
    const [a, b] = await Promise.all([reply(w, w.byRole.owner, t.id, 'From the owner.'), reply(w, w.byRole.editor, t.id, 'From the editor.')]);
    expect([a.status, b.status]).toEqual([201, 201]);
    const got = await call(thread.GET as Handler, 'GET', `${base(w)}/threads/${t.id}`, { studyId: w.studyId, threadId: t.id }, w.byRole.viewer);
    expect(got.body.comments.map((c: Body) => c.text).sort()).toEqual(['First.', 'From the editor.', 'From the owner.']);
  });

  it('resolving after an unseen reply is refused; resolving what one has read works; a reply reopens a resolved thread', async () => {
    const w = await classroom();
    const t = (await startThread(w, w.byRole.consultant, { anchor: UNIT_FINDING, body: 'First.' })).body;
    const seen = t.comments[0].id;
    await reply(w, w.byRole.owner, t.id, 'But what about schools?');
    const stale = await resolveIt(w, w.byRole.consultant, t.id, { seenCommentId: seen });
    expect(stale.status).toBe(409);
    expect(stale.body.error.message).toMatch(/replied in this thread after the comment you last read/);
    const threadNow = (await list(w, w.byRole.viewer)).body.items[0];
    expect(threadNow.status).toBe('open');

    const ok = await resolveIt(w, w.byRole.consultant, t.id, { seenCommentId: threadNow.comments.at(-1).id });
    expect(ok.status).toBe(200);
    expect(ok.body).toMatchObject({ status: 'resolved', resolvedByName: expect.stringMatching(/^consultant /) });

    const late = await reply(w, w.byRole.editor, t.id, 'One more thing.');
    expect(late.status).toBe(201);
    expect(late.body.status).toBe('open');
    expect((await actions(w)).filter((a) => a.startsWith('comment.'))).toEqual(['comment.created', 'comment.replied', 'comment.resolved', 'comment.reopened', 'comment.replied']);
  });

  it('resolving while someone replies: whichever takes the thread first, the reply is kept and the thread ends open or visibly resolved after it', async () => {
    const w = await classroom();
    const t = (await startThread(w, w.byRole.consultant, { anchor: UNIT_FINDING, body: 'First.' })).body;
    const [r, s] = await Promise.all([reply(w, w.byRole.owner, t.id, 'Wait.'), resolveIt(w, w.byRole.consultant, t.id, { seenCommentId: t.comments[0].id })]);
    expect(r.status).toBe(201);
    const final = (await list(w, w.byRole.viewer)).body.items[0];
    expect(final.comments.map((c: Body) => c.text)).toEqual(['First.', 'Wait.']);
    // Resolve first: the reply reopens. Reply first: resolving without having read it is refused.
    expect(final.status).toBe('open');
    expect([200, 409]).toContain(s.status);
  });

  it('writers resolve their own threads only; viewers cannot comment', async () => {
    const w = await classroom();
    const mine = (await startThread(w, w.byRole.writer, { anchor: { kind: 'section', part: 'outcome' }, body: 'Is the outcome final?' })).body;
    const theirs = (await startThread(w, w.byRole.consultant, { anchor: { kind: 'section', part: 'outcome' }, body: 'Primary outcome?' })).body;
    expect((await resolveIt(w, w.byRole.writer, mine.id)).status).toBe(200);
    expect((await resolveIt(w, w.byRole.writer, theirs.id)).status).toBe(403);
    const reopened = await call(reopen.POST as Handler, 'POST', `${base(w)}/threads/${mine.id}/reopen`, { studyId: w.studyId, threadId: mine.id }, w.byRole.writer);
    expect(reopened.body.status).toBe('open');
    expect((await startThread(w, w.byRole.viewer, { anchor: { kind: 'section', part: 'outcome' }, body: 'Hello' })).status).toBe(403);
  });

  it('says "changed since" when the anchored field changed, not when another one did', async () => {
    const w = await classroom();
    const onIcc = (await startThread(w, w.byRole.consultant, { anchor: { kind: 'field', path: ICC }, body: 'Is 0.15 realistic?' })).body;
    const onName = (await startThread(w, w.byRole.consultant, { anchor: { kind: 'field', path: 'outcome.name' }, body: 'Fine.' })).body;
    expect(onIcc).toMatchObject({ anchorLabel: 'Assumptions: Intracluster correlation (ICC) for Classroom', changedSince: false, anchorHref: `/studies/${w.studyId}/design/assumptions` });
    const d = await currentDesign(w);
    d.design.assumptions.iccs[0].value = 0.2;
    await call(design.PUT as Handler, 'PUT', `${base(w)}/design`, { studyId: w.studyId }, w.byRole.owner, { baseRevision: d.revision, design: d.design });
    const items = (await list(w, w.byRole.viewer)).body.items as Body[];
    expect(items.find((t) => t.id === onIcc.id)!.changedSince).toBe(true);
    expect(items.find((t) => t.id === onName.id)!.changedSince).toBe(false);
  });

  it('filters by anchor kind, anchor, author and state', async () => {
    const w = await classroom();
    const a = (await startThread(w, w.byRole.consultant, { anchor: UNIT_FINDING, body: 'One.' })).body;
    const b = (await startThread(w, w.byRole.editor, { anchor: { kind: 'field', path: ICC }, body: 'Two.' })).body;
    await reply(w, w.byRole.consultant, b.id, 'Three.');
    await resolveIt(w, w.byRole.owner, a.id);
    const ids = async (q: string) => ((await list(w, w.byRole.viewer, q)).body.items as Body[]).map((t) => t.id).sort();
    expect(await ids('?anchorKind=finding')).toEqual([a.id]);
    expect(await ids(`?anchor=${encodeURIComponent(`field:${ICC}`)}`)).toEqual([b.id]);
    expect(await ids(`?author=${w.byRole.consultant.id}`)).toEqual([a.id, b.id].sort());
    expect(await ids(`?author=${w.byRole.editor.id}`)).toEqual([b.id]);
    expect(await ids('?state=resolved')).toEqual([a.id]);
    expect(await ids('?state=open')).toEqual([b.id]);
    expect((await list(w, w.byRole.viewer, '?state=closed')).status).toBe(400);
  });
});

describe('suggestions', () => {
  it('a consultant suggests, the owner accepts: a new revision with the value, attributed to both, and the consultant is told', async () => {
    const w = await classroom();
    const s = await suggest(w, w.byRole.consultant, { path: ICC, value: 0.2, reason: 'Reading ICCs in this region run near 0.2.' });
    expect(s.status).toBe(201);
    expect(s.body).toMatchObject({ status: 'pending', oldValue: 0.15, newValue: 0.2, oldText: '0.15', newText: '0.2', changedSince: false, revision: 2 });
    expect(sent).toEqual([expect.objectContaining({ kind: 'suggestion', recipientIds: expect.arrayContaining([w.byRole.owner.id, w.byRole.editor.id, w.target.id]), dedupeKey: `suggestion:${s.body.id}:created` })]);
    expect(sent[0]!.recipientIds).not.toContain(w.byRole.consultant.id);
    expect(sent[0]!.recipientIds).not.toContain(w.byRole.writer.id);

    expect((await acceptIt(w, w.byRole.consultant, s.body.id)).status).toBe(403);
    sent.length = 0;
    const a = await acceptIt(w, w.byRole.owner, s.body.id);
    expect(a.status).toBe(200);
    expect(a.body).toMatchObject({ status: 'accepted', acceptedRevision: 3, decidedByName: expect.stringMatching(/^owner /) });
    const d = await currentDesign(w);
    expect(d.revision).toBe(3);
    expect(d.design.assumptions.iccs[0].value).toBe(0.2);
    const rev = await db().selectFrom('study_revisions').select(['author_id', 'note']).where('study_id', '=', w.studyId).where('number', '=', 3).executeTakeFirstOrThrow();
    expect(rev.author_id).toBe(w.byRole.owner.id);
    const saved = await db().selectFrom('activity_log').select('details').where('study_id', '=', w.studyId).where('action', '=', 'design.saved').orderBy('id', 'desc').executeTakeFirstOrThrow();
    expect(saved.details).toMatchObject({ revision: 3, suggestionId: s.body.id, coAuthorId: w.byRole.consultant.id });
    expect((await actions(w)).slice(-2)).toEqual(['design.saved', 'suggestion.accepted']);
    expect(sent).toEqual([expect.objectContaining({ kind: 'decision', recipientIds: [w.byRole.consultant.id], dedupeKey: `suggestion:${s.body.id}:accepted` })]);

    const again = await acceptIt(w, w.byRole.editor, s.body.id);
    expect(again.status).toBe(409);
    expect((await currentDesign(w)).revision).toBe(3);
  });

  it('refuses a value the design cannot hold, and writers and viewers cannot suggest', async () => {
    const w = await classroom();
    const bad = await suggest(w, w.byRole.consultant, { path: ICC, value: 1.5, reason: 'Typo test.' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields.value[0]).toMatch(/Intracluster correlation/);
    expect((await suggest(w, w.byRole.consultant, { path: 'nowhere.field', value: 1, reason: 'x' })).status).toBe(400);
    expect((await suggest(w, w.byRole.writer, { path: ICC, value: 0.2, reason: 'x' })).status).toBe(403);
    expect((await suggest(w, w.byRole.viewer, { path: ICC, value: 0.2, reason: 'x' })).status).toBe(403);
  });

  it('a suggestion whose field changed meanwhile is not applied blindly', async () => {
    const w = await classroom();
    const s = (await suggest(w, w.byRole.consultant, { path: ICC, value: 0.2, reason: 'Regional data.' })).body;
    const d = await currentDesign(w);
    d.design.assumptions.iccs[0].value = 0.1;
    await call(design.PUT as Handler, 'PUT', `${base(w)}/design`, { studyId: w.studyId }, w.byRole.editor, { baseRevision: d.revision, design: d.design });

    const listed = (await call(suggestions.GET as Handler, 'GET', `${base(w)}/suggestions?state=pending`, { studyId: w.studyId }, w.byRole.owner)).body.items[0];
    expect(listed).toMatchObject({ changedSince: true, currentValue: 0.1, oldValue: 0.15 });

    const blind = await acceptIt(w, w.byRole.owner, s.id);
    expect(blind.status).toBe(409);
    expect(blind.body.error.message).toMatch(/changed since the suggestion was made: it was 0\.15 and is 0\.1 now/);
    const wrong = await acceptIt(w, w.byRole.owner, s.id, { confirmedCurrentValue: 0.15 });
    expect(wrong.status).toBe(409);
    expect((await currentDesign(w)).revision).toBe(3);

    const confirmed = await acceptIt(w, w.byRole.owner, s.id, { confirmedCurrentValue: 0.1 });
    expect(confirmed.status).toBe(200);
    expect(confirmed.body.acceptedRevision).toBe(4);
    expect((await currentDesign(w)).design.assumptions.iccs[0].value).toBe(0.2);
  });

  it('declining needs a reason, tells the suggester, and changes nothing in the design', async () => {
    const w = await classroom();
    const s = (await suggest(w, w.byRole.consultant, { path: 'outcome.name', value: 'Reading age', reason: 'Clearer.' })).body;
    const path = `${base(w)}/suggestions/${s.id}/decline`;
    expect((await call(decline.POST as Handler, 'POST', path, { studyId: w.studyId, suggestionId: s.id }, w.byRole.owner, { reason: '' })).status).toBe(400);
    sent.length = 0;
    const r = await call(decline.POST as Handler, 'POST', path, { studyId: w.studyId, suggestionId: s.id }, w.byRole.owner, { reason: 'The funder asked for "reading score".' });
    expect(r.status).toBe(200);
    expect(r.body).toMatchObject({ status: 'declined', decisionReason: 'The funder asked for "reading score".', acceptedRevision: null });
    expect(sent).toEqual([expect.objectContaining({ kind: 'decision', recipientIds: [w.byRole.consultant.id], dedupeKey: `suggestion:${s.id}:declined` })]);
    expect((await currentDesign(w)).revision).toBe(2);
    expect((await actions(w)).at(-1)).toBe('suggestion.declined');
    expect((await acceptIt(w, w.byRole.owner, s.id)).status).toBe(409);
  });
});
