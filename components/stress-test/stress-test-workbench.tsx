'use client';

import { formatCount, formatDateTime, formatNumber } from '@/lib/format';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { usePathname, useSearchParams } from 'next/navigation';
import { useEffect, useState } from 'react';
import { Alert } from '@/components/ui/alert';
import { ApiError, apiFetch } from '@/lib/api/client';
import type { SimulationDto } from '@/lib/api/simulations';
import type { AnalysisName } from '@/lib/models/types';
import type { SimulationSpec, SimulationSpecInput } from '@/lib/sim/spec';
import { PastRuns } from './past-runs';
import { RunForm } from './run-form';
import { RunProgress } from './run-progress';
import { RunResults, type RunWithSpec } from './run-results';
import { SizeSweep } from './size-sweep';
import { sizeOf } from './sweep';

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
  /** The design's planned analysis in the stress test's names (lib/sim/from-design.ts), or null. */
  planned: AnalysisName | null;
  /** The design's target power. */
  targetPower: number;
}

const POLL_MS = 750;
const active = (r: SimulationDto | undefined) => r !== undefined && (r.status === 'queued' || r.status === 'running');
const message = (e: unknown) => (e instanceof ApiError ? e.message : 'The stress test could not be started. Try again.');

/** The Stress test tab's interactive part: the form, the current run's progress and results, the size sweep and the study's runs. */
export function StressTestWorkbench({ studyId, revision, base, analyses, canRun, initialRun, runs, sizeLabel, planned, targetPower }: StressTestWorkbenchProps) {
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
    // A run again of a shown run keeps that run's design revision; a new run from the form takes the current one.
    mutationFn: ({ spec, from = revision }: { spec: SimulationSpecInput; from?: number }) =>
      apiFetch<RunWithSpec>('/api/v1/simulations', { method: 'POST', json: { studyId, revision: from, spec } }),
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

  // While a run is under way, cancelled or failed, the last finished run stays in view below it.
  const lastDoneId = run && run.status !== 'done' ? ((list.data ?? runs).find((r) => r.status === 'done' && r.id !== run.id)?.id ?? null) : null;
  const lastDone = useQuery({
    queryKey: ['simulation', lastDoneId],
    queryFn: () => apiFetch<RunWithSpec>(`/api/v1/simulations/${lastDoneId}`),
    enabled: lastDoneId !== null,
  });
  const lastRun = lastDoneId !== null && lastDone.data?.id === lastDoneId && lastDone.data.studyId === studyId && lastDone.data.results ? lastDone.data : undefined;

  return (
    <div className="space-y-6">
      {canRun && base && <RunForm base={base} analyses={analyses} pending={start.isPending} onRun={(spec) => start.mutate({ spec })} />}
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
            {formatCount(sizeOf(run.spec))} {sizeLabel} · {formatCount(run.spec.replicates)} replicates per scenario · seed {run.spec.seed} · α = {formatNumber(run.spec.alpha)}
          </p>
          <RunProgress run={run} canCancel={canRun} cancelling={cancel.isPending} onCancel={() => cancel.mutate(run.id)} />
          {run.status === 'done' && run.results && (
            <RunResults
              run={run}
              planned={planned}
              targetPower={targetPower}
              starting={start.isPending}
              onMoreReplicates={canRun ? (replicates) => start.mutate({ spec: { ...run.spec, replicates }, from: run.revision ?? revision }) : undefined}
            />
          )}
        </section>
      )}
      {lastRun && (
        <section aria-labelledby="last-done-heading" className="space-y-4 rounded-lg border border-line bg-white p-5" data-testid="last-finished-run">
          <h2 id="last-done-heading" className="text-lg font-bold">
            Last finished run: design revision {lastRun.revision ?? '—'}
          </h2>
          <p className="text-sm text-muted">
            Started {formatDateTime(lastRun.createdAt)} ·{' '}
            {formatCount(sizeOf(lastRun.spec))} {sizeLabel} · {formatCount(lastRun.spec.replicates)} replicates per scenario
          </p>
          <RunResults run={lastRun} planned={planned} targetPower={targetPower} />
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

      <PastRuns studyId={studyId} runs={list.data ?? runs} shownId={run?.id ?? null} hrefFor={(id) => hrefWith({ run: id, sweep: null })} />
    </div>
  );
}
