/**
 * The function each worker thread runs (lib/jobs/pool.ts): one chunk of replicates, computed and
 * encoded for storage. Plain data in (the parsed specification and the replicate range), bytes
 * out.
 */
import type { SimulationSpec } from '@/lib/sim/spec';
import { computeChunkBytes } from './engine';

export interface ChunkTask {
  spec: SimulationSpec;
  scenarioIndex: number;
  from: number;
  to: number;
}

export default function runChunk(task: ChunkTask): Uint8Array {
  return computeChunkBytes(task.spec, task.scenarioIndex, task.from, task.to);
}
