import { sql } from 'kysely';
import { afterAll, beforeEach, vi } from 'vitest';
import { db } from '@/lib/db';
import { stopBoss } from '@/lib/jobs/boss';
import { stopMailSender } from '@/lib/mail/sender';
import { sentMail, smtp } from './mail';

process.env.AUTH_SECRET ??= 'integration-test-secret-integration-test-secret';
process.env.APP_URL ??= 'http://localhost:3100';
process.env.SMTP_HOST ??= '127.0.0.1';

// Mail is captured in memory: integration tests check what would be sent without an SMTP server.
// The app only queues mail; tests send the queue with drainMail() (tests/support/drain-mail.ts).
vi.mock('@/lib/mail/send', async () => {
  const { sentMail, smtp } = await import('./mail');
  return {
    sendMail: async (m: (typeof sentMail)[number]) => {
      if (smtp.latencyMs) await new Promise((r) => setTimeout(r, smtp.latencyMs));
      if (smtp.down) throw new Error('connect ECONNREFUSED 127.0.0.1:2525');
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
  smtp.down = false;
  smtp.latencyMs = 0;
  await sql.raw(`truncate ${(await tables()).join(', ')} restart identity cascade`).execute(db());
  // The mail queue's jobs name messages that are gone now (pg-boss's own schema is kept).
  await sql`delete from pgboss.job where name = 'mail' and to_regclass('pgboss.job') is not null`.execute(db()).catch(() => undefined);
});

afterAll(async () => {
  // Queueing mail starts this process's pg-boss (lib/jobs/boss.ts); stop it before the pool.
  await stopMailSender();
  await stopBoss();
  await db().destroy();
  (globalThis as { unitwiseDb?: unknown }).unitwiseDb = undefined;
});
