/**
 * The worker process: `npm run worker` (here or on any machine that reaches DATABASE_URL), and the
 * worker that `npm start` runs beside the web server. Computes stress-test chunks from the queue
 * on one thread per core (SIM_WORKER_THREADS to change; lib/jobs/config.ts lists every setting).
 *
 * Waits for the database when it is not reachable yet. SIGTERM or SIGINT: stop taking chunks, let
 * the ones in progress finish (up to 10 s; a chunk cut short is retried by another worker once it
 * expires), then exit.
 */
import { createDb } from '@/db/client';
import { ConfigError, parseConfig } from '@/lib/config';
import { logger } from '@/lib/log';
import { jobsConfig } from './config';
import { createPool, poolEngine } from './pool';
import { startWorker, type RunningWorker } from './worker';

const log = (m: string) => console.log(`[worker ${process.pid}] ${m}`);

async function main(): Promise<void> {
  // The whole configuration, checked before anything starts: a bad value stops the worker here, by name.
  const url = parseConfig(process.env, 'worker').DATABASE_URL;
  const config = jobsConfig();
  const db = createDb(url, { max: config.threads + 2 });
  // Even with one thread the chunks run on the pool, so that the process's own thread keeps
  // answering the queue and the database while a chunk is computed.
  const pool = createPool(config.threads);
  const engine = poolEngine(pool);

  let worker: RunningWorker | undefined;
  let stopping = false;
  const stop = async (signal: string) => {
    if (stopping) return;
    stopping = true;
    log(`${signal}: finishing the chunks in progress`);
    try {
      await worker?.stop(10_000);
      await pool.destroy();
      await db.destroy();
    } finally {
      process.exit(0);
    }
  };
  for (const signal of ['SIGTERM', 'SIGINT', 'SIGHUP'] as const) process.on(signal, () => void stop(signal));

  for (let attempt = 1; !stopping; attempt++) {
    try {
      worker = await startWorker({ db, engine, concurrency: config.threads, url, log });
      return;
    } catch (err) {
      const wait = Math.min(30, 2 * attempt);
      log(`cannot reach the queue yet (${(err as Error).message}); trying again in ${wait} s`);
      await new Promise((r) => setTimeout(r, wait * 1000));
    }
  }
}

main().catch((err) => {
  if (err instanceof ConfigError) {
    logger('worker').error(`cannot start. ${err.message}`);
    process.exit(1);
  }
  console.error('[worker] failed:', err);
  process.exit(1);
});
