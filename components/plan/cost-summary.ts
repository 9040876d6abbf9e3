/**
 * The sentence under the budget view's cost curve. It names one optimum — the best whole cluster
 * size of the calculation above it (Raudenbush 1997, via lib/stats/calculations/optimal-allocation.ts)
 * — and the cost of reaching the target there; the curve's own lowest point can sit a few sizes
 * away only because clusters come in whole numbers, so the sentence says how flat the curve is
 * around the optimum instead of naming a second one.
 */
import { formatNumber } from '@/components/calculations/format';
import type { CostPoint } from '@/lib/plan/sensitivity';

/** Costs within this share of the cost at the optimum count as "almost the same" (common practice, not from a source). */
export const FLAT_SHARE = 0.05;

export function costSummary(points: readonly CostPoint[], best: number, memberWord: string): string {
  const ok = points.filter((p): p is CostPoint & { cost: number; clustersPerArm: number } => p.cost !== null);
  if (ok.length === 0) return 'No cluster size shown reaches the target power.';
  const atBest = ok.find((p) => p.clusterSize === best);
  if (!atBest) return `The best cluster size is ${best} ${memberWord}; it does not reach the target power within the allowed number of clusters.`;
  const near = ok.filter((p) => p.cost <= atBest.cost * (1 + FLAT_SHARE)).map((p) => p.clusterSize);
  const lo = Math.min(...near);
  const hi = Math.max(...near);
  return (
    `The best cluster size is ${best} ${memberWord}: reaching the target there takes ${atBest.clustersPerArm} per arm and costs ${formatNumber(atBest.cost, 6)} in all. ` +
    (hi > lo
      ? `The curve is flat around it: from ${lo} to ${hi} ${memberWord} the cost is within ${Math.round(FLAT_SHARE * 100)}% of that, because clusters come in whole numbers.`
      : 'Other sizes cost noticeably more.')
  );
}
