/**
 * A simulation worker: takes chunk jobs from the queue and computes them on a pool of worker
 * threads. One pg-boss subscription per thread, each claiming one chunk at a time, so that every
 * core stays busy and no chunk waits on another. After a chunk, the subscription asks again at
 * once (pg-boss would otherwise pause for its polling interval, 0.5 s at least, which is more
 * than a chunk's work); an idle subscription polls every SIM_POLL_SECONDS.
 *
 * The same code runs inside `npm start` (a worker process beside the web server, see
 * scripts/start.mjs) and as `npm run worker` on any machine that reaches the database.
 */
import type { Kysely } from 'kysely';
import type PgBoss from 'pg-boss';
import type { Database } from '@/db/schema';
import { CHUNK_QUEUE, FAILED_CHUNK_QUEUE, getBoss, stopBoss, type ChunkJobData } from './boss';
import { jobsConfig } from './config';
import { describeFailure, failRun, processChunk, type Engine } from './handler';

export interface WorkerOptions<Spec> {
  db: Kysely<Database>;
  engine: Engine<Spec>;
  /** Parallel chunk subscriptions (default: SIM_WORKER_THREADS). */
  concurrency?: number;
  url?: string;
  log?: (message: string) => void;
}

export interface RunningWorker {
  boss: PgBoss;
  /** Stops taking new chunks (those in progress finish); the process's pg-boss keeps running. */
  pause(): Promise<void>;
  /** Stops taking chunks, waits for those in progress (up to timeoutMs), stops pg-boss. */
  stop(timeoutMs?: number): Promise<void>;
}

export async function startWorker<Spec>(options: WorkerOptions<Spec>): Promise<RunningWorker> {
  const config = jobsConfig();
  const log = options.log ?? ((m: string) => console.log(`[worker] ${m}`));
  const boss = await getBoss(options.url);
  const concurrency = options.concurrency ?? config.threads;
  const workOptions = { batchSize: 1, includeMetadata: true as const, pollingIntervalSeconds: config.pollSeconds };

  const ids: string[] = [];
  for (let i = 0; i < concurrency; i++) {
    const id: string = await boss.work<ChunkJobData>(CHUNK_QUEUE, workOptions, async ([job]) => {
      if (!job) return;
      try {
        const outcome = await processChunk(options.db, job.data, options.engine);
        if (outcome === 'finished') log(`run ${job.data.simulationId} done`);
      } finally {
        boss.notifyWorker(id);
      }
    });
    ids.push(id);
  }

  const failedId = await boss.work<ChunkJobData>(FAILED_CHUNK_QUEUE, workOptions, async ([job]) => {
    if (!job) return;
    const reason = describeFailure(job.output);
    const jobIds = await failRun(options.db, job.data, reason, job.retryLimit + 1);
    if (jobIds) {
      log(`run ${job.data.simulationId} failed: ${reason}`);
      if (jobIds.length) await boss.cancel(CHUNK_QUEUE, jobIds);
    }
  });

  log(`taking stress-test chunks with ${concurrency} parallel slot${concurrency === 1 ? '' : 's'}`);
  ids.push(failedId);
  const pause = async () => {
    for (const id of ids) await boss.offWork({ id });
  };
  return {
    boss,
    pause,
    async stop(timeoutMs = 10_000) {
      await pause();
      await stopBoss({ graceful: true, timeout: timeoutMs });
    },
  };
}
