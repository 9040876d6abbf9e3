/**
 * The pool of db/client.ts outlives a lost connection. A connection that Kysely has borrowed for a
 * transaction is cut by the server (as a restart or a network drop would cut it) while no query
 * is running on it: its next query fails as a database outage, the process carries on (without
 * the fix, node-postgres emitted 'error' with no listener and the process ended), and the pool's
 * next query opens a fresh connection.
 */
import { sql } from 'kysely';
import { afterAll, describe, expect, it } from 'vitest';
import { createDb } from '@/db/client';
import { db } from '@/lib/db';
import { isDatabaseUnavailable } from '@/lib/errors';

const mine = createDb(process.env.DATABASE_URL!, { max: 2 });

afterAll(async () => {
  await mine.destroy();
});

describe('a connection lost while borrowed', () => {
  it('fails its own query as an outage, does not end the process, and the pool carries on', async () => {
    const uncaught: unknown[] = [];
    const record = (err: unknown) => uncaught.push(err);
    process.on('uncaughtException', record);
    let failure: unknown;
    try {
      await mine.transaction().execute(async (trx) => {
        const { rows } = await sql<{ pid: number }>`select pg_backend_pid() as pid`.execute(trx);
        await sql`select pg_terminate_backend(${rows[0]!.pid})`.execute(db());
        // The server's goodbye arrives while the transaction holds the connection between queries.
        await new Promise((r) => setTimeout(r, 300));
        await sql`select 1`.execute(trx);
      });
    } catch (err) {
      failure = err;
    } finally {
      process.off('uncaughtException', record);
    }
    expect(uncaught, 'no error escaped to the process').toEqual([]);
    expect(isDatabaseUnavailable(failure), String(failure)).toBe(true);
    const { rows } = await sql<{ one: number }>`select 1 as one`.execute(mine);
    expect(rows).toEqual([{ one: 1 }]);
  });
});
