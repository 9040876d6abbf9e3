/**
 * Timing does not reveal who has an account. For sign-up, password reset and password sign-in,
 * calls for an address with an account and for one without alternate (so that a load change on
 * the machine hits both alike), and the two samples of durations are compared as distributions:
 * the probability that a call of one kind takes longer than a call of the other (Mann–Whitney
 * U / n·m) must stay near one half. With 40 calls of each kind its standard deviation under "no
 * difference" is 0.065, so the bound of 0.25 is almost four standard deviations away (a false
 * alarm about once in 8,000 runs); reset, being fast, makes 150 of each (0.033). What is left
 * for reset is one inserted token row for an account (about 0.1 ms: 0.55–0.60 with 300 calls of
 * each). A real difference gives 0 or 1: before the fix, sign-up
 * hashed a password only for a new address (0.00) and reset sent its mail, only for a known
 * address, while answering (0.98). The stand-in SMTP server takes 20 ms per message here, as a
 * local one does; a distant provider takes longer.
 */
import { describe, expect, it } from 'vitest';
import { checkCredentials, requestPasswordReset, signUp, verifyEmail } from '@/lib/auth/accounts';
import { db } from '@/lib/db';
import { drainMail } from '../support/drain-mail';
import { linkIn, smtp } from '../support/mail';
import { ksStatistic, median, probabilityOfSuperiority } from '../support/timing';

const headers = () => new Headers({ 'x-forwarded-for': '203.0.113.7' });
const PASSWORD = 'trays-are-not-plants-7';
/** Calls per kind of address: reset is fast, so it gets more, to see a small difference. */
const CALLS = { reset: 150, signUp: 40, signIn: 40 };
const WARM_UP = 4;
const MAX_DISTANCE_FROM_HALF = 0.25;

interface Comparison {
  medianKnownMs: number;
  medianUnknownMs: number;
  /** P(a call for a known address takes longer than one for an unknown address). */
  superiority: number;
  ks: number;
}

/** Alternates known and unknown calls; the rate limits are emptied between calls (not timed). */
async function compare(perKind: number, call: (known: boolean, i: number) => Promise<unknown>): Promise<Comparison> {
  smtp.latencyMs = 20;
  const known: number[] = [];
  const unknown: number[] = [];
  for (let i = 0; i < WARM_UP + 2 * perKind; i++) {
    const isKnown = i % 2 === 0;
    const start = performance.now();
    await call(isKnown, i);
    const ms = performance.now() - start;
    if (i >= WARM_UP) (isKnown ? known : unknown).push(ms);
    await db().deleteFrom('rate_limits').execute();
  }
  return {
    medianKnownMs: median(known),
    medianUnknownMs: median(unknown),
    superiority: probabilityOfSuperiority(known, unknown),
    ks: ksStatistic(known, unknown),
  };
}

function expectInseparable(what: string, c: Comparison) {
  const summary = `${what}: median ${c.medianKnownMs.toFixed(1)} ms (account) vs ${c.medianUnknownMs.toFixed(1)} ms (no account), P(longer) = ${c.superiority.toFixed(3)}, KS D = ${c.ks.toFixed(3)}`;
  console.info(summary);
  expect(Math.abs(c.superiority - 0.5), summary).toBeLessThanOrEqual(MAX_DISTANCE_FROM_HALF);
}

async function verifiedAccount(email: string) {
  await signUp({ name: 'Priya', email, password: PASSWORD }, headers());
  const [mail] = await drainMail();
  await verifyEmail(new URL(linkIn(mail!.text)).searchParams.get('token')!);
}

describe('the time an answer takes does not tell whether an address has an account', () => {
  it('password reset', { timeout: 60_000 }, async () => {
    await verifiedAccount('priya@test.example');
    const c = await compare(CALLS.reset, (known, i) => requestPasswordReset(known ? 'priya@test.example' : `nobody.${i}@test.example`, headers()));
    expectInseparable('reset', c);
  });

  it('sign-up', { timeout: 60_000 }, async () => {
    await verifiedAccount('priya@test.example');
    const c = await compare(CALLS.signUp, (known, i) =>
      signUp({ name: `Someone ${i}`, email: known ? 'priya@test.example' : `new.${i}@test.example`, password: PASSWORD }, headers()),
    );
    expectInseparable('sign-up', c);
  });

  it('password sign-in: a wrong password and an unknown address', { timeout: 60_000 }, async () => {
    await verifiedAccount('priya@test.example');
    const c = await compare(CALLS.signIn, async (known, i) => {
      const outcome = await checkCredentials(known ? 'priya@test.example' : `nobody.${i}@test.example`, 'not-the-password-1', headers());
      expect(outcome.kind).toBe('invalid');
    });
    expectInseparable('sign-in', c);
  });
});
