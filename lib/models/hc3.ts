/**
 * `ols-hc3`: ordinary least squares with the HC3 heteroskedasticity-consistent standard error of
 * MacKinnon & White (1985, J Econometrics 29:305–325),
 *
 *   V̂ = (XᵀX)⁻¹ Xᵀ diag(e_i² / (1 − h_i)²) X (XᵀX)⁻¹,   h_i = x_iᵀ(XᵀX)⁻¹x_i,
 *
 * so Var(β̂_t) = Σ_i w_i² e_i² / (1 − h_i)² with w = X(XᵀX)⁻¹e_t. The leverages come from the
 * thin Q of the QR (h_i = Σ_j Q_ij²). df = n − p, the residual df that a t test with a
 * sandwich covariance conventionally uses (lmtest::coeftest's default for an lm fit — from
 * memory; lmtest is not installed here). Reference:
 * R's sandwich::vcovHC(type = "HC3"), matched to 1e-6 relative or better.
 *
 * Fast path: for intercept + a 0/1 treat the leverage in arm a is 1/n_a, and
 *   Var = SS₀/(n₀ − 1)² + SS₁/(n₁ − 1)².
 *
 * Returns a non-converged result when the design is rank-deficient, n ≤ p, or some h_i is 1
 * (an observation fitted exactly, e.g. an arm of one: HC3 is then undefined).
 */
import { buildDesignMatrix, isTwoArmComparison } from './design-matrix';
import { notEstimable } from './estimate';
import { LeastSquares } from './least-squares';
import { TwoArmSums } from './two-arm';
import type { Dataset, EffectEstimate, FixedEffects } from './types';

export interface Hc3Options {
  /** Use the QR path even when the closed form applies (for tests). */
  general?: boolean;
}

/** Leverages this close to 1 make HC3 undefined. */
const LEVERAGE_LIMIT = 1 - 1e-10;

const sums = new TwoArmSums();
const ls = new LeastSquares();
let xBuffer: Float64Array = new Float64Array(0);
let wBuffer: Float64Array = new Float64Array(0);

export function fitOlsHc3(data: Dataset, fixed: FixedEffects, options: Hc3Options = {}): EffectEstimate {
  const n = data.n;
  if (!options.general && isTwoArmComparison(data, fixed)) {
    if (n <= 2) return notEstimable();
    sums.compute(data.y, data.treat, n);
    if (sums.n0 < 2 || sums.n1 < 2) return notEstimable();
    const v = sums.ss0 / ((sums.n0 - 1) * (sums.n0 - 1)) + sums.ss1 / ((sums.n1 - 1) * (sums.n1 - 1));
    return { estimate: sums.mean1 - sums.mean0, se: Math.sqrt(v), df: n - 2, converged: true };
  }
  const design = buildDesignMatrix(data, fixed, xBuffer);
  xBuffer = design.x;
  const { x, p, target } = design;
  if (n <= p || ls.fit(x, n, p, data.y) < p) return notEstimable();
  const cov = ls.unscaledCovariance();
  const q = ls.thinQ();
  if (wBuffer.length < p) wBuffer = new Float64Array(p);
  const m = wBuffer; // column `target` of (XᵀX)⁻¹
  for (let j = 0; j < p; j++) m[j] = cov[j + target * p]!;
  const e = ls.residuals;
  let v = 0;
  for (let i = 0; i < n; i++) {
    let h = 0;
    let w = 0;
    for (let j = 0; j < p; j++) {
      const qij = q[i + j * n]!;
      h += qij * qij;
      w += x[i + j * n]! * m[j]!;
    }
    if (h > LEVERAGE_LIMIT) return notEstimable();
    const r = (w * e[i]!) / (1 - h);
    v += r * r;
  }
  return { estimate: ls.coef[target]!, se: Math.sqrt(v), df: n - p, converged: true };
}
