/**
 * Nobody can lock other people out (lib/rate-limit.ts): an attacker's flood of failed sign-ins,
 * sign-ups and reset requests slows the attacker and the attacked account, never another
 * person, with or without a trusted proxy. A refused attempt writes nothing (the rows keep their
 * xmin and xmax), a key never lets through more than its limit under concurrent attempts, and
 * old rows are deleted.
 */
import { sql } from 'kysely';
import { afterEach, describe, expect, it } from 'vitest';
import { checkCredentials, requestPasswordReset, signUp } from '@/lib/auth/accounts';
import { hashPassword } from '@/lib/auth/password';
import { setPasswordHash } from '@/db/repositories/users';
import { db } from '@/lib/db';
import { accountChecks, addressKey, consume, consumeAll, LIMITS, pruneRateLimits } from '@/lib/rate-limit';
import { drainMail } from '../support/drain-mail';
import { makeUser } from '../support/fixtures';

const PASSWORD = 'trays-are-not-plants-7';
const from = (ip: string) => new Headers({ 'x-forwarded-for': ip });

afterEach(() => {
  delete process.env.TRUST_PROXY;
});

async function genuineUser(label: string) {
  const user = await makeUser(label);
  await setPasswordHash(db(), user.id, await hashPassword(PASSWORD));
  return user;
}

/** Runs an attempt, counting a refusal (`rate_limited`) instead of failing. */
async function attempt(run: () => Promise<unknown>): Promise<'done' | 'refused'> {
  try {
    const out = await run();
    return (out as { kind?: string } | undefined)?.kind === 'rate_limited' ? 'refused' : 'done';
  } catch (err) {
    if ((err as { code?: string }).code === 'rate_limited') return 'refused';
    throw err;
  }
}

describe.each([
  { setting: 'without a proxy (TRUST_PROXY unset)', trustProxy: false },
  { setting: 'behind a trusted proxy, the attacker on one address', trustProxy: true },
])('an attacker cannot lock anybody else out, $setting', ({ trustProxy }) => {
  it('60 failed sign-ins, 10 sign-ups and 30 reset requests for made-up addresses leave another person able to sign in, sign up and reset', { timeout: 60_000 }, async () => {
    if (trustProxy) process.env.TRUST_PROXY = 'true';
    const ada = await genuineUser('ada');
    const attacker = from('198.51.100.66');
    const refused = { signIn: 0, signUp: 0, reset: 0 };
    for (let i = 0; i < 60; i++) {
      if ((await attempt(() => checkCredentials(`made.up.${i}@test.example`, 'guess-password-1', attacker))) === 'refused') refused.signIn += 1;
    }
    for (let i = 0; i < 10; i++) {
      if ((await attempt(() => signUp({ name: 'Bot', email: `bot.${i}@test.example`, password: PASSWORD }, attacker))) === 'refused') refused.signUp += 1;
    }
    for (let i = 0; i < 30; i++) {
      if ((await attempt(() => requestPasswordReset(`made.up.${i}@test.example`, attacker))) === 'refused') refused.reset += 1;
    }
    // Behind a proxy the attacker's own address is slowed; without one, nothing is refused at this scale.
    expect(refused).toEqual(trustProxy ? { signIn: 60 - LIMITS.signInPerClient.limit, signUp: 0, reset: 30 - LIMITS.resetPerClient.limit } : { signIn: 0, signUp: 0, reset: 0 });

    const someoneElse = from('203.0.113.20');
    expect((await checkCredentials(ada.email, PASSWORD, someoneElse)).kind).toBe('ok');
    await expect(signUp({ name: 'Lena', email: 'lena@test.example', password: PASSWORD }, someoneElse)).resolves.toBeUndefined();
    await expect(requestPasswordReset(ada.email, someoneElse)).resolves.toBeUndefined();
    const mail = await drainMail();
    expect(mail.map((m) => [m.to, m.subject])).toEqual(
      expect.arrayContaining([
        ['lena@test.example', 'Confirm your e-mail address for Unitwise'],
        [ada.email, 'Reset your Unitwise password'],
      ]),
    );
  });
});

describe('the attacked account is slowed', () => {
  it('after 10 attempts on one address, password sign-in for it waits one spacing (90 s), even with the right password; other accounts and its reset are unaffected', async () => {
    const ada = await genuineUser('ada');
    const bruno = await genuineUser('bruno');
    for (let i = 0; i < 15; i++) await checkCredentials(ada.email, `guess-${i}-password`, from(`192.0.2.${i}`));
    expect((await checkCredentials(ada.email, PASSWORD, from('203.0.113.20'))).kind).toBe('rate_limited');
    expect((await checkCredentials(bruno.email, PASSWORD, from('203.0.113.20'))).kind).toBe('ok');
    await requestPasswordReset(ada.email, from('203.0.113.20'));
    expect((await drainMail()).map((m) => m.to)).toEqual([ada.email]);

    const r = await consume(db(), addressKey('sign-in', ada.email), LIMITS.signInPerAddress);
    const spacing = LIMITS.signInPerAddress.windowSeconds / LIMITS.signInPerAddress.limit;
    expect(r.retryAfterSeconds).toBeGreaterThan(spacing - 5);
    expect(r.retryAfterSeconds).toBeLessThanOrEqual(spacing);
    await db()
      .updateTable('rate_limits')
      .set({ paced_until: sql`paced_until - make_interval(secs => ${spacing})` })
      .where('key', '=', addressKey('sign-in', ada.email))
      .execute();
    expect((await checkCredentials(ada.email, PASSWORD, from('203.0.113.20'))).kind).toBe('ok');
  });

  it('a reset flood for one address answers as usual and stops mailing it after 5 requests an hour', async () => {
    const ada = await genuineUser('ada');
    for (let i = 0; i < 12; i++) await expect(requestPasswordReset(ada.email, from(`192.0.2.${i}`))).resolves.toBeUndefined();
    expect(await drainMail()).toHaveLength(LIMITS.resetPerAddress.limit);
  });
});

describe('a refused attempt writes nothing', () => {
  async function versions(keys: string[]) {
    const { rows } = await sql<{ key: string; xmin: string; xmax: string }>`
      select key, xmin::text, xmax::text from rate_limits where key = any(${keys}::text[]) order by key`.execute(db());
    return rows;
  }

  it('neither the refusing key nor the shared overall key gets a new row version or a row lock', async () => {
    const checks = accountChecks('sign-in', 'ada@test.example', from('203.0.113.7'));
    const keys = checks.map((c) => c.key);
    for (let i = 0; i < LIMITS.signInPerAddress.limit; i++) expect((await consumeAll(db(), checks)).allowed).toBe(true);
    expect((await consumeAll(db(), checks)).allowed).toBe(false);
    const before = await versions(keys);
    expect(before.map((r) => r.key)).toEqual([...keys].sort());

    for (let i = 0; i < 25; i++) {
      const r = await consumeAll(db(), checks);
      expect(r.allowed).toBe(false);
      expect(r.refused).toEqual([addressKey('sign-in', 'ada@test.example')]);
    }
    expect(await versions(keys)).toEqual(before);
  });
});

describe('limits hold under concurrent attempts', () => {
  it('of 30 attempts at once (ten connections) on a key with limit 3, exactly 3 get through', async () => {
    const limit = { limit: 3, windowSeconds: 600 };
    for (let trial = 0; trial < 5; trial++) {
      const results = await Promise.all(Array.from({ length: 30 }, () => consume(db(), `burst:${trial}`, limit)));
      expect(results.filter((r) => r.allowed)).toHaveLength(3);
    }
  });
});

describe('old rows are deleted', () => {
  async function seed(pastKeys: number, futureKeys: number) {
    const rows = [
      ...Array.from({ length: pastKeys }, (_, i) => ({ key: `old:${i}`, paced_until: new Date(Date.now() - 60_000 - i * 1000), window_seconds: 60 })),
      ...Array.from({ length: futureKeys }, (_, i) => ({ key: `live:${i}`, paced_until: new Date(Date.now() + 60_000), window_seconds: 60 })),
    ];
    await db().insertInto('rate_limits').values(rows).execute();
  }
  const remaining = async () => (await db().selectFrom('rate_limits').select('key').orderBy('key').execute()).map((r) => r.key);

  it('deletes rows whose allowance is whole again, a bounded batch at a time, and keeps the others', async () => {
    await seed(5, 2);
    expect(await pruneRateLimits(db(), 3)).toBe(3);
    expect(await pruneRateLimits(db(), 3)).toBe(2);
    expect(await pruneRateLimits(db(), 3)).toBe(0);
    expect(await remaining()).toEqual(['live:0', 'live:1']);
  });

  it('every process deletes them now and then while it counts attempts', async () => {
    await seed(4, 1);
    (globalThis as { unitwiseRatePrunedAt?: number }).unitwiseRatePrunedAt = 0;
    await consume(db(), 'fresh', { limit: 5, windowSeconds: 60 });
    await expect.poll(remaining).toEqual(['fresh', 'live:0']);
  });
});
