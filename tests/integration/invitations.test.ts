/** Invitations: e-mailed, single use, expiring, revocable, and only for the invited address. */
import { describe, expect, it } from 'vitest';
import { db } from '@/lib/db';
import * as accept from '@/app/api/v1/invitations/accept/route';
import * as studyInvitations from '@/app/api/v1/studies/[studyId]/invitations/route';
import * as studyMembers from '@/app/api/v1/studies/[studyId]/members/route';
import * as study from '@/app/api/v1/studies/[studyId]/route';
import * as revoke from '@/app/api/v1/invitations/[invitationId]/route';
import { ctx, makeUser, makeWorld, request } from '../support/fixtures';
import { linkIn, sentMail } from '../support/mail';
import { drainMail } from '../support/drain-mail';

async function invite(w: Awaited<ReturnType<typeof makeWorld>>, email: string, role = 'consultant') {
  const res = await studyInvitations.POST(
    request('POST', `/api/v1/studies/${w.studyId}/invitations`, { user: w.byRole.owner, body: { email, role } }),
    ctx({ studyId: w.studyId }),
  );
  expect(res.status).toBe(201);
  await drainMail();
  const mail = sentMail.at(-1)!;
  const token = linkIn(mail.text).split('/invitations/')[1]!;
  return { token, body: await res.json(), mail };
}

function acceptAs(user: Awaited<ReturnType<typeof makeUser>> | null, token: string) {
  return accept.POST(request('POST', '/api/v1/invitations/accept', { user, body: { token } }), ctx({}));
}

describe('study invitations', () => {
  it('mails a link; the invited person joins with the role and can read but not edit', async () => {
    const w = await makeWorld();
    const lena = await makeUser('lena');
    const { token, body, mail } = await invite(w, lena.email);
    expect(body).toMatchObject({ email: lena.email, studyRole: 'consultant', state: 'pending' });
    expect(body).not.toHaveProperty('token');
    expect(mail.to).toBe(lena.email);
    expect(mail.subject).toContain('Reading-support programme');

    const res = await acceptAs(lena, token);
    expect(res.status).toBe(200);
    expect(await res.json()).toEqual({ workspaceId: w.workspaceId, studyId: w.studyId });

    const read = await study.GET(request('GET', `/api/v1/studies/${w.studyId}`, { user: lena }), ctx({ studyId: w.studyId }));
    expect((await read.json()).role).toBe('consultant');
    const edit = await study.PATCH(request('PATCH', `/api/v1/studies/${w.studyId}`, { user: lena, body: { title: 'Mine now' } }), ctx({ studyId: w.studyId }));
    expect(edit.status).toBe(403);

    const members = await (await studyMembers.GET(request('GET', `/api/v1/studies/${w.studyId}/members`, { user: lena }), ctx({ studyId: w.studyId }))).json();
    expect(members.items.find((m: { email: string }) => m.email === lena.email).role).toBe('consultant');
  });

  it('works once', async () => {
    const w = await makeWorld();
    const lena = await makeUser('lena');
    const { token } = await invite(w, lena.email);
    expect((await acceptAs(lena, token)).status).toBe(200);
    const again = await acceptAs(lena, token);
    expect(again.status).toBe(410);
    expect((await again.json()).error.message).toMatch(/already used/);
  });

  it('is only for the invited address', async () => {
    const w = await makeWorld();
    const lena = await makeUser('lena');
    const mallory = await makeUser('mallory');
    const { token } = await invite(w, lena.email);
    const res = await acceptAs(mallory, token);
    expect(res.status).toBe(403);
    expect((await res.json()).error.message).toContain(lena.email);
    expect((await acceptAs(lena, token)).status).toBe(200);
  });

  it('expires after its lifetime', async () => {
    const w = await makeWorld();
    const lena = await makeUser('lena');
    const { token } = await invite(w, lena.email);
    await db().updateTable('invitations').set({ expires_at: new Date(Date.now() - 1000) }).execute();
    expect((await acceptAs(lena, token)).status).toBe(410);
  });

  it('can be revoked before it is used', async () => {
    const w = await makeWorld();
    const lena = await makeUser('lena');
    const { token, body } = await invite(w, lena.email);
    const r = await revoke.DELETE(request('DELETE', `/api/v1/invitations/${body.id}`, { user: w.byRole.owner }), ctx({ invitationId: body.id }));
    expect(r.status).toBe(204);
    expect((await acceptAs(lena, token)).status).toBe(410);
  });

  it('needs a signed-in user, and an unknown token is a 404', async () => {
    const w = await makeWorld();
    const { token } = await invite(w, 'someone@test.example');
    expect((await acceptAs(null, token)).status).toBe(401);
    const lena = await makeUser('lena');
    expect((await acceptAs(lena, 'x'.repeat(43))).status).toBe(404);
  });

  it('refuses a malformed e-mail with a field error, and saves nothing', async () => {
    const w = await makeWorld();
    const res = await studyInvitations.POST(
      request('POST', `/api/v1/studies/${w.studyId}/invitations`, { user: w.byRole.owner, body: { email: 'not-an-address', role: 'owner' } }),
      ctx({ studyId: w.studyId }),
    );
    expect(res.status).toBe(400);
    const body = await res.json();
    expect(Object.keys(body.error.fields).sort()).toEqual(['email', 'role']);
    expect(await db().selectFrom('invitations').selectAll().execute()).toHaveLength(0);
    await drainMail();
    expect(sentMail).toHaveLength(0);
  });
});
