/**
 * Taking jobs from a pg-boss queue so that the consumer outlives the database: `consume()` is
 * one slot, a loop that claims one job, runs it, marks it complete (or failed, when the handler
 * threw) and at once asks for the next; when the queue is empty it asks again every `pollSeconds`.
 * Several slots on one queue run jobs in parallel. Any queue may use it (lib/jobs/worker.ts runs
 * the stress-test chunks with it).
 *
 * pg-boss's own `work()` loop is not used, for two reasons: it marks a job complete or failed
 * without awaiting the answer, so a database that drops at that moment leaves a rejected promise
 * that nobody handles (Node then ends the process: this is what stopped workers when PostgreSQL
 * restarted), and its fetch answers "no job" when its query fails, so an outage looked like an
 * empty queue. Here every step that needs the database waits while the database is unreachable,
 * trying again after 0.25 s, then twice as long each time up to 2 s, and carries on when it answers:
 *  - claiming: the slot waits, then claims again;
 *  - running: a handler that fails because the database is unreachable is run again from the start
 *    once it answers, without using up one of the job's retries (so handlers must be idempotent);
 *  - completing or failing the job: tried again until the database has recorded it.
 * The outage is logged when it begins and when it ends (db/availability.ts), not at every try.
 * A slot told to stop during an outage leaves its job as it is: the job expires and pg-boss
 * retries it (its expireInSeconds), on whichever process is running then.
 */
import type PgBoss from 'pg-boss';
import { noteDatabaseDown, noteDatabaseUp } from '@/db/availability';
import { isDatabaseUnavailable } from '@/lib/errors';
import { logger } from '@/lib/log';

const log = logger('jobs');

/** Waits between tries while the database is unreachable: 0.25 s, 0.5 s, 1 s, then 2 s. */
export const RECONNECT_FIRST_MS = 250;
export const RECONNECT_MAX_MS = 2_000;

export function reconnectDelayMs(attempt: number): number {
  return Math.min(RECONNECT_MAX_MS, RECONNECT_FIRST_MS * 2 ** attempt);
}

/** Resolves after `ms`, or at once when `signal` aborts. */
function sleep(ms: number, signal: AbortSignal): Promise<void> {
  if (signal.aborted) return Promise.resolve();
  return new Promise((resolve) => {
    const done = () => {
      clearTimeout(timer);
      signal.removeEventListener('abort', done);
      resolve();
    };
    const timer = setTimeout(done, ms);
    signal.addEventListener('abort', done);
  });
}

/** Thrown out of a wait for the database when the slot is told to stop. */
class Stopped extends Error {}

/** Runs `step` until the database answers it; throws Stopped when `signal` aborts meanwhile. */
async function untilReachable<T>(step: () => Promise<T>, signal: AbortSignal, who: string): Promise<T> {
  for (let attempt = 0; ; attempt++) {
    try {
      const value = await step();
      noteDatabaseUp();
      return value;
    } catch (err) {
      if (!isDatabaseUnavailable(err)) throw err;
      noteDatabaseDown(err, who);
      if (signal.aborted) throw new Stopped();
      await sleep(reconnectDelayMs(attempt), signal);
      if (signal.aborted) throw new Stopped();
    }
  }
}

/**
 * Claims one job. pg-boss's fetch() answers "no job" when its query fails; its queries go
 * through this connection, which keeps the failure so that an outage is told from an empty queue.
 */
async function claim<T>(boss: PgBoss, queue: string): Promise<PgBoss.JobWithMetadata<T> | undefined> {
  const bossDb = boss.getDb();
  let failure: unknown;
  const db = {
    async executeSql(text: string, values: unknown[]) {
      try {
        return await bossDb.executeSql(text, values as never[]);
      } catch (err) {
        failure = err;
        throw err;
      }
    },
  };
  const [job] = await boss.fetch<T>(queue, { batchSize: 1, includeMetadata: true, db });
  if (failure !== undefined) throw failure;
  return job;
}

export interface ConsumeOptions {
  /** Aborting it stops the slot: after the job in progress, or at once while the database is away. */
  signal: AbortSignal;
  /** How often an idle slot asks the queue again. */
  pollSeconds: number;
  /** Lets the process that queued a job wake its idle slots at once instead of after pollSeconds. */
  wake?: Wakeup;
}

/** A bell that idle slots wait on: `ring()` ends every current wait. */
export class Wakeup {
  private waiters = new Set<() => void>();

  ring(): void {
    for (const done of [...this.waiters]) done();
  }

  /** Resolves after `ms`, on `ring()`, or when `signal` aborts. */
  wait(ms: number, signal: AbortSignal): Promise<void> {
    if (signal.aborted) return Promise.resolve();
    return new Promise((resolve) => {
      const done = () => {
        clearTimeout(timer);
        signal.removeEventListener('abort', done);
        this.waiters.delete(done);
        resolve();
      };
      const timer = setTimeout(done, ms);
      signal.addEventListener('abort', done);
      this.waiters.add(done);
    });
  }
}

/** One slot taking jobs from `queue` until `signal` aborts; resolves when it has stopped. */
export async function consume<T>(boss: PgBoss, queue: string, handle: (job: PgBoss.JobWithMetadata<T>) => Promise<void>, options: ConsumeOptions): Promise<void> {
  const { signal } = options;
  const who = `the ${queue} queue`;
  while (!signal.aborted) {
    try {
      const job = await untilReachable(() => claim<T>(boss, queue), signal, who);
      if (!job) {
        await (options.wake ? options.wake.wait(options.pollSeconds * 1000, signal) : sleep(options.pollSeconds * 1000, signal));
        continue;
      }
      let failure: unknown;
      try {
        await untilReachable(() => handle(job), signal, who);
      } catch (err) {
        if (err instanceof Stopped) throw err;
        failure = err;
      }
      if (failure === undefined) await untilReachable(() => boss.complete(queue, job.id), signal, who);
      else await untilReachable(() => boss.fail(queue, job.id, failure as object), signal, who);
    } catch (err) {
      if (err instanceof Stopped) return;
      // Not the database's absence (that is waited out above): log it, and keep the slot alive.
      log.error(`${queue}: unexpected error`, err);
      await sleep(options.pollSeconds * 1000, signal);
    }
  }
}
