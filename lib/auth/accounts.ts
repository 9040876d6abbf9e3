import 'server-only';
import { randomUUID } from 'node:crypto';
import { sql, type Kysely, type Transaction } from 'kysely';
import type { Database } from '@/db/schema';
import {
  deleteSessionsOfUser,
  findUserByEmail,
  findUserById,
  insertEmailToken,
  insertEmailTokenForAddress,
  insertUser,
  markEmailVerified,
  setPasswordHash,
  useEmailToken,
  type User,
} from '@/db/repositories/users';
import { insertWorkspace, upsertWorkspaceMember } from '@/db/repositories/workspaces';
import { logActivity } from '@/db/repositories/activity';
import { db } from '@/lib/db';
import { env } from '@/lib/env';
import { AppError } from '@/lib/errors';
import { queueMail } from '@/lib/mail/queue';
import { wakeMailSender } from '@/lib/mail/sender';
import { alreadyRegisteredMail, resetPasswordMail, verifyEmailMail } from '@/lib/mail/templates';
import { accountChecks, accountLimitError, addressKey, consume, consumeAll, LIMITS } from '@/lib/rate-limit';
import type { SignUpInput } from '@/lib/validation/auth';
import { safeCallback } from '@/lib/action-state';
import { burnComparison, COMMON_PASSWORD_MESSAGE, hashPassword, isCommonPassword, verifyPassword } from './password';
import { hashToken, newToken, TOKEN_LIFETIME } from './tokens';

/**
 * Accounts: sign-up with e-mail verification, password sign-in checks and password reset.
 * Answers never reveal whether an address has an account: sign-up and reset always say
 * "check your inbox", and the inbox tells the owner of the address what happened. Their cost
 * does not reveal it either: each path does the same work for a known and an unknown address
 * (see `signUp`, `requestPasswordReset`, and `checkCredentials`, which compares an unknown
 * address's password with a dummy hash), and no answer waits for the mail server: messages are
 * queued (lib/mail/queue.ts).
 */

const UNIQUE_VIOLATION = '23505';

function appUrl(path: string): string {
  return new URL(path, env().APP_URL).toString();
}

export async function createPersonalWorkspace(database: Kysely<Database>, userId: string, displayName: string): Promise<void> {
  const first = displayName.split(/[\s@]/)[0] || 'My';
  const ws = await insertWorkspace(database, { name: `${first}'s workspace`, createdBy: userId });
  await upsertWorkspaceMember(database, ws.id, userId, 'admin');
}

/** A new single-use confirmation link for `user`, stored in `trx`. */
async function newVerificationLink(trx: Transaction<Database>, user: User, callbackUrl?: string): Promise<{ href: string; hash: string }> {
  const { token, hash } = newToken();
  await insertEmailToken(trx, {
    userId: user.id,
    purpose: 'verify-email',
    hash,
    expiresAt: new Date(Date.now() + TOKEN_LIFETIME.verifyEmailHours * 3600_000),
  });
  const next = callbackUrl ? `&callbackUrl=${encodeURIComponent(safeCallback(callbackUrl))}` : '';
  return { href: appUrl(`/verify-email?token=${token}${next}`), hash };
}

/** Queues a confirmation link for `user` in `trx`. */
async function queueVerification(trx: Transaction<Database>, user: User, callbackUrl?: string): Promise<void> {
  const link = await newVerificationLink(trx, user, callbackUrl);
  await queueMail(trx, {
    kind: 'verify-email',
    idempotencyKey: `verify-email:${link.hash}`,
    mail: verifyEmailMail(user.email, user.name ?? user.email, link.href),
  });
}

/** An unverified account with its password, personal workspace and a confirmation link. */
async function createAccount(trx: Transaction<Database>, input: SignUpInput, passwordHash: string) {
  const user = await insertUser(trx, { name: input.name, email: input.email });
  await setPasswordHash(trx, user.id, passwordHash);
  await createPersonalWorkspace(trx as unknown as Kysely<Database>, user.id, input.name);
  await logActivity(trx, { actorId: user.id, action: 'auth.sign-up' });
  return { user, link: await newVerificationLink(trx, user, input.callbackUrl) };
}

/**
 * Signs up, or tells the owner of an address that already has an account, in the same work: one
 * bcrypt hash, then one transaction that creates an account and queues one message. For an
 * address with an account, the account created is a stand-in (an address that cannot exist)
 * and is rolled back to a savepoint, so both answers run the same statements.
 */
export async function signUp(input: SignUpInput, headers: Headers): Promise<void> {
  const limit = await consumeAll(db(), accountChecks('sign-up', input.email, headers));
  if (!limit.allowed) throw accountLimitError('sign-up', limit);
  if (isCommonPassword(input.password)) {
    throw new AppError('bad_request', COMMON_PASSWORD_MESSAGE, { fields: { password: [COMMON_PASSWORD_MESSAGE] } });
  }
  const passwordHash = await hashPassword(input.password);
  const standIn = `stand-in-${randomUUID()}@unitwise.invalid`;
  try {
    await db()
      .transaction()
      .execute(async (trx) => {
        const existing = await findUserByEmail(trx, input.email);
        await sql`savepoint sign_up`.execute(trx);
        const { user, link } = await createAccount(trx, existing ? { ...input, email: standIn } : input, passwordHash);
        await sql.raw(existing ? 'rollback to savepoint sign_up' : 'release savepoint sign_up').execute(trx);
        await queueMail(
          trx,
          existing
            ? {
                kind: 'already-registered',
                idempotencyKey: `already-registered:${link.hash}`,
                mail: alreadyRegisteredMail(existing.email, appUrl('/sign-in'), appUrl('/forgot-password')),
              }
            : { kind: 'verify-email', idempotencyKey: `verify-email:${link.hash}`, mail: verifyEmailMail(user.email, user.name ?? user.email, link.href) },
        );
      });
  } catch (err) {
    // Two sign-ups for one new address at once: the other created the account and queued its link.
    if ((err as { code?: string }).code !== UNIQUE_VIOLATION) throw err;
  }
  wakeMailSender();
}

export async function resendVerification(email: string): Promise<void> {
  const r = await consume(db(), `verify:${email.toLowerCase()}`, LIMITS.verifyResendPerAddress);
  if (!r.allowed) return;
  const user = await findUserByEmail(db(), email);
  if (!user || user.emailVerified) return;
  await db()
    .transaction()
    .execute((trx) => queueVerification(trx, user));
  wakeMailSender();
}

export async function verifyEmail(token: string): Promise<'verified' | 'invalid'> {
  const used = await useEmailToken(db(), 'verify-email', hashToken(token));
  if (!used) return 'invalid';
  await markEmailVerified(db(), used.userId);
  await logActivity(db(), { actorId: used.userId, action: 'auth.email-verified' });
  return 'verified';
}

export type CredentialOutcome =
  | { kind: 'ok'; user: User }
  | { kind: 'invalid' }
  | { kind: 'unverified' }
  | { kind: 'rate_limited' };

export async function checkCredentials(email: string, password: string, headers: Headers): Promise<CredentialOutcome> {
  const limit = await consumeAll(db(), accountChecks('sign-in', email, headers));
  if (!limit.allowed) return { kind: 'rate_limited' };
  const user = await findUserByEmail(db(), email);
  if (!user || !user.passwordHash) {
    await burnComparison(password);
    return { kind: 'invalid' };
  }
  if (!(await verifyPassword(password, user.passwordHash))) return { kind: 'invalid' };
  if (!user.emailVerified) {
    await resendVerification(user.email);
    return { kind: 'unverified' };
  }
  return { kind: 'ok', user };
}

/**
 * Mails a reset link when the address has an account. The same work either way: one statement
 * inserts a token only for an existing account, and one message is queued, suppressed (never
 * sent) for an unknown address.
 */
export async function requestPasswordReset(email: string, headers: Headers): Promise<void> {
  const limit = await consumeAll(db(), accountChecks('reset', email, headers));
  if (!limit.allowed) {
    // The address's own limit refuses with the same answer as success: its inbox already has links.
    if (limit.refused.every((key) => key === addressKey('reset', email))) return;
    throw accountLimitError('reset', limit);
  }
  const { token, hash } = newToken();
  const address = email.trim().toLowerCase();
  await db()
    .transaction()
    .execute(async (trx) => {
      const account = await insertEmailTokenForAddress(trx, {
        email: address,
        purpose: 'reset-password',
        hash,
        expiresAt: new Date(Date.now() + TOKEN_LIFETIME.resetPasswordMinutes * 60_000),
      });
      await queueMail(trx, {
        kind: 'reset-password',
        idempotencyKey: `reset-password:${hash}`,
        mail: resetPasswordMail(address, appUrl(`/reset-password?token=${token}`)),
        suppressed: !account,
      });
    });
  wakeMailSender();
}

export async function resetPassword(token: string, password: string): Promise<void> {
  if (isCommonPassword(password)) {
    throw new AppError('bad_request', COMMON_PASSWORD_MESSAGE, { fields: { password: [COMMON_PASSWORD_MESSAGE] } });
  }
  const passwordHash = await hashPassword(password);
  await db()
    .transaction()
    .execute(async (trx) => {
      const used = await useEmailToken(trx, 'reset-password', hashToken(token));
      if (!used) {
        throw new AppError('gone', 'This reset link has expired or was already used. Ask for a new one.');
      }
      await setPasswordHash(trx, used.userId, passwordHash);
      // The link proves control of the address.
      await markEmailVerified(trx, used.userId);
      await deleteSessionsOfUser(trx, used.userId);
      await logActivity(trx, { actorId: used.userId, action: 'auth.password-reset' });
    });
}

export { findUserById };
