/**
 * What a worker does with one chunk job, and with a chunk whose retries are used up.
 *
 * A chunk job may run more than once: pg-boss retries it when its handler throws, and when its
 * worker disappears (killed, machine lost) it is retried once its expiry has passed, possibly
 * while a slow first attempt is still going. Every step is therefore idempotent:
 *
 *  1. A run that no longer exists, or has ended (done, failed, cancelled), is skipped.
 *  2. The chunk's replicates are computed (in a worker thread) unless the chunk is already stored.
 *  3. One transaction locks the run's row, stores the chunk (`on conflict do nothing`: the
 *     primary key (run, scenario, chunk) keeps a second copy out), and sets replicates_done to the
 *     sum over the stored chunks, so nothing is ever counted twice. When that sum reaches the
 *     total, the same transaction reads every chunk in replicate order, aggregates and stores the
 *     results with status done. Locking the row first serialises the chunks of one run, so
 *     exactly one transaction sees the last chunk land.
 *
 * If a worker dies between storing the last chunk and completing its job, the retry finds the
 * chunk stored and the run done, and does nothing.
 */
import { plural } from '@/lib/format';
import type { Kysely } from 'kysely';
import type { Database } from '@/db/schema';
import {
  chunkExists,
  endRun,
  findSimulation,
  insertChunk,
  listChunks,
  lockSimulation,
  markDone,
  markRunning,
  recountDone,
  type StoredChunk,
} from '@/db/repositories/simulations';
import type { ChunkJobData } from './boss';

/** The simulation engine as the queue needs it (lib/jobs/engine.ts binds it to lib/sim). */
export interface Engine<Spec = unknown> {
  /** The stored specification, parsed (throws when it no longer parses). */
  parseSpec(raw: unknown): Spec;
  /** Per-replicate results of replicates [from, to) of one scenario, encoded for storage. */
  computeChunk(spec: Spec, scenarioIndex: number, from: number, to: number): Promise<Uint8Array>;
  /** The run's results from all its stored chunks (given in scenario and replicate order). */
  aggregate(spec: Spec, chunks: StoredChunk[]): unknown;
}

export type ChunkOutcome = 'stored' | 'already-stored' | 'finished' | 'skipped';

const ACTIVE = new Set(['queued', 'running']);

export async function processChunk<Spec>(db: Kysely<Database>, job: ChunkJobData, engine: Engine<Spec>): Promise<ChunkOutcome> {
  const run = await findSimulation(db, job.simulationId);
  if (!run || !ACTIVE.has(run.status)) return 'skipped';
  if (run.status === 'queued') await markRunning(db, run.id);
  const spec = engine.parseSpec(run.spec);

  const stored = await chunkExists(db, job.simulationId, job.scenarioIndex, job.chunkIndex);
  const bytes = stored ? undefined : await engine.computeChunk(spec, job.scenarioIndex, job.from, job.to);

  return db.transaction().execute(async (trx) => {
    const locked = await lockSimulation(trx, job.simulationId);
    if (!locked || !ACTIVE.has(locked.status)) return 'skipped';
    const inserted = bytes
      ? await insertChunk(trx, { simulationId: job.simulationId, scenarioIndex: job.scenarioIndex, chunkIndex: job.chunkIndex, from: job.from, to: job.to, results: bytes })
      : false;
    const done = await recountDone(trx, job.simulationId);
    if (done < locked.replicatesTotal) return inserted ? 'stored' : 'already-stored';
    const results = engine.aggregate(spec, await listChunks(trx, job.simulationId));
    await markDone(trx, job.simulationId, results);
    return 'finished';
  });
}

/**
 * A chunk used up its retries: the run fails with a plain message. Returns the pg-boss ids of
 * the run's chunks so that the caller can withdraw those still waiting (undefined when the run
 * had already ended).
 */
export async function failRun(db: Kysely<Database>, job: ChunkJobData, reason: string, attempts: number): Promise<string[] | undefined> {
  const message =
    `Replicates ${job.from + 1}–${job.to} of scenario ${job.scenarioIndex + 1} could not be computed ` +
    `(${plural(attempts, 'attempt')}; last error: ${reason}). ` +
    'The run was stopped. Start it again; if it fails again, try fewer replicates or a smaller design.';
  const ended = await endRun(db, job.simulationId, 'failed', message);
  return ended?.jobIds;
}

/** A short, safe description of why a chunk failed, from what pg-boss stored as its output. */
export function describeFailure(output: unknown): string {
  const o = output as { message?: unknown; value?: { message?: unknown } } | null | undefined;
  const raw = typeof o?.message === 'string' ? o.message : typeof o?.value?.message === 'string' ? o.value.message : undefined;
  if (!raw) return 'unknown error';
  if (/failed by timeout/i.test(raw)) return 'the worker computing it stopped answering (it may have been stopped or run out of memory)';
  // First line only, without file paths (a stack never gets this far: pg-boss stores it apart).
  return raw.split('\n')[0]!.replace(/\s*\(?(?:\/[\w.@+-]+){2,}(?::\d+)*\)?/g, '').trim().slice(0, 200) || 'unknown error';
}
