import 'server-only';
import { findNotificationSettings, upsertNotificationSettings } from '@/db/repositories/notifications';
import { findUserById } from '@/db/repositories/users';
import type { Actor } from '@/lib/auth/session';
import { db } from '@/lib/db';
import { AppError } from '@/lib/errors';
import { NOTIFICATION_KINDS, withDefaults, type Delivery, type NotificationSettings, type UnsubscribeScope } from '@/lib/notifications/kinds';
import { readUnsubscribeToken } from '@/lib/notifications/unsubscribe-token';
import type { NotificationSettingsUpdate } from '@/lib/validation/notifications';
import { requireActor } from './access';
import { transaction } from './transaction';

/**
 * A person's notification settings. Everyone may read and change their own, and nobody anyone
 * else's; the unsubscribe link's token stands in for signing in, for its person and scope only.
 */

export async function getNotificationSettings(actor: Actor | null): Promise<NotificationSettings> {
  const a = requireActor(actor);
  return withDefaults(await findNotificationSettings(db(), a.id));
}

export async function updateNotificationSettings(actor: Actor | null, input: NotificationSettingsUpdate): Promise<NotificationSettings> {
  const a = requireActor(actor);
  return transaction(async (trx) => {
    const choices = NOTIFICATION_KINDS.flatMap((k) => (input[k] ? [[k, input[k]] as [string, Delivery]] : []));
    await upsertNotificationSettings(trx, a.id, choices);
    return withDefaults(await findNotificationSettings(trx, a.id));
  });
}

const INVALID_LINK = 'This unsubscribe link is not valid. Copy the whole link from the e-mail, or sign in and open Notification settings.';

export interface UnsubscribeTarget {
  scope: UnsubscribeScope;
  email: string;
  settings: NotificationSettings;
}

/** Whom and what an unsubscribe token names, for the confirmation page; throws not_found when forged. */
export async function readUnsubscribeTarget(token: string): Promise<UnsubscribeTarget> {
  const named = readUnsubscribeToken(token);
  const user = named && (await findUserById(db(), named.userId));
  if (!named || !user) throw new AppError('not_found', INVALID_LINK);
  return { scope: named.scope, email: user.email, settings: withDefaults(await findNotificationSettings(db(), user.id)) };
}

/**
 * Turns e-mail off for the token's person and scope: one kind, or (for the digest's link) every
 * kind that person receives in the digest. Doing it twice changes nothing the second time.
 */
export async function unsubscribe(token: string): Promise<UnsubscribeTarget> {
  const named = readUnsubscribeToken(token);
  if (!named) throw new AppError('not_found', INVALID_LINK);
  return transaction(async (trx) => {
    const user = await findUserById(trx, named.userId);
    if (!user) throw new AppError('not_found', INVALID_LINK);
    const before = withDefaults(await findNotificationSettings(trx, user.id));
    const kinds = named.scope === 'digest' ? NOTIFICATION_KINDS.filter((k) => before[k] === 'digest') : [named.scope];
    await upsertNotificationSettings(
      trx,
      user.id,
      kinds.map((k) => [k, 'none']),
    );
    return { scope: named.scope, email: user.email, settings: withDefaults(await findNotificationSettings(trx, user.id)) };
  });
}
