'use server';

import { headers } from 'next/headers';
import { AuthError } from 'next-auth';
import { requestPasswordReset, resetPassword, signUp, verifyEmail } from '@/lib/auth/accounts';
import { signIn, signOut } from '@/lib/auth/next-auth';
import { safeCallback, type ActionState } from '@/lib/action-state';
import { invalid } from '@/lib/api/handler';
import { toAppError } from '@/lib/errors';
import { magicLinkSchema, resetPasswordSchema, resetRequestSchema, signInSchema, signUpSchema } from '@/lib/validation/auth';

function failure(err: unknown): ActionState {
  const e = toAppError(err);
  return { status: 'error', message: e.message, fields: e.fields };
}

const GENERIC_SIGN_IN = 'That e-mail and password do not match an account. Check both, or use a sign-in link instead.';

export async function signInAction(values: unknown): Promise<ActionState> {
  const parsed = signInSchema.safeParse(values);
  if (!parsed.success) return failure(invalid(parsed.error));
  try {
    await signIn('credentials', {
      email: parsed.data.email,
      password: parsed.data.password,
      redirectTo: safeCallback(parsed.data.callbackUrl),
    });
  } catch (err) {
    if (err instanceof AuthError) {
      const code = (err as AuthError & { code?: string }).code;
      if (code === 'unverified') {
        return { status: 'error', message: 'Confirm your e-mail address first. We have sent you a new confirmation link.' };
      }
      if (code === 'rate_limited') {
        return { status: 'error', message: 'Too many sign-in attempts. Wait a few minutes, or use a sign-in link.' };
      }
      if (err.type === 'CredentialsSignin') return { status: 'error', message: GENERIC_SIGN_IN };
      return failure(err.cause ?? err);
    }
    // next's redirect is thrown as an error too: let it through.
    if ((err as { digest?: string })?.digest?.startsWith('NEXT_REDIRECT')) throw err;
    return failure(err);
  }
  return { status: 'success', message: 'Signed in.' };
}

export async function magicLinkAction(values: unknown): Promise<ActionState> {
  const parsed = magicLinkSchema.safeParse(values);
  if (!parsed.success) return failure(invalid(parsed.error));
  try {
    await signIn('nodemailer', { email: parsed.data.email, redirectTo: safeCallback(parsed.data.callbackUrl) });
  } catch (err) {
    if ((err as { digest?: string })?.digest?.startsWith('NEXT_REDIRECT')) throw err;
    if (err instanceof AuthError) return failure(err.cause?.err ?? err);
    return failure(err);
  }
  return { status: 'success', message: 'Check your inbox for a sign-in link.' };
}

export async function signUpAction(values: unknown): Promise<ActionState> {
  const parsed = signUpSchema.safeParse(values);
  if (!parsed.success) return failure(invalid(parsed.error));
  try {
    await signUp(parsed.data, await headers());
  } catch (err) {
    return failure(err);
  }
  return {
    status: 'success',
    message: `Check your inbox at ${parsed.data.email}: we have sent a link to confirm the address. It works for 24 hours.`,
  };
}

export async function verifyEmailAction(token: string): Promise<ActionState> {
  try {
    const outcome = await verifyEmail(String(token ?? ''));
    if (outcome === 'invalid') {
      return { status: 'error', message: 'This confirmation link has expired or was already used. Sign in to get a new one.' };
    }
    return { status: 'success', message: 'Your e-mail address is confirmed. You can sign in now.' };
  } catch (err) {
    return failure(err);
  }
}

export async function forgotPasswordAction(values: unknown): Promise<ActionState> {
  const parsed = resetRequestSchema.safeParse(values);
  if (!parsed.success) return failure(invalid(parsed.error));
  try {
    await requestPasswordReset(parsed.data.email, await headers());
  } catch (err) {
    return failure(err);
  }
  return {
    status: 'success',
    message: `If ${parsed.data.email} has an account, a reset link is on its way. It works once, for 60 minutes.`,
  };
}

export async function resetPasswordAction(values: unknown): Promise<ActionState> {
  const parsed = resetPasswordSchema.safeParse(values);
  if (!parsed.success) return failure(invalid(parsed.error));
  try {
    await resetPassword(parsed.data.token, parsed.data.password);
  } catch (err) {
    return failure(err);
  }
  return { status: 'success', message: 'Your password is changed and every other session is signed out. Sign in with the new password.' };
}

export async function signOutAction(): Promise<void> {
  await signOut({ redirectTo: '/' });
}
