/**
 * Idempotent retries (lib/api/idempotency.ts): a write sent again with the same Idempotency-Key
 * is carried out once and answered the same; the same key with another request is refused;
 * duplicates sent together write once; two people's equal keys never meet; a write whose
 * transaction failed before it committed is carried out by its retry, once.
 */
import { sql } from 'kysely';
import { describe, expect, it } from 'vitest';
import { pruneIdempotencyKeys } from '@/db/repositories/idempotency';
import { db } from '@/lib/db';
import * as checks from '@/app/api/v1/studies/[studyId]/checks/route';
import * as notes from '@/app/api/v1/studies/[studyId]/finding-notes/route';
import * as studies from '@/app/api/v1/studies/route';
import * as wsMember from '@/app/api/v1/workspaces/[workspaceId]/members/[userId]/route';
import { createDb } from '@/db/client';
import { openApiDocument } from '@/lib/api/openapi';
import { ctx, makeWorld, request, type TestUser } from '../support/fixtures';

type World = Awaited<ReturnType<typeof makeWorld>>;

const NOTE = { ruleId: 'unit-of-analysis', key: 'pupil', status: 'addressed', reason: 'Analysed by classroom means.' } as const;

function addNote(w: World, user: TestUser, key: string | undefined, body: unknown = NOTE) {
  const headers: Record<string, string> = key === undefined ? {} : { 'Idempotency-Key': key };
  return notes.POST(request('POST', `/api/v1/studies/${w.studyId}/finding-notes`, { user, body, headers }), ctx({ studyId: w.studyId }));
}

async function noteCount(w: World): Promise<number> {
  const r = await db().selectFrom('finding_notes').select((eb) => eb.fn.countAll<string>().as('n')).where('study_id', '=', w.studyId).executeTakeFirstOrThrow();
  return Number(r.n);
}

async function answer(res: Response) {
  return { status: res.status, body: await res.text(), replayed: res.headers.get('Idempotent-Replayed') };
}

describe('a write sent twice with the same key', () => {
  it('is carried out once and answered the same both times', async () => {
    const w = await makeWorld();
    const first = await answer(await addNote(w, w.byRole.owner, 'note-2026-12-03-a'));
    const again = await answer(await addNote(w, w.byRole.owner, 'note-2026-12-03-a'));
    expect(first).toMatchObject({ status: 201, replayed: null });
    expect(again).toEqual({ ...first, replayed: 'true' });
    expect(await noteCount(w)).toBe(1);
    const activity = await db().selectFrom('activity_log').select('action').where('study_id', '=', w.studyId).where('action', '=', 'finding.addressed').execute();
    expect(activity).toHaveLength(1);
  });

  it('without a key is carried out twice, as before', async () => {
    const w = await makeWorld();
    expect((await addNote(w, w.byRole.owner, undefined)).status).toBe(201);
    expect((await addNote(w, w.byRole.owner, undefined)).status).toBe(201);
    expect(await noteCount(w)).toBe(2);
  });

  it('answers a repeated DELETE with the first answer (204), not with 404', async () => {
    const w = await makeWorld();
    const remove = () =>
      wsMember.DELETE(
        request('DELETE', `/api/v1/workspaces/${w.workspaceId}/members/${w.workspaceOnly.id}`, { user: w.byRole.owner, headers: { 'Idempotency-Key': 'remove-1' } }),
        ctx({ workspaceId: w.workspaceId, userId: w.workspaceOnly.id }),
      );
    expect((await remove()).status).toBe(204);
    const again = await remove();
    expect(again.status).toBe(204);
    expect(again.headers.get('Idempotent-Replayed')).toBe('true');
  });

  it('also replays a write that changed nothing (checking a design)', async () => {
    const w = await makeWorld();
    const run = () =>
      checks.POST(request('POST', `/api/v1/studies/${w.studyId}/checks`, { user: w.byRole.owner, body: {}, headers: { 'Idempotency-Key': 'check-1' } }), ctx({ studyId: w.studyId }));
    const first = await answer(await run());
    expect(first.status).toBe(200);
    expect(await answer(await run())).toEqual({ ...first, replayed: 'true' });
  });
});

describe('a key reused for another request', () => {
  it('is refused with a message that says why, and nothing is written', async () => {
    const w = await makeWorld();
    expect((await addNote(w, w.byRole.owner, 'k-1')).status).toBe(201);
    const other = await addNote(w, w.byRole.owner, 'k-1', { ...NOTE, reason: 'A different reason.' });
    expect(other.status).toBe(409);
    expect((await other.json()).error.message).toMatch(/already used .* for another request \(POST \/api\/v1\/studies\/.*\/finding-notes with another body\)/);
    expect(await noteCount(w)).toBe(1);
  });

  it('on another route is refused too', async () => {
    const w = await makeWorld();
    expect((await addNote(w, w.byRole.owner, 'k-2')).status).toBe(201);
    const res = await studies.POST(
      request('POST', '/api/v1/studies', { user: w.byRole.owner, body: { workspaceId: w.workspaceId, title: 'Another' }, headers: { 'Idempotency-Key': 'k-2' } }),
      ctx({}),
    );
    expect(res.status).toBe(409);
    expect(await db().selectFrom('studies').select('id').execute()).toHaveLength(1);
  });

  it('is not a key of its own when it is malformed', async () => {
    const w = await makeWorld();
    const res = await addNote(w, w.byRole.owner, 'has spaces in it');
    expect(res.status).toBe(400);
    expect((await res.json()).error.message).toMatch(/Idempotency-Key header must be 1 to 255 visible characters/);
    expect(await noteCount(w)).toBe(0);
  });
});

describe('keys', () => {
  it('of two people never meet', async () => {
    const w = await makeWorld();
    const a = await answer(await addNote(w, w.byRole.owner, 'same-key'));
    const b = await answer(await addNote(w, w.byRole.editor, 'same-key'));
    expect([a.status, a.replayed, b.status, b.replayed]).toEqual([201, null, 201, null]);
    expect(await noteCount(w)).toBe(2);
  });

  it('are not kept for an error: the retry of a refused write runs again', async () => {
    const w = await makeWorld();
    const bad = await addNote(w, w.byRole.owner, 'k-3', { ...NOTE, status: 'maybe' });
    expect(bad.status).toBe(400);
    expect(await db().selectFrom('idempotency_keys').select('key').execute()).toEqual([]);
    expect((await addNote(w, w.byRole.owner, 'k-3')).status).toBe(201);
  });

  it('count as new after 24 hours and are pruned', async () => {
    const w = await makeWorld();
    expect((await addNote(w, w.byRole.owner, 'old-key')).status).toBe(201);
    await db().updateTable('idempotency_keys').set({ created_at: sql<Date>`now() - interval '25 hours'` }).execute();
    const later = await addNote(w, w.byRole.owner, 'old-key', { ...NOTE, reason: 'Written a day later.' });
    expect([later.status, later.headers.get('Idempotent-Replayed')]).toEqual([201, null]);
    expect(await noteCount(w)).toBe(2);

    await db().updateTable('idempotency_keys').set({ created_at: sql<Date>`now() - interval '25 hours'` }).execute();
    expect(await pruneIdempotencyKeys(db())).toBe(1);
    expect(await db().selectFrom('idempotency_keys').select('key').execute()).toEqual([]);
  });
});

describe('duplicates sent together', () => {
  it('write once and all get the same answer', async () => {
    const w = await makeWorld();
    for (let trial = 0; trial < 10; trial++) {
      const key = `together-${trial}`;
      const answers = await Promise.all(Array.from({ length: 6 }, () => addNote(w, w.byRole.owner, key).then(answer)));
      expect(await noteCount(w), `trial ${trial}`).toBe(trial + 1);
      expect(new Set(answers.map((a) => `${a.status} ${a.body}`)).size, `trial ${trial}`).toBe(1);
      expect(answers[0]!.status).toBe(201);
      expect(answers.filter((a) => a.replayed === null), `trial ${trial}: one answer is the original`).toHaveLength(1);
    }
  });
});

describe('writes with keys', () => {
  it('take the same locks: two admins demoting each other still leave an admin', async () => {
    for (let trial = 0; trial < 10; trial++) {
      const w = await makeWorld();
      const admin = w.byRole.editor;
      await db().updateTable('workspace_members').set({ role: 'admin' }).where('workspace_id', '=', w.workspaceId).where('user_id', '=', admin.id).execute();
      const demote = (by: TestUser, target: TestUser) =>
        wsMember.PATCH(
          request('PATCH', `/api/v1/workspaces/${w.workspaceId}/members/${target.id}`, { user: by, body: { role: 'member' }, headers: { 'Idempotency-Key': `demote-${trial}` } }),
          ctx({ workspaceId: w.workspaceId, userId: target.id }),
        );
      const answers = await Promise.all([demote(w.byRole.owner, admin), demote(admin, w.byRole.owner)]);
      expect(answers.map((r) => r.status).sort(), `trial ${trial}`).toEqual([200, 403]);
      const admins = await db().selectFrom('workspace_members').select('user_id').where('workspace_id', '=', w.workspaceId).where('role', '=', 'admin').execute();
      expect(admins, `trial ${trial}`).toHaveLength(1);
    }
  });
});

describe('a write whose transaction failed before it committed', () => {
  it('is carried out by its retry, once', async () => {
    const w = await makeWorld();
    // Hold the study's row from another connection, so that the write waits inside its
    // transaction (the key claimed, nothing committed); then cancel the write's statement.
    // (Ending its connection instead, as a database restart does, is the same to the
    // transaction, but the pool of this test process does not yet handle a lost connection.)
    const other = createDb(process.env.DATABASE_URL!, { max: 2 });
    try {
      const blocker = await other.startTransaction().execute();
      await blocker.selectFrom('studies').select('id').where('id', '=', w.studyId).forUpdate().execute();
      const pending = addNote(w, w.byRole.owner, 'cancelled-once');
      let pid: number | undefined;
      for (let i = 0; i < 200 && pid === undefined; i++) {
        const { rows } = await sql<{ pid: number }>`
          select pid from pg_stat_activity
          where wait_event_type = 'Lock' and datname = current_database() and query ilike '%from "studies"%for share%'`.execute(other);
        pid = rows[0]?.pid;
        if (pid === undefined) await new Promise((r) => setTimeout(r, 10));
      }
      expect(pid, 'the write was seen waiting for the lock').toBeDefined();
      await sql`select pg_cancel_backend(${pid})`.execute(other);
      const failed = await pending;
      expect(failed.status).toBe(500);
      await blocker.rollback().execute();
    } finally {
      await other.destroy();
    }
    expect(await noteCount(w)).toBe(0);
    expect(await db().selectFrom('idempotency_keys').select('key').execute()).toEqual([]);

    const retry = await addNote(w, w.byRole.owner, 'cancelled-once');
    expect([retry.status, retry.headers.get('Idempotent-Replayed')]).toEqual([201, null]);
    expect((await addNote(w, w.byRole.owner, 'cancelled-once')).headers.get('Idempotent-Replayed')).toBe('true');
    expect(await noteCount(w)).toBe(1);
  });
});

describe('the API document', () => {
  it('lists the Idempotency-Key header on every signed-in write, and only there', () => {
    const doc = openApiDocument() as unknown as { paths: Record<string, Record<string, { security?: unknown[]; parameters?: { name: string; in: string }[] }>> };
    const withKey: string[] = [];
    const writes: string[] = [];
    for (const [path, methods] of Object.entries(doc.paths)) {
      for (const [method, op] of Object.entries(methods)) {
        if (op.parameters?.some((p) => p.in === 'header' && p.name === 'Idempotency-Key')) withKey.push(`${method} ${path}`);
        const signedIn = op.security === undefined || op.security.length > 0;
        if (['post', 'put', 'patch', 'delete'].includes(method) && signedIn) writes.push(`${method} ${path}`);
      }
    }
    expect(writes.length).toBeGreaterThan(10);
    expect(withKey.sort()).toEqual(writes.sort());
  });
});
