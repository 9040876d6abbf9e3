/**
 * Sign-up, e-mail verification, password sign-in checks, password reset and the rate limits,
 * against the real database. Mail is captured in memory (tests/support/mail.ts).
 */
import { sql } from 'kysely';
import { afterEach, describe, expect, it } from 'vitest';
import { checkCredentials, requestPasswordReset, resetPassword, signUp, verifyEmail } from '@/lib/auth/accounts';
import { db } from '@/lib/db';
import { createDb } from '@/db/client';
import { consume, LIMITS } from '@/lib/rate-limit';
import { insertSession } from '@/db/repositories/users';
import { AppError } from '@/lib/errors';
import { linkIn, sentMail } from '../support/mail';
import { drainMail } from '../support/drain-mail';

const headers = (ip = '203.0.113.7') => new Headers({ 'x-forwarded-for': ip });
const PASSWORD = 'trays-are-not-plants-7';

function tokenOf(link: string): string {
  return new URL(link).searchParams.get('token')!;
}

describe('sign-up and verification', () => {
  it('creates an unverified account with a personal workspace and mails a single-use link', async () => {
    await signUp({ name: 'Lena Vogel', email: 'lena@test.example', password: PASSWORD }, headers());
    await drainMail();
    expect(sentMail).toHaveLength(1);
    expect(sentMail[0]!.to).toBe('lena@test.example');
    expect((await checkCredentials('lena@test.example', PASSWORD, headers())).kind).toBe('unverified');

    const link = linkIn(sentMail[0]!.text);
    expect(link).toMatch(/^http:\/\/localhost:3100\/verify-email\?token=/);
    expect(await verifyEmail(tokenOf(link))).toBe('verified');
    expect(await verifyEmail(tokenOf(link))).toBe('invalid');

    const ok = await checkCredentials('lena@test.example', PASSWORD, headers());
    expect(ok.kind).toBe('ok');
    const ws = await db().selectFrom('workspace_members').innerJoin('workspaces', 'workspaces.id', 'workspace_members.workspace_id').select(['workspaces.name', 'workspace_members.role']).execute();
    expect(ws).toEqual([{ name: "Lena's workspace", role: 'admin' }]);
  });

  it('stores a bcrypt hash, never the password', async () => {
    await signUp({ name: 'Ada', email: 'ada@test.example', password: PASSWORD }, headers());
    const row = await db().selectFrom('user_credentials').select('password_hash').executeTakeFirstOrThrow();
    expect(row.password_hash).toMatch(/^\$2[aby]\$10\$/);
    expect(row.password_hash).not.toContain(PASSWORD);
  });

  it('refuses a common password with a field error and saves nothing', async () => {
    const err = (await signUp({ name: 'Ada', email: 'ada@test.example', password: 'password1234' }, headers()).catch((e) => e)) as AppError;
    expect(err.code).toBe('bad_request');
    expect(err.fields?.password?.[0]).toMatch(/commonly used|breached/);
    expect(await db().selectFrom('User').selectAll().execute()).toHaveLength(0);
  });

  it('answers a second sign-up for an existing address the same way, and tells the owner by mail', async () => {
    await signUp({ name: 'Ada', email: 'ada@test.example', password: PASSWORD }, headers());
    await drainMail();
    sentMail.length = 0;
    await expect(signUp({ name: 'Mallory', email: 'ada@test.example', password: 'another-long-pass-9' }, headers())).resolves.toBeUndefined();
    await drainMail();
    expect(sentMail).toHaveLength(1);
    expect(sentMail[0]!.subject).toMatch(/tried to create/);
    expect(await db().selectFrom('User').selectAll().execute()).toHaveLength(1);
  });

  it('gives the same answer for an unknown address and a wrong password', async () => {
    await signUp({ name: 'Ada', email: 'ada@test.example', password: PASSWORD }, headers());
    await drainMail();
    await verifyEmail(tokenOf(linkIn(sentMail[0]!.text)));
    expect((await checkCredentials('ada@test.example', 'wrong-password-123', headers())).kind).toBe('invalid');
    expect((await checkCredentials('nobody@test.example', 'wrong-password-123', headers())).kind).toBe('invalid');
  });
});

describe('password reset', () => {
  async function verifiedUser() {
    await signUp({ name: 'Priya', email: 'priya@test.example', password: PASSWORD }, headers());
    await drainMail();
    await verifyEmail(tokenOf(linkIn(sentMail[0]!.text)));
    sentMail.length = 0;
    return db().selectFrom('User').select('id').executeTakeFirstOrThrow();
  }

  it('changes the password once per link and signs out every session', async () => {
    const user = await verifiedUser();
    await insertSession(db(), { userId: user.id, sessionToken: 'old-session', expires: new Date(Date.now() + 3600_000) });
    await requestPasswordReset('priya@test.example', headers());
    await drainMail();
    const token = tokenOf(linkIn(sentMail[0]!.text));
    await resetPassword(token, 'a-brand-new-passphrase');
    expect((await checkCredentials('priya@test.example', 'a-brand-new-passphrase', headers())).kind).toBe('ok');
    expect((await checkCredentials('priya@test.example', PASSWORD, headers())).kind).toBe('invalid');
    expect(await db().selectFrom('Session').selectAll().execute()).toHaveLength(0);
    await expect(resetPassword(token, 'yet-another-passphrase')).rejects.toMatchObject({ code: 'gone' });
  });

  it('refuses an expired link', async () => {
    await verifiedUser();
    await requestPasswordReset('priya@test.example', headers());
    await drainMail();
    await db().updateTable('email_tokens').set({ expires_at: new Date(Date.now() - 1000) }).execute();
    await expect(resetPassword(tokenOf(linkIn(sentMail[0]!.text)), 'a-brand-new-passphrase')).rejects.toMatchObject({ code: 'gone' });
  });

  it('sends nothing for an unknown address but answers the same', async () => {
    await expect(requestPasswordReset('nobody@test.example', headers())).resolves.toBeUndefined();
    await drainMail();
    expect(sentMail).toHaveLength(0);
  });
});

describe('rate limits kept in PostgreSQL', () => {
  afterEach(() => {
    delete process.env.TRUST_PROXY;
  });

  it('stops sign-ups from one client beyond its limit (behind a trusted proxy); another client is unaffected', async () => {
    process.env.TRUST_PROXY = 'true';
    for (let i = 0; i < LIMITS.signUpPerClient.limit; i++) {
      await signUp({ name: 'Bot', email: `bot${i}@test.example`, password: PASSWORD }, headers('198.51.100.1'));
    }
    await expect(signUp({ name: 'Bot', email: 'bot99@test.example', password: PASSWORD }, headers('198.51.100.1'))).rejects.toMatchObject({
      code: 'rate_limited',
      message: expect.stringContaining('from your network'),
    });
    await expect(signUp({ name: 'Ada', email: 'ada@test.example', password: PASSWORD }, headers('198.51.100.2'))).resolves.toBeUndefined();
  });

  it('without a trusted proxy, X-Forwarded-For is ignored: no per-client count is kept', async () => {
    for (let i = 0; i < 3; i++) {
      await signUp({ name: 'Bot', email: `bot${i}@test.example`, password: PASSWORD }, headers(`198.51.100.${i}`));
    }
    const keys = (await db().selectFrom('rate_limits').select('key').execute()).map((r) => r.key);
    expect(keys.filter((k) => k.includes(':client:'))).toEqual([]);
    expect(keys).toContain('sign-up:overall');
  });

  it('locks password sign-in for an address after 10 attempts', async () => {
    for (let i = 0; i < LIMITS.signInPerAddress.limit; i++) {
      expect((await checkCredentials('ada@test.example', `wrong-${i}-password`, headers(`192.0.2.${i}`))).kind).toBe('invalid');
    }
    expect((await checkCredentials('ada@test.example', 'wrong-again-password', headers('192.0.2.200'))).kind).toBe('rate_limited');
  });

  it('shares one count between app processes (two separate connection pools)', async () => {
    const second = createDb(process.env.DATABASE_URL!, { max: 1 });
    try {
      const limit = { limit: 3, windowSeconds: 60 };
      expect((await consume(db(), 'k', limit)).allowed).toBe(true);
      expect((await consume(second, 'k', limit)).allowed).toBe(true);
      expect((await consume(db(), 'k', limit)).allowed).toBe(true);
      const fourth = await consume(second, 'k', limit);
      expect(fourth.allowed).toBe(false);
      expect(fourth.retryAfterSeconds).toBeGreaterThan(0);
      expect(fourth.retryAfterSeconds).toBeLessThanOrEqual(60);
    } finally {
      await second.destroy();
    }
  });

  it('allows the next attempt once one spacing (window / limit) has passed', async () => {
    const limit = { limit: 2, windowSeconds: 60 };
    await consume(db(), 'w', limit);
    await consume(db(), 'w', limit);
    const refused = await consume(db(), 'w', limit);
    expect(refused.allowed).toBe(false);
    expect(refused.retryAfterSeconds).toBeGreaterThan(25);
    expect(refused.retryAfterSeconds).toBeLessThanOrEqual(30);
    // Thirty seconds later (one spacing) one attempt is free again, not the whole window.
    await db().updateTable('rate_limits').set({ paced_until: sql`paced_until - interval '30 seconds'` }).where('key', '=', 'w').execute();
    expect((await consume(db(), 'w', limit)).allowed).toBe(true);
    expect((await consume(db(), 'w', limit)).allowed).toBe(false);
  });
});
