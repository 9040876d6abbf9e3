/**
 * The activity log (issue 12, point 6): filters by kind of event, person and days, pages, words
 * for every entry, and the CSV export (RFC 4180, formula cells defused), which is itself logged.
 */
import { sql } from 'kysely';
import { describe, expect, it } from 'vitest';
import * as activity from '@/app/api/v1/studies/[studyId]/activity/route';
import * as activityExport from '@/app/api/v1/studies/[studyId]/activity/export/route';
import { logActivity } from '@/db/repositories/activity';
import { db } from '@/lib/db';
import { ctx, makeWorld, request, type TestUser, type World } from '../support/fixtures';

async function log(w: World, who: TestUser, action: string, when: string, details: Record<string, unknown> = {}) {
  await logActivity(db(), { workspaceId: w.workspaceId, studyId: w.studyId, actorId: who.id, action, details });
  await sql`update activity_log set created_at = ${new Date(when)} where id = (select max(id) from activity_log)`.execute(db());
}

async function seed(w: World) {
  await log(w, w.byRole.owner, 'design.saved', '2026-11-30T09:00:00Z', { revision: 3 });
  await log(w, w.byRole.consultant, 'comment.created', '2026-12-01T10:00:00Z', { excerpt: '=HYPERLINK("http://evil.example","click")' });
  await log(w, w.byRole.owner, 'comment.replied', '2026-12-01T11:00:00Z', { excerpt: 'Yes, from the pilot, see "Table 2", p. 4' });
  await log(w, w.byRole.consultant, 'suggestion.created', '2026-12-02T08:00:00Z', { fieldLabel: 'ICC of classroom', after: '0.15' });
  await log(w, w.byRole.owner, 'suggestion.accepted', '2026-12-02T09:00:00Z', { fieldLabel: 'ICC of classroom' });
  await log(w, w.byRole.consultant, 'signoff.created', '2026-12-03T12:00:00Z', { name: 'ethics v2' });
  await log(w, w.byRole.owner, 'simulation.started', '2026-12-03T13:00:00Z');
  await log(w, w.byRole.owner, 'member.role-changed', '2026-12-03T14:00:00Z', { from: 'viewer', to: 'writer' });
}

const list = async (w: World, user: TestUser, query = '') => {
  const res = await activity.GET(request('GET', `/api/v1/studies/${w.studyId}/activity${query}`, { user }), ctx({ studyId: w.studyId }));
  return { status: res.status, body: await res.json() };
};

describe('activity filters', () => {
  it('filters by kind of event, person and days (UTC, both ends included), newest first, in words', async () => {
    const w = await makeWorld();
    await seed(w);
    const all = await list(w, w.byRole.viewer);
    expect(all.status).toBe(200);
    expect(all.body.total).toBe(8);
    expect(all.body.items[0].summary).toMatch(/changed a member’s role from viewer to writer$/);

    const comments = await list(w, w.byRole.viewer, '?kind=comments');
    expect(comments.body.items.map((i: { action: string }) => i.action)).toEqual(['comment.replied', 'comment.created']);

    const consultant = await list(w, w.byRole.viewer, `?actor=${w.byRole.consultant.id}`);
    expect(consultant.body.total).toBe(3);

    const days = await list(w, w.byRole.viewer, '?from=2026-12-01&to=2026-12-02');
    expect(days.body.items.map((i: { action: string }) => i.action)).toEqual(['suggestion.accepted', 'suggestion.created', 'comment.replied', 'comment.created']);

    const signoffs = await list(w, w.byRole.viewer, `?kind=signoffs&actor=${w.byRole.consultant.id}&from=2026-12-03&to=2026-12-03`);
    expect(signoffs.body.items.map((i: { summary: string }) => i.summary)).toEqual([expect.stringMatching(/signed off version “ethics v2”$/)]);
  });

  it('pages by 25', async () => {
    const w = await makeWorld();
    for (let i = 0; i < 30; i++) await logActivity(db(), { studyId: w.studyId, actorId: w.byRole.owner.id, action: 'design.saved', details: { revision: i } });
    const first = await list(w, w.byRole.owner);
    const second = await list(w, w.byRole.owner, '?page=2');
    expect(first.body.items).toHaveLength(25);
    expect(second.body.items).toHaveLength(5);
    expect(second.body).toMatchObject({ total: 30, page: 2, pageSize: 25 });
  });

  it('says what to fix for a bad filter', async () => {
    const w = await makeWorld();
    const bad = await list(w, w.byRole.owner, '?from=2026-12-05&to=2026-12-01');
    expect(bad.status).toBe(400);
    expect(bad.body.error.message).toContain('The first day must not be after the last day.');
    expect((await list(w, w.byRole.owner, '?from=2026-02-30')).status).toBe(400);
    expect((await list(w, w.byRole.owner, '?kind=everything')).status).toBe(400);
  });
});

describe('activity export', () => {
  const download = (w: World, user: TestUser | null, query = '') =>
    activityExport.GET(request('GET', `/api/v1/studies/${w.studyId}/activity/export${query}`, { user }), ctx({ studyId: w.studyId }));

  it('is a CSV file with quoting, defused formula cells, the filters applied, and is logged', async () => {
    const w = await makeWorld();
    await seed(w);
    const res = await download(w, w.byRole.writer, '?kind=comments');
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toMatch(/^text\/csv/);
    expect(res.headers.get('content-disposition')).toMatch(/^attachment; filename="reading-support-programme-activity-\d{4}-\d{2}-\d{2}\.csv"$/);
    const csv = await res.text();
    const lines = csv.split('\r\n');
    expect(lines[0]).toBe('Time (UTC),Person,E-mail,What happened,Action,Details');
    expect(lines).toHaveLength(4); // header, two comments, and the empty string after the last CRLF
    expect(lines[3]).toBe('');
    expect(lines[1]).toMatch(/^2026-12-01T11:00:00\.000Z,owner \d+,owner\.\d+@test\.example,"owner \d+ replied in a thread: “Yes, from the pilot, see ""Table 2"", p\. 4”",comment\.replied,/);
    // The typed formula is text: quoted, the quotes doubled, and an apostrophe would lead a cell
    // that starts with "=" (here the cell starts with the person's name, the details with "{").
    expect(lines[2]).toContain('commented: “=HYPERLINK(""http://evil.example"",""click"")”');
    const logged = await db().selectFrom('activity_log').selectAll().where('action', '=', 'activity.exported').execute();
    expect(logged).toHaveLength(1);
    expect(logged[0]).toMatchObject({ actor_id: w.byRole.writer.id, details: { rows: 2, kind: 'comments' } });
  });

  it('defuses a cell that starts with a formula character', async () => {
    const w = await makeWorld();
    await db().updateTable('User').set({ name: '=cmd|" /C calc"!A0' }).where('id', '=', w.byRole.editor.id).execute();
    await log(w, w.byRole.editor, 'design.saved', '2026-12-01T10:00:00Z');
    const csv = await (await download(w, w.byRole.owner)).text();
    expect(csv.split('\r\n')[1]).toMatch(/^2026-12-01T10:00:00\.000Z,"'=cmd\|"" \/C calc""!A0",/);
  });

  it('is for members only: someone outside the study gets 404', async () => {
    const w = await makeWorld();
    expect((await download(w, w.workspaceOnly)).status).toBe(404);
    expect((await download(w, w.outsider)).status).toBe(404);
    expect((await download(w, null)).status).toBe(401);
  });
});
