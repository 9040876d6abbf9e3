/**
 * `log-ols`: ordinary least squares on log y, for a positive outcome.
 *
 * The effect is reported on the log scale: with a 0/1 treat the estimate is the difference in
 * mean log outcome, log(GM₁/GM₀), the log of the ratio of the arms' geometric means (a ratio of
 * medians when log y is symmetric), and its SE and df are those of `ols` on log y. The caller
 * exponentiates the estimate and its CI limits to report a ratio; the truth it is compared with
 * must be on the same log scale.
 *
 * Returns a non-converged result when some y is not positive and finite (the log is undefined),
 * and otherwise whatever `fitOls` returns for log y.
 */
import { fitOls, type OlsOptions } from './ols';
import type { Dataset, EffectEstimate, FixedEffects } from './types';

let logY: Float64Array = new Float64Array(0);

export function fitLogOls(data: Dataset, fixed: FixedEffects, options: OlsOptions = {}): EffectEstimate {
  const n = data.n;
  if (logY.length < n) logY = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const v = data.y[i]!;
    if (!(v > 0 && v < Infinity)) return { estimate: NaN, se: NaN, df: NaN, converged: false };
    logY[i] = Math.log(v);
  }
  return fitOls({ ...data, y: logY.subarray(0, n) }, fixed, options);
}
