/**
 * `period-difference`: the analysis of an AB/BA cross-over by the differences between each
 * unit's two periods (Hills & Armitage 1979, Br J Clin Pharmacol 8:7; Senn 2002, Cross-over
 * Trials in Clinical Research, 2nd ed., §3.6 — from memory). For unit i with outcomes y_i1 in
 * period 1 and y_i2 in period 2, d_i = (y_i1 − y_i2)/2; then
 *
 *   estimate = d̄_BA − d̄_AB,   SE = s·√(1/n_AB + 1/n_BA),   df = n_AB + n_BA − 2,
 *
 * with s² the pooled within-sequence variance of d — the two-sample t test on the period
 * differences. In expectation d̄_BA − d̄_AB = B − A: the period effect cancels, and so does any
 * unit's own level. It is unbiased whatever the correlation within units, and is the estimate
 * of the REML mixed model y ~ treat + period + (1 | unit) for complete data (its SE too, when the
 * between-unit variance is not estimated at 0). Carry-over biases it by half the difference in
 * carry-over (Senn's argument for a wash-out rather than a test).
 *
 * The units are the groups at `level` (default: the innermost grouping level); rows of a unit in
 * period order. A unit with one row is left out (it carries no within-unit information); its
 * sequence is AB when its first row has treat 0 and its second treat 1, BA for the reverse.
 *
 * Returns a non-converged result when fewer than one unit per sequence remains or n_AB + n_BA
 * ≤ 2. Throws a RangeError when a unit has more than two rows or both of its rows have the same
 * treat (not an AB/BA design), or the data set has no grouping level.
 */
import { groupingAt, notEstimable } from './estimate';
import type { Dataset, EffectEstimate, FixedEffects } from './types';

export interface PeriodDifferenceOptions {
  /** Grouping level whose groups are the units (default: the innermost). */
  level?: number;
}

export function fitPeriodDifference(data: Dataset, _fixed: FixedEffects, options: PeriodDifferenceOptions = {}): EffectEstimate {
  if (data.groups.length === 0) throw new RangeError('the period-difference analysis needs the units as a grouping level');
  const units = groupingAt(data, options.level ?? data.groups.length - 1);
  const { y, treat, n } = data;
  const id = units.id;
  // Per sequence: count, mean and sum of squares of d (Welford's update).
  const count = [0, 0];
  const mean = [0, 0];
  const ss = [0, 0];
  let i = 0;
  while (i < n) {
    let j = i + 1;
    while (j < n && id[j] === id[i]) j++;
    const rows = j - i;
    if (rows > 2) throw new RangeError(`unit ${id[i]} has ${rows} rows: the period-difference analysis takes two periods`);
    if (rows === 2) {
      if (treat[i] === treat[i + 1]) throw new RangeError(`unit ${id[i]} has the same arm in both periods: not an AB/BA design`);
      const sequence = treat[i] === 0 ? 0 : 1;
      const d = (y[i]! - y[i + 1]!) / 2;
      count[sequence]!++;
      const delta = d - mean[sequence]!;
      mean[sequence]! += delta / count[sequence]!;
      ss[sequence]! += delta * (d - mean[sequence]!);
    }
    i = j;
  }
  const [nAB, nBA] = count as [number, number];
  if (nAB < 1 || nBA < 1 || nAB + nBA <= 2) return notEstimable();
  const df = nAB + nBA - 2;
  const s2 = (ss[0]! + ss[1]!) / df;
  return { estimate: mean[1]! - mean[0]!, se: Math.sqrt(s2 * (1 / nAB + 1 / nBA)), df, converged: true };
}
