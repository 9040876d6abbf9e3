/**
 * A worker killed in the middle of a chunk loses nothing and counts nothing twice: a worker
 * process (`npm run worker`, with a short chunk expiry) claims a chunk and is killed with SIGKILL
 * while computing it; a second worker process takes over, the killed chunk is retried once its
 * expiry has passed, and the run completes with every replicate stored exactly once and results
 * bit-identical to the same run computed in one piece.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { findSimulation, listChunks } from '@/db/repositories/simulations';
import { db } from '@/lib/db';
import { createSimulation } from '@/lib/data/simulations';
import { CHUNK_QUEUE, getBoss, stopBoss } from '@/lib/jobs/boss';
import { aggregateChunks, computeChunkBytes, parseSpec } from '@/lib/jobs/engine';
import type { SimulationSpec } from '@/lib/sim/spec';
import { makeUser } from '../support/fixtures';

const root = path.resolve(__dirname, '../..');
const EXPIRE_SECONDS = 4;

/**
 * Eight chunks of 0.1–0.3 s each on this machine once warm; the first chunk of a fresh worker
 * takes longer (the thread loads and compiles the engine), so the kill lands inside it. The test
 * checks that it did.
 */
const SPEC = parseSpec({
  design: { arms: 2, clustersPerArm: 10, clusterSize: 20 },
  truth: { effect: 0.5, sd: 1, icc: 0.1 },
  scenarios: [{ violation: 'none' }],
  analyses: ['ols', 'cluster-robust', 'cluster-means', 'mixed'],
  replicates: 600,
  seed: 2026,
}) as SimulationSpec;
const CHUNK_SIZE = 75;

interface Worker {
  child: ChildProcess;
  output: string[];
  exited: Promise<number | null>;
}

const workers: Worker[] = [];

function startWorkerProcess(): Worker {
  const child = spawn(process.execPath, ['--import', 'tsx', 'lib/jobs/worker-main.ts'], {
    cwd: root,
    env: { ...process.env, SIM_WORKER_THREADS: '1', SIM_MAINTENANCE_SECONDS: '1', NODE_ENV: 'production' },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  const output: string[] = [];
  child.stdout!.on('data', (d) => output.push(String(d)));
  child.stderr!.on('data', (d) => output.push(String(d)));
  const exited = new Promise<number | null>((resolve) => child.on('exit', (code) => resolve(code)));
  const w = { child, output, exited };
  workers.push(w);
  return w;
}

async function until<T>(what: string, fn: () => Promise<T | undefined | false>, timeoutMs: number, logs: () => string): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const v = await fn();
    if (v) return v;
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}. Worker output:\n${logs()}`);
    await new Promise((r) => setTimeout(r, 50));
  }
}

beforeAll(async () => {
  // Settings of the chunks this test creates (each job carries them) and of this process's pg-boss.
  process.env.SIM_CHUNK_EXPIRE_SECONDS = String(EXPIRE_SECONDS);
  process.env.SIM_CHUNK_RETRY_DELAY_SECONDS = '0';
  process.env.SIM_MAINTENANCE_SECONDS = '1';
  await getBoss();
});

afterAll(async () => {
  for (const w of workers) if (w.child.exitCode === null && w.child.signalCode === null) w.child.kill('SIGKILL');
  await Promise.all(workers.map((w) => w.exited));
  await stopBoss({ timeout: 3_000 });
  delete process.env.SIM_CHUNK_EXPIRE_SECONDS;
  delete process.env.SIM_CHUNK_RETRY_DELAY_SECONDS;
  delete process.env.SIM_MAINTENANCE_SECONDS;
});

describe('a worker killed mid-chunk', () => {
  it('loses nothing: the chunk is retried by another worker and the run completes, every replicate counted once', async () => {
    const me = await makeUser('fault');
    const created = await createSimulation({ id: me.id, email: me.email, name: null }, { spec: SPEC }, { chunkSize: CHUNK_SIZE });
    const run = (await findSimulation(db(), created.id))!;
    expect(run.jobIds).toHaveLength(SPEC.replicates / CHUNK_SIZE);
    const boss = await getBoss();
    const logs = () => workers.map((w, i) => `--- worker ${i + 1}\n${w.output.join('')}`).join('\n');

    // Worker 1 claims a chunk; kill it while the chunk is being computed.
    const first = startWorkerProcess();
    const claimed = await until(
      'worker 1 to claim a chunk',
      async () => {
        for (const id of run.jobIds) {
          const job = await boss.getJobById(CHUNK_QUEUE, id);
          if (job?.state === 'active') return id;
        }
        return undefined;
      },
      60_000,
      logs,
    );
    first.child.kill('SIGKILL');
    await first.exited;
    const afterKill = await boss.getJobById(CHUNK_QUEUE, claimed);
    expect(afterKill?.state, 'the killed chunk was still in progress').toBe('active');
    const storedAtKill = await listChunks(db(), created.id);

    // Worker 2 finishes the run, including the killed chunk once it has expired.
    startWorkerProcess();
    const done = await until(
      'the run to finish',
      async () => {
        const r = await findSimulation(db(), created.id);
        return r && r.status !== 'queued' && r.status !== 'running' ? r : undefined;
      },
      90_000,
      logs,
    );
    expect(done.status, `${done.error ?? ''}\n${logs()}`).toBe('done');
    expect(done.replicatesDone).toBe(SPEC.replicates);

    const chunks = await listChunks(db(), created.id);
    expect(chunks.map((c) => c.chunkIndex)).toEqual(Array.from({ length: SPEC.replicates / CHUNK_SIZE }, (_, i) => i));
    expect(chunks.reduce((s, c) => s + (c.to - c.from), 0)).toBe(SPEC.replicates);
    expect(storedAtKill.length).toBeLessThan(chunks.length);

    // The run is marked done inside the last chunk's work; its job is marked complete just after.
    await expect.poll(async () => (await boss.getJobById(CHUNK_QUEUE, claimed))?.state, { timeout: 10_000 }).toBe('completed');
    const retried = await boss.getJobById(CHUNK_QUEUE, claimed);
    expect(retried?.retryCount, 'the killed chunk was retried').toBeGreaterThanOrEqual(1);

    // The same results as the run computed in one piece, to the last bit.
    const whole = aggregateChunks(SPEC, [{ scenarioIndex: 0, chunkIndex: 0, from: 0, to: SPEC.replicates, results: computeChunkBytes(SPEC, 0, 0, SPEC.replicates) }]);
    expect(done.results).toEqual(JSON.parse(JSON.stringify(whole)));
  }, 150_000);
});
