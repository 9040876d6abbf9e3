/**
 * How a run is cut into chunks. A chunk is a range of replicates [from, to) of one scenario; its
 * size is chosen from an estimate of the run's cost so that one chunk is about
 * SIM_CHUNK_SECONDS of work (0.3 s by default): long enough that the queue's overhead per chunk
 * (a few milliseconds: claim, one transaction, complete) stays small, short enough that progress
 * moves smoothly, that the cores are shared fairly between runs and that a chunk lost with a killed
 * worker costs little to redo.
 *
 * The cost model is an estimate, not a measurement: µs per replicate ≈
 *   2 × (rows × (GENERATION_US_PER_ROW + Σₐ ANALYSIS_COST_US[a]) + Σₐ FIT_OVERHEAD_US[a]).
 * The constants were fitted roughly to timings of `runReplicates` on this 2-core machine
 * (designs of 100–1,000 rows, one analysis at a time, measured while other work shared the
 * cores, so they are high rather than low): closed-form least squares and its sandwich variants
 * are cheap and linear in the rows; the iterative fits (REML mixed model, Huber IRLS, GLM IRLS)
 * cost several passes and a fixed amount per fit. glm-nb and glmm from `npm run bench -- glmm`
 * (glmm's rows are those of a design whose rows all differ, e.g. a cross-over; clusters without
 * covariates merge into one pattern each and cost far less).
 * A wrong estimate changes only the chunk size, never the results: each replicate draws its own
 * random stream, so results do not depend on how the run is cut.
 */
import type { AnalysisName } from '@/lib/models/types';
import { rowsPerDataset as datasetRows, type SimulationSpec } from '@/lib/sim/spec';

/** Estimated µs per row per fit, by analysis. */
const ANALYSIS_COST_US: Record<AnalysisName, number> = {
  ols: 0.03,
  'ols-hc3': 0.05,
  'cluster-robust': 0.06,
  'cluster-means': 0.03,
  mixed: 0.25,
  huber: 0.2,
  'log-ols': 0.04,
  glm: 0.3,
  'glm-nb': 0.2,
  glmm: 5,
  'period-difference': 0.03,
};
/** Estimated µs per fit beyond the rows (iterations' set-up, small matrices). */
const FIT_OVERHEAD_US: Record<AnalysisName, number> = {
  ols: 5,
  'ols-hc3': 5,
  'cluster-robust': 10,
  'cluster-means': 5,
  mixed: 40,
  huber: 40,
  'log-ols': 5,
  glm: 40,
  'glm-nb': 60,
  glmm: 300,
  'period-difference': 5,
};
const GENERATION_US_PER_ROW = 0.12;

/** At most this many chunks per scenario, so that a huge run does not flood the queue. */
export const MAX_CHUNKS_PER_SCENARIO = 500;

/** Rows (observations) of one simulated data set of a valid specification. */
export function rowsPerDataset(design: SimulationSpec['design']): number {
  const rows = datasetRows(design);
  if (rows === undefined) throw new RangeError('The specification has neither clusters nor units per arm.');
  return rows;
}

/** Estimated seconds of one replicate (both hypotheses, every analysis). */
export function secondsPerReplicate(spec: SimulationSpec): number {
  const rows = rowsPerDataset(spec.design);
  const perRow = GENERATION_US_PER_ROW + spec.analyses.reduce((s, a) => s + ANALYSIS_COST_US[a], 0);
  const perFit = spec.analyses.reduce((s, a) => s + FIT_OVERHEAD_US[a], 0);
  return (2 * (rows * perRow + perFit)) / 1e6;
}

export function replicatesTotal(spec: SimulationSpec): number {
  return spec.replicates * spec.scenarios.length;
}

/** Replicates per chunk for about `targetSeconds` of work (within 1 … spec.replicates). */
export function chooseChunkSize(spec: SimulationSpec, targetSeconds: number): number {
  const bySpeed = Math.floor(targetSeconds / secondsPerReplicate(spec));
  const byCount = Math.ceil(spec.replicates / MAX_CHUNKS_PER_SCENARIO);
  return Math.min(spec.replicates, Math.max(1, bySpeed, byCount));
}

export interface ChunkPlan {
  scenarioIndex: number;
  chunkIndex: number;
  from: number;
  to: number;
}

/** Every chunk of the run, scenario by scenario, in replicate order. */
export function planChunks(spec: SimulationSpec, chunkSize: number): ChunkPlan[] {
  if (!Number.isInteger(chunkSize) || chunkSize < 1) throw new RangeError(`chunk size must be a whole number of at least 1, got ${chunkSize}`);
  const chunks: ChunkPlan[] = [];
  spec.scenarios.forEach((_, scenarioIndex) => {
    for (let from = 0, chunkIndex = 0; from < spec.replicates; from += chunkSize, chunkIndex++) {
      chunks.push({ scenarioIndex, chunkIndex, from, to: Math.min(spec.replicates, from + chunkSize) });
    }
  });
  return chunks;
}
