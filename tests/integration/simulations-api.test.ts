/**
 * Stress-test runs through the API with a real PostgreSQL and a real pg-boss: a run is queued as
 * chunks, a worker started in this process (computing on this thread) takes them, and GET shows
 * progress and then the results. Also: the results are bit-identical whatever the chunk size;
 * cancelling withdraws the waiting chunks and workers skip the rest; a chunk that keeps failing
 * fails the run with a plain message; permissions and per-person limits.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { findSimulation, listChunks } from '@/db/repositories/simulations';
import { CLASSROOM_DESIGN, GREENHOUSE_DESIGN, SLEEP_DESIGN } from '@/db/demo/designs';
import { db } from '@/lib/db';
import { createSimulation } from '@/lib/data/simulations';
import { CHUNK_QUEUE, getBoss, stopBoss, type ChunkJobData } from '@/lib/jobs/boss';
import { decodeResults } from '@/lib/jobs/codec';
import { inlineEngine } from '@/lib/jobs/engine';
import { processChunk, type Engine } from '@/lib/jobs/handler';
import { startWorker, type RunningWorker } from '@/lib/jobs/worker';
import { METRIC_NAMES } from '@/lib/sim/metrics';
import { mergeBlocks, type ReplicateBlock } from '@/lib/sim/run';
import type { SimulationSpec, SimulationSpecInput } from '@/lib/sim/spec';
import * as runs from '@/app/api/v1/simulations/route';
import * as run from '@/app/api/v1/simulations/[simulationId]/route';
import * as studyRuns from '@/app/api/v1/studies/[studyId]/simulations/route';
import * as studySpec from '@/app/api/v1/studies/[studyId]/simulations/spec/route';
import * as design from '@/app/api/v1/studies/[studyId]/design/route';
import { ctx, makeUser, makeWorld, request, SMALL_SPEC, type TestUser } from '../support/fixtures';

/** A seed that makes the test worker's engine throw: a chunk that can never be computed. */
const FAULT_SEED = 666;

const SMALL = SMALL_SPEC;

// The real engine on this thread, except for runs with FAULT_SEED (fault injection).
const engine: Engine<SimulationSpec> = {
  ...inlineEngine,
  async computeChunk(spec, scenarioIndex, from, to) {
    if (spec.seed === FAULT_SEED) throw new Error('injected failure for the test');
    return inlineEngine.computeChunk(spec, scenarioIndex, from, to);
  },
};

/** A run's stored per-replicate fits of each named scenario, merged in replicate order, as bytes. */
async function perReplicate(id: string, scenarios: string[]): Promise<Buffer[]> {
  const blocks = (await storedChunks(id)).map((c) => decodeResults(c.results) as ReplicateBlock);
  return scenarios.map((name) => {
    const m = mergeBlocks(blocks.filter((b) => b.scenario === name));
    return Buffer.concat([m.estimate, m.se, m.df, m.converged].map((a) => Buffer.from(a.buffer, a.byteOffset, a.byteLength)));
  });
}

let worker: RunningWorker | undefined;

async function startTestWorker() {
  worker ??= await startWorker({ db: db(), engine, concurrency: 1, log: () => {} });
}
async function pauseTestWorker() {
  await worker?.pause();
  worker = undefined;
}

beforeAll(async () => {
  await getBoss();
});

afterAll(async () => {
  await pauseTestWorker();
  await stopBoss({ timeout: 5_000 });
});

async function post(user: TestUser | null, body: unknown) {
  const res = await runs.POST(request('POST', '/api/v1/simulations', { user, body }), ctx({}));
  return { status: res.status, body: await res.json() };
}

async function get(user: TestUser | null, id: string) {
  const res = await run.GET(request('GET', `/api/v1/simulations/${id}`, { user }), ctx({ simulationId: id }));
  return { status: res.status, body: await res.json() };
}

async function cancel(user: TestUser | null, id: string) {
  const res = await run.DELETE(request('DELETE', `/api/v1/simulations/${id}`, { user }), ctx({ simulationId: id }));
  return { status: res.status, body: await res.json() };
}

/** Polls GET until the run has ended (or the time is up), recording the progress seen. */
async function waitUntilEnded(user: TestUser, id: string, timeoutMs = 30_000) {
  const seen: number[] = [];
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const r = await get(user, id);
    expect(r.status).toBe(200);
    seen.push(r.body.progress.replicatesDone);
    if (!['queued', 'running'].includes(r.body.status)) return { ...r.body, seen };
    if (Date.now() > deadline) throw new Error(`run ${id} still ${r.body.status} after ${timeoutMs} ms: ${JSON.stringify(r.body.progress)}`);
    await new Promise((res) => setTimeout(res, 100));
  }
}

const actor = (u: TestUser) => ({ id: u.id, email: u.email, name: null });

async function storedChunks(id: string) {
  return listChunks(db(), id);
}

describe('a run from a compact specification', () => {
  it('is queued as chunks, computed by a worker, and answered with results by scenario, analysis and metric', async () => {
    const me = await makeUser('runner');
    const created = await post(me, { spec: SMALL });
    expect(created.status, JSON.stringify(created.body)).toBe(202);
    expect(created.body).toMatchObject({ status: 'queued', studyId: null, progress: { replicatesDone: 0, replicatesTotal: 200 } });
    expect(created.body.chunkCount).toBeGreaterThanOrEqual(2);

    await startTestWorker();
    const done = await waitUntilEnded(me, created.body.id);
    expect(done.status, done.error ?? '').toBe('done');
    expect(done.progress).toMatchObject({ replicatesDone: 200, replicatesTotal: 200, etaSeconds: 0 });
    expect(done.seen).toEqual([...done.seen].sort((a: number, b: number) => a - b)); // progress only moves forward

    expect(Object.keys(done.results)).toEqual(['none', 'skewed']);
    for (const scenario of ['none', 'skewed']) {
      expect(Object.keys(done.results[scenario])).toEqual(['ols', 'cluster-robust', 'mixed']);
      for (const analysis of ['ols', 'cluster-robust', 'mixed']) {
        const m = done.results[scenario][analysis];
        expect(Object.keys(m).sort()).toEqual([...METRIC_NAMES].sort());
        for (const name of ['power', 'typeIError', 'coverage'] as const) {
          expect(m[name].value, `${scenario} ${analysis} ${name}`).toBeGreaterThanOrEqual(0);
          expect(m[name].value).toBeLessThanOrEqual(1);
          expect(m[name].mcse).toBeGreaterThanOrEqual(0);
        }
        expect(Number.isInteger(m.nonConverged.value)).toBe(true);
      }
    }
    expect(Array.isArray(done.summary)).toBe(true);
    done.summary.forEach((s: unknown) => expect(typeof s).toBe('string'));

    // Every replicate stored exactly once, in chunks that tile each scenario.
    const chunks = await storedChunks(created.body.id);
    expect(chunks).toHaveLength(created.body.chunkCount);
    for (const s of [0, 1]) {
      const own = chunks.filter((c) => c.scenarioIndex === s);
      expect(own[0]!.from).toBe(0);
      own.forEach((c, i) => i > 0 && expect(c.from).toBe(own[i - 1]!.to));
      expect(own[own.length - 1]!.to).toBe(100);
    }
  });

  it('gives bit-identical results with chunks of 1, of 4 and in one piece', async () => {
    const me = await makeUser('chunker');
    const spec: SimulationSpecInput = {
      design: { arms: 2, clustersPerArm: 3, clusterSize: 4 },
      truth: { effect: 1, sd: 2, icc: 0.2 },
      scenarios: [{ violation: 'none' }, { violation: 'outliers', name: 'rare outliers', fraction: 0.1 }],
      analyses: ['ols', 'cluster-means', 'huber'],
      replicates: 24,
      seed: 11,
    };
    await startTestWorker();
    const ids: string[] = [];
    for (const chunkSize of [1, 4, 24]) {
      const r = await createSimulation(actor(me), { spec: spec as SimulationSpec }, { chunkSize });
      expect(r.chunkCount).toBe(2 * Math.ceil(24 / chunkSize));
      ids.push(r.id);
    }
    const ended = [];
    for (const id of ids) ended.push(await waitUntilEnded(me, id));
    ended.forEach((e) => expect(e.status, e.error ?? '').toBe('done'));

    // The per-replicate fits, merged in replicate order: the same bytes.
    const [one, four, whole] = await Promise.all(ids.map((id) => perReplicate(id, ['none', 'rare outliers'])));
    expect(one![0]!.equals(four![0]!) && one![0]!.equals(whole![0]!)).toBe(true);
    expect(one![1]!.equals(four![1]!) && one![1]!.equals(whole![1]!)).toBe(true);
    // And the aggregated results, to the last digit.
    expect(JSON.stringify(ended[0].results)).toBe(JSON.stringify(ended[1].results));
    expect(JSON.stringify(ended[0].results)).toBe(JSON.stringify(ended[2].results));
    expect(Object.keys(ended[0].results)).toEqual(['none', 'rare outliers']);
  });

  it('gives the same bytes with one chunk at a time and with four at once, finishing out of order', async () => {
    const me = await makeUser('parallel');
    const spec: SimulationSpecInput = {
      design: { arms: 2, clustersPerArm: 3, clusterSize: 4 },
      truth: { effect: 1, sd: 2, icc: 0.2 },
      scenarios: [{ violation: 'none' }, { violation: 'heavy-tailed' }],
      analyses: ['ols', 'cluster-robust', 'mixed'],
      replicates: 16,
      seed: 23,
    };
    await startTestWorker();
    const serial = await createSimulation(actor(me), { spec: spec as SimulationSpec }, { chunkSize: 1 });
    const serialEnded = await waitUntilEnded(me, serial.id);
    expect(serialEnded.status, serialEnded.error ?? '').toBe('done');
    await pauseTestWorker();

    // Four slots, and chunks that take longer or shorter by their position: they finish out of order.
    const shuffled: Engine<SimulationSpec> = {
      ...engine,
      async computeChunk(s, scenarioIndex, from, to) {
        await new Promise((resolve) => setTimeout(resolve, ((from * 7 + scenarioIndex * 3) % 5) * 15));
        return engine.computeChunk(s, scenarioIndex, from, to);
      },
    };
    const four = await startWorker({ db: db(), engine: shuffled, concurrency: 4, log: () => {} });
    try {
      const parallel = await createSimulation(actor(me), { spec: spec as SimulationSpec }, { chunkSize: 1 });
      const parallelEnded = await waitUntilEnded(me, parallel.id);
      expect(parallelEnded.status, parallelEnded.error ?? '').toBe('done');
      const [a, b] = await Promise.all([serial.id, parallel.id].map((id) => perReplicate(id, ['none', 'heavy-tailed'])));
      expect(a![0]!.equals(b![0]!) && a![1]!.equals(b![1]!)).toBe(true);
      expect(JSON.stringify(parallelEnded.results)).toBe(JSON.stringify(serialEnded.results));
    } finally {
      await four.pause();
    }
  });

  it('fails with a plain message when a chunk fails on every attempt', async () => {
    const me = await makeUser('unlucky');
    process.env.SIM_CHUNK_RETRY_LIMIT = '1';
    process.env.SIM_CHUNK_RETRY_DELAY_SECONDS = '0';
    try {
      const created = await post(me, { spec: { ...SMALL, scenarios: [{ violation: 'none' }], replicates: 10, seed: FAULT_SEED } });
      expect(created.status).toBe(202);
      await startTestWorker();
      const ended = await waitUntilEnded(me, created.body.id);
      expect(ended.status).toBe('failed');
      expect(ended.error).toMatch(/^Replicates 1–10 of scenario 1 could not be computed \(2 attempts; last error: injected failure for the test\)\. The run was stopped\. Start it again; if it fails again, try fewer replicates or a smaller design\.$/);
      expect(ended.results).toBeUndefined();
    } finally {
      delete process.env.SIM_CHUNK_RETRY_LIMIT;
      delete process.env.SIM_CHUNK_RETRY_DELAY_SECONDS;
    }
  });
});

describe('cancelling', () => {
  it('withdraws the waiting chunks, and a worker skips a chunk of a cancelled run', async () => {
    await pauseTestWorker();
    const me = await makeUser('canceller');
    const created = await post(me, { spec: { ...SMALL, replicates: 50 } });
    expect(created.status).toBe(202);
    const row = await findSimulation(db(), created.body.id);

    const res = await cancel(me, created.body.id);
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ status: 'cancelled', progress: { replicatesDone: 0 } });
    expect(res.body.finishedAt).not.toBeNull();

    const boss = await getBoss();
    const states = await Promise.all(row!.jobIds.map((id) => boss.getJobById(CHUNK_QUEUE, id)));
    expect(states.map((j) => j?.state)).toEqual(row!.jobIds.map(() => 'cancelled'));

    // A chunk that was already taken when the run was cancelled is skipped, and stores nothing.
    const job = states[0]!.data as ChunkJobData;
    expect(await processChunk(db(), job, inlineEngine)).toBe('skipped');
    expect(await storedChunks(created.body.id)).toHaveLength(0);

    // Cancelling again leaves it as it was.
    const again = await cancel(me, created.body.id);
    expect(again.body.status).toBe('cancelled');
  });

  it('stops a running run part-way', async () => {
    const me = await makeUser('stopper');
    const created = await createSimulation(actor(me), { spec: { ...(SMALL as SimulationSpec), replicates: 400 } }, { chunkSize: 5 });
    await startTestWorker();
    const deadline = Date.now() + 20_000;
    while ((await get(me, created.id)).body.progress.replicatesDone === 0) {
      if (Date.now() > deadline) throw new Error('no chunk finished in 20 s');
      await new Promise((r) => setTimeout(r, 50));
    }
    const res = await cancel(me, created.id);
    expect(res.body.status).toBe('cancelled');
    await new Promise((r) => setTimeout(r, 1_000));
    const after = await get(me, created.id);
    expect(after.body.status).toBe('cancelled');
    expect(after.body.progress.replicatesDone).toBeLessThan(800);
    // Nothing lands after the cancel (at most the chunk that was in its final transaction).
    expect((await storedChunks(created.id)).length * 5).toBeLessThanOrEqual(res.body.progress.replicatesDone + 5);
  });
});

describe('runs on a study', () => {
  it('start from the saved design, are listed newest first, and are readable by the study’s viewers', async () => {
    const w = await makeWorld();
    const saved = await design.PUT(
      request('PUT', `/api/v1/studies/${w.studyId}/design`, { user: w.byRole.owner, body: { baseRevision: 1, design: CLASSROOM_DESIGN } }),
      ctx({ studyId: w.studyId }),
    );
    expect(saved.status).toBe(200);

    const derived = await studySpec.GET(request('GET', `/api/v1/studies/${w.studyId}/simulations/spec`, { user: w.byRole.viewer }), ctx({ studyId: w.studyId }));
    expect(derived.status).toBe(200);
    expect(await derived.json()).toMatchObject({ revision: 2, missing: [], spec: { design: { clustersPerArm: 10 }, replicates: 1000, seed: 1, alpha: 0.05 } });

    const first = await post(w.byRole.consultant, { studyId: w.studyId, replicates: 10, seed: 3 });
    expect(first.status, JSON.stringify(first.body)).toBe(202);
    expect(first.body).toMatchObject({ studyId: w.studyId, revision: 2 });
    expect(first.body.spec).toMatchObject({
      design: { clustersPerArm: 10, clusterSize: 23, clusterSizeCv: 0.25 },
      truth: { effect: 3, sd: 10, icc: 0.15 },
      analyses: ['ols', 'cluster-robust', 'cluster-means', 'mixed'],
      replicates: 10,
      seed: 3,
    });
    const second = await post(w.byRole.editor, { studyId: w.studyId, revision: 2, spec: { ...SMALL, replicates: 10 } });
    expect(second.status).toBe(202);

    const list = await studyRuns.GET(request('GET', `/api/v1/studies/${w.studyId}/simulations`, { user: w.byRole.viewer }), ctx({ studyId: w.studyId }));
    const items = (await list.json()).items as { id: string; results?: unknown }[];
    expect(items.map((i) => i.id)).toEqual([second.body.id, first.body.id]);
    expect(items.every((i) => i.results === undefined)).toBe(true);

    await startTestWorker();
    const done = await waitUntilEnded(w.byRole.viewer, first.body.id, 60_000);
    expect(done.status, done.error ?? '').toBe('done');
    expect(Object.keys(done.results.none)).toEqual(['ols', 'cluster-robust', 'cluster-means', 'mixed']);
    await waitUntilEnded(w.byRole.viewer, second.body.id);
  });

  it('refuses viewers and writers, hides runs from other workspaces, and keeps specification runs private', async () => {
    const w = await makeWorld();
    for (const role of ['viewer', 'writer'] as const) {
      const r = await post(w.byRole[role], { studyId: w.studyId, spec: SMALL });
      expect(r.status).toBe(403);
      expect(r.body.error.code).toBe('forbidden');
    }
    const mine = await post(w.byRole.owner, { studyId: w.studyId, spec: { ...SMALL, replicates: 10 } });
    expect((await get(w.outsider, mine.body.id)).status).toBe(404);
    expect((await get(w.workspaceOnly, mine.body.id)).status).toBe(404);
    expect((await cancel(w.byRole.viewer, mine.body.id)).status).toBe(403);
    expect((await post(w.outsider, { studyId: w.studyId, spec: SMALL })).status).toBe(404);

    const privateRun = await post(w.byRole.owner, { spec: { ...SMALL, replicates: 10 } });
    expect((await get(w.byRole.owner, privateRun.body.id)).status).toBe(200);
    expect((await get(w.byRole.editor, privateRun.body.id)).status).toBe(404);
    expect((await cancel(w.byRole.editor, privateRun.body.id)).status).toBe(404);
    expect((await get(w.byRole.owner, '00000000-0000-4000-8000-000000000000')).status).toBe(404);
    expect((await get(w.byRole.owner, 'not-a-uuid')).status).toBe(404);
    expect((await get(null, privateRun.body.id)).status).toBe(401);
  });

  it('answers a study without a saved design, or with an incomplete one, with what to do', async () => {
    const w = await makeWorld(); // revision 1 holds an empty design
    const r = await post(w.byRole.owner, { studyId: w.studyId });
    expect(r.status).toBe(400);
    expect(r.body.error.message).toMatch(/not complete enough for a stress test: .*levels of the structure/);
    const bad = await post(w.byRole.owner, { studyId: w.studyId, revision: 9 });
    expect(bad.status).toBe(404);
    const derived = await studySpec.GET(request('GET', `/api/v1/studies/${w.studyId}/simulations/spec?revision=1`, { user: w.byRole.viewer }), ctx({ studyId: w.studyId }));
    const body = await derived.json();
    expect(body).toMatchObject({ revision: 1, spec: null });
    expect(body.missing.join('; ')).toMatch(/levels of the structure/);
  });

  it('derives the demo designs: a complete specification where the stress test simulates the shape, one sentence where it does not', async () => {
    const w = await makeWorld();
    const derive = async (d: typeof CLASSROOM_DESIGN, baseRevision: number) => {
      const saved = await design.PUT(request('PUT', `/api/v1/studies/${w.studyId}/design`, { user: w.byRole.owner, body: { baseRevision, design: d } }), ctx({ studyId: w.studyId }));
      expect(saved.status).toBe(200);
      const res = await studySpec.GET(request('GET', `/api/v1/studies/${w.studyId}/simulations/spec`, { user: w.byRole.viewer }), ctx({ studyId: w.studyId }));
      expect(res.status).toBe(200);
      return res.json();
    };
    const greenhouse = await derive(GREENHOUSE_DESIGN, 1);
    expect(greenhouse).toMatchObject({ revision: 2, missing: [], unsupported: [], spec: { design: { clustersPerArm: 6, clusterSize: 5, occasions: 4 } } });
    // The outcome is right-skewed, but the simulated one is normal and can be ≤ 0: no log-ols.
    expect(greenhouse.spec.analyses).toEqual(['ols', 'ols-hc3', 'cluster-robust', 'cluster-means', 'mixed']);

    const sleep = await derive(SLEEP_DESIGN, 2);
    expect(sleep).toMatchObject({ revision: 3, missing: [], unsupported: [], spec: { design: { unitsPerArm: 12, crossover: { periods: 8, sequences: ['AAAABBBB', 'BBBBAAAA'] } } } });

    const threeArms = await derive({ ...SLEEP_DESIGN, assignment: { ...SLEEP_DESIGN.assignment, arms: [...SLEEP_DESIGN.assignment!.arms!, { name: 'Free schedule', allocation: 1 }] } }, 3);
    expect(threeArms).toMatchObject({ revision: 4, spec: null, missing: [] });
    expect(threeArms.unsupported).toEqual([expect.stringMatching(/^The design has 3 arms: the stress test compares two/)]);
    const r = await post(w.byRole.owner, { studyId: w.studyId });
    expect(r.status).toBe(400);
    expect(r.body.error.message).toBe(threeArms.unsupported[0]);
  });
});

describe('limits per person', () => {
  it('refuses more runs in progress than allowed, and runs that are too large, saying what to do', async () => {
    await pauseTestWorker();
    const me = await makeUser('flooder');
    process.env.SIM_MAX_ACTIVE_RUNS = '2';
    process.env.SIM_MAX_REPLICATES = '1000';
    try {
      const big = await post(me, { spec: { ...SMALL, replicates: 600 } });
      expect(big.status).toBe(400);
      expect(big.body.error.message).toBe(
        'This run has 1,200 replicates (600 × 2 scenarios); one run can have at most 1,000. Use fewer replicates or scenarios.',
      );
      const a = await post(me, { spec: { ...SMALL, replicates: 10 } });
      const b = await post(me, { spec: { ...SMALL, replicates: 10 } });
      expect([a.status, b.status]).toEqual([202, 202]);
      const c = await post(me, { spec: { ...SMALL, replicates: 10 } });
      expect(c.status).toBe(429);
      expect(c.body.error.message).toBe('You already have 2 stress tests queued or running (at most 2). Wait for one to finish, or cancel one, then start this one.');
      await cancel(me, a.body.id);
      expect((await post(me, { spec: { ...SMALL, replicates: 10 } })).status).toBe(202);
    } finally {
      delete process.env.SIM_MAX_ACTIVE_RUNS;
      delete process.env.SIM_MAX_REPLICATES;
    }
  });

  it('checks the request body', async () => {
    const me = await makeUser('typo');
    const none = await post(me, {});
    expect(none.status).toBe(400);
    expect(none.body.error.fields.spec).toEqual(['Send a stress-test specification, or the study whose design to use.']);
    const stray = await post(me, { spec: SMALL, seed: 4 });
    expect(stray.body.error.fields.seed).toEqual(['With a specification, give the random seed inside the specification.']);
    const wrong = await post(me, { spec: { ...SMALL, scenarios: [{ violation: 'serial' }] } });
    expect(wrong.status).toBe(400);
    expect(wrong.body.error.fields['spec.scenarios.0.violation']).toEqual(['Serial correlation needs occasions.']);
  });
});
