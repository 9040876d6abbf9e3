/**
 * Builds a Kysely instance on a pg pool. The app keeps one instance (lib/db.ts); scripts and
 * tests build their own from a URL. bigint (int8) values are parsed to numbers only where they
 * are safe: counts come back from `count(*)` as strings and are converted by the caller.
 */
import { Kysely, PostgresDialect } from 'kysely';
import pg from 'pg';
import type { Database } from './schema';

export function createDb(connectionString: string, options: { max?: number } = {}): Kysely<Database> {
  const pool = new pg.Pool({
    connectionString,
    max: options.max ?? 10,
    connectionTimeoutMillis: 3_000,
    idleTimeoutMillis: 30_000,
  });
  // A dropped connection must not crash the process; the pool reconnects on the next query.
  pool.on('error', (err) => {
    console.error('[db] idle client error:', err.message);
  });
  return new Kysely<Database>({ dialect: new PostgresDialect({ pool }) });
}
