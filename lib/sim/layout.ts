/**
 * The fixed layout of a simulated data set: which rows belong to which arm, cluster, unit and
 * occasion. It depends on the design only, so it is built once per specification and every
 * replicate refills the same arrays.
 *
 * Order of rows: block by block (when the design has blocks); within a block (or the study)
 * arm 1's clusters, then arm 2's (or arm 1's units, then arm 2's, when there are no clusters);
 * within a cluster its units; within a unit its occasions in time order. Rows of a block, a
 * cluster and a unit are therefore contiguous, as `Dataset` requires. Cluster sizes follow
 * `clusterSizes` (the same sizes in both arms and every block, increasing).
 *
 * A cross-over: the "arms" are the two sequences (arm 1 = sequence 1), the occasions are the
 * periods, and each row's treatment is its sequence's letter at that period (A = 0, B = 1);
 * `carried` marks the rows whose previous period had B.
 */
import type { Dataset, Grouping } from '@/lib/models/types';
import { defaultSequences, type SimulationDesign } from './spec';
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
  /** Blocks (0 without blocks), and the block of each unit (−1 without). */
  blockCount: number;
  blockOfUnit: Int32Array;
  /** Treatment (0 arm 1, 1 arm 2) of each row. */
  treatOfRow: Uint8Array;
  /** Cross-over: 1 for a row whose unit had arm 2 in the previous period; all 0 otherwise. */
  carriedOfRow: Uint8Array;
  /** Cross-over periods (0 otherwise; then they are the occasions). */
  periods: number;
}

/** Name of the indicator column of period k (k ≥ 2) of a cross-over. */
export function periodColumn(k: number): string {
  return `period${k}`;
}

export function buildLayout(design: SimulationDesign): Layout {
  const periods = design.crossover?.periods ?? 0;
  const occasions = periods > 0 ? periods : (design.occasions ?? 1);
  const times = Float64Array.from(design.times ?? Array.from({ length: occasions }, (_, t) => t));
  const blocks = design.blocks ?? 1;
  // One block's units: arm, cluster within the block (−1 without clusters).
  let blockArm: number[];
  let blockCluster: number[];
  let perBlockSizes: Int32Array;
  if (design.clustersPerArm !== undefined) {
    const perArm = clusterSizes(design.clustersPerArm, design.clusterSize ?? 1, design.clusterSizeCv);
    perBlockSizes = new Int32Array(2 * perArm.length);
    perBlockSizes.set(perArm, 0);
    perBlockSizes.set(perArm, perArm.length);
    blockArm = [];
    blockCluster = [];
    perBlockSizes.forEach((m, cluster) => {
      for (let i = 0; i < m; i++) {
        blockArm.push(cluster < perArm.length ? 0 : 1);
        blockCluster.push(cluster);
      }
    });
  } else {
    const units = design.unitsPerArm ?? 0;
    const [n1, n2] = typeof units === 'number' ? [units, units] : units;
    blockArm = Array.from({ length: n1 + n2 }, (_, u) => (u < n1 ? 0 : 1));
    blockCluster = blockArm.map(() => -1);
    perBlockSizes = new Int32Array(0);
  }
  const perBlock = blockArm.length;
  const clustersPerBlock = perBlockSizes.length;
  const unitCount = perBlock * blocks;
  const armOfUnit = new Uint8Array(unitCount);
  const clusterOfUnit = new Int32Array(unitCount);
  const blockOfUnit = new Int32Array(unitCount).fill(-1);
  const sizes = new Int32Array(clustersPerBlock * blocks);
  for (let b = 0; b < blocks; b++) {
    sizes.set(perBlockSizes, b * clustersPerBlock);
    for (let u = 0; u < perBlock; u++) {
      const unit = b * perBlock + u;
      armOfUnit[unit] = blockArm[u]!;
      clusterOfUnit[unit] = blockCluster[u]! < 0 ? -1 : b * clustersPerBlock + blockCluster[u]!;
      if (design.blocks !== undefined) blockOfUnit[unit] = b;
    }
  }
  const n = unitCount * occasions;
  const treatOfRow = new Uint8Array(n);
  const carriedOfRow = new Uint8Array(n);
  const sequences = periods > 0 ? (design.crossover!.sequences ?? defaultSequences(periods)) : undefined;
  for (let u = 0, row = 0; u < unitCount; u++) {
    for (let t = 0; t < occasions; t++, row++) {
      if (sequences) {
        const letters = sequences[armOfUnit[u]!]!;
        treatOfRow[row] = letters[t] === 'B' ? 1 : 0;
        carriedOfRow[row] = t > 0 && letters[t - 1] === 'B' ? 1 : 0;
      } else treatOfRow[row] = armOfUnit[u]!;
    }
  }
  return {
    n,
    clusterCount: sizes.length,
    unitCount,
    occasions,
    times,
    armOfUnit,
    clusterOfUnit,
    clusterSizes: sizes,
    blockCount: design.blocks ?? 0,
    blockOfUnit,
    treatOfRow,
    carriedOfRow,
    periods,
  };
}

/**
 * A data set with the layout's fixed columns filled (treat, time, groups) and room for the
 * outcome and the named covariates, which each replicate refills.
 */
export function allocateDataset(layout: Layout, covariates: readonly string[]): Dataset {
  const { n, occasions, unitCount, clusterCount, blockCount } = layout;
  const treat = Float64Array.from(layout.treatOfRow);
  const time = occasions > 1 ? new Float64Array(n) : undefined;
  const groups: Grouping[] = [];
  const blockId = blockCount > 0 ? new Int32Array(n) : undefined;
  const clusterId = clusterCount > 0 ? new Int32Array(n) : undefined;
  const unitId = occasions > 1 ? new Int32Array(n) : undefined;
  for (let unit = 0, row = 0; unit < unitCount; unit++) {
    for (let t = 0; t < occasions; t++, row++) {
      if (time) time[row] = layout.times[t]!;
      if (blockId) blockId[row] = layout.blockOfUnit[unit]!;
      if (clusterId) clusterId[row] = layout.clusterOfUnit[unit]!;
      if (unitId) unitId[row] = unit;
    }
  }
  if (blockId) groups.push({ name: 'block', id: blockId, count: blockCount });
  if (clusterId) groups.push({ name: 'cluster', id: clusterId, count: clusterCount });
  if (unitId) groups.push({ name: 'unit', id: unitId, count: unitCount });
  const dataset: Dataset = { n, y: new Float64Array(n), treat, groups };
  if (time) dataset.time = time;
  if (covariates.length > 0) {
    dataset.covariates = Object.fromEntries(covariates.map((name) => [name, new Float64Array(n)]));
    // The period indicators of a cross-over are part of the design: filled once here.
    for (let k = 2; k <= layout.periods; k++) {
      const column = dataset.covariates[periodColumn(k)];
      if (column) for (let row = k - 1; row < n; row += occasions) column[row] = 1;
    }
  }
  return dataset;
}
