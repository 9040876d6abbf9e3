'use client';

import { analysisLabel } from '@/lib/sim/analysis-words';
import { nounFor } from '@/lib/format';
import { CartesianGrid, ErrorBar, Label, ReferenceLine, ResponsiveContainer, Scatter, ScatterChart, Tooltip, XAxis, YAxis } from 'recharts';
import { axisStyle, CHART } from '@/components/plan/chart-style';
import { formatRate, type MetricValue } from './words';

export interface DotPoint {
  /** The scenario in a few words (the table and the form give its parameters). */
  scenarioLabel: string;
  analysis: string;
  metric: MetricValue;
}

export interface DotPlotProps {
  id: string;
  title: string;
  /** What the value is, e.g. 'False-positive rate'. */
  measure: string;
  points: DotPoint[];
  /** The value a correct analysis gives (0.05, 0.95), drawn as a line; none for power. */
  nominal?: number;
}

/** Half-width of the Monte Carlo error bar: 1.96 MC SE. */
const Z = 1.96;

function interval(m: MetricValue): [number, number] | null {
  if (m.value === null || !Number.isFinite(m.value)) return null;
  const h = m.mcse !== null && Number.isFinite(m.mcse) ? Z * m.mcse : 0;
  return [Math.max(0, m.value - h), Math.min(1, m.value + h)];
}

/**
 * "Nominal 5%. Outside ±1.96 MC SE of it: ols with assumptions hold (25.3%). Within it: mixed, …"
 * For power (no nominal value): the highest and the lowest.
 */
export function dotPlotSummary({ measure, points, nominal }: DotPlotProps): string {
  const shown = points.filter((p) => interval(p.metric) !== null);
  if (shown.length === 0) return `No ${measure.toLowerCase()} to show.`;
  const name = (p: DotPoint) => `${analysisLabel(p.analysis)} (${p.scenarioLabel}): ${formatRate(p.metric.value)}`;
  if (nominal === undefined) {
    const byValue = [...shown].sort((a, b) => (b.metric.value ?? 0) - (a.metric.value ?? 0));
    const hi = byValue[0]!;
    const lo = byValue[byValue.length - 1]!;
    return hi === lo ? `${measure}: ${name(hi)}.` : `${measure} ranges from ${name(lo)} to ${name(hi)}.`;
  }
  const off = shown.filter((p) => {
    const [a, b] = interval(p.metric)!;
    return nominal < a || nominal > b;
  });
  const head = `${measure} against the nominal ${formatRate(nominal)}, with ±1.96 Monte Carlo SE.`;
  if (off.length === 0) return `${head} Every analysis is within its Monte Carlo error of ${formatRate(nominal)}.`;
  return `${head} Away from ${formatRate(nominal)} by more than the Monte Carlo error: ${off.map(name).join('; ')}. The other ${shown.length - off.length} ${nounFor(shown.length - off.length, 'is', 'are')} within it.`;
}

/** A dot per scenario × analysis with its ±1.96 MC SE bar, against a nominal line; a summary and a data table behind it. */
export default function DotPlot(props: DotPlotProps) {
  const { id, title, measure, points, nominal } = props;
  const single = new Set(points.map((p) => p.scenarioLabel)).size === 1;
  const data = points
    .filter((p) => interval(p.metric) !== null)
    .map((p) => {
      const v = p.metric.value!;
      const [lo, hi] = interval(p.metric)!;
      return { label: single ? analysisLabel(p.analysis) : `${analysisLabel(p.analysis)} · ${p.scenarioLabel}`, value: v * 100, error: [(v - lo) * 100, (hi - v) * 100] };
    });
  const lows = data.map((d) => d.value - d.error[0]!);
  const highs = data.map((d) => d.value + d.error[1]!);
  const lo = Math.max(0, Math.floor(Math.min(...lows, nominal !== undefined ? nominal * 100 : 100) / 5) * 5 - 5);
  const hi = Math.min(100, Math.ceil(Math.max(...highs, nominal !== undefined ? nominal * 100 : 0) / 5) * 5 + 5);
  const height = 74 + 34 * Math.max(1, data.length);
  return (
    <figure aria-labelledby={`${id}-title`} className="space-y-3 rounded-lg border border-line bg-white p-5" data-testid={`chart-${id}`}>
      <figcaption className="space-y-1">
        <h3 id={`${id}-title`} className="text-base font-bold">
          {title}
        </h3>
        <p className="text-sm" data-testid={`chart-${id}-summary`}>
          {dotPlotSummary(props)}
        </p>
      </figcaption>
      <div aria-hidden="true" className="w-full" style={{ height }}>
        <ResponsiveContainer width="100%" height="100%">
          <ScatterChart margin={{ top: 24, right: 24, bottom: 28, left: 12 }} accessibilityLayer={false}>
            <CartesianGrid stroke={CHART.grid} strokeDasharray="3 3" />
            <XAxis type="number" dataKey="value" domain={[lo, hi]} tickFormatter={(v: number) => `${v}%`} {...axisStyle}>
              <Label value={measure} position="insideBottom" offset={-16} fill={CHART.ink} fontSize={13} />
            </XAxis>
            <YAxis type="category" dataKey="label" width={single ? 110 : 240} interval={0} {...axisStyle} />
            <Tooltip
              cursor={false}
              formatter={(v, _n, item) => {
                const e = (item?.payload as { error?: number[] } | undefined)?.error;
                return [`${Number(v).toFixed(1)}%${e ? ` (bar ${(Number(v) - e[0]!).toFixed(1)}–${(Number(v) + e[1]!).toFixed(1)}%)` : ''}`, measure];
              }}
              contentStyle={{ borderColor: CHART.grid, color: CHART.ink, fontSize: 13 }}
            />
            {nominal !== undefined && (
              <ReferenceLine x={nominal * 100} stroke={CHART.caution} strokeDasharray="6 4" strokeWidth={1.5}>
                <Label value={`nominal ${formatRate(nominal)}`} position="top" fill={CHART.caution} fontSize={12} />
              </ReferenceLine>
            )}
            <Scatter data={data} fill={CHART.brand} isAnimationActive={false}>
              <ErrorBar dataKey="error" direction="x" width={6} stroke={CHART.ink} strokeWidth={1.5} />
            </Scatter>
          </ScatterChart>
        </ResponsiveContainer>
      </div>
      <details className="text-sm">
        <summary className="cursor-pointer font-semibold text-brand">Data behind this chart</summary>
        <table className="mt-2 w-full max-w-2xl text-left" data-testid={`chart-${id}-table`}>
          <caption className="sr-only">{measure} of each analysis in each scenario, with the Monte Carlo interval</caption>
          <thead>
            <tr className="border-b border-line">
              <th scope="col" className="py-1 pr-3">
                Scenario
              </th>
              <th scope="col" className="py-1 pr-3">
                Analysis
              </th>
              <th scope="col" className="py-1 pr-3 text-right">
                {measure}
              </th>
              <th scope="col" className="py-1 text-right">
                ±1.96 MC SE
              </th>
            </tr>
          </thead>
          <tbody>
            {points.map((p) => {
              const iv = interval(p.metric);
              return (
                <tr key={`${p.scenarioLabel}/${p.analysis}`} className="border-b border-line/60">
                  <td className="py-0.5 pr-3">{p.scenarioLabel}</td>
                  <th scope="row" className="py-0.5 pr-3 font-normal">
                    {analysisLabel(p.analysis)}
                  </th>
                  <td className="py-0.5 pr-3 text-right tabular-nums">{formatRate(p.metric.value)}</td>
                  <td className="py-0.5 text-right tabular-nums">{iv ? `${formatRate(iv[0])} to ${formatRate(iv[1])}` : '—'}</td>
                </tr>
              );
            })}
          </tbody>
        </table>
      </details>
    </figure>
  );
}
