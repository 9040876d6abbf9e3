/**
 * Putting a run's chunks on the queue, and withdrawing them. The jobs are inserted through the
 * caller's transaction (pg-boss accepts any connection that can run SQL), so a run's row and its
 * chunk jobs are created together or not at all: no run without jobs, no jobs without a run.
 *
 * Each job carries its own retry limit, retry delay and expiry (SIM_CHUNK_RETRY_LIMIT,
 * SIM_CHUNK_RETRY_DELAY_SECONDS, SIM_CHUNK_EXPIRE_SECONDS), so the values in force when the run
 * was created apply to it whichever worker takes it.
 */
import { randomUUID } from 'node:crypto';
import { CompiledQuery, type Kysely, type Transaction } from 'kysely';
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

/** Inserts one job per chunk; returns their ids, in the order of `chunks`. */
export async function enqueueChunks(trx: Transaction<Database>, simulationId: string, chunks: readonly ChunkPlan[]): Promise<string[]> {
  const boss = await getBoss(); // makes sure the queues (and pg-boss's schema) exist
  const config = jobsConfig();
  const jobs = chunks.map((c) => {
    const data: ChunkJobData = { simulationId, scenarioIndex: c.scenarioIndex, chunkIndex: c.chunkIndex, from: c.from, to: c.to };
    return {
      id: randomUUID(),
      name: CHUNK_QUEUE,
      data,
      retryLimit: config.retryLimit,
      retryDelay: config.retryDelaySeconds,
      expireInSeconds: config.expireSeconds,
      deadLetter: FAILED_CHUNK_QUEUE,
    };
  });
  // Large runs go in slices, to keep each statement's JSON parameter small.
  for (let i = 0; i < jobs.length; i += 500) {
    await boss.insert(jobs.slice(i, i + 500), { db: bossDb(trx) });
  }
  return jobs.map((j) => j.id);
}

/** Cancels the chunk jobs that have not finished (those already taken are skipped by their worker). */
export async function withdrawChunks(jobIds: readonly string[]): Promise<void> {
  if (jobIds.length === 0) return;
  const boss = await getBoss();
  for (let i = 0; i < jobIds.length; i += 1000) await boss.cancel(CHUNK_QUEUE, jobIds.slice(i, i + 1000));
}
