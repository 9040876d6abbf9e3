/**
 * The simulation engine (lib/sim) bound to the queue: parse a stored specification, compute one
 * chunk's replicates into bytes for simulation_chunks, and aggregate a finished run's chunks into
 * results and summary sentences.
 *
 * A chunk is `runReplicates(spec, scenario, from, to)` encoded with lib/jobs/codec.ts (bit-exact).
 * Aggregation decodes every chunk and hands them to `aggregate`, which merges each scenario's
 * blocks in replicate order and sums in that order, so the results are bit-identical however the
 * run was cut into chunks and whichever workers computed them.
 */
import { aggregate, createWorkspace, runReplicates, type ReplicateBlock, type Workspace } from '@/lib/sim/run';
import { summarise } from '@/lib/sim/summarise';
import { simulationSpecSchema, type SimulationSpec } from '@/lib/sim/spec';
import type { StoredChunk } from '@/db/repositories/simulations';
import { decodeResults, encodeResults } from './codec';
import type { Engine } from './handler';

/** The stored outcome of a finished run: results[scenario][analysis][metric] and the summary sentences. */
export interface StoredResults {
  results: Record<string, Record<string, Record<string, { value: number | null; mcse: number | null }>>>;
  summary: string[];
}

export function parseSpec(raw: unknown): SimulationSpec {
  return simulationSpecSchema.parse(raw);
}

/**
 * Workspaces (the scenario's layout and buffers, allocated once) of the last few scenarios this
 * thread computed, keyed by specification and scenario. Chunks of one run arrive one after
 * another, each with its own copy of the specification, so the copy that built the workspace is
 * kept and used.
 */
const workspaces = new Map<string, { spec: SimulationSpec; workspace: Workspace }>();
const MAX_WORKSPACES = 8;

function workspaceFor(spec: SimulationSpec, scenarioIndex: number): { spec: SimulationSpec; workspace: Workspace } {
  const key = `${scenarioIndex}:${JSON.stringify(spec)}`;
  let entry = workspaces.get(key);
  if (!entry) {
    entry = { spec, workspace: createWorkspace(spec, scenarioIndex) };
    workspaces.set(key, entry);
    if (workspaces.size > MAX_WORKSPACES) workspaces.delete(workspaces.keys().next().value!);
  }
  return entry;
}

/** Replicates [from, to) of one scenario, encoded for storage. */
export function computeChunkBytes(spec: SimulationSpec, scenarioIndex: number, from: number, to: number): Uint8Array {
  const entry = workspaceFor(spec, scenarioIndex);
  return encodeResults(runReplicates(entry.spec, scenarioIndex, from, to, entry.workspace));
}

/** Results and summary of a run from all its stored chunks. */
export function aggregateChunks(spec: SimulationSpec, chunks: StoredChunk[]): StoredResults {
  const blocks = chunks.map((c) => decodeResults(c.results) as ReplicateBlock);
  const results = aggregate(spec, blocks);
  return { results: results as StoredResults['results'], summary: summarise(spec, results) };
}

/** The engine computing on the calling thread (tests, and anything without a pool). */
export const inlineEngine: Engine<SimulationSpec> = {
  parseSpec,
  async computeChunk(spec, scenarioIndex, from, to) {
    return computeChunkBytes(spec, scenarioIndex, from, to);
  },
  aggregate: aggregateChunks,
};
