/**
 * Cluster sizes that vary with a given coefficient of variation, by a fixed, documented rule, so
 * that every replicate of a simulation has the same layout (the data vary, the design does not).
 *
 * Rule: the k sizes of an arm follow a log-normal shape at evenly spaced probabilities,
 *   wⱼ = exp(σ·Φ⁻¹((j + ½)/k)),  j = 0 … k − 1,
 *   mⱼ = max(1, round(m · wⱼ / mean(w))),
 * with σ chosen (by bisection) so that the unrounded sizes m·wⱼ/mean(w) have exactly mean m and
 * coefficient of variation cv (population SD over mean, SD with divisor k). A log-normal shape
 * is the usual model for right-skewed cluster sizes (classes, practices, litters); Eldridge,
 * Ashby & Kerry (2006, Int J Epidemiol 35:1292) express the effect of unequal sizes through cv
 * alone, so the rule fixes cv and the mean and lets the shape be log-normal. Rounding to whole
 * numbers moves the realised mean and cv slightly (`describeSizes` reports them); sizes are
 * returned in increasing order.
 *
 * Valid range: k ≥ 1 whole, m ≥ 1, 0 ≤ cv with cv reachable by k sizes (a log-normal pattern of
 * k points has cv < √(k − 1); for k = 2 that is 1). Bad input or an unreachable cv: throws
 * RangeError saying what to change.
 */
import { normalQuantile } from '@/lib/stats/normal';

/** The population coefficient of variation of exp(σ·zⱼ). */
function patternCv(z: readonly number[], sigma: number): number {
  const w = z.map((zj) => Math.exp(sigma * zj));
  const mean = w.reduce((s, x) => s + x, 0) / w.length;
  const variance = w.reduce((s, x) => s + (x - mean) ** 2, 0) / w.length;
  return Math.sqrt(variance) / mean;
}

/** The largest σ tried; exp(40·Φ⁻¹(…)) stays finite for k up to 10⁶. */
const SIGMA_MAX = 40;

/** The unrounded sizes m·wⱼ/mean(w), increasing. */
export function unroundedClusterSizes(count: number, meanSize: number, cv: number): number[] {
  if (!Number.isInteger(count) || count < 1) throw new RangeError(`the number of clusters must be a whole number of at least 1, got ${count}`);
  if (!(meanSize >= 1) || !Number.isFinite(meanSize)) throw new RangeError(`the mean cluster size must be at least 1, got ${meanSize}`);
  if (!(cv >= 0) || !Number.isFinite(cv)) throw new RangeError(`the cluster-size CV must be a finite number of at least 0, got ${cv}`);
  if (cv === 0 || count === 1) {
    if (cv > 0) throw new RangeError(`a cluster-size CV above 0 needs at least 2 clusters per arm, got ${count}`);
    return new Array<number>(count).fill(meanSize);
  }
  const z = Array.from({ length: count }, (_, j) => normalQuantile((j + 0.5) / count));
  if (patternCv(z, SIGMA_MAX) <= cv) {
    throw new RangeError(`a cluster-size CV of ${cv} cannot be reached with ${count} clusters per arm; lower the CV or add clusters`);
  }
  let lo = 0;
  let hi = SIGMA_MAX;
  for (let i = 0; i < 200 && hi - lo > 1e-15 * hi; i++) {
    const mid = 0.5 * (lo + hi);
    if (patternCv(z, mid) < cv) lo = mid;
    else hi = mid;
  }
  const sigma = 0.5 * (lo + hi);
  const w = z.map((zj) => Math.exp(sigma * zj));
  const mean = w.reduce((s, x) => s + x, 0) / count;
  return w.map((x) => (meanSize * x) / mean);
}

/** The whole-number sizes of the rule above (each at least 1), increasing. */
export function clusterSizes(count: number, meanSize: number, cv: number): Int32Array {
  return Int32Array.from(unroundedClusterSizes(count, meanSize, cv), (x) => Math.max(1, Math.round(x)));
}

/** Realised mean and population CV of a list of sizes. */
export function describeSizes(sizes: ArrayLike<number>): { mean: number; cv: number; total: number } {
  let total = 0;
  for (let i = 0; i < sizes.length; i++) total += sizes[i]!;
  const mean = total / sizes.length;
  let ss = 0;
  for (let i = 0; i < sizes.length; i++) ss += (sizes[i]! - mean) ** 2;
  return { mean, cv: Math.sqrt(ss / sizes.length) / mean, total };
}
