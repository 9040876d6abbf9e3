import { stirlingError } from './log-gamma';

/**
 * Loader's saddle-point building blocks for densities with large arguments: the deviance term
 * bd0 and the Poisson density at a real "count" (with the error of Stirling's formula,
 * `stirlingError` in `log-gamma.ts`).
 *
 * Source: C. Loader, "Fast and accurate computation of binomial probabilities" (2000, technical
 * note, Bell Labs), the method R uses in dbinom and dpois. Writing x^a e^(−x)/Γ(a + 1) or
 * x^a y^b Γ(a + b)/(Γ(a)Γ(b)) through these terms avoids the cancellation of differences of
 * log-gamma values: for a = 10⁶ each log Γ is about 1.3e7 and carries a rounding error of about
 * 2e-9, which the naive formula passes on as a relative error of the density. Here the density
 * keeps a relative error of a few ε times (1 + bd0), its own condition number.
 *
 * Bad input: these are internal helpers for positive arguments; NaN propagates.
 */

const LOG_2PI = 1.8378770664093453; // log(2π)

/**
 * Loader's deviance term bd0(x, m) = x log(x/m) + m − x ≥ 0, for x ≥ 0, m > 0, computed
 * without cancellation when x ≈ m by the series 2x Σ v^(2k+1)/(2k + 1) − (x − m) v with
 * v = (x − m)/(x + m) (|v| < 0.1 there).
 */
export function devianceTerm(x: number, m: number): number {
  if (x === 0) return m;
  const d = x - m;
  if (Math.abs(d) < 0.1 * (x + m)) {
    const v = d / (x + m);
    let s = d * v;
    let ej = 2 * x * v;
    const v2 = v * v;
    for (let j = 1; j < 1000; j++) {
      ej *= v2;
      const next = s + ej / (2 * j + 1);
      if (next === s) return s;
      s = next;
    }
    return s;
  }
  return x * Math.log(x / m) + m - x;
}

/**
 * log of the Poisson density at a real count: log(m^a e^(−m) / Γ(a + 1)) for a ≥ 0, m > 0,
 * as −δ(a) − bd0(a, m) − ½ log(2πa) (Loader 2000); a = 0 gives −m exactly.
 */
export function logPoissonDensity(a: number, m: number): number {
  if (a === 0) return -m;
  if (m === 0) return -Infinity;
  return -stirlingError(a) - devianceTerm(a, m) - 0.5 * (LOG_2PI + Math.log(a));
}
