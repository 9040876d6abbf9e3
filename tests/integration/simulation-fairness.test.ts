/**
 * The queue is fair between people (lib/jobs/queue.ts): while one person's two large runs keep a
 * worker busy, another person's 10-replicate run starts at once (within one chunk, and well within
 * 2 s of being queued) and finishes long before the large runs, instead of waiting behind every
 * chunk queued before it. And interleaving changes no result: runs that shared the worker give the
 * same results, to the last bit, as each run computed alone in one piece.
 */
import { sql } from 'kysely';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { findSimulation, insertChunk, type Simulation } from '@/db/repositories/simulations';
import { db } from '@/lib/db';
import { cancelSimulation, createSimulation } from '@/lib/data/simulations';
import type { SimulationDto } from '@/lib/api/simulations';
import { BOSS_SCHEMA, CHUNK_QUEUE, getBoss, stopBoss } from '@/lib/jobs/boss';
import { aggregateChunks, computeChunkBytes, inlineEngine, parseSpec } from '@/lib/jobs/engine';
import { startWorker, type RunningWorker } from '@/lib/jobs/worker';
import type { SimulationSpec } from '@/lib/sim/spec';
import { makeUser, type TestUser } from '../support/fixtures';

/** Cheap replicates: with one replicate per chunk, a chunk costs mostly the queue's own work. */
const spec = (replicates: number, seed: number) =>
  parseSpec({
    design: { arms: 2, clustersPerArm: 4, clusterSize: 5 },
    truth: { effect: 0.5, sd: 1, icc: 0.1 },
    scenarios: [{ violation: 'none' }],
    analyses: ['ols', 'cluster-robust'],
    replicates,
    seed,
  }) as SimulationSpec;

const actor = (u: TestUser) => ({ id: u.id, email: u.email, name: null });

/** One slot, computing on this thread: the busiest a worker can be. */
let worker: RunningWorker | undefined;

beforeAll(async () => {
  await getBoss();
});

afterAll(async () => {
  await worker?.pause();
  await stopBoss({ timeout: 5_000 });
});

async function until<T>(what: string, fn: () => Promise<T | undefined | false>, timeoutMs: number): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const v = await fn();
    if (v) return v;
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 20));
  }
}

async function ended(id: string): Promise<Simulation | undefined> {
  const r = await findSimulation(db(), id);
  return r && r.status !== 'queued' && r.status !== 'running' ? r : undefined;
}

interface JobTimes {
  id: string;
  createdOn: Date;
  startedOn: Date | null;
}

/** When pg-boss created and (last) started each of the jobs, read from its table. */
async function jobTimes(ids: readonly string[]): Promise<JobTimes[]> {
  const { rows } = await sql<{ id: string; created_on: Date; started_on: Date | null }>`
    select id, created_on, started_on from ${sql.table(`${BOSS_SCHEMA}.job`)}
    where name = ${CHUNK_QUEUE} and id = any(${[...ids]}::uuid[])`.execute(db());
  return rows.map((r) => ({ id: r.id, createdOn: r.created_on, startedOn: r.started_on }));
}

/** The run's results as if it had been computed alone, in one piece, on this thread. */
function solo(s: SimulationSpec) {
  const whole = aggregateChunks(s, [{ scenarioIndex: 0, chunkIndex: 0, from: 0, to: s.replicates, results: computeChunkBytes(s, 0, 0, s.replicates) }]);
  return JSON.parse(JSON.stringify(whole));
}

describe('the queue between people', () => {
  it('places a person’s next run after their own, and another person’s at the turn the queue has reached', async () => {
    const [a, b, c] = [await makeUser('a'), await makeUser('b'), await makeUser('c')];
    const first = await createSimulation(actor(a), { spec: spec(10, 21) }, { chunkSize: 1 });
    const second = await createSimulation(actor(a), { spec: spec(10, 22) }, { chunkSize: 2 });
    const other = await createSimulation(actor(b), { spec: spec(10, 23) }, { chunkSize: 5 });
    const turns = async (id: string) => (await findSimulation(db(), id))!.firstTurn;
    expect([await turns(first.id), await turns(second.id), await turns(other.id)]).toEqual([0, 10, 0]);

    // Three chunks of the first run are done: a newcomer starts at turn 3 (the second of b's
    // chunks, turn 1, is still waiting: the lowest turn still to be served counts).
    for (let i = 0; i < 3; i++) await insertChunk(db(), { simulationId: first.id, scenarioIndex: 0, chunkIndex: i, from: i, to: i + 1, results: new Uint8Array(1) });
    await insertChunk(db(), { simulationId: other.id, scenarioIndex: 0, chunkIndex: 0, from: 0, to: 5, results: new Uint8Array(1) });
    const late = await createSimulation(actor(c), { spec: spec(10, 24) }, { chunkSize: 5 });
    expect(await turns(late.id)).toBe(1);

    // The pg-boss priority of the k-th chunk is −(first turn + k).
    const { jobIds } = (await findSimulation(db(), second.id))!;
    const { rows } = await sql<{ priority: number }>`
      select priority from ${sql.table(`${BOSS_SCHEMA}.job`)} where id = any(${jobIds}::uuid[]) order by priority desc`.execute(db());
    expect(rows.map((r) => r.priority)).toEqual([-10, -11, -12, -13, -14]);
    for (const r of [first, second, other, late]) await cancelSimulation(actor(r === other ? b : r === late ? c : a), r.id);
  });

  it('starts a small run within one chunk while another person’s two large runs are under way', async () => {
    const a = await makeUser('heavy');
    const b = await makeUser('light');
    // 2 × 600 chunks: far more than 10 s of one slot's work, as each chunk takes several queries.
    const large = [spec(600, 1), spec(600, 2)];
    const runsOfA: SimulationDto[] = [];
    for (const s of large) runsOfA.push(await createSimulation(actor(a), { spec: s }, { chunkSize: 1 }));
    worker = await startWorker({ db: db(), engine: inlineEngine, concurrency: 1, log: () => {} });
    await until('the first run to get going', async () => (await findSimulation(db(), runsOfA[0]!.id))!.replicatesDone >= 20, 30_000);

    const small = spec(10, 3);
    const queuedAt = Date.now();
    const runOfB = await createSimulation(actor(b), { spec: small }, { chunkSize: 5 });
    const done = await until('the small run to end', () => ended(runOfB.id), 30_000);
    const finishedAfterMs = Date.now() - queuedAt;
    const progressOfA = await Promise.all(runsOfA.map(async (r) => (await findSimulation(db(), r.id))!.replicatesDone));
    await worker.pause();
    worker = undefined;

    const rowB = (await findSimulation(db(), runOfB.id))!;
    const [first] = (await jobTimes(rowB.jobIds)).sort((x, y) => x.startedOn!.getTime() - y.startedOn!.getTime());
    const waitMs = first!.startedOn!.getTime() - first!.createdOn.getTime();
    // Chunks of the large runs that were claimed while the small run's first chunk was waiting.
    const jobsOfA = (await Promise.all(runsOfA.map((r) => findSimulation(db(), r.id)))).flatMap((r) => r!.jobIds);
    const overtaking = (await jobTimes(jobsOfA)).filter((j) => j.startedOn && j.startedOn > first!.createdOn && j.startedOn < first!.startedOn!);
    const report = `waited ${waitMs} ms for its first chunk (${overtaking.length} chunks of the large runs went first), finished ${finishedAfterMs} ms after being queued; large runs at ${progressOfA.join(' and ')} of 600`;

    expect(done.status, report).toBe('done');
    expect(overtaking.length, report).toBeLessThanOrEqual(2);
    expect(waitMs, report).toBeLessThan(2_000);
    // The large runs were still far from done: the small run did not wait for them.
    expect(progressOfA[0]! + progressOfA[1]!, report).toBeLessThan(600);
    expect(done.results).toEqual(solo(small));

    for (const r of runsOfA) await cancelSimulation(actor(a), r.id);
  }, 90_000);

  it('changes no result: runs that shared the worker give the bytes of each run computed alone', async () => {
    const a = await makeUser('first');
    const b = await makeUser('second');
    const specsOfA = [spec(40, 11), spec(30, 12)];
    const runsOfA: SimulationDto[] = [];
    for (const s of specsOfA) runsOfA.push(await createSimulation(actor(a), { spec: s }, { chunkSize: 2 }));
    worker = await startWorker({ db: db(), engine: inlineEngine, concurrency: 1, log: () => {} });
    await until('the first run to get going', async () => (await findSimulation(db(), runsOfA[0]!.id))!.replicatesDone > 0, 30_000);
    const small = spec(10, 13);
    const runOfB = await createSimulation(actor(b), { spec: small }, { chunkSize: 1 });

    const all = [...runsOfA, runOfB];
    const results: Simulation[] = [];
    for (const r of all) results.push(await until(`run ${r.id} to end`, () => ended(r.id), 60_000));
    await worker.pause();
    worker = undefined;
    results.forEach((r) => expect(r.status, r.error ?? '').toBe('done'));

    // They did share it: the small run's chunks went between the large runs' chunks.
    const timesOfB = await jobTimes(results[2]!.jobIds);
    const timesOfA = await jobTimes([...results[0]!.jobIds, ...results[1]!.jobIds]);
    const lastOfA = Math.max(...timesOfA.map((j) => j.startedOn!.getTime()));
    expect(Math.max(...timesOfB.map((j) => j.startedOn!.getTime())), 'the small run’s last chunk started before the large runs’ last').toBeLessThan(lastOfA);

    [...specsOfA, small].forEach((s, i) => expect(results[i]!.results, `run ${i + 1}`).toEqual(solo(s)));
  }, 90_000);
});
