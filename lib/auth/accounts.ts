import 'server-only';
import type { Kysely } from 'kysely';
import type { Database } from '@/db/schema';
import {
  deleteSessionsOfUser,
  findUserByEmail,
  findUserById,
  insertEmailToken,
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
import { sendMail } from '@/lib/mail/send';
import { alreadyRegisteredMail, resetPasswordMail, verifyEmailMail } from '@/lib/mail/templates';
import { clientIp, consume, enforce, LIMITS } from '@/lib/rate-limit';
import type { SignUpInput } from '@/lib/validation/auth';
import { safeCallback } from '@/lib/action-state';
import { burnComparison, COMMON_PASSWORD_MESSAGE, hashPassword, isCommonPassword, verifyPassword } from './password';
import { hashToken, newToken, TOKEN_LIFETIME } from './tokens';

/**
 * Accounts: sign-up with e-mail verification, password sign-in checks and password reset.
 * Answers never reveal whether an address has an account: sign-up and reset always say
 * "check your inbox", and the inbox tells the owner of the address what happened.
 */

function appUrl(path: string): string {
  return new URL(path, env().APP_URL).toString();
}

export async function createPersonalWorkspace(database: Kysely<Database>, userId: string, displayName: string): Promise<void> {
  const first = displayName.split(/[\s@]/)[0] || 'My';
  const ws = await insertWorkspace(database, { name: `${first}'s workspace`, createdBy: userId });
  await upsertWorkspaceMember(database, ws.id, userId, 'admin');
}

async function sendVerification(user: User, callbackUrl?: string): Promise<void> {
  const { token, hash } = newToken();
  await insertEmailToken(db(), {
    userId: user.id,
    purpose: 'verify-email',
    hash,
    expiresAt: new Date(Date.now() + TOKEN_LIFETIME.verifyEmailHours * 3600_000),
  });
  const next = callbackUrl ? `&callbackUrl=${encodeURIComponent(safeCallback(callbackUrl))}` : '';
  await sendMail(verifyEmailMail(user.email, user.name ?? user.email, appUrl(`/verify-email?token=${token}${next}`)));
}

export async function signUp(input: SignUpInput, headers: Headers): Promise<void> {
  await enforce(db(), `signup:ip:${clientIp(headers)}`, LIMITS.signUpPerIp, 'sign-ups from this network');
  if (isCommonPassword(input.password)) {
    throw new AppError('bad_request', COMMON_PASSWORD_MESSAGE, { fields: { password: [COMMON_PASSWORD_MESSAGE] } });
  }
  const existing = await findUserByEmail(db(), input.email);
  if (existing) {
    await sendMail(alreadyRegisteredMail(existing.email, appUrl('/sign-in'), appUrl('/forgot-password')));
    return;
  }
  const passwordHash = await hashPassword(input.password);
  const user = await db()
    .transaction()
    .execute(async (trx) => {
      const u = await insertUser(trx, { name: input.name, email: input.email });
      await setPasswordHash(trx, u.id, passwordHash);
      await createPersonalWorkspace(trx as unknown as Kysely<Database>, u.id, input.name);
      await logActivity(trx, { actorId: u.id, action: 'auth.sign-up' });
      return u;
    });
  await sendVerification(user, input.callbackUrl);
}

export async function resendVerification(email: string): Promise<void> {
  const r = await consume(db(), `verify:${email}`, LIMITS.verifyResendPerEmail);
  if (!r.allowed) return;
  const user = await findUserByEmail(db(), email);
  if (user && !user.emailVerified) await sendVerification(user);
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
  const perIp = await consume(db(), `signin:ip:${clientIp(headers)}`, LIMITS.signInPerIp);
  const perEmail = await consume(db(), `signin:email:${email}`, LIMITS.signInPerEmail);
  if (!perIp.allowed || !perEmail.allowed) return { kind: 'rate_limited' };
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

export async function requestPasswordReset(email: string, headers: Headers): Promise<void> {
  await enforce(db(), `reset:ip:${clientIp(headers)}`, LIMITS.resetPerIp, 'reset requests from this network');
  const perEmail = await consume(db(), `reset:email:${email}`, LIMITS.resetPerEmail);
  if (!perEmail.allowed) return; // Same answer as success: the inbox already has links.
  const user = await findUserByEmail(db(), email);
  if (!user) return;
  const { token, hash } = newToken();
  await insertEmailToken(db(), {
    userId: user.id,
    purpose: 'reset-password',
    hash,
    expiresAt: new Date(Date.now() + TOKEN_LIFETIME.resetPasswordMinutes * 60_000),
  });
  await sendMail(resetPasswordMail(user.email, appUrl(`/reset-password?token=${token}`)));
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
