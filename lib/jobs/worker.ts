/**
 * A simulation worker: takes chunk jobs from the queue and computes them on a pool of worker
 * threads. One slot per thread (lib/jobs/consume.ts), each claiming one chunk at a time, computing
 * and storing it and at once asking for the next, so that every core stays busy and no chunk waits
 * on another; a slot that finds the queue empty asks again every SIM_POLL_SECONDS. One more slot
 * takes the chunks whose retries are used up and fails their runs.
 *
 * The worker outlives the database: every step waits while PostgreSQL is unreachable and carries
 * on when it answers (consume.ts says how). A chunk whose store failed is run again once the
 * database answers, without using up a retry; every step of lib/jobs/handler.ts is idempotent,
 * and the chunk's primary key keeps a chunk from being stored or counted twice.
 *
 * The same code runs inside `npm start` (a worker process beside the web server, see
 * scripts/start.mjs) and as `npm run worker` on any machine that reaches the database.
 */
import { plural } from '@/lib/format';
import type { Kysely } from 'kysely';
import type PgBoss from 'pg-boss';
import type { Database } from '@/db/schema';
import { logger } from '@/lib/log';
import { CHUNK_QUEUE, FAILED_CHUNK_QUEUE, getBoss, stopBoss, type ChunkJobData } from './boss';
import { jobsConfig } from './config';
import { consume } from './consume';
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

export async function startWorker<Spec>(options: WorkerOptions<Spec>): Promise<RunningWorker> {
  const config = jobsConfig();
  const defaultLog = logger('worker');
  const log = options.log ?? ((m: string) => defaultLog.info(m));
  const boss = await getBoss(options.url);
  const concurrency = options.concurrency ?? config.threads;
  const stopping = new AbortController();

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

  const slot = { signal: stopping.signal, pollSeconds: config.pollSeconds };
  const loops = [
    ...Array.from({ length: concurrency }, () => consume(boss, CHUNK_QUEUE, computeChunk, slot)),
    consume(boss, FAILED_CHUNK_QUEUE, failChunk, slot),
  ];
  log(`taking stress-test chunks with ${plural(concurrency, 'parallel slot')}`);

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
