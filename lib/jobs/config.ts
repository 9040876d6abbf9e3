/**
 * Settings of the simulation queue, from the SIM_* variables of the one configuration schema
 * (lib/config.ts), read at the moment they are needed (so that a test can shorten the expiry before
 * it starts a worker). Every value has a default that suits `npm start`; the fault test and the
 * integration tests shorten the times.
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
import { cachedReader, configSchema } from '@/lib/config';

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

const readSim = cachedReader(
  configSchema.pick({
    SIM_WORKER_THREADS: true,
    SIM_CHUNK_SECONDS: true,
    SIM_CHUNK_EXPIRE_SECONDS: true,
    SIM_CHUNK_RETRY_LIMIT: true,
    SIM_CHUNK_RETRY_DELAY_SECONDS: true,
    SIM_MAINTENANCE_SECONDS: true,
    SIM_POLL_SECONDS: true,
    SIM_MAX_ACTIVE_RUNS: true,
    SIM_MAX_REPLICATES: true,
  }),
);

export function jobsConfig(): JobsConfig {
  const sim = readSim();
  return {
    threads: sim.SIM_WORKER_THREADS ?? Math.max(1, os.availableParallelism()),
    chunkSeconds: sim.SIM_CHUNK_SECONDS,
    expireSeconds: sim.SIM_CHUNK_EXPIRE_SECONDS,
    retryLimit: sim.SIM_CHUNK_RETRY_LIMIT,
    retryDelaySeconds: sim.SIM_CHUNK_RETRY_DELAY_SECONDS,
    maintenanceSeconds: sim.SIM_MAINTENANCE_SECONDS,
    pollSeconds: sim.SIM_POLL_SECONDS,
    maxActiveRuns: sim.SIM_MAX_ACTIVE_RUNS,
    maxReplicates: sim.SIM_MAX_REPLICATES,
  };
}
