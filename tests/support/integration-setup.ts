import fs from 'node:fs';
import path from 'node:path';
import { sql } from 'kysely';
import { afterAll, afterEach, beforeEach, inject, vi } from 'vitest';
import { db } from '@/lib/db';
import { stopBoss } from '@/lib/jobs/boss';
import { stopMailSender } from '@/lib/mail/sender';
import { contract, takeProblems } from './api-contract';
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

// Every response a route handler gives is checked against the API document
// (tests/support/api-contract.ts): a 2xx body that the document does not describe fails the test.
vi.mock('@/lib/api/handler', async (importOriginal) => {
  const actual = await importOriginal<typeof import('@/lib/api/handler')>();
  const { recordResponse } = await import('./api-contract');
  const api: typeof actual.api = (fn, options) => {
    const handler = actual.api(fn, options);
    return async (req, context) => {
      const res = await handler(req, context);
      await recordResponse(req, res);
      return res;
    };
  };
  return { ...actual, api };
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

function failOnUndescribedResponses(): void {
  const problems = takeProblems();
  if (problems.length) throw new Error(`Responses that the API document does not describe:\n${problems.join('\n')}`);
}

afterEach(failOnUndescribedResponses);

afterAll(async () => {
  // What this file exercised, for the summary at the end of the run (global-setup.ts).
  fs.writeFileSync(path.join(inject('apiContractDir'), `${process.pid}-${Date.now()}.json`), JSON.stringify([...contract.exercised]));
  // Queueing mail starts this process's pg-boss (lib/jobs/boss.ts); stop it before the pool.
  await stopMailSender();
  await stopBoss();
  await db().destroy();
  (globalThis as { unitwiseDb?: unknown }).unitwiseDb = undefined;
  // Responses received in a file's beforeAll or afterAll hooks.
  failOnUndescribedResponses();
});
