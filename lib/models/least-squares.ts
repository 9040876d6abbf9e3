/**
 * (Weighted) least squares by Householder QR, with reusable buffers: the core of ols, ols-hc3,
 * cluster-robust, cluster-means, huber (IRLS), log-ols and glm (IRLS).
 *
 * For weights w_i ≥ 0 the fit minimises Σ w_i (y_i − x_iᵀβ)² by the QR of diag(√w)·X
 * (Golub & Van Loan 2013, §5.3: backward stable; the condition number is not squared as it is
 * in the normal equations). After `fit`, `coef` holds β̂, `residuals` the raw residuals
 * y_i − x_iᵀβ̂ (unweighted, as R's lm.wfit reports them), `rss` = Σ w_i·e_i², and
 * `unscaledCovariance()` gives (XᵀWX)⁻¹ from R without forming XᵀWX.
 *
 * When column 0 of X is the intercept (all ones), y is centred at its weighted mean before the
 * fit (and the mean added back to the intercept), which keeps the residuals accurate when the
 * outcome's mean is large compared with its spread.
 *
 * `fit` returns the numerical rank; when it is below p the coefficients are NaN (the model is not
 * estimable — e.g. an arm without observations) and callers report a non-converged fit.
 */
import { applyQt, formThinQ, inverseFromUpper, qrDecompose, solveUpper } from './linalg';

export class LeastSquares {
  n = 0;
  p = 0;
  rank = 0;
  /** The QR factor of diag(√w)·X (see linalg.qrDecompose). */
  qr: Float64Array = new Float64Array(0);
  tau: Float64Array = new Float64Array(0);
  coef: Float64Array = new Float64Array(0);
  residuals: Float64Array = new Float64Array(0);
  rss = 0;
  private qty: Float64Array = new Float64Array(0);
  private q: Float64Array = new Float64Array(0);
  private cov: Float64Array = new Float64Array(0);
  private work: Float64Array = new Float64Array(0);

  private ensure(n: number, p: number): void {
    if (this.qr.length < n * p) this.qr = new Float64Array(n * p);
    if (this.q.length < n * p) this.q = new Float64Array(n * p);
    if (this.qty.length < n) this.qty = new Float64Array(n);
    if (this.residuals.length < n) this.residuals = new Float64Array(n);
    if (this.tau.length < p) {
      this.tau = new Float64Array(p);
      this.coef = new Float64Array(p);
      this.cov = new Float64Array(p * p);
      this.work = new Float64Array(p * p);
    }
  }

  /**
   * Fits y on the n × p column-major `x` (left untouched), with optional square-root weights
   * `sqrtW` (length n). Returns the numerical rank (p when the fit is usable).
   */
  fit(x: Float64Array, n: number, p: number, y: Float64Array, sqrtW?: Float64Array): number {
    this.ensure(n, p);
    this.n = n;
    this.p = p;
    const { qr, qty, coef, residuals } = this;
    // With an intercept in column 0, fit y − ȳ_w and add ȳ_w to the intercept afterwards: the
    // residuals then carry rounding errors of order ε·‖y − ȳ‖ instead of ε·‖y‖ (which matters for
    // HC3 and CR2 when the outcome's mean is far from 0, e.g. a reaction time of 300 ± 15 ms).
    let intercept = p > 0;
    for (let i = 0; i < n && intercept; i++) intercept = x[i] === 1;
    let centre = 0;
    if (intercept) {
      let sw = 0;
      let swy = 0;
      for (let i = 0; i < n; i++) {
        const w = sqrtW ? sqrtW[i]! * sqrtW[i]! : 1;
        sw += w;
        swy += w * y[i]!;
      }
      centre = sw > 0 ? swy / sw : 0;
    }
    if (sqrtW) {
      for (let j = 0; j < p; j++) {
        const c = j * n;
        for (let i = 0; i < n; i++) qr[c + i] = x[c + i]! * sqrtW[i]!;
      }
      for (let i = 0; i < n; i++) qty[i] = (y[i]! - centre) * sqrtW[i]!;
    } else {
      qr.set(x.subarray(0, n * p));
      for (let i = 0; i < n; i++) qty[i] = y[i]! - centre;
    }
    this.rank = n >= p ? qrDecompose(qr, n, p, this.tau) : Math.min(n, p);
    if (this.rank < p) {
      coef.fill(NaN, 0, p);
      residuals.fill(NaN, 0, n);
      this.rss = NaN;
      return this.rank;
    }
    applyQt(qr, n, p, this.tau, qty);
    for (let j = 0; j < p; j++) coef[j] = qty[j]!;
    solveUpper(qr, n, p, coef);
    let rss = 0;
    for (let i = 0; i < n; i++) {
      let fitted = 0;
      for (let j = 0; j < p; j++) fitted += x[i + j * n]! * coef[j]!;
      const e = y[i]! - centre - fitted;
      residuals[i] = e;
      const we = sqrtW ? e * sqrtW[i]! : e;
      rss += we * we;
    }
    if (intercept) coef[0]! += centre;
    this.rss = rss;
    return this.rank;
  }

  /** (XᵀWX)⁻¹, p × p column-major; valid until the next `fit`. */
  unscaledCovariance(): Float64Array {
    inverseFromUpper(this.qr, this.n, this.p, this.cov, this.work);
    return this.cov;
  }

  /** The thin Q of diag(√w)·X, n × p column-major; valid until the next `fit`. */
  thinQ(): Float64Array {
    formThinQ(this.qr, this.n, this.p, this.tau, this.q);
    return this.q;
  }
}
