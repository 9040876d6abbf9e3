/**
 * The mail queue (lib/mail/queue.ts, lib/mail/sender.ts): a message is written with the action
 * that causes it, once per cause, and sent once; a failed attempt is retried and ends `failed`;
 * a mail outage does not fail an invitation, whose list shows how far its e-mail got, and a
 * failed one can be sent again.
 */
import { sql } from 'kysely';
import { afterEach, describe, expect, it } from 'vitest';
import * as invitationResend from '@/app/api/v1/invitations/[invitationId]/resend/route';
import * as studyInvitations from '@/app/api/v1/studies/[studyId]/invitations/route';
import * as accept from '@/app/api/v1/invitations/accept/route';
import { db } from '@/lib/db';
import { deliverMail, MailBusy, queueMail, STALE_SENDING_SECONDS } from '@/lib/mail/queue';
import { startMailSender, stopMailSender } from '@/lib/mail/sender';
import { drainMail } from '../support/drain-mail';
import { ctx, makeUser, makeWorld, request, type World } from '../support/fixtures';
import { linkIn, sentMail, smtp } from '../support/mail';

const message = (to = 'lena@test.example') => ({ to, subject: 'Hello', text: 'Open http://localhost:3100/x?token=abc', html: '<p>Hello</p>' });

async function queue(key: string, to?: string): Promise<string> {
  return db()
    .transaction()
    .execute((trx) => queueMail(trx, { kind: 'invitation', idempotencyKey: key, mail: message(to) }));
}

const row = (id: string) => db().selectFrom('mail').selectAll().where('id', '=', id).executeTakeFirstOrThrow();

async function jobsFor(mailId: string): Promise<number> {
  const { rows } = await sql<{ n: string }>`select count(*) as n from pgboss.job where name = 'mail' and data->>'mailId' = ${mailId}`.execute(db());
  return Number(rows[0]!.n);
}

describe('queueing', () => {
  it('writes the message and its job in the caller’s transaction: a rolled-back action leaves neither', async () => {
    let id = '';
    await expect(
      db()
        .transaction()
        .execute(async (trx) => {
          id = await queueMail(trx, { kind: 'invitation', idempotencyKey: 'rolled-back', mail: message() });
          throw new Error('the action failed');
        }),
    ).rejects.toThrow('the action failed');
    expect(id).not.toBe('');
    expect(await db().selectFrom('mail').selectAll().execute()).toEqual([]);
    expect(await jobsFor(id)).toBe(0);
  });

  it('queues one message and one job per idempotency key', async () => {
    const first = await queue('invitation:same-cause');
    const second = await queue('invitation:same-cause');
    expect(second).toBe(first);
    expect(await db().selectFrom('mail').select('id').execute()).toHaveLength(1);
    expect(await jobsFor(first)).toBe(1);
  });
});

describe('sending', () => {
  it('sends a message once, with a Message-ID of its own, and erases its bodies', async () => {
    const id = await queue('k1');
    expect(await deliverMail(db(), id, { final: false })).toBe('sent');
    expect(await deliverMail(db(), id, { final: false })).toBe('settled');
    expect(sentMail).toHaveLength(1);
    expect(sentMail[0]!.messageId).toBe(`<${id}@unitwise.mail>`);
    expect(await row(id)).toMatchObject({ status: 'sent', attempts: 1, text: null, html: null, last_error: null });
    expect((await row(id)).sent_at).toBeInstanceOf(Date);
  });

  it('two senders holding the same message send it once', async () => {
    const id = await queue('k2');
    smtp.latencyMs = 50;
    const outcomes = await Promise.allSettled([deliverMail(db(), id, { final: false }), deliverMail(db(), id, { final: false })]);
    expect(sentMail).toHaveLength(1);
    const [a, b] = outcomes;
    const results = [a, b].map((o) => (o.status === 'fulfilled' ? o.value : (o.reason as Error).name));
    expect(results.sort()).toEqual(['MailBusy', 'sent']);
  });

  it('a message left `sending` by a sender that died is sent again once it is stale (the at-least-once window)', async () => {
    const id = await queue('k3');
    await db().updateTable('mail').set({ status: 'sending', claimed_at: new Date() }).where('id', '=', id).execute();
    await expect(deliverMail(db(), id, { final: false })).rejects.toBeInstanceOf(MailBusy);
    await db()
      .updateTable('mail')
      .set({ claimed_at: new Date(Date.now() - (STALE_SENDING_SECONDS + 1) * 1000) })
      .where('id', '=', id)
      .execute();
    expect(await deliverMail(db(), id, { final: false })).toBe('sent');
    expect(sentMail).toHaveLength(1);
  });

  it('records a failed attempt as retrying, and the last one as failed', async () => {
    const id = await queue('k4');
    smtp.down = true;
    await expect(deliverMail(db(), id, { final: false })).rejects.toThrow(/ECONNREFUSED/);
    expect(await row(id)).toMatchObject({ status: 'retrying', attempts: 1, last_error: expect.stringContaining('ECONNREFUSED') });
    await expect(deliverMail(db(), id, { final: true })).rejects.toThrow(/ECONNREFUSED/);
    expect(await row(id)).toMatchObject({ status: 'failed', attempts: 2 });
    smtp.down = false;
    expect(await deliverMail(db(), id, { final: false })).toBe('settled');
    expect(sentMail).toHaveLength(0);
  });
});

describe('invitations during a mail outage', () => {
  afterEach(async () => {
    await stopMailSender();
  });

  async function invite(w: World, email: string) {
    const res = await studyInvitations.POST(
      request('POST', `/api/v1/studies/${w.studyId}/invitations`, { user: w.byRole.owner, body: { email, role: 'consultant' } }),
      ctx({ studyId: w.studyId }),
    );
    return { status: res.status, body: await res.json() };
  }

  async function delivery(w: World): Promise<string | null> {
    const res = await studyInvitations.GET(request('GET', `/api/v1/studies/${w.studyId}/invitations`, { user: w.byRole.owner }), ctx({ studyId: w.studyId }));
    return (await res.json()).items[0].delivery;
  }

  it('store the invitation (201), show the e-mail as sending, then failed and retrying, then sent, through the queue’s own sender', { timeout: 30_000 }, async () => {
    const w = await makeWorld();
    smtp.down = true;
    const created = await invite(w, 'lena@test.example');
    expect(created.status).toBe(201);
    expect(created.body).toMatchObject({ state: 'pending', delivery: 'sending' });

    await startMailSender();
    await expect.poll(() => delivery(w), { timeout: 10_000 }).toBe('retrying');
    // The outage ends; the retry is due (its delay, 15–30 s for the first, has passed).
    smtp.down = false;
    // The message is marked retrying before its job is failed back to the queue: wait for the job.
    const retries = async () =>
      Number((await sql<{ n: string }>`select count(*) as n from pgboss.job where name = 'mail' and state = 'retry'`.execute(db())).rows[0]!.n);
    await expect.poll(retries, { timeout: 10_000 }).toBe(1);
    await sql`update pgboss.job set start_after = now() where name = 'mail' and state = 'retry'`.execute(db());
    await expect.poll(() => delivery(w), { timeout: 10_000 }).toBe('sent');
    expect(sentMail.map((m) => m.to)).toEqual(['lena@test.example']);
  });

  it('once its retries are used up, the e-mail shows as failed and can be sent again with a new link; the old link stops working', async () => {
    const w = await makeWorld();
    const lena = await makeUser('lena');
    smtp.down = true;
    const created = await invite(w, lena.email);
    const [mail] = await db().selectFrom('mail').select(['id', 'text']).execute();
    const oldToken = linkIn(mail!.text!).split('/invitations/')[1]!;
    await expect(deliverMail(db(), mail!.id, { final: true })).rejects.toThrow();
    expect(await delivery(w)).toBe('failed');

    smtp.down = false;
    const resent = await invitationResend.POST(
      request('POST', `/api/v1/invitations/${created.body.id}/resend`, { user: w.byRole.owner }),
      ctx({ invitationId: created.body.id }),
    );
    expect(resent.status).toBe(200);
    expect(await resent.json()).toMatchObject({ id: created.body.id, state: 'pending', delivery: 'sending' });
    // Not twice while the new e-mail is on its way.
    const again = await invitationResend.POST(
      request('POST', `/api/v1/invitations/${created.body.id}/resend`, { user: w.byRole.owner }),
      ctx({ invitationId: created.body.id }),
    );
    expect(again.status).toBe(409);

    const [sent] = await drainMail();
    expect(await delivery(w)).toBe('sent');
    const newToken = linkIn(sent!.text).split('/invitations/')[1]!;
    expect(newToken).not.toBe(oldToken);
    const acceptWith = (token: string) => accept.POST(request('POST', '/api/v1/invitations/accept', { user: lena, body: { token } }), ctx({}));
    expect((await acceptWith(oldToken)).status).toBe(404);
    expect((await acceptWith(newToken)).status).toBe(200);
  });
});
