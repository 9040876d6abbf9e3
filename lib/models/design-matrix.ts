/**
 * The fixed-effect design matrix of an analysis, built from a `Dataset` and its `FixedEffects`.
 *
 * Columns, in this order (the order of R's `y ~ treat + x1 + … + time + treat:time`):
 *   intercept, treat, the named covariates, time (when `includeTime` or the target is
 *   `treat:time`), treat × time (when the target is `treat:time`).
 * The effect of interest is the column of `treat` or of `treat:time` (`target`).
 *
 * Throws a RangeError when a named covariate or the time column is missing, or when y, treat or
 * a named column has fewer than `n` values. Does not check the rank: the least-squares routines report that.
 */
import type { Dataset, FixedEffects } from './types';

export interface DesignMatrix {
  /** Column-major n × p (entry (i, j) at i + j·n); the array may be longer than n·p. */
  x: Float64Array;
  n: number;
  p: number;
  /** Column names, R-style ('(Intercept)', 'treat', covariates, 'time', 'treat:time'). */
  names: string[];
  /** Index of the column whose coefficient is the effect of interest. */
  target: number;
}

function checkColumn(name: string, column: Float64Array | undefined, n: number): Float64Array {
  if (!column) throw new RangeError(`the data set has no column "${name}"`);
  if (column.length < n) throw new RangeError(`column "${name}" has ${column.length} values, expected ${n}`);
  return column;
}

/** The column names of the design matrix of `fixed`, in order. */
export function designColumnNames(fixed: FixedEffects): string[] {
  const names = ['(Intercept)', 'treat', ...fixed.covariates];
  if (fixed.includeTime || fixed.target === 'treat:time') names.push('time');
  if (fixed.target === 'treat:time') names.push('treat:time');
  return names;
}

/**
 * Builds the design matrix of `fixed` for `data`, writing into `out` when it is long enough
 * (reuse it across replicates) and into a new array otherwise.
 */
export function buildDesignMatrix(data: Dataset, fixed: FixedEffects, out?: Float64Array): DesignMatrix {
  const n = data.n;
  const names = designColumnNames(fixed);
  const p = names.length;
  const x = out && out.length >= n * p ? out : new Float64Array(n * p);
  checkColumn('y', data.y, n);
  const treat = checkColumn('treat', data.treat, n);
  x.fill(1, 0, n);
  x.set(treat.subarray(0, n), n);
  let j = 2;
  for (const name of fixed.covariates) {
    x.set(checkColumn(name, data.covariates?.[name], n).subarray(0, n), j * n);
    j++;
  }
  if (fixed.includeTime || fixed.target === 'treat:time') {
    const time = checkColumn('time', data.time, n);
    x.set(time.subarray(0, n), j * n);
    j++;
    if (fixed.target === 'treat:time') {
      const c = j * n;
      for (let i = 0; i < n; i++) x[c + i] = treat[i]! * time[i]!;
    }
  }
  return { x, n, p, names, target: fixed.target === 'treat:time' ? p - 1 : 1 };
}

/**
 * True when the model is intercept + a 0/1 treatment with both arms present, the case the
 * closed-form fast paths of ols, ols-hc3, cluster-robust and cluster-means handle.
 */
export function isTwoArmComparison(data: Dataset, fixed: FixedEffects): boolean {
  if (fixed.covariates.length > 0 || fixed.includeTime || fixed.target !== 'treat') return false;
  checkColumn('y', data.y, data.n);
  const treat = checkColumn('treat', data.treat, data.n);
  let ones = 0;
  for (let i = 0; i < data.n; i++) {
    const t = treat[i]!;
    if (t === 1) ones++;
    else if (t !== 0) return false;
  }
  return ones > 0 && ones < data.n;
}
