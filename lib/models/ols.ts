/**
 * `ols`: ordinary least squares with the model-based standard error.
 *
 *   β̂ = argmin ‖y − Xβ‖²,  s² = ‖y − Xβ̂‖² / (n − p),  SE(β̂_t) = s·√[(XᵀX)⁻¹]_tt,  df = n − p,
 *
 * the classical linear model (e.g. Seber & Lee, Linear Regression Analysis, 2nd ed., 2003, §3);
 * it treats all n observations as independent, which is what the stress test shows the cost of
 * under clustering. Reference: R's summary(lm(...)) (lib/models/fixtures/generate_models.R),
 * matched to 1e-6 relative or better.
 *
 * Fast path: for intercept + a 0/1 treat this is the pooled two-sample t test,
 *   estimate = ȳ₁ − ȳ₀,  SE = √[s²(1/n₀ + 1/n₁)],  s² = (SS₀ + SS₁)/(n − 2),
 * from two passes over the rows; otherwise Householder QR (lib/models/least-squares.ts).
 *
 * Returns a non-converged result (NaN estimate) when the design is rank-deficient or n ≤ p.
 * Throws a RangeError when a column named in `fixed` is missing.
 */
import { buildDesignMatrix, isTwoArmComparison } from './design-matrix';
import { notEstimable } from './estimate';
import { LeastSquares } from './least-squares';
import { TwoArmSums } from './two-arm';
import type { Dataset, EffectEstimate, FixedEffects } from './types';

export interface OlsOptions {
  /** Use the QR path even when the closed form applies (for tests). */
  general?: boolean;
}

const sums = new TwoArmSums();
const ls = new LeastSquares();
let xBuffer: Float64Array = new Float64Array(0);

export function fitOls(data: Dataset, fixed: FixedEffects, options: OlsOptions = {}): EffectEstimate {
  const n = data.n;
  if (!options.general && isTwoArmComparison(data, fixed)) {
    if (n <= 2) return notEstimable();
    sums.compute(data.y, data.treat, n);
    const s2 = (sums.ss0 + sums.ss1) / (n - 2);
    return {
      estimate: sums.mean1 - sums.mean0,
      se: Math.sqrt(s2 * (1 / sums.n0 + 1 / sums.n1)),
      df: n - 2,
      converged: true,
    };
  }
  const design = buildDesignMatrix(data, fixed, xBuffer);
  xBuffer = design.x;
  const { p, target } = design;
  if (n <= p || ls.fit(design.x, n, p, data.y) < p) return notEstimable();
  const cov = ls.unscaledCovariance();
  const s2 = ls.rss / (n - p);
  return {
    estimate: ls.coef[target]!,
    se: Math.sqrt(s2 * cov[target + target * p]!),
    df: n - p,
    converged: true,
  };
}
