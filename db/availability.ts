/**
 * Whether this process can reach PostgreSQL, as its queries find out, with one log line per
 * change of state: a warning at the first failure of an outage and a line with the outage's
 * length at the first success after it. The pools (db/client.ts), the queue (lib/jobs) and
 * request errors (lib/errors.ts) all report here, so a 30 s restart that every retry and every
 * request runs into logs two lines, not hundreds.
 *
 * Only for logging: nothing waits on this state (a query that fails is retried or answered 503
 * by its caller). Kept on globalThis, like the app's pool (lib/db.ts), so that hot reload in
 * development keeps one state per process.
 */
import { logger } from '@/lib/log';

const log = logger('db');

interface State {
  /** Date.now() of the first failure of the current outage, undefined while the database answers. */
  downSince?: number;
}

const holder = globalThis as unknown as { unitwiseDbAvailability?: State };
const state = (holder.unitwiseDbAvailability ??= {});

function describe(err: unknown): string {
  const e = err as { code?: unknown; message?: unknown } | undefined;
  const message = typeof e?.message === 'string' && e.message ? e.message : String(err);
  return typeof e?.code === 'string' && !message.includes(e.code) ? `${message} (${e.code})` : message;
}

/** A query failed because PostgreSQL cannot be reached (the caller has checked that it is such a failure). */
export function noteDatabaseDown(err: unknown, where: string): void {
  if (state.downSince !== undefined) return;
  state.downSince = Date.now();
  log.warn(`database unavailable (seen by ${where}): ${describe(err)}; waiting for it to come back`);
}

/** A query succeeded: ends the outage, if there was one. */
export function noteDatabaseUp(): void {
  if (state.downSince === undefined) return;
  const seconds = (Date.now() - state.downSince) / 1000;
  state.downSince = undefined;
  log.info(`database reachable again after ${seconds.toFixed(1)} s`);
}

/** When the current outage began (Date.now()), or undefined while the database answers. */
export function databaseDownSince(): number | undefined {
  return state.downSince;
}
