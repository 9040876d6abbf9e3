/**
 * The fixed layout of a simulated data set: which rows belong to which arm, cluster, unit and
 * occasion. It depends on the design only, so it is built once per specification and every
 * replicate refills the same arrays.
 *
 * Order of rows: arm 1's clusters, then arm 2's (or arm 1's units, then arm 2's, when there are
 * no clusters); within a cluster its units; within a unit its occasions in time order. Rows of a
 * cluster, and of a unit, are therefore contiguous, as `Dataset` requires. Cluster sizes follow
 * `clusterSizes` (the same sizes in both arms, increasing).
 */
import type { Dataset, Grouping } from '@/lib/models/types';
import type { SimulationDesign } from '@/lib/validation/simulations';
import { clusterSizes } from './cluster-sizes';

export interface Layout {
  /** Rows per data set. */
  n: number;
  /** Clusters in both arms (0 when units are independent). */
  clusterCount: number;
  /** Units (pupils, plants, volunteers) in both arms. */
  unitCount: number;
  /** Occasions per unit (1 without repeated measures). */
  occasions: number;
  /** Time of each occasion. */
  times: Float64Array;
  /** Arm of each unit: 0 for arm 1, 1 for arm 2. */
  armOfUnit: Uint8Array;
  /** Cluster of each unit (−1 without clusters). */
  clusterOfUnit: Int32Array;
  /** Units per cluster. */
  clusterSizes: Int32Array;
}

export function buildLayout(design: SimulationDesign): Layout {
  const occasions = design.occasions ?? 1;
  const times = Float64Array.from(design.times ?? Array.from({ length: occasions }, (_, t) => t));
  let armOfUnit: Uint8Array;
  let clusterOfUnit: Int32Array;
  let sizes: Int32Array;
  if (design.clustersPerArm !== undefined) {
    const perArm = clusterSizes(design.clustersPerArm, design.clusterSize ?? 1, design.clusterSizeCv);
    sizes = new Int32Array(2 * perArm.length);
    sizes.set(perArm, 0);
    sizes.set(perArm, perArm.length);
    const unitCount = sizes.reduce((s, m) => s + m, 0);
    armOfUnit = new Uint8Array(unitCount);
    clusterOfUnit = new Int32Array(unitCount);
    let unit = 0;
    sizes.forEach((m, cluster) => {
      for (let i = 0; i < m; i++, unit++) {
        clusterOfUnit[unit] = cluster;
        armOfUnit[unit] = cluster < perArm.length ? 0 : 1;
      }
    });
  } else {
    const units = design.unitsPerArm ?? 0;
    const [n1, n2] = typeof units === 'number' ? [units, units] : units;
    armOfUnit = new Uint8Array(n1 + n2);
    armOfUnit.fill(1, n1);
    clusterOfUnit = new Int32Array(n1 + n2).fill(-1);
    sizes = new Int32Array(0);
  }
  const unitCount = armOfUnit.length;
  return { n: unitCount * occasions, clusterCount: sizes.length, unitCount, occasions, times, armOfUnit, clusterOfUnit, clusterSizes: sizes };
}

/**
 * A data set with the layout's fixed columns filled (treat, time, groups) and room for the
 * outcome and the named covariates, which each replicate refills.
 */
export function allocateDataset(layout: Layout, covariates: readonly string[]): Dataset {
  const { n, occasions, unitCount, clusterCount } = layout;
  const treat = new Float64Array(n);
  const time = occasions > 1 ? new Float64Array(n) : undefined;
  const groups: Grouping[] = [];
  const clusterId = clusterCount > 0 ? new Int32Array(n) : undefined;
  const unitId = occasions > 1 ? new Int32Array(n) : undefined;
  for (let unit = 0, row = 0; unit < unitCount; unit++) {
    for (let t = 0; t < occasions; t++, row++) {
      treat[row] = layout.armOfUnit[unit]!;
      if (time) time[row] = layout.times[t]!;
      if (clusterId) clusterId[row] = layout.clusterOfUnit[unit]!;
      if (unitId) unitId[row] = unit;
    }
  }
  if (clusterId) groups.push({ name: 'cluster', id: clusterId, count: clusterCount });
  if (unitId) groups.push({ name: 'unit', id: unitId, count: unitCount });
  const dataset: Dataset = { n, y: new Float64Array(n), treat, groups };
  if (time) dataset.time = time;
  if (covariates.length > 0) dataset.covariates = Object.fromEntries(covariates.map((name) => [name, new Float64Array(n)]));
  return dataset;
}
