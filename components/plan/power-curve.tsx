'use client';

import { CartesianGrid, Label, Line, LineChart, ReferenceLine, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import { formatPercent } from '@/components/calculations/format';
import { niceTicks } from '@/lib/plan/sensitivity';
import { axisStyle, CHART, chartMargin, sizeAxis } from './chart-style';

export interface PowerCurveProps {
  points: { size: number; power: number }[];
  /** What the size counts, e.g. 'classrooms per arm'. */
  sizeLabel: string;
  targetPower: number | null;
  /** The size the calculation gives (solved or entered). */
  chosen?: number;
  /** The size the design plans, when different. */
  planned?: number;
}

const { brand: BRAND, caution: CAUTION, ink: INK } = CHART;

/** "Power rises from 5.1% with 2 … to 97.8% with 56; 35 reach the target of 80%." */
export function powerCurveSummary({ points, sizeLabel, targetPower, chosen, planned }: PowerCurveProps): string {
  if (points.length === 0) return 'No power curve for these inputs.';
  const first = points[0]!;
  const last = points[points.length - 1]!;
  const at = (size: number | undefined) => (size === undefined ? undefined : points.find((p) => p.size === size));
  const parts = [`Power rises from ${formatPercent(first.power)} with ${first.size} ${sizeLabel} to ${formatPercent(last.power)} with ${last.size}.`];
  const c = at(chosen);
  if (c) parts.push(`With ${c.size} (this calculation) it is ${formatPercent(c.power)}${targetPower !== null ? `, against a target of ${formatPercent(targetPower)}` : ''}.`);
  const p = at(planned);
  if (p && p.size !== c?.size) parts.push(`With the ${p.size} the design plans it is ${formatPercent(p.power)}.`);
  return parts.join(' ');
}

/** Power against the size, with the target power and the chosen and planned sizes marked; a data table and a summary behind it. */
export default function PowerCurve(props: PowerCurveProps) {
  const { points, sizeLabel, targetPower, chosen, planned } = props;
  const summary = powerCurveSummary(props);
  const data = points.map((p) => ({ size: p.size, power: p.power * 100 }));
  return (
    <figure aria-labelledby="power-curve-title" className="space-y-3 rounded-lg border border-line bg-white p-5">
      <figcaption className="space-y-1">
        <h3 id="power-curve-title" className="text-base font-bold">
          Power against {sizeLabel}
        </h3>
        <p className="text-sm" data-testid="power-curve-summary">
          {summary}
        </p>
      </figcaption>
      <div aria-hidden="true" className="h-72 w-full">
        <ResponsiveContainer width="100%" height="100%">
          <LineChart data={data} margin={chartMargin} accessibilityLayer={false}>
            <CartesianGrid stroke={CHART.grid} strokeDasharray="3 3" />
            <XAxis dataKey="size" {...sizeAxis} ticks={points.length ? niceTicks(points[0]!.size, points[points.length - 1]!.size) : undefined}>
              <Label value={sizeLabel} position="insideBottom" offset={-16} fill={INK} fontSize={13} />
            </XAxis>
            <YAxis domain={[0, 100]} ticks={[0, 20, 40, 60, 80, 100]} tickFormatter={(v: number) => `${v}%`} {...axisStyle} width={48} />
            <Tooltip
              formatter={(v) => [formatPercent(Number(v) / 100), 'Power']}
              labelFormatter={(l) => `${l} ${sizeLabel}`}
              contentStyle={{ borderColor: '#cbd2dc', color: INK, fontSize: 13 }}
            />
            {targetPower !== null && (
              <ReferenceLine y={targetPower * 100} stroke={CAUTION} strokeDasharray="6 4" strokeWidth={1.5}>
                <Label value={`target ${formatPercent(targetPower)}`} position="insideTopLeft" fill={CAUTION} fontSize={12} />
              </ReferenceLine>
            )}
            {chosen !== undefined && (
              <ReferenceLine x={chosen} stroke={BRAND} strokeWidth={2}>
                <Label value={`${chosen}`} position="top" fill={BRAND} fontSize={12} fontWeight={700} />
              </ReferenceLine>
            )}
            {planned !== undefined && planned !== chosen && (
              <ReferenceLine x={planned} stroke={INK} strokeDasharray="2 3">
                <Label value={`planned ${planned}`} position="insideBottomRight" fill={INK} fontSize={12} />
              </ReferenceLine>
            )}
            <Line type="monotone" dataKey="power" stroke={BRAND} strokeWidth={2.5} dot={false} isAnimationActive={false} />
          </LineChart>
        </ResponsiveContainer>
      </div>
      <details className="text-sm">
        <summary className="cursor-pointer font-semibold text-brand">Data behind the power curve</summary>
        <table className="mt-2 w-full max-w-md text-left" data-testid="power-curve-table">
          <caption className="sr-only">Power for each number of {sizeLabel}</caption>
          <thead>
            <tr className="border-b border-line">
              <th scope="col" className="py-1 pr-3">
                {sizeLabel.charAt(0).toUpperCase() + sizeLabel.slice(1)}
              </th>
              <th scope="col" className="py-1 text-right">
                Power
              </th>
            </tr>
          </thead>
          <tbody>
            {points.map((p) => (
              <tr key={p.size} className="border-b border-line/60">
                <th scope="row" className="py-0.5 pr-3 font-normal tabular-nums">
                  {p.size}
                  {p.size === chosen ? ' (this calculation)' : p.size === planned ? ' (planned)' : ''}
                </th>
                <td className="py-0.5 text-right tabular-nums">{formatPercent(p.power)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </details>
    </figure>
  );
}
