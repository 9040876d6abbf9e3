/**
 * Notifications by e-mail (issue 12, point 7): notify() stores one notification per current
 * member, never the actor, once per cause; each person's setting per kind decides between one
 * message at once (durable mail queue, with RFC 8058 unsubscribe headers), the daily digest
 * grouped by study, and nothing. Unsubscribe tokens are bound to a person and a kind. Time is
 * injected: no test waits for a clock.
 */
import { createHmac } from 'node:crypto';
import { sql } from 'kysely';
import { describe, expect, it } from 'vitest';
import * as settingsRoute from '@/app/api/v1/me/notification-settings/route';
import * as unsubscribeRoute from '@/app/api/v1/unsubscribe/[token]/route';
import { insertStudy, upsertStudyMember } from '@/db/repositories/studies';
import { db } from '@/lib/db';
import { deliverMail } from '@/lib/mail/queue';
import { digestCutoff, sendDueDigests } from '@/lib/notifications/digest';
import { notify, type NotificationEvent } from '@/lib/notifications/notify';
import { readUnsubscribeToken, unsubscribeToken } from '@/lib/notifications/unsubscribe-token';
import { drainMail } from '../support/drain-mail';
import { BASE, ctx, makeWorld, request, type TestUser, type World } from '../support/fixtures';
import { sentMail } from '../support/mail';

function event(w: World, over: Partial<NotificationEvent> = {}): NotificationEvent {
  return {
    kind: 'mention',
    recipientIds: [w.byRole.owner.id],
    studyId: w.studyId,
    actorId: w.byRole.consultant.id,
    subject: 'consultant mentioned you on Reading-support programme',
    text: '“@owner is the ICC of 0.2 from the pilot?”',
    path: `/studies/${w.studyId}/review?thread=t1`,
    dedupeKey: 'comment:c1:mention',
    ...over,
  };
}

const send = (e: NotificationEvent, now?: Date) =>
  db()
    .transaction()
    .execute((trx) => notify(trx, e, { now }));

const notificationsOf = (userId: string) => db().selectFrom('notifications').selectAll().where('recipient_id', '=', userId).orderBy('created_at').execute();
const mailRows = () => db().selectFrom('mail').selectAll().orderBy('created_at').execute();

async function setDelivery(user: TestUser, body: Record<string, string>): Promise<Response> {
  return settingsRoute.PUT(request('PUT', '/api/v1/me/notification-settings', { user, body }), ctx({}));
}

describe('notify', () => {
  it('tells each current member once, never the actor, and ignores people outside the study', async () => {
    const w = await makeWorld();
    await send(
      event(w, {
        recipientIds: [w.byRole.owner.id, w.byRole.owner.id, w.byRole.consultant.id, w.workspaceOnly.id, w.outsider.id, w.byRole.editor.id],
      }),
    );
    expect(await notificationsOf(w.byRole.owner.id)).toHaveLength(1);
    expect(await notificationsOf(w.byRole.editor.id)).toHaveLength(1);
    expect(await notificationsOf(w.byRole.consultant.id)).toHaveLength(0); // the actor
    expect(await notificationsOf(w.workspaceOnly.id)).toHaveLength(0); // in the workspace, not the study
    expect(await notificationsOf(w.outsider.id)).toHaveLength(0);
    const sent = await drainMail();
    expect(sent.map((m) => m.to).sort()).toEqual([w.byRole.editor.email, w.byRole.owner.email].sort());
  });

  it('a repeated cause (a retried job, a second call) notifies and mails once', async () => {
    const w = await makeWorld();
    await send(event(w));
    await send(event(w));
    await send(event(w, { subject: 'changed words, same cause' }));
    expect(await notificationsOf(w.byRole.owner.id)).toHaveLength(1);
    expect(await mailRows()).toHaveLength(1);
    await drainMail();
    await drainMail();
    expect(sentMail).toHaveLength(1);
  });

  it('is rolled back with the action that caused it', async () => {
    const w = await makeWorld();
    await expect(
      db()
        .transaction()
        .execute(async (trx) => {
          await notify(trx, event(w));
          throw new Error('the comment could not be saved');
        }),
    ).rejects.toThrow('could not be saved');
    expect(await notificationsOf(w.byRole.owner.id)).toHaveLength(0);
    expect(await mailRows()).toHaveLength(0);
  });

  it('sends an immediate message that says where, what, why, and how to stop, with one-click headers', async () => {
    const w = await makeWorld();
    await send(event(w));
    const [m] = await drainMail();
    expect(m!.subject).toBe('consultant mentioned you on Reading-support programme');
    expect(m!.text).toContain('Study: Reading-support programme');
    expect(m!.text).toContain('is the ICC of 0.2 from the pilot?');
    expect(m!.text).toContain(`${BASE}/studies/${w.studyId}/review?thread=t1`);
    expect(m!.text).toContain('because someone mentioned you in a comment');
    expect(m!.text).toContain(`${BASE}/settings/notifications`);
    expect(m!.html).toContain('Reading-support programme');
    const token = unsubscribeToken(w.byRole.owner.id, 'mention');
    expect(m!.text).toContain(`${BASE}/unsubscribe/${token}`);
    expect(m!.headers).toEqual({
      'List-Unsubscribe': `<${BASE}/api/v1/unsubscribe/${token}>`,
      'List-Unsubscribe-Post': 'List-Unsubscribe=One-Click',
    });
  });

  it('a message whose delivery job is run twice goes out once', async () => {
    const w = await makeWorld();
    await send(event(w));
    const [row] = await mailRows();
    expect(await deliverMail(db(), row!.id, { final: false })).toBe('sent');
    expect(await deliverMail(db(), row!.id, { final: false })).toBe('settled');
    expect(sentMail).toHaveLength(1);
  });

  it('respects each person’s setting: none queues nothing, digest waits, immediate goes out', async () => {
    const w = await makeWorld();
    expect((await setDelivery(w.byRole.owner, { mention: 'none' })).status).toBe(200);
    expect((await setDelivery(w.byRole.editor, { mention: 'digest' })).status).toBe(200);
    await send(event(w, { recipientIds: [w.byRole.owner.id, w.byRole.editor.id, w.byRole.viewer.id] }));
    const sent = await drainMail();
    expect(sent.map((m) => m.to)).toEqual([w.byRole.viewer.email]);
    expect((await notificationsOf(w.byRole.owner.id)).map((n) => n.delivery)).toEqual(['none']);
    expect((await notificationsOf(w.byRole.editor.id)).map((n) => [n.delivery, n.delivered_at])).toEqual([['digest', null]]);
  });

  it('replies default to the daily digest, the other kinds to at once', async () => {
    const w = await makeWorld();
    await send(event(w, { kind: 'reply', dedupeKey: 'comment:c2:reply' }));
    await send(event(w, { kind: 'signoff', dedupeKey: 'signoff:s1' }));
    expect((await notificationsOf(w.byRole.owner.id)).map((n) => [n.kind, n.delivery])).toEqual([
      ['reply', 'digest'],
      ['signoff', 'immediate'],
    ]);
  });
});

describe('the daily digest', () => {
  const day = (iso: string) => new Date(iso);

  it('is due from 07:00 UTC for what happened before then', () => {
    expect(digestCutoff(day('2026-12-04T06:59:00Z')).toISOString()).toBe('2026-12-03T07:00:00.000Z');
    expect(digestCutoff(day('2026-12-04T07:00:00Z')).toISOString()).toBe('2026-12-04T07:00:00.000Z');
    expect(digestCutoff(day('2026-12-04T23:00:00Z')).toISOString()).toBe('2026-12-04T07:00:00.000Z');
  });

  async function twoStudies(w: World) {
    const second = await insertStudy(db(), { workspaceId: w.workspaceId, title: 'Allotment greenhouse trial', description: '', createdBy: w.byRole.owner.id });
    await upsertStudyMember(db(), second.id, w.byRole.owner.id, 'owner');
    await upsertStudyMember(db(), second.id, w.byRole.consultant.id, 'consultant');
    return second.id;
  }

  async function backdate(minutes: number) {
    await db()
      .updateTable('notifications')
      .set({ created_at: sql<Date>`created_at - make_interval(mins => ${minutes})` })
      .execute();
  }

  it('sends one message per person, grouped by study, and a retried run sends nothing more', async () => {
    const w = await makeWorld();
    const secondId = await twoStudies(w);
    await send(event(w, { kind: 'reply', dedupeKey: 'r1', subject: 'Reply on the ICC thread' }));
    await send(event(w, { kind: 'reply', dedupeKey: 'r2', studyId: secondId, subject: 'Reply on the greenhouse thread', path: `/studies/${secondId}/review` }));
    await send(event(w, { kind: 'reply', dedupeKey: 'r3', subject: 'Second reply on the ICC thread' }));
    await backdate(60);
    const now = new Date(Date.now() + 24 * 3600_000); // a cut-off after the three replies

    expect(await sendDueDigests(db(), now)).toBe(1);
    expect(await sendDueDigests(db(), now)).toBe(0); // the job runs again: nothing is left to send
    const sent = await drainMail();
    expect(sent).toHaveLength(1);
    const m = sent[0]!;
    expect(m.to).toBe(w.byRole.owner.email);
    expect(m.subject).toBe('Your Unitwise digest: 3 updates on 2 studies');
    // Studies in alphabetical order, each with its own updates under it in time order.
    const t = m.text;
    const at = (s: string) => t.indexOf(s);
    expect(at('Study: Allotment greenhouse trial')).toBeGreaterThan(-1);
    expect(at('Study: Allotment greenhouse trial')).toBeLessThan(at('Reply on the greenhouse thread'));
    expect(at('Reply on the greenhouse thread')).toBeLessThan(at('Study: Reading-support programme'));
    expect(at('Study: Reading-support programme')).toBeLessThan(at('Reply on the ICC thread'));
    expect(at('Reply on the ICC thread')).toBeLessThan(at('Second reply on the ICC thread'));
    expect(m.headers?.['List-Unsubscribe']).toBe(`<${BASE}/api/v1/unsubscribe/${unsubscribeToken(w.byRole.owner.id, 'digest')}>`);
    expect(m.headers?.['List-Unsubscribe-Post']).toBe('List-Unsubscribe=One-Click');
    const rows = await notificationsOf(w.byRole.owner.id);
    expect(rows.every((r) => r.delivered_at !== null && r.mail_id !== null)).toBe(true);
  });

  it('waits for the digest hour: nothing from after the cut-off goes out early', async () => {
    const w = await makeWorld();
    await send(event(w, { kind: 'reply', dedupeKey: 'r1' }));
    const before = new Date(Date.now() - 3600_000); // a cut-off an hour ago at the latest
    expect(await sendDueDigests(db(), before)).toBe(0);
    expect(await drainMail()).toHaveLength(0);
  });

  it('leaves out kinds turned to none since, and studies the person has left', async () => {
    const w = await makeWorld();
    const secondId = await twoStudies(w);
    await setDelivery(w.byRole.owner, { mention: 'digest' });
    await send(event(w, { kind: 'reply', dedupeKey: 'r1', subject: 'A reply' }));
    await send(event(w, { kind: 'mention', dedupeKey: 'm1', subject: 'A mention' }));
    await send(event(w, { kind: 'mention', dedupeKey: 'm2', studyId: secondId, subject: 'A mention elsewhere' }));
    await setDelivery(w.byRole.owner, { reply: 'none' });
    await db().deleteFrom('study_members').where('study_id', '=', secondId).where('user_id', '=', w.byRole.owner.id).execute();
    await backdate(60);
    expect(await sendDueDigests(db(), new Date(Date.now() + 24 * 3600_000))).toBe(1);
    const [m] = await drainMail();
    expect(m!.text).toContain('A mention');
    expect(m!.text).not.toContain('A reply');
    expect(m!.text).not.toContain('A mention elsewhere');
    expect(m!.subject).toBe('Your Unitwise digest: one update on "Reading-support programme"');
    expect((await notificationsOf(w.byRole.owner.id)).every((r) => r.delivered_at !== null)).toBe(true);
  });
});

describe('unsubscribe links', () => {
  const post = (token: string) =>
    unsubscribeRoute.POST(
      new Request(`${BASE}/api/v1/unsubscribe/${token}`, {
        method: 'POST',
        headers: { 'content-type': 'application/x-www-form-urlencoded' },
        body: 'List-Unsubscribe=One-Click',
      }),
      ctx({ token }),
    );
  const settingsOf = async (u: TestUser) => (await settingsRoute.GET(request('GET', '/api/v1/me/notification-settings', { user: u }), ctx({}))).json();

  it('one click turns that kind off for that person, without signing in, and again changes nothing', async () => {
    const w = await makeWorld();
    const token = unsubscribeToken(w.byRole.owner.id, 'mention');
    const res = await post(token);
    expect(res.status).toBe(200);
    expect((await res.json()).settings.mention).toBe('none');
    expect((await post(token)).status).toBe(200);
    const owner = await settingsOf(w.byRole.owner);
    expect(owner).toMatchObject({ mention: 'none', reply: 'digest', suggestion: 'immediate' });
    expect((await settingsOf(w.byRole.editor)).mention).toBe('immediate'); // nobody else
    await send(event(w));
    expect(await drainMail()).toHaveLength(0);
  });

  it('the digest’s link turns off every kind that came in the digest', async () => {
    const w = await makeWorld();
    await setDelivery(w.byRole.owner, { signoff: 'digest' });
    expect((await post(unsubscribeToken(w.byRole.owner.id, 'digest'))).status).toBe(200);
    expect(await settingsOf(w.byRole.owner)).toMatchObject({ reply: 'none', signoff: 'none', mention: 'immediate' });
  });

  it('cannot be forged, nor turned to another person or kind', async () => {
    const w = await makeWorld();
    const owner = w.byRole.owner.id;
    const editor = w.byRole.editor.id;
    const token = unsubscribeToken(owner, 'mention');
    const [, , sig] = token.split('.') as [string, string, string];
    const flip = (s: string) => (s[0] === 'A' ? 'B' : 'A') + s.slice(1);
    // The last character's two spare bits: a decoder reads the same bytes, the token must still differ.
    const B64 = 'ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789-_';
    const spareBits = (s: string) => s.slice(0, -1) + B64[B64.indexOf(s.at(-1)!) ^ 1];
    const otherSecret = createHmac('sha256', createHmac('sha256', 'another-secret-another-secret-another').update('unitwise/unsubscribe/v1').digest())
      .update(`${owner}.mention`)
      .digest('base64url');
    const forged = [
      `${editor}.mention.${sig}`, // another person with the owner's signature
      `${owner}.reply.${sig}`, // another kind
      `${owner}.digest.${sig}`,
      `${owner}.mention.${flip(sig)}`, // altered signature
      `${owner}.mention.${spareBits(sig)}`, // another spelling of the same bytes
      `${owner}.mention.${otherSecret}`, // signed with another secret
      `${owner}.mention`, // no signature
      `${owner}.mention.${sig}.x`,
      `${owner}.everything.${sig}`,
      'not-a-token',
    ];
    for (const t of forged) {
      expect(readUnsubscribeToken(t), t).toBeNull();
      const res = await post(t);
      expect(res.status, t).toBe(404);
      expect((await res.json()).error.message).toMatch(/not valid/);
    }
    expect(await db().selectFrom('notification_settings').selectAll().execute()).toEqual([]);
    expect(readUnsubscribeToken(token)).toEqual({ userId: owner, scope: 'mention' });
  });

  it('a browser that opens the one-click address is sent to the confirmation page, which asks first', async () => {
    const w = await makeWorld();
    const token = unsubscribeToken(w.byRole.owner.id, 'reply');
    const res = await unsubscribeRoute.GET(new Request(`${BASE}/api/v1/unsubscribe/${token}`), ctx({ token }));
    expect(res.status).toBe(303);
    expect(res.headers.get('location')).toBe(`${BASE}/unsubscribe/${token}`);
    expect((await settingsOf(w.byRole.owner)).reply).toBe('digest');
  });
});

describe('notification settings API', () => {
  it('reads the defaults, changes some kinds, and refuses a delivery it does not know in plain words', async () => {
    const w = await makeWorld();
    const u = w.byRole.viewer;
    const get = await settingsRoute.GET(request('GET', '/api/v1/me/notification-settings', { user: u }), ctx({}));
    expect(await get.json()).toEqual({ mention: 'immediate', reply: 'digest', suggestion: 'immediate', decision: 'immediate', signoff: 'immediate', withdrawal: 'immediate' });
    const put = await setDelivery(u, { reply: 'immediate', withdrawal: 'none' });
    expect(await put.json()).toMatchObject({ reply: 'immediate', withdrawal: 'none', mention: 'immediate' });
    const bad = await setDelivery(u, { reply: 'hourly' });
    expect(bad.status).toBe(400);
    expect((await bad.json()).error.message).toContain('Choose at once, daily digest or none.');
    const unknown = await setDelivery(u, { everything: 'none' });
    expect(unknown.status).toBe(400);
  });
});
