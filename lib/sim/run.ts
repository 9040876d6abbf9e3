/**
 * Running replicates and aggregating them.
 *
 * `runReplicates(spec, s, from, to)` generates replicates from … to − 1 of scenario s, each
 * twice — under the planned effect (the alternative run) and at zero effect (the paired null
 * run), from two independent streams `Rng.forReplicate(seed, scenario, 'alternative' | 'null', r)`
 * — and fits every analysis of the specification to both. Results come back in compact typed
 * arrays, in replicate order, that can be stored and merged. Since each replicate owns its
 * streams, a replicate's result is the same whichever chunk, worker or order produced it, and
 * `aggregate` — which merges chunks in replicate order and sums in that order — gives
 * bit-identical results for any chunking.
 */
import { analyse as fitAnalysis, type AnalysisOptions } from '@/lib/models';
import type { AnalysisName, Dataset, EffectEstimate, FixedEffects } from '@/lib/models/types';
import { scenarioKey, type SimulationSpec } from './spec';
import { trueEffect } from './estimand';
import { createSimulation, generate, type Simulation } from './generate';
import { computeMetrics, type FitColumns, type Metrics } from './metrics';
import { Rng, type Hypothesis } from './rng';

/**
 * The analysis function: `analyse` of lib/models unless a workspace brings another. `options` are
 * the design's options for that analysis (`Simulation.analysisOptions`, e.g. the glmm's level).
 */
export type AnalyseFunction = (name: AnalysisName, data: Dataset, fixed: FixedEffects, options?: AnalysisOptions) => EffectEstimate;

/** The fits of replicates from … to − 1 of one scenario. Entry ((r − from)·A + a)·2 + h holds analysis a, hypothesis h (0 alternative, 1 null). */
export interface ReplicateBlock {
  scenario: string;
  analyses: AnalysisName[];
  from: number;
  to: number;
  estimate: Float64Array;
  se: Float64Array;
  df: Float64Array;
  /** 1 when the fit converged, else 0. */
  converged: Uint8Array;
}

/** What a worker allocates once per scenario and reuses for every chunk. */
export interface Workspace {
  scenarioIndex: number;
  simulation: Simulation;
  analyse: AnalyseFunction;
}

export function createWorkspace(spec: SimulationSpec, scenarioIndex: number, options: { analyse?: AnalyseFunction } = {}): Workspace {
  return { scenarioIndex, simulation: createSimulation(spec, scenarioIndex), analyse: options.analyse ?? fitAnalysis };
}

const HYPOTHESES: readonly Hypothesis[] = ['alternative', 'null'];

/** Runs replicates from … to − 1 (0 ≤ from ≤ to ≤ spec.replicates) of one scenario. */
export function runReplicates(spec: SimulationSpec, scenarioIndex: number, from: number, to: number, workspace?: Workspace): ReplicateBlock {
  if (!Number.isInteger(from) || !Number.isInteger(to) || from < 0 || to < from || to > spec.replicates) {
    throw new RangeError(`replicates must satisfy 0 ≤ from ≤ to ≤ ${spec.replicates}, got from ${from}, to ${to}`);
  }
  const ws = workspace ?? createWorkspace(spec, scenarioIndex);
  if (ws.scenarioIndex !== scenarioIndex || ws.simulation.spec !== spec) throw new RangeError('the workspace belongs to another specification or scenario');
  const { simulation, analyse } = ws;
  const analyses = spec.analyses;
  const size = (to - from) * analyses.length * 2;
  const block: ReplicateBlock = {
    scenario: simulation.scenarioName,
    analyses: [...analyses],
    from,
    to,
    estimate: new Float64Array(size),
    se: new Float64Array(size),
    df: new Float64Array(size),
    converged: new Uint8Array(size),
  };
  for (let r = from; r < to; r++) {
    for (let h = 0; h < 2; h++) {
      const hypothesis = HYPOTHESES[h]!;
      const rng = Rng.forReplicate(spec.seed, simulation.scenarioName, hypothesis, r);
      const data = generate(simulation, rng, hypothesis === 'alternative' ? spec.truth.effect : 0);
      for (let a = 0; a < analyses.length; a++) {
        const name = analyses[a]!;
        const fit = analyse(name, data, simulation.fixed, simulation.analysisOptions[name]);
        const k = ((r - from) * analyses.length + a) * 2 + h;
        block.estimate[k] = fit.estimate;
        block.se[k] = fit.se;
        block.df[k] = fit.df;
        block.converged[k] = fit.converged ? 1 : 0;
      }
    }
  }
  return block;
}

/**
 * Joins blocks of one scenario into one, in replicate order. The blocks may come in any order
 * but must cover a contiguous range without overlap.
 */
export function mergeBlocks(blocks: readonly ReplicateBlock[]): ReplicateBlock {
  if (blocks.length === 0) throw new RangeError('there are no blocks to merge');
  const sorted = [...blocks].sort((x, y) => x.from - y.from);
  const first = sorted[0]!;
  const names = first.analyses.join(',');
  sorted.forEach((b, i) => {
    if (b.scenario !== first.scenario || b.analyses.join(',') !== names) {
      throw new RangeError(`block ${b.from}–${b.to} belongs to another scenario or list of analyses`);
    }
    if (i > 0 && b.from !== sorted[i - 1]!.to) {
      throw new RangeError(`blocks must be contiguous: one ends at replicate ${sorted[i - 1]!.to}, the next starts at ${b.from}`);
    }
  });
  const size = sorted.reduce((s, b) => s + b.estimate.length, 0);
  const merged: ReplicateBlock = {
    scenario: first.scenario,
    analyses: [...first.analyses],
    from: first.from,
    to: sorted[sorted.length - 1]!.to,
    estimate: new Float64Array(size),
    se: new Float64Array(size),
    df: new Float64Array(size),
    converged: new Uint8Array(size),
  };
  let offset = 0;
  for (const b of sorted) {
    merged.estimate.set(b.estimate, offset);
    merged.se.set(b.se, offset);
    merged.df.set(b.df, offset);
    merged.converged.set(b.converged, offset);
    offset += b.estimate.length;
  }
  return merged;
}

/** The fits of analysis a under hypothesis h, in replicate order. */
function columnsOf(block: ReplicateBlock, a: number, h: number): FitColumns {
  const count = block.to - block.from;
  const stride = block.analyses.length * 2;
  const pick = <T extends Float64Array | Uint8Array>(source: T, target: T): T => {
    for (let i = 0; i < count; i++) target[i] = source[i * stride + a * 2 + h]!;
    return target;
  };
  return {
    estimate: pick(block.estimate, new Float64Array(count)),
    se: pick(block.se, new Float64Array(count)),
    df: pick(block.df, new Float64Array(count)),
    converged: pick(block.converged, new Uint8Array(count)),
  };
}

/** results[scenario][analysis][metric] = { value, mcse }. */
export type SimulationResults = Record<string, Partial<Record<AnalysisName, Metrics>>>;

/**
 * The measures of every scenario × analysis, from blocks of any scenarios in any order. Each
 * scenario's blocks must together cover replicates 0 … spec.replicates − 1. Bias and coverage
 * are measured against the true effect on each analysis's scale (`estimand.ts`).
 */
export function aggregate(spec: SimulationSpec, blocks: readonly ReplicateBlock[]): SimulationResults {
  const results: SimulationResults = {};
  for (const [index, scenario] of spec.scenarios.entries()) {
    const name = scenarioKey(scenario);
    const own = blocks.filter((b) => b.scenario === name);
    if (own.length === 0) throw new RangeError(`no replicates of scenario "${name}"`);
    const merged = mergeBlocks(own);
    if (merged.from !== 0 || merged.to !== spec.replicates) {
      throw new RangeError(`scenario "${name}" has replicates ${merged.from}–${merged.to}, not 0–${spec.replicates}`);
    }
    const simulation = createSimulation(spec, index);
    const byAnalysis: Partial<Record<AnalysisName, Metrics>> = {};
    merged.analyses.forEach((analysis, a) => {
      byAnalysis[analysis] = computeMetrics(columnsOf(merged, a, 0), columnsOf(merged, a, 1), trueEffect(simulation, analysis), spec.alpha);
    });
    results[name] = byAnalysis;
  }
  return results;
}
