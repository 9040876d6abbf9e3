import type PgBoss from 'pg-boss';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { consume } from './consume';

/** What node-postgres raises when the server is not there. */
const refused = () => Object.assign(new Error('connect ECONNREFUSED 127.0.0.1:5432'), { code: 'ECONNREFUSED', syscall: 'connect' });

/**
 * A pg-boss stand-in with one job: `down` failures of each kind of query before the database
 * "answers". Like pg-boss, fetch() swallows the error of its query and answers no job.
 */
function fakeBoss({ fetchDown = 0, completeDown = 0 } = {}) {
  const calls = { fetch: 0, complete: [] as string[], fail: [] as unknown[] };
  let handedOut = false;
  let fetchFailures = fetchDown;
  let completeFailures = completeDown;
  const boss = {
    getDb: () => ({
      async executeSql() {
        if (fetchFailures-- > 0) throw refused();
        return { rows: [] };
      },
    }),
    async fetch(_queue: string, options: { db: { executeSql(text: string, values: unknown[]): Promise<unknown> } }) {
      calls.fetch++;
      try {
        await options.db.executeSql('select', []);
      } catch {
        return [];
      }
      if (handedOut) return [];
      handedOut = true;
      return [{ id: 'job-1', data: { n: 1 } }];
    },
    async complete(_queue: string, id: string) {
      if (completeFailures-- > 0) throw refused();
      calls.complete.push(id);
    },
    async fail(_queue: string, id: string, err: unknown) {
      calls.fail.push([id, err]);
    },
  };
  return { boss: boss as unknown as PgBoss, calls };
}

/** Runs one slot until `done()` holds, then stops it. */
async function runUntil(boss: PgBoss, handle: () => Promise<void>, done: () => boolean) {
  const stop = new AbortController();
  const slot = consume(boss, 'q', handle, { signal: stop.signal, pollSeconds: 0.05 });
  const deadline = Date.now() + 10_000;
  while (!done() && Date.now() < deadline) await new Promise((r) => setTimeout(r, 10));
  stop.abort();
  await slot;
}

afterEach(() => vi.restoreAllMocks());

describe('a queue slot while the database is away', () => {
  it('runs a job again whose handler met the outage, completes it once it can, and never fails it', async () => {
    vi.spyOn(console, 'error').mockImplementation(() => {});
    vi.spyOn(console, 'log').mockImplementation(() => {});
    const { boss, calls } = fakeBoss({ fetchDown: 2, completeDown: 2 });
    let runs = 0;
    const handle = async () => {
      runs++;
      if (runs === 1) throw new Error('Connection terminated unexpectedly');
    };
    await runUntil(boss, handle, () => calls.complete.length > 0);
    expect(runs).toBe(2);
    expect(calls.complete).toEqual(['job-1']);
    expect(calls.fail).toEqual([]);
    expect(calls.fetch).toBeGreaterThanOrEqual(3); // two claims met the outage before the job was handed out
  });

  it('fails a job whose handler threw for another reason, and keeps taking jobs', async () => {
    vi.spyOn(console, 'error').mockImplementation(() => {});
    const { boss, calls } = fakeBoss();
    const boom = new Error('no such scenario');
    await runUntil(boss, async () => { throw boom; }, () => calls.fail.length > 0 && calls.fetch > 2);
    expect(calls.fail).toEqual([['job-1', boom]]);
    expect(calls.complete).toEqual([]);
  });

  it('stops at once when told to while waiting for the database, leaving the job to expire', async () => {
    vi.spyOn(console, 'error').mockImplementation(() => {});
    const { boss, calls } = fakeBoss({ completeDown: 1_000 });
    const started = Date.now();
    await runUntil(boss, async () => {}, () => calls.fetch > 0 && Date.now() - started > 300);
    expect(Date.now() - started).toBeLessThan(5_000);
    expect(calls.complete).toEqual([]);
    expect(calls.fail).toEqual([]);
  });
});
