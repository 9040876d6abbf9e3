/**
 * The worker process: `npm run worker` (here or on any machine that reaches DATABASE_URL), and the
 * worker that `npm start` runs beside the web server. Computes stress-test chunks from the queue
 * on one thread per core (SIM_WORKER_THREADS to change; lib/jobs/config.ts lists every setting).
 *
 * Runs without a supervisor: it waits for the database when it is not reachable yet, and keeps
 * running through a PostgreSQL restart or a network drop (lib/jobs/consume.ts waits and carries
 * on; db/client.ts keeps lost connections from ending the process). SIGTERM or SIGINT: stop
 * taking chunks, let the ones in progress finish (up to 10 s; a chunk cut short is retried by
 * another worker once it expires), then exit.
 */
import { noteDatabaseDown } from '@/db/availability';
import { createDb } from '@/db/client';
import { ConfigError, parseConfig } from '@/lib/config';
import { isDatabaseUnavailable } from '@/lib/errors';
import { logger } from '@/lib/log';
import { jobsConfig } from './config';
import { createPool, poolEngine } from './pool';
import { reconnectDelayMs } from './consume';
import { startWorker, type RunningWorker } from './worker';

const log = logger(`worker ${process.pid}`);

// A last line of defence, for a library that forgets to await a query: a promise rejected because
// the database is away must not end a worker that is built to wait for it. Anything else is a bug:
// logged, and the process ends as Node would end it.
process.on('unhandledRejection', (reason) => {
  if (isDatabaseUnavailable(reason)) {
    noteDatabaseDown(reason, 'a background query');
    return;
  }
  log.error('unhandled promise rejection', reason);
  process.exit(1);
});

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
    log.info(`${signal}: finishing the chunks in progress`);
    try {
      await worker?.stop(10_000);
      await pool.destroy();
      await db.destroy();
    } finally {
      process.exit(0);
    }
  };
  for (const signal of ['SIGTERM', 'SIGINT', 'SIGHUP'] as const) process.on(signal, () => void stop(signal));

  const workerLog = (m: string) => log.info(m);
  for (let attempt = 0; !stopping; attempt++) {
    try {
      worker = await startWorker({ db, engine, concurrency: config.threads, url, log: workerLog });
      return;
    } catch (err) {
      // The queue's tables are created on the first start, which needs the database.
      const unavailable = isDatabaseUnavailable(err);
      if (unavailable) noteDatabaseDown(err, 'the worker starting');
      else log.error('cannot start taking chunks; trying again in 5 s', err);
      await new Promise((r) => setTimeout(r, unavailable ? reconnectDelayMs(attempt) : 5_000));
    }
  }
}

main().catch((err) => {
  if (err instanceof ConfigError) {
    log.error(`cannot start. ${err.message}`);
    process.exit(1);
  }
  log.error('failed', err);
  process.exit(1);
});
