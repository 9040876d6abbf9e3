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

/** Every table of ours (the migration bookkeeping stays), listed from the catalogue. */
async function tables(): Promise<string[]> {
  const { rows } = await sql<{ name: string }>`
    select format('%I', tablename) as name from pg_tables
    where schemaname = 'public' and tablename not like 'kysely_%'`.execute(db());
  return rows.map((r) => r.name);
}

beforeEach(async () => {
  sentMail.length = 0;
  await sql.raw(`truncate ${(await tables()).join(', ')} restart identity cascade`).execute(db());
});

afterAll(async () => {
  await db().destroy();
  (globalThis as { unitwiseDb?: unknown }).unitwiseDb = undefined;
});
