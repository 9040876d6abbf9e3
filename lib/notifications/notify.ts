import 'server-only';
import type { Transaction } from 'kysely';
import type { Database } from '@/db/schema';
import { currentMembers, findDeliveries, insertNotification, markNotificationsDelivered } from '@/db/repositories/notifications';
import { env } from '@/lib/env';
import { queueMail } from '@/lib/mail/queue';
import { notificationMail } from '@/lib/mail/templates';
import { DEFAULT_DELIVERY, KIND_WORDS, NOTIFICATION_KINDS, type NotificationKind } from './kinds';
import { listUnsubscribeHeaders, unsubscribePageUrl, unsubscribeToken } from './unsubscribe-token';

/**
 * The one way review events reach people by e-mail (issue 12). Callers (comments, suggestions,
 * sign-offs) call `notify` inside the transaction of the action that causes it, so a
 * notification exists exactly when its cause committed.
 *
 * Each recipient gets one row in `notifications`, unique on (recipient, dedupeKey): a cause
 * repeated or a job retried tells a person once. The actor is never told, nor anyone who is not
 * a member of the study now (a mention of someone outside the study is dropped). Each person's
 * choice for the kind (lib/notifications/kinds.ts) decides what follows: `immediate` queues one
 * message through the durable mail queue in this same transaction (its idempotency key is the
 * notification's id); `digest` leaves the row for the daily digest (./digest.ts); `none` keeps
 * the row and sends nothing. Every message carries an unsubscribe link and RFC 8058 headers.
 */
export { NOTIFICATION_KINDS, type NotificationKind };

export interface NotificationEvent {
  kind: NotificationKind;
  /** People to tell; the actor is never told about their own action. */
  recipientIds: string[];
  studyId: string;
  actorId: string;
  /** One line, e.g. "Dr Ama Owusu mentioned you on Classroom reading study". */
  subject: string;
  /** Plain text body: what happened, quoted where useful. */
  text: string;
  /** Path inside the app that shows the thing, e.g. `/studies/<id>/review?thread=<id>`. */
  path: string;
  /** Names the cause, e.g. `comment:<id>:mention:<user id>`: one cause notifies once. */
  dedupeKey: string;
}

/** Records the event for its recipients. Delivery follows each recipient's settings. */
export async function notify(trx: Transaction<Database>, event: NotificationEvent, options: { now?: Date } = {}): Promise<void> {
  const wanted = [...new Set(event.recipientIds)].filter((id) => id !== event.actorId);
  const recipients = await currentMembers(trx, event.studyId, wanted);
  if (!recipients.length) return;
  const study = await trx.selectFrom('studies').select('title').where('id', '=', event.studyId).executeTakeFirstOrThrow();
  const chosen = await findDeliveries(
    trx,
    recipients.map((r) => r.id),
    event.kind,
  );
  const now = options.now ?? new Date();
  const appUrl = env().APP_URL;
  for (const person of recipients) {
    const delivery = chosen.get(person.id) ?? DEFAULT_DELIVERY[event.kind];
    const id = await insertNotification(trx, {
      recipientId: person.id,
      studyId: event.studyId,
      actorId: event.actorId,
      kind: event.kind,
      subject: event.subject,
      text: event.text,
      path: event.path,
      dedupeKey: event.dedupeKey,
      delivery,
    });
    if (!id || delivery !== 'immediate') continue;
    const token = unsubscribeToken(person.id, event.kind);
    const mailId = await queueMail(trx, {
      kind: 'notification',
      idempotencyKey: `notification:${id}`,
      mail: notificationMail({
        to: person.email,
        subject: event.subject,
        studyTitle: study.title,
        text: event.text,
        href: new URL(event.path, appUrl).toString(),
        reason: KIND_WORDS[event.kind].reason,
        topic: KIND_WORDS[event.kind].topic,
        unsubscribeHref: unsubscribePageUrl(token),
        settingsHref: new URL('/settings/notifications', appUrl).toString(),
        headers: listUnsubscribeHeaders(token),
      }),
    });
    await markNotificationsDelivered(trx, [id], mailId, now);
  }
}
