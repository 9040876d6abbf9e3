'use client';

import { useMemo, useState } from 'react';
import { RAUDENBUSH_1997 } from '@/lib/citations';
import { capitalise as cap } from '@/lib/format';
import { formatNumber, formatPercent } from '@/components/calculations/format';
import { costSummary } from './cost-summary';
import { ResultPanel } from '@/components/calculations/result-panel';
import { Alert } from '@/components/ui/alert';
import { TextField } from '@/components/ui/field';
import { costCurve, costCurveSizes, type CostPoint } from '@/lib/plan/sensitivity';
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

/** A few cluster sizes around the optimum to compare: from small to three times it. */
export function candidateSizes(optimum: number): number[] {
  const o = Math.max(1, Math.round(optimum));
  return [...new Set([2, o / 3, o / 2, (2 * o) / 3, o, 1.5 * o, 2 * o, 3 * o].map((m) => Math.max(2, Math.round(m))))].sort((a, b) => a - b);
}

/** Power of `request` with `clustersPerArm` clusters of `clusterSize`; null where it cannot be worked out. */
function powerAt(request: ClusterRequest, clusterSize: number, clustersPerArm: number | null): number | null {
  if (clustersPerArm === null || clustersPerArm < 2) return null;
  try {
    const out = calculate(clusterMeansSchema.parse({ ...request, cv: 0, clusterSize, clustersPerArm, power: undefined, solveFor: 'power' }));
    const p = out.result.power;
    return typeof p === 'number' ? p : null;
  } catch {
    return null;
  }
}

interface Candidate extends CostPoint {
  /** Power with the clusters the target needs (whole clusters: at or a little above the target). */
  power: number | null;
  /** With a budget: the clusters per arm it buys at this size and the power they give. */
  budgetClusters?: number;
  budgetPower?: number | null;
}

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
      const grid = clusterMeansSchema.parse({ ...request, cv: 0, solveFor: undefined });
      const points = costCurve(clustersGrid(grid, [request.icc], costCurveSizes(optimum)), cc, cu);
      const b = toNumber(budget);
      const candidates: Candidate[] = costCurve(clustersGrid(grid, [request.icc], [...new Set([...candidateSizes(optimum), optimum])].sort((x, y) => x - y)), cc, cu).map((p) => {
        const c: Candidate = { ...p, power: powerAt(request, p.clusterSize, p.clustersPerArm) };
        if (b !== undefined) {
          c.budgetClusters = Math.floor(b / (2 * (cc + p.clusterSize * cu)));
          c.budgetPower = powerAt(request, p.clusterSize, c.budgetClusters);
        }
        return c;
      });
      return { state: 'ok' as const, output, optimum, points, candidates, budget: b };
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
          <figure aria-labelledby="cost-curve-title" className="space-y-3" data-testid="budget-candidates">
            <figcaption className="space-y-1">
              <h4 id="cost-curve-title" className="text-sm font-bold">
                What each cluster size costs, and the power it gives
              </h4>
              <p className="text-sm" data-testid="cost-curve-summary">
                {costSummary(computed.points, computed.optimum, memberWord)}
              </p>
            </figcaption>
            <CandidateTable candidates={computed.candidates} optimum={computed.optimum} budget={computed.budget} clusterWord={clusterWord} memberWord={memberWord} target={request.power ?? 0.8} />
          </figure>
        </>
      )}
    </section>
  );
}

/**
 * The candidate cluster sizes as rows: the clusters each needs for the target power, the total
 * cost as a bar (the longest bar is the dearest size shown) and the power reached; with a budget,
 * the clusters the budget buys at that size and their power. The optimum is marked in words.
 */
function CandidateTable({ candidates, optimum, budget, clusterWord, memberWord, target }: { candidates: Candidate[]; optimum: number; budget: number | undefined; clusterWord: string; memberWord: string; target: number }) {
  const top = Math.max(...candidates.map((c) => c.cost ?? 0), budget ?? 0);
  return (
    <div className="overflow-x-auto" tabIndex={0} role="region" aria-label="Cost and power of each cluster size (scrolls sideways)">
      <table className="w-full min-w-[20rem] text-left text-sm">
        <caption className="sr-only">
          For each cluster size: {clusterWord} per arm for the target power of {formatPercent(target)}, the total cost and the power reached
          {budget !== undefined ? '; and the clusters and power the budget buys' : ''}
        </caption>
        <thead>
          <tr className="border-b border-line">
            <th scope="col" className="py-1 pr-3">
              {cap(memberWord)}
            </th>
            <th scope="col" className="py-1 pr-3 text-right">
              {cap(clusterWord)} per arm
            </th>
            <th scope="col" className="w-1/2 py-1 pr-3">
              Total cost for {formatPercent(target)} power
            </th>
            {budget !== undefined && (
              <th scope="col" className="py-1 text-right">
                Power within the budget
              </th>
            )}
          </tr>
        </thead>
        <tbody>
          {candidates.map((c) => {
            const best = c.clusterSize === optimum;
            return (
              <tr key={c.clusterSize} className={`border-b border-line/60 ${best ? 'bg-brand-light' : ''}`} data-optimum={best || undefined}>
                <th scope="row" className="py-1 pr-3 font-semibold tabular-nums">
                  {c.clusterSize}
                  {best && <span className="ml-2 text-xs font-semibold text-brand-dark">best</span>}
                </th>
                <td className="py-1 pr-3 text-right tabular-nums">{c.clustersPerArm ?? '—'}</td>
                <td className="py-1 pr-3">
                  {c.cost === null ? (
                    <span className="text-muted">target not reached</span>
                  ) : (
                    <span className="flex flex-col gap-0.5 sm:flex-row sm:items-center sm:gap-2">
                      <span aria-hidden="true" className={`block h-3 min-w-[0.5rem] rounded-sm ${best ? 'bg-brand-dark' : 'bg-brand'}`} style={{ width: `${Math.max(2, (60 * c.cost) / top).toFixed(1)}%` }} />
                      <span className="whitespace-nowrap tabular-nums">
                        {formatNumber(c.cost, 6)}
                        {c.power !== null && <span className="text-muted"> · {formatPercent(c.power)}</span>}
                      </span>
                    </span>
                  )}
                </td>
                {budget !== undefined && (
                  <td className="whitespace-nowrap py-1 text-right tabular-nums">
                    {c.budgetPower === null || c.budgetPower === undefined ? '—' : `${formatPercent(c.budgetPower)} (${c.budgetClusters} per arm)`}
                  </td>
                )}
              </tr>
            );
          })}
        </tbody>
      </table>
    </div>
  );
}
