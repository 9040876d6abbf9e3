/**
 * Settings of the simulation queue, read from the environment at the moment they are needed (so
 * that a test can shorten the expiry before it starts a worker). Every value has a default that
 * suits `npm start`; the fault test and the integration tests shorten the times.
 *
 *   SIM_WORKER_THREADS          worker threads per worker process (default: os.availableParallelism())
 *   SIM_CHUNK_SECONDS           target work per chunk in seconds (default 0.3)
 *   SIM_CHUNK_EXPIRE_SECONDS    a chunk not finished this long after it was claimed is retried (default 20;
 *                               a chunk is planned as 0.3 s of work, so only a dead or stuck worker misses it)
 *   SIM_CHUNK_RETRY_LIMIT       retries of a failed or expired chunk before the run fails (default 3)
 *   SIM_CHUNK_RETRY_DELAY_SECONDS  wait before a retry (default 1)
 *   SIM_MAINTENANCE_SECONDS     how often a process looks for expired chunks (default 5): a killed worker's
 *                               chunk is back on the queue within expiry + this
 *   SIM_POLL_SECONDS            how often an idle worker asks for work (default 0.5, pg-boss's minimum)
 *   SIM_MAX_ACTIVE_RUNS         queued or running runs per person (default 3)
 *   SIM_MAX_REPLICATES          replicates per run, summed over scenarios (default 200000)
 */
import os from 'node:os';

function num(name: string, fallback: number, { min, integer = false }: { min: number; integer?: boolean }): number {
  const raw = process.env[name];
  if (raw === undefined || raw === '') return fallback;
  const v = Number(raw);
  if (!Number.isFinite(v) || v < min || (integer && !Number.isInteger(v))) {
    throw new Error(`${name} must be ${integer ? 'an integer' : 'a number'} of at least ${min} (got "${raw}")`);
  }
  return v;
}

export interface JobsConfig {
  threads: number;
  chunkSeconds: number;
  expireSeconds: number;
  retryLimit: number;
  retryDelaySeconds: number;
  maintenanceSeconds: number;
  pollSeconds: number;
  maxActiveRuns: number;
  maxReplicates: number;
}

export function jobsConfig(): JobsConfig {
  return {
    threads: num('SIM_WORKER_THREADS', Math.max(1, os.availableParallelism()), { min: 1, integer: true }),
    chunkSeconds: num('SIM_CHUNK_SECONDS', 0.3, { min: 0.001 }),
    expireSeconds: num('SIM_CHUNK_EXPIRE_SECONDS', 20, { min: 1, integer: true }),
    retryLimit: num('SIM_CHUNK_RETRY_LIMIT', 3, { min: 0, integer: true }),
    retryDelaySeconds: num('SIM_CHUNK_RETRY_DELAY_SECONDS', 1, { min: 0, integer: true }),
    maintenanceSeconds: num('SIM_MAINTENANCE_SECONDS', 5, { min: 1, integer: true }),
    pollSeconds: num('SIM_POLL_SECONDS', 0.5, { min: 0.5 }),
    maxActiveRuns: num('SIM_MAX_ACTIVE_RUNS', 3, { min: 1, integer: true }),
    maxReplicates: num('SIM_MAX_REPLICATES', 200_000, { min: 1, integer: true }),
  };
}
