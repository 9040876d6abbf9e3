'use client';

import { formatDateTime } from '@/lib/format';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import dynamic from 'next/dynamic';
import { usePathname, useSearchParams } from 'next/navigation';
import { useEffect, useState } from 'react';
import { Alert } from '@/components/ui/alert';
import { ApiError, apiFetch } from '@/lib/api/client';
import type { SimulationDto } from '@/lib/api/simulations';
import type { AnalysisName } from '@/lib/models/types';
import { scenarioKey, type SimulationSpec, type SimulationSpecInput } from '@/lib/sim/spec';
import { PastRuns } from './past-runs';
import { ResultsTable, type ResultRow } from './results-table';
import { RunForm } from './run-form';
import { RunProgress } from './run-progress';
import { SizeSweep } from './size-sweep';
import { sizeOf } from './sweep';
import { describeScenario, VIOLATION_TITLES, type MetricValue } from './words';

const DotPlot = dynamic(() => import('./dot-plot'), { ssr: false, loading: () => <p className="text-sm text-muted">Drawing the chart…</p> });

type RunWithSpec = SimulationDto & { spec: SimulationSpec };

export interface StressTestWorkbenchProps {
  studyId: string;
  revision: number;
  /** The specification from the design, or null when the design cannot be simulated yet. */
  base: SimulationSpec | null;
  analyses: AnalysisName[];
  canRun: boolean;
  /** The run shown when the page opened (from ?run=…, else the newest), with its results. */
  initialRun: RunWithSpec | null;
  runs: SimulationDto[];
  sizeLabel: string;
}

const POLL_MS = 750;
const active = (r: SimulationDto | undefined) => r !== undefined && (r.status === 'queued' || r.status === 'running');
const message = (e: unknown) => (e instanceof ApiError ? e.message : 'The stress test could not be started. Try again.');

/** The rows of the results table: scenario × analysis in the specification's order. */
function rowsOf(run: RunWithSpec): ResultRow[] {
  const rows: ResultRow[] = [];
  for (const s of run.spec.scenarios) {
    const byAnalysis = run.results?.[scenarioKey(s)];
    if (!byAnalysis) continue;
    for (const [analysis, metrics] of Object.entries(byAnalysis)) {
      rows.push({ scenario: scenarioKey(s), scenarioLabel: describeScenario(s), shortLabel: s.name ?? VIOLATION_TITLES[s.violation], analysis, metrics: metrics as Record<string, MetricValue> });
    }
  }
  return rows;
}

/** The Stress test tab's interactive part: the form, the current run's progress and results, the size sweep and the study's runs. */
export function StressTestWorkbench({ studyId, revision, base, analyses, canRun, initialRun, runs, sizeLabel }: StressTestWorkbenchProps) {
  const pathname = usePathname();
  const params = useSearchParams();
  const client = useQueryClient();
  const runId = params.get('run') ?? initialRun?.id ?? null;
  const sweepIds = (params.get('sweep') ?? '').split(',').filter((x) => /^[0-9a-f-]{36}$/i.test(x));
  const [startError, setStartError] = useState<string | null>(null);
  const [sweepError, setSweepError] = useState<string | null>(null);

  const hrefWith = (changes: Record<string, string | null>) => {
    const next = new URLSearchParams(params.toString());
    for (const [k, v] of Object.entries(changes)) {
      if (v === null) next.delete(k);
      else next.set(k, v);
    }
    return `${pathname}?${next.toString()}`;
  };

  const list = useQuery({
    queryKey: ['simulations', studyId],
    queryFn: async () => (await apiFetch<{ items: SimulationDto[] }>(`/api/v1/studies/${studyId}/simulations`)).items,
    initialData: runs,
    refetchInterval: (q) => (q.state.data?.some(active) ? 2000 : false),
  });

  const current = useQuery({
    queryKey: ['simulation', runId],
    queryFn: () => apiFetch<RunWithSpec>(`/api/v1/simulations/${runId}`),
    enabled: runId !== null,
    initialData: initialRun && initialRun.id === runId ? initialRun : undefined,
    refetchInterval: (q) => (active(q.state.data) ? POLL_MS : false),
  });
  // A run of another study (a hand-edited ?run=…) is not shown here.
  const run = current.data?.studyId === studyId ? current.data : undefined;
  // When the shown run ends, the list of runs changes status too.
  const runStatus = run?.status;
  useEffect(() => {
    if (runStatus && runStatus !== 'queued' && runStatus !== 'running') void client.invalidateQueries({ queryKey: ['simulations', studyId] });
  }, [runStatus, client, studyId]);

  const start = useMutation({
    mutationFn: (spec: SimulationSpecInput) => apiFetch<RunWithSpec>('/api/v1/simulations', { method: 'POST', json: { studyId, revision, spec } }),
    onMutate: () => setStartError(null),
    onSuccess: (created) => {
      client.setQueryData(['simulation', created.id], created);
      void client.invalidateQueries({ queryKey: ['simulations', studyId] });
      window.history.replaceState(null, '', hrefWith({ run: created.id, sweep: null }));
    },
    onError: (e) => setStartError(message(e)),
  });

  const cancel = useMutation({
    mutationFn: (id: string) => apiFetch<RunWithSpec>(`/api/v1/simulations/${id}`, { method: 'DELETE' }),
    onSuccess: (ended) => {
      client.setQueryData(['simulation', ended.id], ended);
      void client.invalidateQueries({ queryKey: ['simulations', studyId] });
    },
  });

  const sweep = useMutation({
    mutationFn: async (specs: SimulationSpecInput[]) => {
      const ids: string[] = [];
      for (const spec of specs) {
        try {
          const created = await apiFetch<RunWithSpec>('/api/v1/simulations', { method: 'POST', json: { studyId, revision: run?.revision ?? revision, spec } });
          client.setQueryData(['simulation', created.id], created);
          ids.push(created.id);
        } catch (e) {
          if (ids.length === 0) throw e;
          setSweepError(`${ids.length} of ${specs.length} runs started: ${message(e)}`);
          break;
        }
      }
      return ids;
    },
    onMutate: () => setSweepError(null),
    onSuccess: (ids) => {
      void client.invalidateQueries({ queryKey: ['simulations', studyId] });
      // Pin the shown run: the sweep's runs are newer, and the page otherwise shows the newest.
      window.history.replaceState(null, '', hrefWith({ run: run?.id ?? null, sweep: ids.join(',') }));
    },
    onError: (e) => setSweepError(message(e)),
  });

  const rows = run?.status === 'done' && run.results ? rowsOf(run) : [];
  const pointsOf = (metric: string) => rows.map((r) => ({ scenarioLabel: r.shortLabel, analysis: r.analysis, metric: r.metrics[metric] ?? { value: null, mcse: null } }));
  const alpha = run?.spec.alpha ?? 0.05;

  return (
    <div className="space-y-6">
      {canRun && base && <RunForm base={base} analyses={analyses} pending={start.isPending} onRun={(spec) => start.mutate(spec)} />}
      {!canRun && (
        <Alert tone="info" title="Read-only">
          Your role on this study can read stress tests but not run them. Owners, editors and methods consultants can start one.
        </Alert>
      )}
      <div aria-live="polite">{startError && <Alert live tone="error">{startError}</Alert>}</div>

      {run && (
        <section aria-labelledby="current-heading" className="space-y-4 rounded-lg border border-line bg-white p-5">
          <h2 id="current-heading" className="text-lg font-bold">
            Stress test of design revision {run.revision ?? '—'}
          </h2>
          <p className="text-sm text-muted">
            Started {formatDateTime(run.createdAt)} ·{' '}
            {sizeOf(run.spec).toLocaleString('en-GB')} {sizeLabel} · {run.spec.replicates.toLocaleString('en-GB')} replicates per scenario · seed {run.spec.seed} · α = {run.spec.alpha}
          </p>
          <RunProgress run={run} canCancel={canRun} cancelling={cancel.isPending} onCancel={() => cancel.mutate(run.id)} />
          {run.status === 'done' && (
            <div className="space-y-4">
              <div aria-labelledby="summary-heading" role="region" className="rounded-md border-l-4 border-brand bg-brand-light px-4 py-3 text-sm">
                <h3 id="summary-heading" className="font-bold">
                  What the simulation shows
                </h3>
                {run.summary && run.summary.length > 0 ? (
                  <ul className="mt-1 list-disc space-y-1 pl-5" data-testid="summary-sentences">
                    {run.summary.map((s) => (
                      <li key={s}>{s}</li>
                    ))}
                  </ul>
                ) : (
                  <p className="mt-1" data-testid="summary-sentences">
                    Every analysis kept its promised false-positive rate, coverage, bias and standard error within about 3 Monte Carlo SEs.
                  </p>
                )}
              </div>
              <ResultsTable rows={rows} replicates={run.spec.replicates} alpha={alpha} />
              <div className="grid gap-4 xl:grid-cols-2">
                <DotPlot id="false-positive" title={`False-positive rate against the nominal ${Math.round(alpha * 100)}%`} measure="False-positive rate" points={pointsOf('typeIError')} nominal={alpha} />
                <DotPlot id="coverage" title={`Coverage of the ${Math.round((1 - alpha) * 100)}% confidence interval`} measure="Coverage" points={pointsOf('coverage')} nominal={1 - alpha} />
                <DotPlot id="power" title="Power at the planned effect" measure="Power" points={pointsOf('power')} />
              </div>
            </div>
          )}
        </section>
      )}
      {current.isError && <Alert tone="error">{message(current.error)}</Alert>}

      {run?.status === 'done' && run.studyId === studyId && (
        <SizeSweep
          run={run}
          sweepIds={sweepIds}
          sizeLabel={sizeLabel}
          canRun={canRun}
          starting={sweep.isPending}
          error={sweepError}
          onStart={(specs) => sweep.mutate(specs)}
        />
      )}

      <PastRuns runs={list.data ?? runs} shownId={run?.id ?? null} hrefFor={(id) => hrefWith({ run: id, sweep: null })} />
    </div>
  );
}
