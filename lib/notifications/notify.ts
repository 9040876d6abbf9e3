import 'server-only';
import type { Transaction } from 'kysely';
import type { Database } from '@/db/schema';

/**
 * The one way review events reach people by e-mail (issue 12). Callers (comments, suggestions,
 * sign-offs) call `notify` inside the transaction of the action that causes it, so a
 * notification exists exactly when its cause committed. Delivery — each person's choice of
 * immediate, daily digest or none per kind, unsubscribe links, digests by study, never twice —
 * lives behind this function.
 */
export const NOTIFICATION_KINDS = ['mention', 'reply', 'suggestion', 'decision', 'signoff', 'withdrawal'] as const;
export type NotificationKind = (typeof NOTIFICATION_KINDS)[number];

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
export async function notify(trx: Transaction<Database>, event: NotificationEvent): Promise<void> {
  // Until delivery lands (issue 12, notifications), events are dropped here; callers need not change.
  void trx;
  void event;
}
