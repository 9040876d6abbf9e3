/**
 * A worker survives a PostgreSQL restart. An unsupervised worker process (`node --import tsx
 * lib/jobs/worker-main.ts`, as `npm run worker` starts it, with nothing to restart it) computes a
 * run; PostgreSQL is stopped while one of its chunks is in progress and started again. The worker
 * stays up, waits for the database, takes chunks again once it is back, and the run completes with
 * every replicate stored exactly once and results bit-identical to the run computed in one piece.
 * The outage is logged once when it begins and once when it ends, with timestamps and levels.
 *
 * The restart hits a throwaway PostgreSQL of this test's own (scripts/lib/postgres.mjs, in a
 * temporary folder on a free port), not the database the rest of the suite shares. This process's
 * own pool and pg-boss talk to it too, and live through the restart as well.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';
import type { Kysely } from 'kysely';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createDb } from '@/db/client';
import { migrateToLatest } from '@/db/migrate';
import { findSimulation, insertSimulation, listChunks, setJobIds } from '@/db/repositories/simulations';
import { insertUser } from '@/db/repositories/users';
import type { Database } from '@/db/schema';
import { CHUNK_QUEUE, getBoss, stopBoss } from '@/lib/jobs/boss';
import { aggregateChunks, computeChunkBytes, parseSpec } from '@/lib/jobs/engine';
import { planChunks } from '@/lib/jobs/plan';
import { enqueueChunks, placeRun } from '@/lib/jobs/queue';
import type { SimulationSpec } from '@/lib/sim/spec';
import { ensurePostgres, type PostgresHandle } from '../../scripts/lib/postgres.mjs';

const root = path.resolve(__dirname, '../..');

/** 24 chunks of about 0.1–0.2 s each on this machine: the restart lands early in the run. */
const SPEC = parseSpec({
  design: { arms: 2, clustersPerArm: 10, clusterSize: 20 },
  truth: { effect: 0.5, sd: 1, icc: 0.1 },
  scenarios: [{ violation: 'none' }],
  analyses: ['ols', 'cluster-robust', 'cluster-means', 'mixed'],
  replicates: 1200,
  seed: 2027,
}) as SimulationSpec;
const CHUNK_SIZE = 50;

let dir: string;
let server: PostgresHandle;
let pgOptions: Parameters<typeof ensurePostgres>[0];
let db: Kysely<Database>;
let worker: { child: ChildProcess; output: string[]; exited: Promise<number | null> } | undefined;

async function freePort(): Promise<number> {
  const probe = net.createServer();
  await new Promise<void>((resolve) => probe.listen(0, '127.0.0.1', resolve));
  const { port } = probe.address() as net.AddressInfo;
  await new Promise((resolve) => probe.close(resolve));
  return port;
}

async function until<T>(what: string, fn: () => Promise<T | undefined | false>, timeoutMs: number): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    // While the database is away, this process's own queries fail too: that is expected here.
    const v = await fn().catch(() => undefined);
    if (v) return v;
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}. Worker output:\n${worker?.output.join('') ?? ''}`);
    await new Promise((r) => setTimeout(r, 25));
  }
}

/** JSON with the keys of every object sorted. */
function canonical(value: unknown): string {
  return JSON.stringify(value, (_, v: unknown) =>
    v && typeof v === 'object' && !Array.isArray(v) ? Object.fromEntries(Object.entries(v).sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0))) : v,
  );
}

beforeAll(async () => {
  dir = fs.mkdtempSync(path.join(os.tmpdir(), 'unitwise-restart-'));
  pgOptions = {
    dataDir: path.join(dir, 'pg'),
    port: await freePort(),
    user: 'unitwise',
    password: 'restart-test',
    database: 'unitwise_restart_test',
    options: ['fsync=off', 'synchronous_commit=off', 'full_page_writes=off'],
    log: () => {},
  };
  server = await ensurePostgres(pgOptions);
  await migrateToLatest(server.url);
  db = createDb(server.url);
  // Settings of the chunks this test queues (each job carries them) and of the processes' pg-boss.
  process.env.SIM_CHUNK_EXPIRE_SECONDS = '5';
  process.env.SIM_CHUNK_RETRY_DELAY_SECONDS = '0';
  process.env.SIM_MAINTENANCE_SECONDS = '1';
}, 60_000);

afterAll(async () => {
  if (worker && worker.child.exitCode === null && worker.child.signalCode === null) worker.child.kill('SIGKILL');
  await worker?.exited;
  await stopBoss({ timeout: 3_000 });
  await db?.destroy();
  server?.stop();
  if (dir) fs.rmSync(dir, { recursive: true, force: true });
  delete process.env.SIM_CHUNK_EXPIRE_SECONDS;
  delete process.env.SIM_CHUNK_RETRY_DELAY_SECONDS;
  delete process.env.SIM_MAINTENANCE_SECONDS;
}, 30_000);

describe('a PostgreSQL restart in the middle of a run', () => {
  it('leaves the worker running, and the run completes with the results of an undisturbed run', async () => {
    const boss = await getBoss(server.url);
    const me = await insertUser(db, { name: 'restart', email: 'restart@test.example', emailVerified: new Date() });
    const chunks = planChunks(SPEC, CHUNK_SIZE);
    const run = await db.transaction().execute(async (trx) => {
      const firstTurn = await placeRun(trx, me.id);
      const created = await insertSimulation(trx, {
        studyId: null,
        revisionNumber: null,
        createdBy: me.id,
        spec: SPEC,
        replicatesTotal: SPEC.replicates,
        chunkSize: CHUNK_SIZE,
        chunkCount: chunks.length,
        firstTurn,
      });
      const jobIds = await enqueueChunks(trx, created.id, chunks, firstTurn, boss);
      await setJobIds(trx, created.id, jobIds);
      return { ...created, jobIds };
    });

    // No supervisor: if this process exits, nothing starts it again.
    const child = spawn(process.execPath, ['--import', 'tsx', 'lib/jobs/worker-main.ts'], {
      cwd: root,
      env: { ...process.env, DATABASE_URL: server.url, SIM_WORKER_THREADS: '1', NODE_ENV: 'production' },
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    const output: string[] = [];
    child.stdout!.on('data', (d) => output.push(String(d)));
    child.stderr!.on('data', (d) => output.push(String(d)));
    worker = { child, output, exited: new Promise((resolve) => child.on('exit', (code) => resolve(code))) };
    const alive = () => child.exitCode === null && child.signalCode === null;

    // Stop PostgreSQL while a chunk is being computed, a few chunks into the run.
    await until(
      'a chunk in progress after the first few',
      async () => {
        const r = await findSimulation(db, run.id);
        if (!r || r.replicatesDone < 2 * CHUNK_SIZE) return undefined;
        const states = await Promise.all(run.jobIds.map((id) => boss.getJobById(CHUNK_QUEUE, id)));
        return states.some((j) => j?.state === 'active');
      },
      90_000,
    );
    const doneAtStop = (await findSimulation(db, run.id))!.replicatesDone;
    expect(server.stop(), 'PostgreSQL stopped').toBe(true);
    const stoppedAt = Date.now();
    await new Promise((r) => setTimeout(r, 2_000));
    expect(alive(), `the worker is still running while the database is down\n${output.join('')}`).toBe(true);

    server = await ensurePostgres(pgOptions);
    const backAt = Date.now();
    // The worker takes chunks again: a chunk is claimed after the database came back.
    const resumedAt = await until(
      'the worker to take chunks again',
      async () => {
        const states = await Promise.all(run.jobIds.map((id) => boss.getJobById(CHUNK_QUEUE, id)));
        const after = states.filter((j) => j?.startedOn && j.startedOn.getTime() >= backAt).map((j) => j!.startedOn!.getTime());
        return after.length ? Math.min(...after) : undefined;
      },
      60_000,
    );

    const done = await until(
      'the run to finish',
      async () => {
        const r = await findSimulation(db, run.id);
        return r && r.status !== 'queued' && r.status !== 'running' ? r : undefined;
      },
      90_000,
    );
    const log = output.join('');
    const figures = `down ${backAt - stoppedAt} ms; first chunk claimed ${resumedAt - backAt} ms after PostgreSQL was back; ${doneAtStop} of ${SPEC.replicates} replicates done at the stop`;
    expect(done.status, `${done.error ?? ''}\n${figures}\n${log}`).toBe('done');
    expect(doneAtStop, figures).toBeLessThan(SPEC.replicates);
    expect(alive(), `the worker is still running after the restart\n${log}`).toBe(true);

    // Every replicate stored once: the chunks tile the run, and the count is their sum.
    expect(done.replicatesDone).toBe(SPEC.replicates);
    const stored = await listChunks(db, run.id);
    expect(stored.map((c) => c.chunkIndex)).toEqual(chunks.map((c) => c.chunkIndex));
    expect(stored.reduce((s, c) => s + (c.to - c.from), 0)).toBe(SPEC.replicates);

    // Bit-identical to the run computed in one piece, undisturbed: every number prints the same
    // (keys sorted, as jsonb keeps its own key order).
    const whole = aggregateChunks(SPEC, [{ scenarioIndex: 0, chunkIndex: 0, from: 0, to: SPEC.replicates, results: computeChunkBytes(SPEC, 0, 0, SPEC.replicates) }]);
    expect(canonical(done.results)).toBe(canonical(whole));

    // The outage is logged when it begins and when it ends, not at every try; lines carry a UTC timestamp and a level.
    const down = log.match(/^\S+ WARN  \[db\] database unavailable/gm) ?? [];
    const up = log.match(/^\S+ INFO  \[db\] database reachable again after/gm) ?? [];
    expect(down.length, log).toBeGreaterThanOrEqual(1);
    expect(down.length, log).toBeLessThanOrEqual(2);
    expect(up.length, log).toBe(down.length);
    for (const line of log.trim().split('\n')) expect(line).toMatch(/^\d{4}-\d\d-\d\dT\d\d:\d\d:\d\d\.\d{3}Z (DEBUG|INFO |WARN |ERROR) \[/);
  }, 240_000);
});
