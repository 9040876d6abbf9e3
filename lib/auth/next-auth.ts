import 'server-only';
import NextAuth, { CredentialsSignin } from 'next-auth';
import type { Adapter } from 'next-auth/adapters';
import { encode as defaultEncode } from 'next-auth/jwt';
import Credentials from 'next-auth/providers/credentials';
import Nodemailer from 'next-auth/providers/nodemailer';
import { KyselyAdapter } from '@auth/kysely-adapter';
import { randomBytes } from 'node:crypto';
import { insertSession } from '@/db/repositories/users';
import { logActivity } from '@/db/repositories/activity';
import { db } from '@/lib/db';
import { env } from '@/lib/env';
import { accountChecks, accountLimitError, consumeAll } from '@/lib/rate-limit';
import { queueMail } from '@/lib/mail/queue';
import { wakeMailSender } from '@/lib/mail/sender';
import { magicLinkMail } from '@/lib/mail/templates';
import { signInSchema } from '@/lib/validation/auth';
import { checkCredentials, createPersonalWorkspace } from './accounts';
import { hashToken } from './tokens';

/**
 * next-auth: e-mail + password (Credentials) and e-mail magic links (Nodemailer), both ending in
 * a database session in the "Session" table. next-auth writes Credentials sign-ins as JWTs; the
 * `jwt.encode` hook below writes a database session for them instead, so that every session can
 * be listed, revoked on sign-out and on password reset, and resolved by one query.
 */
export const SESSION_MAX_AGE_SECONDS = 30 * 24 * 60 * 60;

export class UnverifiedEmail extends CredentialsSignin {
  code = 'unverified';
}
export class TooManyAttempts extends CredentialsSignin {
  code = 'rate_limited';
}

export const { handlers, signIn, signOut } = NextAuth(() => {
  const e = env();
  return {
    adapter: KyselyAdapter(db() as never) as Adapter,
    secret: e.AUTH_SECRET,
    trustHost: true,
    logger: {
      // A wrong password is an expected outcome, not a server error worth a stack trace.
      error(error) {
        if (error.name === 'CredentialsSignin' || (error as { type?: string }).type === 'CredentialsSignin') return;
        console.error('[auth]', error);
      },
    },
    session: { strategy: 'database', maxAge: SESSION_MAX_AGE_SECONDS, updateAge: 24 * 60 * 60 },
    pages: { signIn: '/sign-in', verifyRequest: '/sign-in/check-email', error: '/sign-in/problem' },
    providers: [
      Credentials({
        credentials: { email: {}, password: {} },
        async authorize(raw, request) {
          const parsed = signInSchema.safeParse(raw);
          if (!parsed.success) return null;
          const outcome = await checkCredentials(parsed.data.email, parsed.data.password, request.headers);
          if (outcome.kind === 'rate_limited') throw new TooManyAttempts();
          if (outcome.kind === 'unverified') throw new UnverifiedEmail();
          if (outcome.kind !== 'ok') return null;
          return { id: outcome.user.id, name: outcome.user.name, email: outcome.user.email };
        },
      }),
      Nodemailer({
        server: { host: e.SMTP_HOST, port: e.SMTP_PORT, secure: e.SMTP_SECURE },
        from: e.MAIL_FROM,
        maxAge: 15 * 60,
        // Queued like every message (lib/mail/queue.ts). next-auth stores its token beside this
        // call, not in our transaction: a message whose token was not stored only fails to sign in.
        async sendVerificationRequest({ identifier, url, token, request }) {
          const limit = await consumeAll(db(), accountChecks('magic-link', identifier, request.headers));
          if (!limit.allowed) throw accountLimitError('magic-link', limit);
          await db()
            .transaction()
            .execute((trx) =>
              queueMail(trx, { kind: 'magic-link', idempotencyKey: `magic-link:${hashToken(token)}`, mail: magicLinkMail(identifier, url) }),
            );
          wakeMailSender();
        },
      }),
    ],
    callbacks: {
      jwt({ token, account, user }) {
        if (account?.provider === 'credentials' && user?.id) token.credentialsUserId = user.id;
        return token;
      },
    },
    jwt: {
      async encode(params) {
        const userId = params.token?.credentialsUserId;
        if (typeof userId === 'string') {
          const sessionToken = randomBytes(32).toString('base64url');
          await insertSession(db(), {
            userId,
            sessionToken,
            expires: new Date(Date.now() + SESSION_MAX_AGE_SECONDS * 1000),
          });
          return sessionToken;
        }
        return defaultEncode(params);
      },
    },
    events: {
      async createUser({ user }) {
        // Accounts made by a first magic link get a personal workspace like sign-ups do.
        if (user.id) await createPersonalWorkspace(db(), user.id, user.name ?? user.email ?? 'My');
      },
      async signIn({ user, account }) {
        if (user.id) await logActivity(db(), { actorId: user.id, action: 'auth.sign-in', details: { method: account?.provider ?? 'unknown' } });
      },
    },
  };
});
