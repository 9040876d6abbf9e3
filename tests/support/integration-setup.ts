import { sql } from 'kysely';
import { afterAll, beforeEach, vi } from 'vitest';
import { db } from '@/lib/db';
import { sentMail } from './mail';

process.env.AUTH_SECRET ??= 'integration-test-secret-integration-test-secret';
process.env.APP_URL ??= 'http://localhost:3100';
process.env.SMTP_HOST ??= '127.0.0.1';

// Mail is captured in memory: integration tests check what would be sent without an SMTP server.
vi.mock('@/lib/mail/send', async () => {
  const { sentMail } = await import('./mail');
  return {
    sendMail: async (m: (typeof sentMail)[number]) => {
      sentMail.push(m);
    },
  };
});

const TABLES = [
  'rate_limits',
  'activity_log',
  'invitations',
  'study_revisions',
  'study_members',
  'studies',
  'workspace_members',
  'workspaces',
  'email_tokens',
  'user_credentials',
  '"VerificationToken"',
  '"Session"',
  '"Account"',
  '"User"',
];

beforeEach(async () => {
  sentMail.length = 0;
  await sql.raw(`truncate ${TABLES.join(', ')} restart identity cascade`).execute(db());
});

afterAll(async () => {
  await db().destroy();
  (globalThis as { unitwiseDb?: unknown }).unitwiseDb = undefined;
});
