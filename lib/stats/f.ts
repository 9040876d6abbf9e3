import { chiSquareCdf, chiSquareSf } from './chi-square';
import { incompleteBetaXY, logBetaPrefactor } from './incomplete-beta';
import { invertTail, type ContinuousDistribution } from './invert-tail';
import { normalQuantile } from './normal';

/**
 * The F distribution with d₁ > 0 and d₂ > 0 degrees of freedom (not necessarily integers).
 *
 * Formula: P(F ≤ x) = I_u(d₁/2, d₂/2) with u = d₁x/(d₁x + d₂), and P(F > x) = I_v(d₂/2, d₁/2)
 * with v = d₂/(d₁x + d₂) = 1 − u (Abramowitz & Stegun 26.6.2 with 26.5.2), u and v each formed
 * without subtraction; each tail is computed directly by the incomplete beta function, so tiny
 * tails keep their relative precision. d₂ = ∞ gives χ²_{d₁}/d₁; d₁ = ∞ gives d₂/χ²_{d₂}.
 *
 * Quantiles invert the tails with a safeguarded Newton iteration on log tail (`invert-tail.ts`);
 * `fQuantileUpper(q, d₁, d₂)` solves P(F > x) = q directly, so q = 1e-8 keeps its digits.
 *
 * Valid range: x ≥ 0 (negative x gives cdf 0), d₁, d₂ from 1 to 1e6 tested. Accuracy, measured
 * against R 4.2's pf in `f.test.ts` (fixtures from `fixtures/generate_distributions.R`, 1,536
 * values): relative error at most 1.9e-11 for values above 1e-300 (the largest with d₂ = 1e6,
 * from the incomplete beta, see `incomplete-beta.ts`), absolute at most 5.4e-12. Quantiles
 * satisfy cdf(quantile(p)) = p to 1e-12 relative for 1e-12 ≤ p ≤ 1 − 1e-12 and match closed
 * forms (F(1, 1), F(2, 2)) to 1e-13; R's qf is not a good reference for small p or for d₁ or
 * d₂ above 4e5 (where it returns the chi-square limit).
 *
 * The jstat package (1.9.6)'s centralF.cdf was measured against the same fixtures
 * (`fixtures/measure_jstat.mjs`): it misses 1e-9 at 192 of 768 points (absolute error 1.7e-2 at
 * x = 1, d₁ = d₂ = 1e6), has no upper tail, and 1 − cdf loses upper tails below 1e-16. Not used.
 *
 * Bad input: NaN in any argument, d₁ ≤ 0 or d₂ ≤ 0 → NaN; x = +∞ → cdf 1. Quantiles of p
 * outside [0, 1] → NaN, of 0 → 0, of 1 → +∞. Never throws.
 */

function invalid(x: number, df1: number, df2: number): boolean {
  return Number.isNaN(x) || !(df1 > 0) || !(df2 > 0);
}

/** u = d₁x/(d₁x + d₂) and v = d₂/(d₁x + d₂) for 0 < x < ∞, both without cancellation. */
function betaArguments(x: number, df1: number, df2: number): { u: number; v: number } {
  const s = df1 * x;
  if (s === Infinity) return { u: 1, v: df2 / df1 / x };
  return { u: s / (s + df2), v: df2 / (s + df2) };
}

/** The tail (upper or lower) for finite d₁, d₂ and 0 < x < ∞. */
function tail(x: number, df1: number, df2: number, upper: boolean): number {
  const { u, v } = betaArguments(x, df1, df2);
  return upper ? incompleteBetaXY(v, u, df2 / 2, df1 / 2) : incompleteBetaXY(u, v, df1 / 2, df2 / 2);
}

/** Limits in d₁ or d₂ = ∞ (through chi-square), or undefined. */
function limit(x: number, df1: number, df2: number, upper: boolean): number | undefined {
  if (df1 === Infinity && df2 === Infinity) return upper ? (x < 1 ? 1 : 0) : x < 1 ? 0 : 1;
  // F = (χ²_{d₁}/d₁)/1: P(F ≤ x) = P(χ²_{d₁} ≤ d₁x).
  if (df2 === Infinity) return upper ? chiSquareSf(df1 * x, df1) : chiSquareCdf(df1 * x, df1);
  // F = 1/(χ²_{d₂}/d₂): P(F ≤ x) = P(χ²_{d₂} ≥ d₂/x).
  if (df1 === Infinity) return upper ? chiSquareCdf(df2 / x, df2) : chiSquareSf(df2 / x, df2);
  return undefined;
}

/** P(F ≤ x) for the F distribution with (d₁, d₂) degrees of freedom. */
export function fCdf(x: number, df1: number, df2: number): number {
  if (invalid(x, df1, df2)) return NaN;
  if (x <= 0) return 0;
  if (x === Infinity) return 1;
  return limit(x, df1, df2, false) ?? tail(x, df1, df2, false);
}

/** P(F > x), computed directly. */
export function fSf(x: number, df1: number, df2: number): number {
  if (invalid(x, df1, df2)) return NaN;
  if (x <= 0) return 1;
  if (x === Infinity) return 0;
  return limit(x, df1, df2, true) ?? tail(x, df1, df2, true);
}

/**
 * The F density, for Newton steps: with u, v as above, f(x) = u^(d₁/2) v^(d₂/2) / (x B(d₁/2, d₂/2)).
 */
function fDensity(x: number, df1: number, df2: number): number {
  if (x <= 0) return 0;
  const { u, v } = betaArguments(x, df1, df2);
  return Math.exp(logBetaPrefactor(u, v, df1 / 2, df2 / 2)) / x;
}

function distribution(df1: number, df2: number): ContinuousDistribution {
  return {
    lower: (x) => fCdf(x, df1, df2),
    upper: (x) => fSf(x, df1, df2),
    density: (x) => fDensity(x, df1, df2),
    supportMin: 0,
    guess: (r, upper) => {
      // log F is roughly normal with mean ½(1/d₂ − 1/d₁)·… ≈ 0 and variance 2(1/d₁ + 1/d₂).
      const z = upper ? -normalQuantile(r) : normalQuantile(r);
      return Math.exp(z * Math.sqrt(2 * (1 / df1 + 1 / df2)));
    },
  };
}

/** The x with P(F ≤ x) = p. */
export function fQuantile(p: number, df1: number, df2: number): number {
  if (Number.isNaN(p) || invalid(0, df1, df2)) return NaN;
  return invertTail(distribution(df1, df2), p, false);
}

/** The x with P(F > x) = q, for small q without the rounding of 1 − q. */
export function fQuantileUpper(q: number, df1: number, df2: number): number {
  if (Number.isNaN(q) || invalid(0, df1, df2)) return NaN;
  return invertTail(distribution(df1, df2), q, true);
}
