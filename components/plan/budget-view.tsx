'use client';

import { useMemo, useState } from 'react';
import { CartesianGrid, Label, Line, LineChart, ReferenceLine, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import { RAUDENBUSH_1997 } from '@/lib/citations';
import { formatNumber } from '@/components/calculations/format';
import { costSummary } from './cost-summary';
import { ResultPanel } from '@/components/calculations/result-panel';
import { Alert } from '@/components/ui/alert';
import { axisStyle, CHART, chartMargin, sizeAxis } from './chart-style';
import { TextField } from '@/components/ui/field';
import { costCurve, costCurveSizes, niceTicks } from '@/lib/plan/sensitivity';
import { calculate } from '@/lib/stats/calculations';
import { CalculationInputError } from '@/lib/stats/calculations/errors';
import { clustersGrid } from '@/lib/stats/calculations/sensitivity';
import type { CalculationOutput } from '@/lib/stats/calculations/types';
import { calculationSchema, clusterMeansSchema, type CalculationRequest } from '@/lib/stats/calculations/request';

type ClusterRequest = Extract<CalculationRequest, { kind: 'cluster-means' }>;

export interface BudgetViewProps {
  /** The cluster-means calculation on screen, with its effect and target power filled in. */
  request: ClusterRequest;
  clusterWord: string;
  memberWord: string;
}

const { ink: INK, brand: BRAND } = CHART;

function toNumber(v: string): number | undefined {
  return v.trim() === '' ? undefined : Number(v);
}

/**
 * Optimal allocation under costs (Raudenbush 1997): costs per cluster and per unit give the
 * cluster size with the most information per unit of cost, then the clusters a budget buys (or
 * the budget the target needs), and the total cost of reaching the target at each cluster size.
 */
export default function BudgetView({ request, clusterWord, memberWord }: BudgetViewProps) {
  const [costPerCluster, setCostPerCluster] = useState('');
  const [costPerUnit, setCostPerUnit] = useState('');
  const [budget, setBudget] = useState('');

  const computed = useMemo(() => {
    const cc = toNumber(costPerCluster);
    const cu = toNumber(costPerUnit);
    if (cc === undefined || cu === undefined) return { state: 'empty' as const };
    const parsed = calculationSchema.safeParse({
      kind: 'optimal-allocation',
      icc: request.icc,
      costPerCluster: cc,
      costPerUnit: cu,
      ...(toNumber(budget) !== undefined ? { budget: toNumber(budget) } : {}),
      delta: request.delta,
      sd: request.sd,
      alpha: request.alpha,
      power: request.power,
      sides: request.sides,
    });
    if (!parsed.success) {
      return { state: 'error' as const, message: parsed.error.issues.map((i) => i.message).join(' ') };
    }
    try {
      const output: CalculationOutput = calculate(parsed.data);
      // One optimum on the card: the best whole cluster size of the calculation shown above.
      const optimum = Number(output.result.clusterSizeInteger);
      const sizes = costCurveSizes(optimum);
      const grid = clusterMeansSchema.parse({ ...request, cv: 0, solveFor: undefined });
      const cells = clustersGrid(grid, [request.icc], sizes);
      return { state: 'ok' as const, output, optimum, points: costCurve(cells, cc, cu) };
    } catch (e) {
      if (e instanceof CalculationInputError) return { state: 'error' as const, message: e.message };
      throw e;
    }
  }, [costPerCluster, costPerUnit, budget, request]);

  return (
    <section aria-labelledby="budget-heading" className="space-y-4 rounded-lg border border-line bg-white p-5">
      <div>
        <h3 id="budget-heading" className="text-base font-bold">
          Cluster size under a budget
        </h3>
        <p className="mt-1 text-sm text-muted">
          When recruiting a {clusterWord.replace(/s$/, '')} costs more than measuring one more of its {memberWord.split(' ')[0]}, fewer, larger clusters can be cheaper — up to a
          point, because members of one cluster resemble each other (ICC {formatNumber(request.icc)}). Enter the costs to see the cluster size with the most information per unit of cost
          ({RAUDENBUSH_1997.short}).
        </p>
      </div>
      <div className="grid gap-4 sm:grid-cols-3">
        <TextField label={`Cost per ${clusterWord.replace(/s$/, '')}`} help="Recruiting, training, travel: costs that come with each cluster." type="number" min={0} step="any" inputMode="decimal" value={costPerCluster} onChange={(e) => setCostPerCluster(e.target.value)} />
        <TextField label="Cost per unit" help={`Costs of measuring one more unit: one more of the ${memberWord}.`} type="number" min={0} step="any" inputMode="decimal" value={costPerUnit} onChange={(e) => setCostPerUnit(e.target.value)} />
        <TextField label="Budget (optional)" help="Leave empty to see the budget the target power needs." type="number" min={0} step="any" inputMode="decimal" value={budget} onChange={(e) => setBudget(e.target.value)} />
      </div>
      <div aria-live="polite" aria-atomic="true">
        {computed.state === 'empty' && <p className="text-sm text-muted">Enter both costs to work out the cluster size.</p>}
        {computed.state === 'error' && (
          <Alert live tone="error">
            {computed.message}
          </Alert>
        )}
      </div>
      {computed.state === 'ok' && (
        <>
          <ResultPanel output={computed.output} title="Cluster size for these costs" headingLevel={3} />
          <figure aria-labelledby="cost-curve-title" className="space-y-3">
            <figcaption className="space-y-1">
              <h4 id="cost-curve-title" className="text-sm font-bold">
                Total cost of reaching the target power, by {memberWord}
              </h4>
              <p className="text-sm" data-testid="cost-curve-summary">
                {costSummary(computed.points, computed.optimum, memberWord)}
              </p>
            </figcaption>
            <div aria-hidden="true" className="h-64 w-full">
              <ResponsiveContainer width="100%" height="100%">
                <LineChart data={computed.points.filter((p) => p.cost !== null)} margin={chartMargin} accessibilityLayer={false}>
                  <CartesianGrid stroke={CHART.grid} strokeDasharray="3 3" />
                  <XAxis dataKey="clusterSize" {...sizeAxis} ticks={niceTicks(computed.points[0]?.clusterSize ?? 1, computed.points.at(-1)?.clusterSize ?? 1)}>
                    <Label value={memberWord} position="insideBottom" offset={-16} fill={INK} fontSize={13} />
                  </XAxis>
                  <YAxis tickFormatter={(v: number) => formatNumber(v, 3)} {...axisStyle} width={64} />
                  <Tooltip formatter={(v) => [formatNumber(Number(v), 6), 'Total cost']} labelFormatter={(l) => `${l} ${memberWord}`} />
                  <ReferenceLine x={computed.optimum} stroke={BRAND} strokeDasharray="4 3">
                    <Label value="optimum" position="top" fill={BRAND} fontSize={12} />
                  </ReferenceLine>
                  <Line type="monotone" dataKey="cost" stroke={BRAND} strokeWidth={2.5} dot={false} isAnimationActive={false} />
                </LineChart>
              </ResponsiveContainer>
            </div>
            <details className="text-sm">
              <summary className="cursor-pointer font-semibold text-brand">Data behind the cost curve</summary>
              <table className="mt-2 w-full max-w-lg text-left">
                <caption className="sr-only">Clusters per arm and total cost at each cluster size</caption>
                <thead>
                  <tr className="border-b border-line">
                    <th scope="col" className="py-1 pr-3">
                      {memberWord.charAt(0).toUpperCase() + memberWord.slice(1)}
                    </th>
                    <th scope="col" className="py-1 pr-3 text-right">
                      {clusterWord.charAt(0).toUpperCase() + clusterWord.slice(1)} per arm
                    </th>
                    <th scope="col" className="py-1 text-right">
                      Total cost
                    </th>
                  </tr>
                </thead>
                <tbody>
                  {computed.points.map((p) => (
                    <tr key={p.clusterSize} className="border-b border-line/60">
                      <th scope="row" className="py-0.5 pr-3 font-normal tabular-nums">
                        {p.clusterSize}
                      </th>
                      <td className="py-0.5 pr-3 text-right tabular-nums">{p.clustersPerArm ?? '—'}</td>
                      <td className="py-0.5 text-right tabular-nums">{p.cost === null ? '—' : formatNumber(p.cost, 6)}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </details>
          </figure>
        </>
      )}
    </section>
  );
}
