/**
 * Small helpers shared by the analyses: the result of a fit that cannot be used, and the
 * grouping level an analysis clusters on.
 */
import type { Dataset, EffectEstimate, Grouping } from './types';

/** A replicate the analysis could not estimate (rank-deficient design, no residual df, …). */
export function notEstimable(): EffectEstimate {
  return { estimate: NaN, se: NaN, df: NaN, converged: false };
}

/**
 * The grouping level `level` (0 = outermost) of `data`. Throws a RangeError when the level does
 * not exist; the ids are checked where they are used.
 */
export function groupingAt(data: Dataset, level: number): Grouping {
  const g = data.groups[level];
  if (!g) {
    throw new RangeError(`the data set has ${data.groups.length} grouping level(s); level ${level} does not exist`);
  }
  return g;
}

/** Throws a RangeError for a group id outside 0 … count − 1 (row i of grouping `name`). */
export function badGroupId(name: string, i: number, id: number, count: number): never {
  throw new RangeError(`grouping "${name}": row ${i} has group id ${id}, outside 0 … ${count - 1}`);
}

let singletonIds: Int32Array = new Int32Array(0);

/** One group per observation. */
function singletons(n: number): Grouping {
  if (singletonIds.length < n) {
    singletonIds = new Int32Array(n);
    for (let i = 0; i < n; i++) singletonIds[i] = i;
  }
  return { name: 'observation', id: singletonIds.subarray(0, n), count: n };
}

/**
 * The clusters of cluster-robust and cluster-means: the groups at `level` (default 0, the
 * outermost), or one per observation when the data set has no grouping levels.
 */
export function clustersOf(data: Dataset, level: number | undefined): Grouping {
  if (data.groups.length === 0 && (level ?? 0) === 0) return singletons(data.n);
  return groupingAt(data, level ?? 0);
}
