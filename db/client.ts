/**
 * Builds a Kysely instance on a pg pool. The app keeps one instance (lib/db.ts); scripts and
 * tests build their own from a URL. bigint (int8) values are parsed to numbers only where they
 * are safe: counts come back from `count(*)` as strings and are converted by the caller.
 *
 * The pool outlives the database: when PostgreSQL restarts or the network drops, the queries in
 * progress fail (their callers answer 503 or, in a worker, wait and try again), broken
 * connections are thrown away, and the next query opens a new one. The outage is logged once
 * when it begins and once when it ends (db/availability.ts), not once per failed query.
 */
import { Kysely, PostgresDialect, type LogEvent } from 'kysely';
import pg from 'pg';
import { isDatabaseUnavailable } from '@/lib/errors';
import { logger } from '@/lib/log';
import { noteDatabaseDown, noteDatabaseUp } from './availability';
import type { Database } from './schema';

const log = logger('db');

/** An error on a connection outside any query (idle in the pool, or lent out between queries). */
function onConnectionError(err: Error): void {
  if (isDatabaseUnavailable(err)) noteDatabaseDown(err, 'the pool');
  else log.error('connection error', err);
}

/** Kysely reports every query: a success ends an outage, a connection failure begins one. */
function onQuery(event: LogEvent): void {
  if (event.level === 'query') noteDatabaseUp();
  else if (isDatabaseUnavailable(event.error)) noteDatabaseDown(event.error, 'a query');
}

export function createDb(connectionString: string, options: { max?: number } = {}): Kysely<Database> {
  const pool = new pg.Pool({
    connectionString,
    max: options.max ?? 10,
    connectionTimeoutMillis: 3_000,
    idleTimeoutMillis: 30_000,
    // A connection whose server vanished without closing it (network lost) is found out by
    // TCP keep-alive instead of hanging until the kernel gives up.
    keepAlive: true,
  });
  // pg-pool listens for errors only on idle connections. Kysely borrows a connection for each
  // query and transaction; one that loses its server while borrowed emits 'error' with nobody
  // listening, and an unhandled 'error' event ends the process (this is what stopped workers
  // when PostgreSQL restarted). So every connection gets a listener for its whole life: the
  // query in progress fails as it would anyway, and the pool discards the broken connection.
  pool.on('connect', (client) => client.on('error', onConnectionError));
  pool.on('error', onConnectionError);
  const connect = async () => {
    try {
      return await pool.connect();
    } catch (err) {
      if (isDatabaseUnavailable(err)) noteDatabaseDown(err, 'the pool');
      throw err;
    }
  };
  return new Kysely<Database>({
    dialect: new PostgresDialect({ pool: { connect, end: () => pool.end() } }),
    log: onQuery,
  });
}
