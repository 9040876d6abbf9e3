/**
 * Power of the three tests the calculations use, given the noncentrality of the test statistic:
 * t (exact, noncentral t), z (normal approximation) and F (exact, noncentral F).
 */
import { noncentralFSf } from '@/lib/stats/noncentral-f';
import { noncentralTCdf, noncentralTSf } from '@/lib/stats/noncentral-t';
import { normalQuantile, normalSf } from '@/lib/stats/normal';
import { fQuantileUpper } from '@/lib/stats/f';
import { tQuantileUpper } from '@/lib/stats/t';
import { inputError } from './errors';

export type Sides = 1 | 2;

/**
 * Power of a t test with df degrees of freedom whose statistic has noncentrality ncp ≥ 0:
 * one-sided P(T > t₁₋α); two-sided P(T > t₁₋α/2) + P(T < −t₁₋α/2), both rejection tails
 * counted (the exact power; the lower tail matters only for small effects).
 *
 * Source: the definition of power with the noncentral t (e.g. Cohen 1988, ch. 2). Accuracy:
 * that of the noncentral t and t quantile (absolute 1e-10 or better). Valid range: df > 0,
 * 0 < α < 1, ncp finite.
 */
export function tTestPower(ncp: number, df: number, alpha: number, sides: Sides): number {
  if (sides === 1) return computable(noncentralTSf(tQuantileUpper(alpha, df), df, ncp));
  const critical = tQuantileUpper(alpha / 2, df);
  return computable(noncentralTSf(critical, df, ncp) + noncentralTCdf(-critical, df, ncp));
}

/**
 * The noncentral distributions return NaN where their sums would take longer than a request may
 * (lib/stats/poisson-mixture.ts `MAX_TERMS`): a noncentrality in the hundreds of thousands near
 * an equally far critical value, which only a tiny alpha with very few degrees of freedom asks
 * (an effect far beyond an ordinary critical value is answered at once: power 1).
 */
function computable(power: number): number {
  if (Number.isNaN(power)) {
    throw inputError(
      'alpha is too small for so few degrees of freedom: the critical value is too far out to compute the power. Use a larger alpha, or more units or clusters.',
      ['alpha'],
    );
  }
  return power;
}

/** z₁₋α/sides, computed as −Φ⁻¹(α/sides) so tiny α keeps its precision. */
export function zCritical(alpha: number, sides: Sides): number {
  return -normalQuantile(alpha / sides);
}

/**
 * Power of a z test by the normal approximation as the sample-size formulas publish it:
 * Φ(ncp − z₁₋α/sides), the rejection tail in the direction of the effect only. Inverting it gives
 * n = (z₁₋α/sides + z₁₋β)²·(variance per unit)/δ². The other tail adds at most α/2 and is
 * ignored, as in the published formulas.
 */
export function zTestPower(ncp: number, alpha: number, sides: Sides): number {
  return normalSf(zCritical(alpha, sides) - ncp);
}

/**
 * Power of an F test with (df1, df2) degrees of freedom and noncentrality λ:
 * P(F > F₁₋α(df1, df2); df1, df2, λ).
 *
 * Accuracy: that of the noncentral F and the F quantile. Valid range: df1, df2 > 0, λ ≥ 0.
 */
export function fTestPower(lambda: number, df1: number, df2: number, alpha: number): number {
  return computable(noncentralFSf(fQuantileUpper(alpha, df1, df2), df1, df2, lambda));
}

/**
 * z₁₋α/sides + z_power: the noncentrality a z test needs for the given power. Squared and times
 * the variance per unit over δ² it is the normal-approximation size, used as the published
 * formula (repeated measures, slopes) or as a starting guess for exact searches.
 */
export function zSum(alpha: number, sides: Sides, power: number): number {
  return zCritical(alpha, sides) - normalQuantile(1 - power);
}
