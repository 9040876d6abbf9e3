import 'server-only';
import type { Kysely } from 'kysely';
import type { Database } from '@/db/schema';
import { findNotificationSettings, listDigestRecipients, markNotificationsDelivered, takeWaitingDigest } from '@/db/repositories/notifications';
import { env } from '@/lib/env';
import { formatDateTime } from '@/lib/format';
import { logger } from '@/lib/log';
import { queueMail } from '@/lib/mail/queue';
import { digestMail, type DigestStudy } from '@/lib/mail/templates';
import { DIGEST_HOUR_UTC, withDefaults, type NotificationKind } from './kinds';
import { listUnsubscribeHeaders, unsubscribePageUrl, unsubscribeToken } from './unsubscribe-token';

/**
 * The daily digest. Each day from DIGEST_HOUR_UTC, everyone with digest notifications from
 * before that hour gets one message that lists them grouped by study. The web server's mail
 * sender runs `sendDueDigests` every few minutes (lib/mail/sender.ts); it does nothing until a
 * digest is due, so how often it runs does not change what is sent.
 *
 * Never twice: per person, one transaction locks the waiting rows, queues the message (durable
 * mail queue, idempotency key from the first row's id) and marks the rows delivered. A run that
 * is retried, or two servers running at once, find the rows taken and send nothing. A kind the
 * person has since turned to none, or a study they have left, is marked settled without mail.
 */

const log = logger('notifications');

/** The newest digest hour at or before `now`: notifications before it are due. */
export function digestCutoff(now: Date): Date {
  const cut = new Date(Date.UTC(now.getUTCFullYear(), now.getUTCMonth(), now.getUTCDate(), DIGEST_HOUR_UTC));
  if (cut > now) cut.setUTCDate(cut.getUTCDate() - 1);
  return cut;
}

/** Sends every digest that is due at `now`; returns how many messages were queued. */
export async function sendDueDigests(db: Kysely<Database>, now: Date = new Date()): Promise<number> {
  const cutoff = digestCutoff(now);
  let queued = 0;
  for (const recipientId of await listDigestRecipients(db, cutoff)) {
    if (await sendDigest(db, recipientId, cutoff, now)) queued += 1;
  }
  if (queued) log.info(`queued ${queued} daily ${queued === 1 ? 'digest' : 'digests'}`);
  return queued;
}

async function sendDigest(db: Kysely<Database>, recipientId: string, cutoff: Date, now: Date): Promise<boolean> {
  return db.transaction().execute(async (trx) => {
    const rows = await takeWaitingDigest(trx, recipientId, cutoff);
    if (!rows.length) return false;
    const settings = withDefaults(await findNotificationSettings(trx, recipientId));
    const due = rows.filter((r) => r.member && settings[r.kind as NotificationKind] !== 'none');
    let mailId: string | null = null;
    if (due.length) {
      const person = await trx.selectFrom('User').select('email').where('id', '=', recipientId).executeTakeFirstOrThrow();
      const appUrl = env().APP_URL;
      const studies: DigestStudy[] = [];
      for (const r of due) {
        let s = studies.at(-1);
        if (!s || s.title !== r.studyTitle || !s.href.endsWith(`/studies/${r.studyId}`)) {
          s = { title: r.studyTitle, href: new URL(`/studies/${r.studyId}`, appUrl).toString(), items: [] };
          studies.push(s);
        }
        s.items.push({ subject: r.subject, when: formatDateTime(r.createdAt), href: new URL(r.path, appUrl).toString() });
      }
      const token = unsubscribeToken(recipientId, 'digest');
      mailId = await queueMail(trx, {
        kind: 'notification-digest',
        idempotencyKey: `digest:${recipientId}:${due[0]!.id}`,
        mail: digestMail({
          to: person.email,
          studies,
          count: due.length,
          unsubscribeHref: unsubscribePageUrl(token),
          settingsHref: new URL('/settings/notifications', appUrl).toString(),
          headers: listUnsubscribeHeaders(token),
        }),
      });
    }
    const dueIds = new Set(due.map((r) => r.id));
    await markNotificationsDelivered(trx, [...dueIds], mailId, now);
    await markNotificationsDelivered(
      trx,
      rows.filter((r) => !dueIds.has(r.id)).map((r) => r.id),
      null,
      now,
    );
    return mailId !== null;
  });
}
