/**
 * Putting a run's chunks on the queue, and withdrawing them. The jobs are inserted through the
 * caller's transaction (pg-boss accepts any connection that can run SQL), so a run's row and its
 * chunk jobs are created together or not at all: no run without jobs, no jobs without a run.
 *
 * Each job carries its own retry limit, retry delay and expiry (SIM_CHUNK_RETRY_LIMIT,
 * SIM_CHUNK_RETRY_DELAY_SECONDS, SIM_CHUNK_EXPIRE_SECONDS), so the values in force when the run
 * was created apply to it whichever worker takes it.
 *
 * Fair between people: chunks are served in turns, round-robin by person. A run's k-th chunk (in
 * plan order) has turn `firstTurn + k`, and workers claim the lowest turn first (pg-boss priority
 * = −turn; equal turns in the order they were queued). A new run starts at the turn the queue has
 * reached, or after the last chunk of the same person's runs still waiting, whichever is later
 * (`placeRun`). So one person's runs follow one another, while another person's run interleaves
 * chunk by chunk with them from the next turn on: a 10-replicate run waits for about one chunk per
 * person ahead of it, not for everything queued before it. The turns are fixed when the run is
 * queued and nothing is moved afterwards, so the scheduling needs no dispatcher, holds with any
 * number of workers (claiming stays pg-boss's `for update skip locked`), and survives crashes as
 * pg-boss's retries do (a retried chunk keeps its turn). The schedule never changes results:
 * each replicate draws its own random stream and the run is aggregated in replicate order.
 */
import { randomUUID } from 'node:crypto';
import { CompiledQuery, type Kysely, type Transaction } from 'kysely';
import type PgBoss from 'pg-boss';
import { queueTurns } from '@/db/repositories/simulations';
import type { Database } from '@/db/schema';
import { CHUNK_QUEUE, FAILED_CHUNK_QUEUE, getBoss, type ChunkJobData } from './boss';
import { jobsConfig } from './config';
import type { ChunkPlan } from './plan';

/** pg-boss's connection interface over a Kysely connection or transaction (also used by lib/mail/queue.ts). */
export function bossDb(db: Kysely<Database> | Transaction<Database>) {
  return {
    async executeSql(text: string, values: unknown[] = []) {
      const result = await db.executeQuery(CompiledQuery.raw(text, values));
      return { rows: result.rows as unknown[] };
    },
  };
}

/** The first turn of a new run of `userId` (see above). */
export async function placeRun(trx: Transaction<Database>, userId: string): Promise<number> {
  const { current, ownerEnd } = await queueTurns(trx, userId);
  return Math.max(current, ownerEnd);
}

/**
 * Inserts one job per chunk, the k-th at turn firstTurn + k; returns their ids, in the order of
 * `chunks`. `boss` defaults to the process's pg-boss (a test may queue on another database).
 */
export async function enqueueChunks(
  trx: Transaction<Database>,
  simulationId: string,
  chunks: readonly ChunkPlan[],
  firstTurn: number,
  boss?: PgBoss,
): Promise<string[]> {
  const queue = boss ?? (await getBoss()); // makes sure the queues (and pg-boss's schema) exist
  const config = jobsConfig();
  const jobs = chunks.map((c, k) => {
    const data: ChunkJobData = { simulationId, scenarioIndex: c.scenarioIndex, chunkIndex: c.chunkIndex, from: c.from, to: c.to };
    return {
      id: randomUUID(),
      name: CHUNK_QUEUE,
      data,
      priority: -(firstTurn + k),
      retryLimit: config.retryLimit,
      retryDelay: config.retryDelaySeconds,
      expireInSeconds: config.expireSeconds,
      deadLetter: FAILED_CHUNK_QUEUE,
    };
  });
  // Large runs go in slices, to keep each statement's JSON parameter small.
  for (let i = 0; i < jobs.length; i += 500) {
    await queue.insert(jobs.slice(i, i + 500), { db: bossDb(trx) });
  }
  return jobs.map((j) => j.id);
}

/**
 * Cancels the chunk jobs that have not finished (those already taken are skipped by their
 * worker). With `db`, through that connection or transaction, so that it happens together with
 * the change of the run's status.
 */
export async function withdrawChunks(
  jobIds: readonly string[],
  options: { db?: Kysely<Database> | Transaction<Database>; boss?: PgBoss } = {},
): Promise<void> {
  if (jobIds.length === 0) return;
  const boss = options.boss ?? (await getBoss());
  const connection = options.db ? { db: bossDb(options.db) } : {};
  for (let i = 0; i < jobIds.length; i += 1000) await boss.cancel(CHUNK_QUEUE, jobIds.slice(i, i + 1000), connection);
}
