/**
 * The worker threads that compute chunks: a piscina pool with one thread per core (or
 * SIM_WORKER_THREADS), so that the worker process's own thread stays free for the queue and the
 * database. Each thread loads lib/jobs/chunk-thread.ts; the path is built from process.cwd()
 * (the project folder, where `npm start` and `npm run worker` run), because a bundler's idea of
 * __dirname is not the source folder. Threads inherit the process's TypeScript loader (tsx).
 */
import path from 'node:path';
import { Piscina } from 'piscina';
import type { SimulationSpec } from '@/lib/sim/spec';
import type { ChunkTask } from './chunk-thread';
import { aggregateChunks, parseSpec } from './engine';
import type { Engine } from './handler';

export function createPool(threads: number): Piscina {
  return new Piscina({
    filename: path.join(process.cwd(), 'lib/jobs/chunk-thread.ts'),
    minThreads: threads,
    maxThreads: threads,
    // Threads stay up between runs: starting one costs the module loading again.
    idleTimeout: 60_000,
  });
}

/** The engine with chunks computed on the pool's threads. */
export function poolEngine(pool: Piscina): Engine<SimulationSpec> {
  return {
    parseSpec,
    async computeChunk(spec, scenarioIndex, from, to) {
      const task: ChunkTask = { spec, scenarioIndex, from, to };
      return (await pool.run(task)) as Uint8Array;
    },
    aggregate: aggregateChunks,
  };
}
