import 'server-only';
import { createHmac, timingSafeEqual } from 'node:crypto';
import { env } from '@/lib/env';
import { UNSUBSCRIBE_SCOPES, type UnsubscribeScope } from './kinds';

/**
 * One-click unsubscribe links that work without signing in: `<user id>.<scope>.<signature>`,
 * where the signature is HMAC-SHA256 over the user id and the scope under a key derived from
 * AUTH_SECRET for this purpose only (so a signature made here is worth nothing anywhere else).
 * A token names one person and one scope (a kind, or the daily digest): changing either breaks
 * the signature, which is compared in constant time. Tokens do not expire: a link in a message
 * from last year must still stop the messages (RFC 8058 asks that the link keep working), and
 * all it can ever do is turn e-mail off for its person and scope.
 */

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/;

function key(): Buffer {
  return createHmac('sha256', env().AUTH_SECRET).update('unitwise/unsubscribe/v1').digest();
}

function signature(userId: string, scope: UnsubscribeScope): Buffer {
  return createHmac('sha256', key()).update(`${userId}.${scope}`).digest();
}

export function unsubscribeToken(userId: string, scope: UnsubscribeScope): string {
  return `${userId}.${scope}.${signature(userId, scope).toString('base64url')}`;
}

/** The person and scope a token names, or null when it was not made here or was altered. */
export function readUnsubscribeToken(token: string): { userId: string; scope: UnsubscribeScope } | null {
  const parts = token.split('.');
  if (parts.length !== 3) return null;
  const [userId, scope, sig] = parts as [string, string, string];
  if (!UUID.test(userId) || !(UNSUBSCRIBE_SCOPES as readonly string[]).includes(scope)) return null;
  // Compared as text, not as decoded bytes: the last of the 43 characters carries two spare bits,
  // and a decoder ignores them, so four spellings would decode to one signature.
  const given = Buffer.from(sig, 'utf8');
  const wanted = Buffer.from(signature(userId, scope as UnsubscribeScope).toString('base64url'), 'utf8');
  if (given.length !== wanted.length || !timingSafeEqual(given, wanted)) return null;
  return { userId, scope: scope as UnsubscribeScope };
}

/** The page a person opens from the message (confirms with a button). */
export function unsubscribePageUrl(token: string): string {
  return new URL(`/unsubscribe/${token}`, env().APP_URL).toString();
}

/** The address a mail program POSTs to for one-click unsubscribe (RFC 8058). */
export function oneClickUrl(token: string): string {
  return new URL(`/api/v1/unsubscribe/${token}`, env().APP_URL).toString();
}

/** The header lines that let a mail program offer its own unsubscribe button (RFC 2369, RFC 8058). */
export function listUnsubscribeHeaders(token: string): Record<string, string> {
  return { 'List-Unsubscribe': `<${oneClickUrl(token)}>`, 'List-Unsubscribe-Post': 'List-Unsubscribe=One-Click' };
}
