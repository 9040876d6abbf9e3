/**
 * A sign-in link is e-mailed on the app's own address (APP_URL), whatever the request that asked
 * for it said. next-auth builds the link from AUTH_URL or, when a deployment left that unset, from
 * the request's Host / X-Forwarded-Host: an attacker asking for a link for somebody else could have
 * it point at their own site and read the token when the victim clicks.
 */
import { describe, expect, it } from 'vitest';
import { queueSignInLink } from '@/lib/auth/accounts';
import { env } from '@/lib/env';
import { drainMail } from '../support/drain-mail';

describe('the e-mailed sign-in link', () => {
  it('points at APP_URL even when next-auth built it from a hostile Host header', async () => {
    const token = 'f'.repeat(64);
    const email = 'victim.link@test.example';
    // What next-auth hands to sendVerificationRequest for a request with Host: evil.example.
    const url = `http://evil.example/api/auth/callback/nodemailer?callbackUrl=%2Fstudies&token=${token}&email=${encodeURIComponent(email)}`;
    await queueSignInLink({ email, url, token }, new Headers({ host: 'evil.example', 'x-forwarded-host': 'evil.example' }));
    const mail = (await drainMail()).find((m) => m.to === email);
    expect(mail, 'the sign-in link was sent').toBeDefined();
    const links = [...mail!.text.matchAll(/https?:\/\/\S+/g)].map((m) => new URL(m[0]));
    expect(links.length).toBeGreaterThan(0);
    for (const link of links) expect(link.origin).toBe(new URL(env().APP_URL).origin);
    const signIn = links.find((l) => l.searchParams.get('token') === token)!;
    expect(signIn.pathname).toBe('/api/auth/callback/nodemailer');
    expect(signIn.searchParams.get('email')).toBe(email);
    expect(mail!.text + mail!.html).not.toContain('evil.example');
  });
});
