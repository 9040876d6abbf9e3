import { sql, type Kysely, type Selectable, type Transaction } from 'kysely';
import type { Database, SimulationStatus, SimulationTable } from '../schema';

type Db = Kysely<Database> | Transaction<Database>;

/** A stress-test run as the app sees it. */
export interface Simulation {
  id: string;
  studyId: string | null;
  revisionNumber: number | null;
  createdBy: string | null;
  spec: unknown;
  status: SimulationStatus;
  replicatesTotal: number;
  replicatesDone: number;
  chunkSize: number;
  chunkCount: number;
  jobIds: string[];
  /** The run's place in the fair queue (lib/jobs/queue.ts); null for runs queued before turns. */
  firstTurn: number | null;
  error: string | null;
  results: unknown | null;
  startedAt: Date | null;
  finishedAt: Date | null;
  createdAt: Date;
}

export const ACTIVE_STATUSES = ['queued', 'running'] as const satisfies readonly SimulationStatus[];

export function rowToSimulation(r: Selectable<SimulationTable>): Simulation {
  return {
    id: r.id,
    studyId: r.study_id,
    revisionNumber: r.revision_number,
    createdBy: r.created_by,
    spec: r.spec,
    status: r.status,
    replicatesTotal: r.replicates_total,
    replicatesDone: r.replicates_done,
    chunkSize: r.chunk_size,
    chunkCount: r.chunk_count,
    jobIds: r.job_ids ?? [],
    firstTurn: r.first_turn,
    error: r.error,
    results: r.results,
    startedAt: r.started_at,
    finishedAt: r.finished_at,
    createdAt: r.created_at,
  };
}

export async function insertSimulation(
  db: Db,
  input: {
    studyId: string | null;
    revisionNumber: number | null;
    createdBy: string;
    spec: unknown;
    replicatesTotal: number;
    chunkSize: number;
    chunkCount: number;
    /** Null: outside the fair queue's turns (tests that never queue the run). */
    firstTurn?: number | null;
  },
): Promise<Simulation> {
  const row = await db
    .insertInto('simulations')
    .values({
      study_id: input.studyId,
      revision_number: input.revisionNumber,
      created_by: input.createdBy,
      spec: JSON.stringify(input.spec),
      replicates_total: input.replicatesTotal,
      chunk_size: input.chunkSize,
      chunk_count: input.chunkCount,
      first_turn: input.firstTurn ?? null,
    })
    .returningAll()
    .executeTakeFirstOrThrow();
  return rowToSimulation(row);
}

export async function setJobIds(db: Db, id: string, jobIds: string[]): Promise<void> {
  await db.updateTable('simulations').set({ job_ids: jobIds }).where('id', '=', id).execute();
}

export async function findSimulation(db: Db, id: string): Promise<Simulation | undefined> {
  const row = await db.selectFrom('simulations').selectAll().where('id', '=', id).executeTakeFirst();
  return row ? rowToSimulation(row) : undefined;
}

/** The run's row, locked until the transaction ends: chunks of one run land one at a time. */
export async function lockSimulation(trx: Transaction<Database>, id: string): Promise<Simulation | undefined> {
  const row = await trx.selectFrom('simulations').selectAll().where('id', '=', id).forUpdate().executeTakeFirst();
  return row ? rowToSimulation(row) : undefined;
}

/** Runs of a study, newest first, without their specification and results (a list is light). */
export async function listStudySimulations(db: Db, studyId: string, limit = 50): Promise<Simulation[]> {
  const rows = await db
    .selectFrom('simulations')
    .selectAll()
    .where('study_id', '=', studyId)
    .orderBy('created_at', 'desc')
    .orderBy('id', 'desc')
    .limit(limit)
    .execute();
  return rows.map(rowToSimulation);
}

/** Queued or running runs someone started, and their replicates still to do. */
export async function activeLoadOfUser(db: Db, userId: string): Promise<{ runs: number; replicatesLeft: number }> {
  const r = await db
    .selectFrom('simulations')
    .select([sql<string>`count(*)`.as('runs'), sql<string>`coalesce(sum(replicates_total - replicates_done), 0)`.as('left')])
    .where('created_by', '=', userId)
    .where('status', 'in', ACTIVE_STATUSES)
    .executeTakeFirstOrThrow();
  return { runs: Number(r.runs), replicatesLeft: Number(r.left) };
}

/**
 * Where the fair queue stands (lib/jobs/queue.ts), over the queued and running runs:
 * `current`, the lowest turn still to be served (a run's next turn is its first turn plus the
 * number of its chunks stored), and `ownerEnd`, the turn after the last chunk of the person's own
 * runs. Both 0 when nothing is waiting.
 */
export async function queueTurns(db: Db, userId: string): Promise<{ current: number; ownerEnd: number }> {
  const r = await db
    .selectFrom('simulations as s')
    .select([
      sql<number>`coalesce(min(s.first_turn + (select count(*) from simulation_chunks c where c.simulation_id = s.id)), 0)::int`.as('current'),
      sql<number>`coalesce(max(s.first_turn + s.chunk_count) filter (where s.created_by = ${userId}), 0)::int`.as('ownerEnd'),
    ])
    .where('s.status', 'in', ACTIVE_STATUSES)
    .where('s.first_turn', 'is not', null)
    .executeTakeFirstOrThrow();
  return { current: r.current, ownerEnd: r.ownerEnd };
}

export async function chunkExists(db: Db, simulationId: string, scenarioIndex: number, chunkIndex: number): Promise<boolean> {
  const r = await db
    .selectFrom('simulation_chunks')
    .select('chunk_index')
    .where('simulation_id', '=', simulationId)
    .where('scenario_index', '=', scenarioIndex)
    .where('chunk_index', '=', chunkIndex)
    .executeTakeFirst();
  return r !== undefined;
}

/** Stores a finished chunk. A chunk that is already stored stays as it was (returns false). */
export async function insertChunk(
  db: Db,
  c: { simulationId: string; scenarioIndex: number; chunkIndex: number; from: number; to: number; results: Uint8Array },
): Promise<boolean> {
  const r = await db
    .insertInto('simulation_chunks')
    .values({
      simulation_id: c.simulationId,
      scenario_index: c.scenarioIndex,
      chunk_index: c.chunkIndex,
      replicate_from: c.from,
      replicate_to: c.to,
      results: Buffer.from(c.results.buffer, c.results.byteOffset, c.results.byteLength),
    })
    .onConflict((oc) => oc.constraint('simulation_chunks_pkey').doNothing())
    .returning('chunk_index')
    .executeTakeFirst();
  return r !== undefined;
}

/** Sets replicates_done to the replicates in the stored chunks (never a running tally). */
export async function recountDone(db: Db, simulationId: string): Promise<number> {
  const r = await db
    .updateTable('simulations')
    .set({
      replicates_done: sql<number>`(select coalesce(sum(replicate_to - replicate_from), 0)::int from simulation_chunks where simulation_id = ${simulationId})`,
    })
    .where('id', '=', simulationId)
    .returning('replicates_done')
    .executeTakeFirstOrThrow();
  return r.replicates_done;
}

export interface StoredChunk {
  scenarioIndex: number;
  chunkIndex: number;
  from: number;
  to: number;
  results: Uint8Array;
}

/** Every stored chunk of a run, in scenario and replicate order. */
export async function listChunks(db: Db, simulationId: string): Promise<StoredChunk[]> {
  const rows = await db
    .selectFrom('simulation_chunks')
    .select(['scenario_index', 'chunk_index', 'replicate_from', 'replicate_to', 'results'])
    .where('simulation_id', '=', simulationId)
    .orderBy('scenario_index')
    .orderBy('replicate_from')
    .execute();
  return rows.map((r) => ({ scenarioIndex: r.scenario_index, chunkIndex: r.chunk_index, from: r.replicate_from, to: r.replicate_to, results: r.results }));
}

export async function markRunning(db: Db, id: string): Promise<void> {
  await db
    .updateTable('simulations')
    .set({ status: 'running', started_at: sql<Date>`coalesce(started_at, now())` })
    .where('id', '=', id)
    .where('status', '=', 'queued')
    .execute();
}

export async function markDone(db: Db, id: string, results: unknown): Promise<void> {
  await db
    .updateTable('simulations')
    .set({ status: 'done', results: JSON.stringify(results), finished_at: sql<Date>`now()`, started_at: sql<Date>`coalesce(started_at, now())` })
    .where('id', '=', id)
    .execute();
}

/**
 * Ends a queued or running run as failed or cancelled. Returns the run as it now is, or
 * undefined when it had already ended (then nothing changes).
 */
export async function endRun(db: Db, id: string, status: 'failed' | 'cancelled', error: string | null = null): Promise<Simulation | undefined> {
  const row = await db
    .updateTable('simulations')
    .set({ status, error, finished_at: sql<Date>`now()` })
    .where('id', '=', id)
    .where('status', 'in', ACTIVE_STATUSES)
    .returningAll()
    .executeTakeFirst();
  return row ? rowToSimulation(row) : undefined;
}
