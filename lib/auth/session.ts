import 'server-only';
import { cache } from 'react';
import { cookies } from 'next/headers';
import { findSessionUser } from '@/db/repositories/users';
import { db } from '@/lib/db';

/**
 * Who is asking. Sessions are database sessions written by next-auth (lib/auth/next-auth.ts);
 * one query turns the session cookie into the signed-in user, the same way for pages, server
 * actions and route handlers.
 */
export interface Actor {
  id: string;
  name: string | null;
  email: string;
}

/** next-auth's cookie names: the __Secure- one when the app is served over https. */
export const SESSION_COOKIES = ['__Secure-authjs.session-token', 'authjs.session-token'] as const;

/**
 * The characters of every token we issue: base64url (lib/auth/next-auth.ts) and next-auth's own
 * UUIDs. Any other cookie value (NUL, a half surrogate pair, a %-escape that did not decode) names
 * no session, and must not reach PostgreSQL, which refuses such text with an error.
 */
const TOKEN_SHAPE = /^[A-Za-z0-9_-]{1,200}$/;

export async function actorFromSessionToken(token: string | undefined): Promise<Actor | null> {
  if (!token || !TOKEN_SHAPE.test(token)) return null;
  const user = await findSessionUser(db(), token);
  return user ? { id: user.id, name: user.name, email: user.email } : null;
}

function tokenFromCookieHeader(header: string | null): string | undefined {
  if (!header) return undefined;
  const pairs = header.split(';').map((p) => p.trim());
  for (const name of SESSION_COOKIES) {
    const hit = pairs.find((p) => p.startsWith(`${name}=`));
    if (!hit) continue;
    try {
      return decodeURIComponent(hit.slice(name.length + 1));
    } catch {
      return undefined; // a broken %-escape (`%ZZ`) is no session, not a server error
    }
  }
  return undefined;
}

export function actorFromRequest(req: Request): Promise<Actor | null> {
  return actorFromSessionToken(tokenFromCookieHeader(req.headers.get('cookie')));
}

/** The signed-in user of the current page or action, looked up once per request. */
export const currentActor = cache(async (): Promise<Actor | null> => {
  const store = await cookies();
  const token = SESSION_COOKIES.map((n) => store.get(n)?.value).find(Boolean);
  return actorFromSessionToken(token);
});
