/**
 * The one pg-boss instance of this process (web server or worker), started on first use.
 *
 * pg-boss keeps its tables in its own schema, `pgboss`, and creates or upgrades them itself when
 * it starts (its `migrate` option, under an advisory lock, so several processes may start at
 * once). Our migrations never touch that schema, and the integration tests' per-test cleanup
 * truncates only tables of the `public` schema, so the queue's tables survive it.
 *
 * Every instance supervises: pg-boss's maintenance (under its own lock, so one process at a time
 * does it) moves chunks whose worker died past their expiry back to the queue for a retry. The
 * interval comes from SIM_MAINTENANCE_SECONDS (lib/jobs/config.ts).
 *
 * Queues: `simulation-chunk` (one job per chunk of replicates) and its dead-letter queue
 * `simulation-chunk-failed`, which receives a chunk once its retries are used up (whether its
 * handler threw or its worker vanished) so that a worker can mark the run failed.
 *
 * pg-boss keeps its own pg pool. Its maintenance runs on a timer and reports failures as 'error'
 * events: while the database is down they come every SIM_MAINTENANCE_SECONDS, so they go to
 * db/availability.ts, which logs the outage once when it begins and once when it ends.
 */
import PgBoss from 'pg-boss';
import { noteDatabaseDown, noteDatabaseUp } from '@/db/availability';
import { isDatabaseUnavailable } from '@/lib/errors';
import { logger } from '@/lib/log';
import { jobsConfig } from './config';

const log = logger('jobs');

export const CHUNK_QUEUE = 'simulation-chunk';
export const FAILED_CHUNK_QUEUE = 'simulation-chunk-failed';
export const BOSS_SCHEMA = 'pgboss';

/** What a chunk job carries. */
export interface ChunkJobData {
  simulationId: string;
  scenarioIndex: number;
  chunkIndex: number;
  /** Replicates [from, to) of the scenario. */
  from: number;
  to: number;
}

const holder = globalThis as unknown as { unitwiseBoss?: { url: string; boss: Promise<PgBoss> } };

async function start(url: string): Promise<PgBoss> {
  const config = jobsConfig();
  const boss = new PgBoss({
    connectionString: url,
    schema: BOSS_SCHEMA,
    application_name: 'unitwise-jobs',
    max: 4,
    migrate: true,
    supervise: true,
    schedule: false,
    maintenanceIntervalSeconds: config.maintenanceSeconds,
  });
  boss.on('error', (err) => {
    if (isDatabaseUnavailable(err)) noteDatabaseDown(err, 'the queue');
    else log.error('queue error', err);
  });
  boss.on('maintenance', () => noteDatabaseUp());
  await boss.start();
  await boss.createQueue(FAILED_CHUNK_QUEUE, { name: FAILED_CHUNK_QUEUE, retryLimit: 5, retryDelay: 2 });
  await boss.createQueue(CHUNK_QUEUE, { name: CHUNK_QUEUE, deadLetter: FAILED_CHUNK_QUEUE });
  return boss;
}

/** The process's pg-boss, started (and its queues created) on the first call. */
export function getBoss(url = process.env.DATABASE_URL): Promise<PgBoss> {
  if (!url) throw new Error('DATABASE_URL is not set: the job queue needs the database.');
  const current = holder.unitwiseBoss;
  if (current && current.url === url) return current.boss;
  const boss = start(url);
  holder.unitwiseBoss = { url, boss };
  // A failed start is not cached: the next call tries again (e.g. once the database is back).
  boss.catch(() => {
    if (holder.unitwiseBoss?.boss === boss) holder.unitwiseBoss = undefined;
  });
  return boss;
}

/** Stops the process's pg-boss (tests and a worker's shutdown). */
export async function stopBoss(options: { graceful?: boolean; timeout?: number } = {}): Promise<void> {
  const current = holder.unitwiseBoss;
  holder.unitwiseBoss = undefined;
  if (!current) return;
  const boss = await current.boss.catch(() => undefined);
  await boss?.stop({ graceful: options.graceful ?? true, timeout: options.timeout ?? 10_000, wait: true });
}
