/**
 * Runs of the stress test in integration tests: a worker in this process that computes chunks
 * on this thread (`useInlineWorker()` registers it for the file's tests), and a wait for a run to
 * end, read through the API as the given user.
 */
import { afterAll, beforeAll, expect } from 'vitest';
import { db } from '@/lib/db';
import { getBoss, stopBoss } from '@/lib/jobs/boss';
import { inlineEngine } from '@/lib/jobs/engine';
import { startWorker, type RunningWorker } from '@/lib/jobs/worker';
import * as run from '@/app/api/v1/simulations/[simulationId]/route';
import { ctx, request, type TestUser } from './fixtures';

/** Starts one inline worker before the file's tests and stops it, and the queue, after them. */
export function useInlineWorker(): void {
  let worker: RunningWorker | undefined;
  beforeAll(async () => {
    await getBoss();
    worker = await startWorker({ db: db(), engine: inlineEngine, concurrency: 1, log: () => {} });
  });
  afterAll(async () => {
    await worker?.pause();
    await stopBoss({ timeout: 5_000 });
  });
}

/** The run's body once it is no longer queued or running; throws after `timeoutMs`. */
export async function waitUntilEnded(user: TestUser, id: string, timeoutMs = 60_000) {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const res = await run.GET(request('GET', `/api/v1/simulations/${id}`, { user }), ctx({ simulationId: id }));
    const body = await res.json();
    expect(res.status).toBe(200);
    if (!['queued', 'running'].includes(body.status)) return body;
    if (Date.now() > deadline) throw new Error(`run ${id} still ${body.status} after ${timeoutMs} ms`);
    await new Promise((r) => setTimeout(r, 100));
  }
}
