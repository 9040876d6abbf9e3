/**
 * Solving a cluster kind for its cluster size. Power rises with the members per cluster m but
 * only up to a plateau, its value as m → ∞, because the variation between clusters does not
 * shrink with more members: when the plateau is below the target no cluster size reaches it, and
 * the answer is the largest size with the clusters per arm that large clusters would need.
 * Shared by cluster-means.ts, cluster-proportions.ts and cluster-rates.ts.
 */

import { sizeFeasibilityWarning } from './output';
import { solveSize, type SizeSolution } from './solve';
import { formatNumber, SENTENCE_DIGITS } from '@/lib/format';

export const MAX_CLUSTER_SIZE = 1_000_000;
export const MAX_CLUSTERS_PER_ARM = 1_000_000;

export interface ClusterSizeSolution extends SizeSolution {
  /** Power as m → ∞ with the request's clusters per arm. */
  plateauPower: number;
  /** When no size is enough: the clusters per arm that reach the target with large clusters (null when none up to the maximum do). */
  clustersPerArmNeeded?: number | null;
  warnings: string[];
}

export interface ClusterSizeProblem {
  /** Power with m members per cluster (Infinity for the plateau) and the request's clusters per arm. */
  powerAt: (clusterSize: number) => number;
  /** Power with k clusters per arm of unlimited size. */
  plateauAt: (clustersPerArm: number) => number;
  clustersPerArm: number;
  target: number;
  /** Why power levels off, e.g. 'the variance between clusters remains (ICC 0.1)'. */
  why: string;
  /** The members, e.g. 'units per cluster'. */
  members: string;
}

/** The smallest m in [1, MAX_CLUSTER_SIZE] with powerAt(m) ≥ target, or the plateau's answer (see the file's comment). */
export function solveClusterSize({ powerAt, plateauAt, clustersPerArm, target, why, members }: ClusterSizeProblem): ClusterSizeSolution {
  const plateauPower = powerAt(Infinity);
  if (plateauPower >= target) {
    const s = solveSize(powerAt, target, 1, MAX_CLUSTER_SIZE);
    return { ...s, plateauPower, warnings: sizeFeasibilityWarning(s.feasibility, members, s.size, s.power, target) };
  }
  const needed = solveSize(plateauAt, target, 2, MAX_CLUSTERS_PER_ARM);
  const clustersPerArmNeeded = needed.feasibility === 'unreachable' ? null : needed.size;
  return {
    size: MAX_CLUSTER_SIZE,
    power: powerAt(MAX_CLUSTER_SIZE),
    feasibility: 'unreachable',
    plateauPower,
    clustersPerArmNeeded,
    warnings: [
      `With ${clustersPerArm} clusters per arm no cluster size reaches power ${formatNumber(target, SENTENCE_DIGITS)}: as clusters grow, power levels off at ` +
        `${formatNumber(plateauPower, SENTENCE_DIGITS)} because ${why}.` +
        (clustersPerArmNeeded !== null ? ` At least ${clustersPerArmNeeded} clusters per arm are needed, with large clusters.` : ''),
    ],
  };
}
