/**
 * Sufficient statistics of a two-arm comparison (intercept + a 0/1 treat), for the closed-form
 * fast paths of ols, ols-hc3, cluster-robust and cluster-means.
 *
 * Two passes over the rows: the arm means first, then the sums of squared deviations from them
 * (the two-pass algorithm: no cancellation of large raw sums) and, when a grouping is given,
 * each cluster's size, arm and sum of residuals Σ(y − ȳ_arm).
 */
import { badGroupId } from './estimate';
import type { Grouping } from './types';

/** Rows and Σy per arm of a 0/1 treat: [n₀, n₁, Σy₀, Σy₁] written into `out`. */
export function armTotals(y: Float64Array, treat: Float64Array, n: number, out: Float64Array): void {
  let n1 = 0;
  let s0 = 0;
  let s1 = 0;
  for (let i = 0; i < n; i++) {
    if (treat[i] === 1) {
      n1++;
      s1 += y[i]!;
    } else s0 += y[i]!;
  }
  out[0] = n - n1;
  out[1] = n1;
  out[2] = s0;
  out[3] = s1;
}

const totals = new Float64Array(4);

export class TwoArmSums {
  n0 = 0;
  n1 = 0;
  mean0 = 0;
  mean1 = 0;
  /** Σ (y − ȳ_arm)² within each arm. */
  ss0 = 0;
  ss1 = 0;
  /**
   * Per cluster (after `compute` with a grouping): size, arm (0/1; −1 for an empty cluster, 1 for
   * a cluster spanning both arms), Σ(y − ȳ_arm).
   */
  clusterSize: Float64Array = new Float64Array(0);
  clusterArm: Int8Array = new Int8Array(0);
  clusterResidualSum: Float64Array = new Float64Array(0);
  clusters = 0;
  /** False when some cluster has rows in both arms (clusters not nested in arms). */
  nestedInArms = true;

  /** `treat` must be 0/1 (see design-matrix.isTwoArmComparison). */
  compute(y: Float64Array, treat: Float64Array, n: number, grouping?: Grouping): void {
    armTotals(y, treat, n, totals);
    const n0 = totals[0]!;
    const n1 = totals[1]!;
    const s0 = totals[2]!;
    const s1 = totals[3]!;
    const mean0 = s0 / n0;
    const mean1 = s1 / n1;
    let ss0 = 0;
    let ss1 = 0;
    // Correction terms of the corrected two-pass algorithm (Chan, Golub & LeVeque 1983, Am Stat
    // 37:242 — from memory): Σ(y − ȳ) is 0 in
    // exact arithmetic; subtracting its square / n removes the rounding of the mean.
    let c0 = 0;
    let c1 = 0;
    if (grouping) {
      const count = grouping.count;
      if (this.clusterSize.length < count) {
        this.clusterSize = new Float64Array(count);
        this.clusterArm = new Int8Array(count);
        this.clusterResidualSum = new Float64Array(count);
      }
      const size = this.clusterSize;
      const arm = this.clusterArm;
      const rsum = this.clusterResidualSum;
      size.fill(0, 0, count);
      arm.fill(-1, 0, count);
      rsum.fill(0, 0, count);
      const id = grouping.id;
      let nested = true;
      for (let i = 0; i < n; i++) {
        const g = id[i]!;
        if (!(g >= 0 && g < count)) badGroupId(grouping.name, i, g, count);
        const a = treat[i] === 1 ? 1 : 0;
        const d = y[i]! - (a === 1 ? mean1 : mean0);
        if (a === 1) {
          ss1 += d * d;
          c1 += d;
        } else {
          ss0 += d * d;
          c0 += d;
        }
        size[g]! += 1;
        rsum[g]! += d;
        if (arm[g] === -1) arm[g] = a;
        else if (arm[g] !== a) nested = false;
      }
      this.clusters = count;
      this.nestedInArms = nested;
    } else {
      for (let i = 0; i < n; i++) {
        if (treat[i] === 1) {
          const d = y[i]! - mean1;
          ss1 += d * d;
          c1 += d;
        } else {
          const d = y[i]! - mean0;
          ss0 += d * d;
          c0 += d;
        }
      }
      this.clusters = 0;
      this.nestedInArms = true;
    }
    if (grouping) {
      // The same correction for the clusters' residual sums.
      const k0 = c0 / n0;
      const k1 = c1 / n1;
      for (let g = 0; g < this.clusters; g++) {
        const a = this.clusterArm[g];
        if (a === 1) this.clusterResidualSum[g]! -= this.clusterSize[g]! * k1;
        else if (a === 0) this.clusterResidualSum[g]! -= this.clusterSize[g]! * k0;
      }
    }
    this.n0 = n0;
    this.n1 = n1;
    this.mean0 = mean0 + c0 / n0;
    this.mean1 = mean1 + c1 / n1;
    this.ss0 = ss0 - (c0 * c0) / n0;
    this.ss1 = ss1 - (c1 * c1) / n1;
  }
}
