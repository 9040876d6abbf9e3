/**
 * Throughput of the stress-test engine (lib/sim) on reference designs: replicates per second,
 * seconds, peak memory, and the floor — the time just to draw the random numbers and fill the
 * data sets (both runs of every replicate, no analyses). Targets, reported and never asserted:
 * 10,000 replicates of the two-arm cluster design (10 clusters per arm × 20 pupils, ICC 0.1)
 * analysed by ols, ols-hc3, cluster-robust, cluster-means and mixed in under 2 s on this 2-core
 * machine using both cores, and within 10× of the floor (`meetsTarget` checks the two-thread
 * compute time and the one-thread time over the floor). The repeated-measures design (30
 * volunteers per arm × 8 nights, difference in slopes, random slopes) and the three-level design
 * (6 trays per arm × 8 plants × 4 leaves) run 1,000 replicates each.
 *
 * Each design runs once on this thread, in chunks of 1,000 replicates through one workspace (as
 * a worker would), then again split between two worker threads; the two-thread results are
 * checked to be bit-identical to the one-thread results. `perFitUs` gives the mean time per fit
 * of each analysis from a separate pass over the first replicates. Figures depend on the load
 * of the machine: `loadAverage` reports it, and `cpuSeconds` / `floorCpuSeconds` give the CPU
 * time this thread used, which other processes' load inflates much less than wall time;
 * `twoThreadSecondsFromCpu` = cpuSeconds / 2 is what two idle cores would take (the replicates
 * are independent).
 *
 *   npm run bench -- sim                        a block per design
 *   npm run bench -- sim --json                 one JSON object per design
 *   npm run bench -- sim --sim-replicates=500   fewer replicates per design (a quick look)
 */
import os from 'node:os';
import { fileURLToPath } from 'node:url';
import { isMainThread, parentPort, Worker, workerData } from 'node:worker_threads';
import { analyse } from '@/lib/models';
import type { AnalysisName } from '@/lib/models/types';
import { createSimulation, generate } from '@/lib/sim/generate';
import { Rng } from '@/lib/sim/rng';
import { aggregate, createWorkspace, mergeBlocks, runReplicates, type ReplicateBlock } from '@/lib/sim/run';
import { simulationSpecSchema, type SimulationSpec, type SimulationSpecInput } from '@/lib/sim/spec';
import type { Throughput, ThroughputResult } from './run';

const ALL_LINEAR: AnalysisName[] = ['ols', 'ols-hc3', 'cluster-robust', 'cluster-means', 'mixed'];

const DESIGNS: { name: string; targetSeconds?: number; spec: SimulationSpecInput }[] = [
  {
    name: 'cluster 2 arms × 10 clusters × 20, ICC 0.1',
    targetSeconds: 2,
    spec: {
      design: { arms: 2, clustersPerArm: 10, clusterSize: 20 },
      truth: { effect: 0.3, sd: 1, icc: 0.1 },
      scenarios: [{ violation: 'none' }],
      analyses: ALL_LINEAR,
      replicates: 10_000,
      seed: 2026,
    },
  },
  {
    name: 'repeated measures 2 arms × 30 volunteers × 8 nights, slope target',
    spec: {
      design: { arms: 2, unitsPerArm: 30, occasions: 8, target: 'treat:time' },
      truth: { effect: 0.05, sd: 1, occasionCorrelation: 0.5, randomSlopeSd: 0.05 },
      scenarios: [{ violation: 'none' }],
      analyses: ALL_LINEAR,
      replicates: 1_000,
      seed: 2026,
    },
  },
  {
    name: 'three levels 2 arms × 6 trays × 8 plants × 4 leaves',
    spec: {
      design: { arms: 2, clustersPerArm: 6, clusterSize: 8, occasions: 4 },
      truth: { effect: 0.5, sd: 1, icc: 0.1, occasionCorrelation: 0.4 },
      scenarios: [{ violation: 'none' }],
      analyses: ALL_LINEAR,
      replicates: 1_000,
      seed: 2026,
    },
  },
];

const CHUNK = 1000;

interface WorkerJob {
  simBench: true;
  spec: SimulationSpec;
  from: number;
  to: number;
}

interface WorkerReply {
  blocks: ReplicateBlock[];
  seconds: number;
}

/** Replicates from … to − 1 in chunks through one workspace; peak heap sampled after each chunk. */
function runChunked(spec: SimulationSpec, from: number, to: number): { blocks: ReplicateBlock[]; peakHeap: number } {
  const workspace = createWorkspace(spec, 0);
  const blocks: ReplicateBlock[] = [];
  let peakHeap = 0;
  for (let start = from; start < to; start += CHUNK) {
    blocks.push(runReplicates(spec, 0, start, Math.min(to, start + CHUNK), workspace));
    peakHeap = Math.max(peakHeap, process.memoryUsage().heapUsed);
  }
  return { blocks, peakHeap };
}

/** Both data sets of every replicate, no analyses. */
function floorSeconds(spec: SimulationSpec): { seconds: number; cpuSeconds: number } {
  const sim = createSimulation(spec, 0);
  const start = process.hrtime.bigint();
  const cpu = process.cpuUsage();
  for (let r = 0; r < spec.replicates; r++) {
    generate(sim, Rng.forReplicate(spec.seed, sim.scenarioName, 'alternative', r), spec.truth.effect);
    generate(sim, Rng.forReplicate(spec.seed, sim.scenarioName, 'null', r), 0);
  }
  return { seconds: Number(process.hrtime.bigint() - start) / 1e9, cpuSeconds: cpuSecondsSince(cpu) };
}

/** CPU seconds (user + system) of this process since `start`: less sensitive than wall time to other processes' load. */
function cpuSecondsSince(start: NodeJS.CpuUsage): number {
  const { user, system } = process.cpuUsage(start);
  return (user + system) / 1e6;
}

/** Mean µs per fit of each analysis over the first `count` replicates' alternative data sets. */
function perFitUs(spec: SimulationSpec, count: number): Record<string, number> {
  const sim = createSimulation(spec, 0);
  const out: Record<string, number> = {};
  for (const name of spec.analyses) {
    let ns = 0n;
    for (let r = 0; r < count; r++) {
      generate(sim, Rng.forReplicate(spec.seed, sim.scenarioName, 'alternative', r), spec.truth.effect);
      const t0 = process.hrtime.bigint();
      analyse(name, sim.dataset, sim.fixed);
      ns += process.hrtime.bigint() - t0;
    }
    out[name] = Math.round(Number(ns) / count / 100) / 10;
  }
  return out;
}

/**
 * A worker thread does not inherit tsx's loader, so it registers tsx's CommonJS hook (which reads
 * tsconfig.json for the `@/` paths) before requiring this file, which then runs its share.
 */
const WORKER_BOOTSTRAP = `require('tsx/cjs/api').register(); require(${JSON.stringify(fileURLToPath(import.meta.url))});`;

/**
 * Runs replicates 0 … R − 1 split between two worker threads. `seconds` is the longer of the two
 * workers' compute times after their warm-up (what a warm pool delivers); `wallSeconds` adds
 * starting the threads and compiling the modules in each.
 */
async function twoThreads(spec: SimulationSpec): Promise<{ seconds: number; wallSeconds: number; blocks: ReplicateBlock[] }> {
  const half = Math.ceil(spec.replicates / 2);
  const start = process.hrtime.bigint();
  const parts = await Promise.all(
    [
      [0, half],
      [half, spec.replicates],
    ].map(
      ([from, to]) =>
        new Promise<WorkerReply>((resolve, reject) => {
          const job: WorkerJob = { simBench: true, spec, from: from!, to: to! };
          const worker = new Worker(WORKER_BOOTSTRAP, { eval: true, workerData: job });
          worker.once('message', (reply: WorkerReply) => {
            resolve(reply);
            void worker.terminate();
          });
          worker.once('error', reject);
        }),
    ),
  );
  return {
    seconds: Math.max(...parts.map((p) => p.seconds)),
    wallSeconds: Number(process.hrtime.bigint() - start) / 1e9,
    blocks: parts.flatMap((p) => p.blocks),
  };
}

/** The first entry where two blocks differ (Object.is, so NaN equals NaN), or null. */
function firstDifference(a: ReplicateBlock, b: ReplicateBlock): string | null {
  if (a.from !== b.from || a.to !== b.to || a.estimate.length !== b.estimate.length) return `ranges ${a.from}–${a.to} and ${b.from}–${b.to}`;
  const stride = a.analyses.length * 2;
  for (let i = 0; i < a.estimate.length; i++) {
    const fields = (['estimate', 'se', 'df', 'converged'] as const).filter((f) => !Object.is(a[f][i], b[f][i]));
    if (fields.length > 0) {
      const where = `replicate ${a.from + Math.floor(i / stride)}, ${a.analyses[Math.floor((i % stride) / 2)]}, ${i % 2 === 0 ? 'alternative' : 'null'}`;
      return `${where}: ${fields.map((f) => `${f} ${a[f][i]} vs ${b[f][i]}`).join(', ')}`;
    }
  }
  return null;
}

const round = (x: number, digits = 3) => Number(x.toFixed(digits));

/** `--sim-replicates=N` on the command line overrides each design's replicate count. */
function replicatesOverride(): number | undefined {
  const arg = process.argv.find((a) => a.startsWith('--sim-replicates='));
  return arg ? Number(arg.slice('--sim-replicates='.length)) : undefined;
}

async function benchDesign(name: string, input: SimulationSpecInput, targetSeconds?: number): Promise<ThroughputResult> {
  const spec = simulationSpecSchema.parse({ ...input, replicates: replicatesOverride() ?? input.replicates });
  runReplicates(spec, 0, 0, Math.min(50, spec.replicates)); // warm-up: compile the hot paths
  floorSeconds({ ...spec, replicates: Math.min(200, spec.replicates) }); // warm-up

  const { seconds: floor, cpuSeconds: floorCpu } = floorSeconds(spec);
  const start = process.hrtime.bigint();
  const cpu = process.cpuUsage();
  const { blocks, peakHeap } = runChunked(spec, 0, spec.replicates);
  const results = aggregate(spec, blocks);
  const seconds = Number(process.hrtime.bigint() - start) / 1e9;
  const cpuSeconds = cpuSecondsSince(cpu);
  const fits = perFitUs(spec, Math.min(500, spec.replicates));
  const two = await twoThreads(spec);
  const difference = firstDifference(mergeBlocks(blocks), mergeBlocks(two.blocks));
  const rows = createSimulation(spec, 0).dataset.n;
  const none = results.none!;
  return {
    name,
    replicates: spec.replicates,
    rowsPerDataset: rows,
    analyses: spec.analyses.join(' '),
    seconds: round(seconds),
    floorSeconds: round(floor),
    cpuSeconds: round(cpuSeconds),
    floorCpuSeconds: round(floorCpu),
    replicatesPerSecond: Math.round(spec.replicates / seconds),
    timesFloor: round(seconds / floor, 1),
    twoThreadSeconds: round(two.seconds),
    twoThreadSecondsFromCpu: round(cpuSeconds / 2),
    twoThreadWallSeconds: round(two.wallSeconds),
    twoThreadReplicatesPerSecond: Math.round(spec.replicates / two.seconds),
    identicalAcrossThreads: difference === null,
    ...(difference !== null ? { firstDifference: difference } : {}),
    ...(targetSeconds !== undefined ? { targetSeconds, meetsTarget: two.seconds <= targetSeconds && seconds / floor <= 10 } : {}),
    perFitUs: Object.entries(fits).map(([k, v]) => `${k} ${v}`).join(', '),
    peakRssMb: Math.round(process.resourceUsage().maxRSS / 1024),
    peakHeapMb: Math.round(peakHeap / 2 ** 20),
    mixedTypeIError: round(none.mixed?.typeIError.value ?? NaN),
    olsTypeIError: round(none.ols?.typeIError.value ?? NaN),
    loadAverage: os.loadavg().map((x) => x.toFixed(1)).join(' '),
    cpus: os.cpus().length,
  };
}

export const throughput: Throughput[] = DESIGNS.map(({ name, spec, targetSeconds }) => ({ name, run: () => benchDesign(name, spec, targetSeconds) }));

if (!isMainThread && (workerData as WorkerJob | undefined)?.simBench) {
  const job = workerData as WorkerJob;
  runReplicates(job.spec, 0, job.from, Math.min(job.to, job.from + 50)); // warm-up, as on the main thread
  const start = process.hrtime.bigint();
  const { blocks } = runChunked(job.spec, job.from, job.to);
  const reply: WorkerReply = { blocks, seconds: Number(process.hrtime.bigint() - start) / 1e9 };
  parentPort!.postMessage(reply);
}
