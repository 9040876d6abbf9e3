/**
 * A simulation worker: takes chunk jobs from the queue and computes them on a pool of worker
 * threads. One slot per thread, each a loop that claims one chunk, computes and stores it, marks
 * the job complete and at once asks for the next, so that every core stays busy and no chunk
 * waits on another; a slot that finds the queue empty asks again every SIM_POLL_SECONDS. One more
 * slot takes the chunks whose retries are used up and fails their runs.
 *
 * The worker outlives the database. pg-boss's own `work()` loop is not used, for two reasons: it
 * marks a job complete or failed without awaiting the answer, so a database that drops at that
 * moment leaves a rejected promise that nobody handles (Node then ends the process: this is what
 * stopped workers when PostgreSQL restarted), and its fetch answers "no job" when its query fails,
 * so an outage looked like an empty queue. Here every step that needs the database waits while
 * the database is unreachable, trying again after 0.25 s, then twice as long each time up to 2 s,
 * and carries on when it answers:
 *  - claiming: the slot waits, then claims again;
 *  - a chunk whose reads or final transaction failed is run again from the start once the database
 *    answers (every step of lib/jobs/handler.ts is idempotent, and a stored chunk is never stored
 *    or counted twice: its primary key keeps the second copy out), without using up a retry;
 *  - completing the job: tried again until the database has recorded it.
 * The outage is logged when it begins and when it ends (db/availability.ts), not at every try.
 * When the worker is stopped during an outage, a chunk waiting for the database is left to
 * expire and is retried by whichever worker is running (SIM_CHUNK_EXPIRE_SECONDS).
 *
 * The same code runs inside `npm start` (a worker process beside the web server, see
 * scripts/start.mjs) and as `npm run worker` on any machine that reaches the database.
 */
import type { Kysely } from 'kysely';
import type PgBoss from 'pg-boss';
import { noteDatabaseDown, noteDatabaseUp } from '@/db/availability';
import type { Database } from '@/db/schema';
import { isDatabaseUnavailable } from '@/lib/errors';
import { logger } from '@/lib/log';
import { CHUNK_QUEUE, FAILED_CHUNK_QUEUE, getBoss, stopBoss, type ChunkJobData } from './boss';
import { jobsConfig } from './config';
import { describeFailure, failRun, processChunk, type Engine } from './handler';
import { withdrawChunks } from './queue';

export interface WorkerOptions<Spec> {
  db: Kysely<Database>;
  engine: Engine<Spec>;
  /** Parallel chunk slots (default: SIM_WORKER_THREADS). */
  concurrency?: number;
  url?: string;
  log?: (message: string) => void;
}

export interface RunningWorker {
  boss: PgBoss;
  /** Stops taking new chunks and waits for those in progress; the process's pg-boss keeps running. */
  pause(): Promise<void>;
  /** Stops taking chunks, waits for those in progress (up to timeoutMs), stops pg-boss. */
  stop(timeoutMs?: number): Promise<void>;
}

type Job = PgBoss.JobWithMetadata<ChunkJobData>;

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

/** Thrown out of a wait for the database when the worker is told to stop. */
class Stopped extends Error {}

export async function startWorker<Spec>(options: WorkerOptions<Spec>): Promise<RunningWorker> {
  const config = jobsConfig();
  const workerLog = logger('worker');
  const log = options.log ?? ((m: string) => workerLog.info(m));
  const boss = await getBoss(options.url);
  const concurrency = options.concurrency ?? config.threads;
  const stopping = new AbortController();
  const signal = stopping.signal;

  /** Runs `step` until the database answers it; throws Stopped when the worker stops meanwhile. */
  async function untilReachable<T>(what: string, step: () => Promise<T>): Promise<T> {
    for (let attempt = 0; ; attempt++) {
      try {
        const value = await step();
        noteDatabaseUp();
        return value;
      } catch (err) {
        if (!isDatabaseUnavailable(err)) throw err;
        noteDatabaseDown(err, what);
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
  async function claim(queue: string): Promise<Job | undefined> {
    const bossDb = boss.getDb();
    return untilReachable('the worker', async () => {
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
      const [job] = await boss.fetch<ChunkJobData>(queue, { batchSize: 1, includeMetadata: true, db });
      if (failure !== undefined) throw failure;
      return job;
    });
  }

  /** Takes jobs from `queue` one at a time until the worker stops. */
  async function slot(queue: string, handle: (job: Job) => Promise<void>): Promise<void> {
    while (!signal.aborted) {
      try {
        const job = await claim(queue);
        if (!job) {
          await sleep(config.pollSeconds * 1000, signal);
          continue;
        }
        let failure: unknown;
        try {
          await untilReachable('the worker', () => handle(job));
        } catch (err) {
          if (err instanceof Stopped) throw err;
          failure = err;
        }
        if (failure === undefined) await untilReachable('the worker', () => boss.complete(queue, job.id));
        else await untilReachable('the worker', () => boss.fail(queue, job.id, failure as object));
      } catch (err) {
        if (err instanceof Stopped) return;
        // Not the database's absence (that is waited out above): log it, and keep the slot alive.
        workerLog.error(`queue ${queue}: unexpected error`, err);
        await sleep(config.pollSeconds * 1000, signal);
      }
    }
  }

  const computeChunk = async (job: Job) => {
    const outcome = await processChunk(options.db, job.data, options.engine);
    if (outcome === 'finished') log(`run ${job.data.simulationId} done`);
  };

  // A chunk out of retries: the run fails and its waiting chunks are withdrawn, in one transaction.
  const failChunk = async (job: Job) => {
    const reason = describeFailure(job.output);
    await options.db.transaction().execute(async (trx) => {
      const jobIds = await failRun(trx, job.data, reason, job.retryLimit + 1);
      if (!jobIds) return;
      await withdrawChunks(jobIds, { db: trx, boss });
      log(`run ${job.data.simulationId} failed: ${reason}`);
    });
  };

  const loops = [
    ...Array.from({ length: concurrency }, () => slot(CHUNK_QUEUE, computeChunk)),
    slot(FAILED_CHUNK_QUEUE, failChunk),
  ];
  log(`taking stress-test chunks with ${concurrency} parallel slot${concurrency === 1 ? '' : 's'}`);

  const pause = async (timeoutMs = Infinity) => {
    stopping.abort();
    const finished = Promise.all(loops).then(() => undefined);
    if (!Number.isFinite(timeoutMs)) return finished;
    let timer: NodeJS.Timeout | undefined;
    await Promise.race([finished, new Promise<void>((resolve) => (timer = setTimeout(resolve, timeoutMs)))]);
    clearTimeout(timer);
  };
  return {
    boss,
    pause: () => pause(),
    async stop(timeoutMs = 10_000) {
      await pause(timeoutMs);
      await stopBoss({ graceful: true, timeout: timeoutMs });
    },
  };
}
