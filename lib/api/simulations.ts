/**
 * What the simulations API sends back about a run: status, progress (replicates done, rate,
 * estimated seconds left) and, when done, the results keyed by scenario name and analysis with
 * each metric's value and Monte Carlo SE, and the summary sentences. `simulationDtoSchema` is the
 * one declaration of that shape (the OpenAPI document names it `Simulation`); `simulationDto`
 * builds it and is typed by it.
 */
import { z } from 'zod';
import { MORRIS_2019 } from '@/lib/citations';
import { SIMULATION_STATUSES } from '@/db/schema';
import type { Simulation } from '@/db/repositories/simulations';
import type { StoredResults } from '@/lib/jobs/engine';
import { METRIC_NAMES } from '@/lib/sim/metrics';

export interface Progress {
  replicatesDone: number;
  replicatesTotal: number;
  /** Replicates per second since the run started (null before the first chunk is stored). */
  replicatesPerSecond: number | null;
  /** Estimated seconds until done, at the rate so far (null when unknown or ended). */
  etaSeconds: number | null;
}

export function progressOf(run: Simulation, now = new Date()): Progress {
  const active = run.status === 'queued' || run.status === 'running';
  const end = run.finishedAt ?? now;
  const elapsed = run.startedAt ? (end.getTime() - run.startedAt.getTime()) / 1000 : 0;
  const rate = run.replicatesDone > 0 && elapsed > 0 ? run.replicatesDone / elapsed : null;
  const left = run.replicatesTotal - run.replicatesDone;
  return {
    replicatesDone: run.replicatesDone,
    replicatesTotal: run.replicatesTotal,
    replicatesPerSecond: rate === null ? null : Math.round(rate * 10) / 10,
    etaSeconds: active && rate ? Math.ceil(left / rate) : active ? null : 0,
  };
}

type ResultTable = StoredResults['results'];

/**
 * The results in the specification's order (scenarios, analyses) and the metrics' order: jsonb
 * keeps its own key order, and a reader expects the order they asked for.
 */
function ordered(results: ResultTable, spec: unknown): ResultTable {
  const s = spec as { scenarios?: { name?: string; violation: string }[]; analyses?: string[] } | null;
  const scenarioNames = (s?.scenarios ?? []).map((x) => x.name ?? x.violation);
  const analyses = s?.analyses ?? [];
  const sortBy = (keys: string[], order: readonly string[]) =>
    [...keys].sort((a, b) => (order.indexOf(a) === -1 ? Infinity : order.indexOf(a)) - (order.indexOf(b) === -1 ? Infinity : order.indexOf(b)));
  const out: ResultTable = {};
  for (const scenario of sortBy(Object.keys(results), scenarioNames)) {
    const byAnalysis = results[scenario]!;
    out[scenario] = {};
    for (const analysis of sortBy(Object.keys(byAnalysis), analyses)) {
      const metrics = byAnalysis[analysis]!;
      out[scenario][analysis] = Object.fromEntries(sortBy(Object.keys(metrics), METRIC_NAMES).map((m) => [m, metrics[m]!]));
    }
  }
  return out;
}

const iso = z.string().meta({ format: 'date-time' });

const metricSchema = z
  .object({ value: z.number().nullable(), mcse: z.number().nullable() })
  .meta({ id: 'SimulationMetric', description: `A performance measure and its Monte Carlo SE (${MORRIS_2019.short}); null where it cannot be computed.` });

export const simulationDtoSchema = z
  .object({
    id: z.uuid(),
    studyId: z.uuid().nullable(),
    revision: z.number().int().nullable(),
    status: z.enum(SIMULATION_STATUSES),
    progress: z.object({
      replicatesDone: z.number().int(),
      replicatesTotal: z.number().int(),
      replicatesPerSecond: z.number().nullable(),
      etaSeconds: z.number().nullable(),
    }),
    chunkCount: z.number().int(),
    error: z.string().nullable().meta({ description: 'Why the run failed, in plain words.' }),
    createdAt: iso,
    startedAt: iso.nullable(),
    finishedAt: iso.nullable(),
    spec: z.unknown().optional().meta({ description: 'The specification the run used (single run only).' }),
    results: z
      .record(z.string(), z.record(z.string(), z.record(z.string(), metricSchema)))
      .optional()
      .meta({
        description:
          'When done: results[scenario name][analysis][metric], e.g. results["none"]["mixed"]["typeIError"] = {"value": 0.051, "mcse": 0.005}.',
      }),
    summary: z.array(z.string()).optional().meta({ description: 'When done: plain-language sentences about the results.' }),
  })
  .meta({ id: 'Simulation' });
export type SimulationDto = z.output<typeof simulationDtoSchema>;

export function simulationDto(run: Simulation, options: { withSpec?: boolean; withResults?: boolean } = {}): SimulationDto {
  const stored = run.status === 'done' && options.withResults !== false ? (run.results as StoredResults | null) : null;
  return {
    id: run.id,
    studyId: run.studyId,
    revision: run.revisionNumber,
    status: run.status,
    progress: progressOf(run),
    chunkCount: run.chunkCount,
    error: run.error,
    createdAt: run.createdAt.toISOString(),
    startedAt: run.startedAt ? run.startedAt.toISOString() : null,
    finishedAt: run.finishedAt ? run.finishedAt.toISOString() : null,
    ...(options.withSpec ? { spec: run.spec } : {}),
    ...(stored ? { results: ordered(stored.results, run.spec), summary: stored.summary } : {}),
  };
}
