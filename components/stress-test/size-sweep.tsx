'use client';

import { analysisLabel } from '@/lib/sim/analysis-words';
import { formatCount, formatPercent, plural } from '@/lib/format';
import { useQueries } from '@tanstack/react-query';
import { CartesianGrid, ErrorBar, Label, Legend, Line, LineChart, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import { axisStyle, CHART, chartMargin } from '@/components/plan/chart-style';
import { apiFetch } from '@/lib/api/client';
import type { SimulationDto } from '@/lib/api/simulations';
import type { SimulationSpec, SimulationSpecInput } from '@/lib/sim/spec';
import { scenarioKey } from '@/lib/sim/spec';
import { sizeOf, sweepScenario, sweepSpecs, SWEEP_FACTORS } from './sweep';
import { Button } from '@/components/ui/button';
import { progressText } from './run-progress';
import { describeScenario, formatMetric, formatRate, type MetricValue } from './words';

const SERIES_COLOURS = [CHART.brand, CHART.caution, '#1d6b3a', '#a61b1b', CHART.ink, '#5b3f8c', '#0f6b6b'];

export interface SizeSweepProps {
  run: SimulationDto & { spec: SimulationSpec };
  sweepIds: string[];
  sizeLabel: string;
  canRun: boolean;
  starting: boolean;
  error: string | null;
  onStart: (specs: SimulationSpecInput[]) => void;
}

/** "Run at other sizes" and the power curve by simulation: power of each analysis against the size, ±1.96 MC SE, with a table and summary. */
export function SizeSweep({ run, sweepIds, sizeLabel, canRun, starting, error, onStart }: SizeSweepProps) {
  const spec = run.spec;
  const scenario = sweepScenario(spec);
  const key = scenarioKey(scenario);
  const queries = useQueries({
    queries: sweepIds.map((id) => ({
      queryKey: ['simulation', id],
      queryFn: () => apiFetch<SimulationDto>(`/api/v1/simulations/${id}`),
      refetchInterval: (q: { state: { data?: SimulationDto } }) => (q.state.data && (q.state.data.status === 'queued' || q.state.data.status === 'running') ? 1000 : false),
    })),
  });
  const runs = queries.map((q) => q.data).filter((r): r is SimulationDto => Boolean(r));
  const pointsOf = (r: SimulationDto): { size: number; byAnalysis: Record<string, MetricValue> } | null => {
    const rs = (r as { spec?: SimulationSpec }).spec;
    const res = r.results?.[key];
    if (!rs || !res) return null;
    return { size: sizeOf(rs), byAnalysis: Object.fromEntries(Object.entries(res).map(([a, m]) => [a, m.power as MetricValue])) };
  };
  const own = pointsOf(run);
  const bySize = new Map<number, NonNullable<typeof own>>();
  for (const p of [own, ...runs.filter((r) => r.id !== run.id).map(pointsOf)]) if (p && !bySize.has(p.size)) bySize.set(p.size, p);
  const points = [...bySize.values()].sort((a, b) => a.size - b.size);
  const analyses = spec.analyses;
  const data = points.map((p) => {
    const row: Record<string, number | number[] | null> = { size: p.size };
    for (const a of analyses) {
      const m = p.byAnalysis[a];
      row[a] = m?.value !== null && m?.value !== undefined ? m.value * 100 : null;
      row[`${a}-err`] = m?.mcse !== null && m?.mcse !== undefined ? 1.96 * m.mcse * 100 : 0;
    }
    return row;
  });
  const pending = runs.filter((r) => r.status === 'queued' || r.status === 'running');
  const failed = runs.filter((r) => r.status === 'failed' || r.status === 'cancelled');
  const summary =
    points.length < 2
      ? null
      : analyses
          .map((a) => {
            const first = points[0]!.byAnalysis[a];
            const last = points[points.length - 1]!.byAnalysis[a];
            return `${analysisLabel(a)}: ${formatRate(first?.value)} with ${points[0]!.size} to ${formatRate(last?.value)} with ${points[points.length - 1]!.size}`;
          })
          .join('; ');

  return (
    <section aria-labelledby="sweep-heading" className="space-y-3 rounded-lg border border-line bg-white p-5">
      <h2 id="sweep-heading" className="text-lg font-bold">
        Power by simulation across sizes
      </h2>
      <p className="text-sm">
        Runs the scenario “{describeScenario(scenario)}” again with {SWEEP_FACTORS.map((f) => `${f}×`).join(', ')} the {sizeLabel} of this run ({sizeOf(spec)}), with the same
        analyses, {formatCount(spec.replicates)} replicates and seed, and plots the simulated power of each analysis against the size.
      </p>
      {canRun && sweepIds.length === 0 && (
        <Button onClick={() => onStart(sweepSpecs(spec).map((s) => s.spec))} disabled={starting}>
          {starting ? 'Starting…' : 'Run at other sizes'}
        </Button>
      )}
      {!canRun && sweepIds.length === 0 && <p className="text-sm text-muted">Your role can read stress tests but not start them.</p>}
      <div aria-live="polite" className="space-y-1 text-sm">
        {error && <p className="font-medium text-danger">{error}</p>}
        {pending.length > 0 && (
          <p>
            {plural(pending.length, 'run')} at other sizes in progress: {pending.map((r) => progressText(r.progress)).join('; ')}.
          </p>
        )}
        {failed.length > 0 && <p className="font-medium text-danger">{failed.length} of the runs at other sizes did not finish ({failed.map((r) => r.error ?? r.status).join('; ')}).</p>}
      </div>
      {points.length >= 2 && (
        <figure aria-labelledby="sweep-chart-title" className="space-y-2" data-testid="chart-power-by-size">
          <figcaption>
            <h3 id="sweep-chart-title" className="text-base font-bold">
              Simulated power against {sizeLabel}
            </h3>
            <p className="text-sm" data-testid="chart-power-by-size-summary">
              Power rises as follows — {summary}.
            </p>
          </figcaption>
          <div aria-hidden="true" className="h-72 w-full">
            <ResponsiveContainer width="100%" height="100%">
              <LineChart data={data} margin={chartMargin} accessibilityLayer={false}>
                <CartesianGrid stroke={CHART.grid} strokeDasharray="3 3" />
                <XAxis dataKey="size" type="number" domain={['dataMin', 'dataMax']} ticks={points.map((p) => p.size)} allowDecimals={false} {...axisStyle}>
                  <Label value={sizeLabel} position="insideBottom" offset={-16} fill={CHART.ink} fontSize={13} />
                </XAxis>
                <YAxis domain={[0, 100]} ticks={[0, 20, 40, 60, 80, 100]} tickFormatter={(v: number) => `${v}%`} width={48} {...axisStyle} />
                <Tooltip formatter={(v, n) => [formatPercent(Number(v) / 100), String(n)]} labelFormatter={(l) => `${l} ${sizeLabel}`} contentStyle={{ borderColor: CHART.grid, color: CHART.ink, fontSize: 13 }} />
                <Legend verticalAlign="top" wrapperStyle={{ color: CHART.ink, fontSize: 13 }} />
                {analyses.map((a, i) => (
                  <Line key={a} dataKey={a} name={analysisLabel(a)} stroke={SERIES_COLOURS[i % SERIES_COLOURS.length]} strokeWidth={2} isAnimationActive={false} connectNulls>
                    <ErrorBar dataKey={`${a}-err`} direction="y" width={5} stroke={SERIES_COLOURS[i % SERIES_COLOURS.length]} />
                  </Line>
                ))}
              </LineChart>
            </ResponsiveContainer>
          </div>
          <details className="text-sm">
            <summary className="cursor-pointer font-semibold text-brand">Data behind this chart</summary>
            <table className="mt-2 w-full text-left" data-testid="chart-power-by-size-table">
              <caption className="sr-only">Simulated power ± Monte Carlo SE of each analysis at each size</caption>
              <thead>
                <tr className="border-b border-line">
                  <th scope="col" className="py-1 pr-3">
                    {sizeLabel.charAt(0).toUpperCase() + sizeLabel.slice(1)}
                  </th>
                  {analyses.map((a) => (
                    <th key={a} scope="col" className="py-1 pr-3 text-right">
                      {analysisLabel(a)}
                    </th>
                  ))}
                </tr>
              </thead>
              <tbody>
                {points.map((p) => (
                  <tr key={p.size} className="border-b border-line/60">
                    <th scope="row" className="py-0.5 pr-3 font-normal tabular-nums">
                      {p.size}
                      {p.size === sizeOf(spec) ? ' (this run)' : ''}
                    </th>
                    {analyses.map((a) => (
                      <td key={a} className="py-0.5 pr-3 text-right tabular-nums">
                        {formatMetric(p.byAnalysis[a], true)}
                      </td>
                    ))}
                  </tr>
                ))}
              </tbody>
            </table>
          </details>
        </figure>
      )}
    </section>
  );
}
