/**
 * `glm-nb`: a negative-binomial GLM with log link for overdispersed counts (NB2: Var y = μ + μ²/θ),
 * fitted by maximum likelihood in β and θ as MASS's glm.nb (Venables & Ripley 2002, Modern
 * Applied Statistics with S, 4th ed., §7.4; Lawless 1987, Can J Stat 15:209 — from memory).
 * The effect of interest is the coefficient of treat, a log rate ratio, with the model-based SE
 * √[(XᵀWX)⁻¹]_tt, W = μ/(1 + μ/θ̂), and a z test (df = Infinity) — summary.negbin's SE (β and θ
 * are orthogonal, so θ's estimation does not enter it).
 *
 * Iteration: a Poisson IRLS gives the first μ; then, in turn, θ by Newton's method on its score
 *   U(θ) = Σ[ψ(θ + y) − ψ(θ) + ln θ + 1 − ln(θ + μ) − (y + θ)/(μ + θ)]
 * (in ln θ, from MASS's moment start n/Σ(y/μ − 1)²) and β by IRLS at that θ (weights
 * μ/(1 + μ/θ), working response η + (y − μ)/μ), until the twice log-likelihood and ln θ change by
 * less than 1e-12 (relative). ψ(θ + y) − ψ(θ) and its derivative are finite sums Σ_{k<y} 1/(θ + k)
 * for y ≤ 50 and differences of digamma and trigamma (recurrence to x ≥ 20, then the asymptotic
 * series; Abramowitz & Stegun 1964, 6.3.18 and 6.4.12) above. One more IRLS step at the final θ
 * gives the reported β̂ and, with W at β̂, the SE.
 *
 * Intercept + 0/1 treat: each arm's fitted mean is its sample mean whatever θ (the score
 * equations for β), so β̂ = ln(ȳ₁/ȳ₀) and SE² = 1/(n₁w₁) + 1/(n₀w₀) in closed form; only θ is
 * iterated.
 *
 * No overdispersion in the sample (θ̂ → ∞; the variance does not exceed the mean): the fit is
 * the Poisson GLM, reported as converged with `theta` Infinity (the boundary of the model, like
 * a variance estimated at 0). `converged` is false when the iteration limit is reached (50
 * rounds), the design is rank-deficient, or a fitted rate is within 10ε of 0 (an arm without any
 * event: the MLE is at infinity).
 *
 * Reference: MASS::glm.nb on MASS's quine data (with all four factors, and Eth alone) and on
 * generated counts (fixtures/generate_glmm.R): β̂ and SEs within 1e-8, θ̂ within 1e-8, twice the
 * log-likelihood within 1e-10 (relative; glm-nb.test.ts). Throws a RangeError when the outcome
 * is not a non-negative whole number.
 */
import { buildDesignMatrix, isTwoArmComparison } from './design-matrix';
import { notEstimable } from './estimate';
import { LeastSquares } from './least-squares';
import { armTotals } from './two-arm';
import type { Dataset, EffectEstimate, FixedEffects } from './types';
import { logGamma } from '@/lib/stats/log-gamma';

export interface GlmNbOptions {
  /** Use the general path even when the closed form applies (for tests). */
  general?: boolean;
}

export interface GlmNbFit {
  beta: Float64Array;
  se: Float64Array;
  /** The NB shape θ̂ (Infinity when the data show no overdispersion). */
  theta: number;
  /** 2 × the log-likelihood at the estimates (MASS's twologlik). */
  twoLogLik: number;
  target: number;
  iterations: number;
  converged: boolean;
}

const EPS10 = 10 * 2 ** -52;
/** Beyond this θ the negative binomial is the Poisson to double precision in every weight. */
const THETA_MAX = 1e10;
const SUM_LIMIT = 50;

/** ψ(x), x > 0: recurrence up to x ≥ 20, then the asymptotic series (truncation error below 1e-17). */
export function digamma(x: number): number {
  let shift = 0;
  while (x < 20) {
    shift -= 1 / x;
    x += 1;
  }
  const r = 1 / (x * x);
  return shift + Math.log(x) - 0.5 / x - r * (1 / 12 - r * (1 / 120 - r * (1 / 252 - r * (1 / 240 - r * (1 / 132)))));
}

/** ψ′(x), x > 0: recurrence up to x ≥ 20, then the asymptotic series (truncation error below 1e-17). */
export function trigamma(x: number): number {
  let shift = 0;
  while (x < 20) {
    shift += 1 / (x * x);
    x += 1;
  }
  const r = 1 / (x * x);
  return shift + 1 / x + r / 2 + (r / x) * (1 / 6 - r * (1 / 30 - r * (1 / 42 - r * (1 / 30 - r * (5 / 66)))));
}

/** ψ(θ + y) − ψ(θ) and ψ′(θ + y) − ψ′(θ) for a whole y ≥ 0. */
function digammaSteps(theta: number, y: number): { d1: number; d2: number } {
  if (y <= SUM_LIMIT) {
    let d1 = 0;
    let d2 = 0;
    for (let k = 0; k < y; k++) {
      const t = 1 / (theta + k);
      d1 += t;
      d2 -= t * t;
    }
    return { d1, d2 };
  }
  return { d1: digamma(theta + y) - digamma(theta), d2: trigamma(theta + y) - trigamma(theta) };
}

/** 2 × the NB log-likelihood. */
function twoLogLikelihood(y: Float64Array, mu: Float64Array, n: number, theta: number): number {
  let s = 0;
  for (let i = 0; i < n; i++) {
    const yi = y[i]!;
    const m = mu[i]!;
    s += logGamma(theta + yi) - logGamma(theta) - logGamma(yi + 1) + theta * Math.log(theta / (theta + m)) + (yi > 0 ? yi * Math.log(m / (theta + m)) : 0);
  }
  return 2 * s;
}

/** θ̂ given μ by Newton's method in ln θ (MASS's theta.ml, moment start); Infinity without overdispersion. */
export function thetaMl(y: Float64Array, mu: Float64Array, n: number): number {
  let moment = 0;
  for (let i = 0; i < n; i++) moment += (y[i]! / mu[i]! - 1) ** 2;
  let logTheta = Math.log(n / moment);
  if (!Number.isFinite(logTheta)) logTheta = 0;
  for (let iteration = 0; iteration < 100; iteration++) {
    const theta = Math.exp(logTheta);
    let score = 0;
    let info = 0;
    for (let i = 0; i < n; i++) {
      const yi = y[i]!;
      const m = mu[i]!;
      const { d1, d2 } = digammaSteps(theta, yi);
      score += d1 + Math.log(theta) + 1 - Math.log(theta + m) - (yi + theta) / (m + theta);
      info += -d2 - 1 / theta + 2 / (m + theta) - (yi + theta) / ((m + theta) * (m + theta));
    }
    // In ln θ: dℓ/d ln θ = θ·U, d²ℓ/d(ln θ)² = θ·U − θ²·I.
    const gradient = theta * score;
    const curvature = theta * score - theta * theta * info;
    let step = curvature < 0 ? -gradient / curvature : Math.sign(gradient);
    step = Math.max(-2, Math.min(2, step));
    logTheta += step;
    if (logTheta > Math.log(THETA_MAX)) return Infinity;
    if (Math.abs(step) < 1e-13) break;
  }
  return Math.exp(logTheta);
}

/**
 * Closed form for intercept + 0/1 treat: β̂ = (ln ȳ₀, ln(ȳ₁/ȳ₀)), θ̂ from the arm means.
 */
function twoArm(data: Dataset): GlmNbFit {
  const { y, treat, n } = data;
  const totals = new Float64Array(4);
  armTotals(y, treat, n, totals);
  const [n0, n1, s0, s1] = totals as unknown as [number, number, number, number];
  const failed: GlmNbFit = { beta: Float64Array.of(NaN, NaN), se: Float64Array.of(NaN, NaN), theta: NaN, twoLogLik: NaN, target: 1, iterations: 0, converged: false };
  if (s0 === 0 || s1 === 0) return failed;
  const m0 = s0 / n0;
  const m1 = s1 / n1;
  const mu = new Float64Array(n);
  for (let i = 0; i < n; i++) mu[i] = treat[i] === 1 ? m1 : m0;
  const theta = thetaMl(y, mu, n);
  const w0 = Number.isFinite(theta) ? m0 / (1 + m0 / theta) : m0;
  const w1 = Number.isFinite(theta) ? m1 / (1 + m1 / theta) : m1;
  return {
    beta: Float64Array.of(Math.log(m0), Math.log(m1 / m0)),
    se: Float64Array.of(Math.sqrt(1 / (n0 * w0)), Math.sqrt(1 / (n1 * w1) + 1 / (n0 * w0))),
    theta,
    twoLogLik: Number.isFinite(theta) ? twoLogLikelihood(y, mu, n, theta) : NaN,
    target: 1,
    iterations: 1,
    converged: Number.isFinite(theta) || theta === Infinity,
  };
}

/** The full fit: β̂, SEs, θ̂, 2 log L and the index of the effect of interest. */
export function fitGlmNbFull(data: Dataset, fixed: FixedEffects, options: GlmNbOptions = {}): GlmNbFit {
  const { n, y } = data;
  for (let i = 0; i < n; i++) {
    if (!(y[i]! >= 0 && Number.isInteger(y[i]!))) throw new RangeError(`glm-nb needs a count outcome (non-negative whole numbers); row ${i} has ${y[i]}`);
  }
  if (!options.general && isTwoArmComparison(data, fixed)) return twoArm(data);
  const design = buildDesignMatrix(data, fixed);
  const { x, p, target } = design;
  const failed = (iterations: number): GlmNbFit => ({
    beta: new Float64Array(p).fill(NaN),
    se: new Float64Array(p).fill(NaN),
    theta: NaN,
    twoLogLik: NaN,
    target,
    iterations,
    converged: false,
  });
  if (n <= p) return failed(0);
  const ls = new LeastSquares();
  const eta = new Float64Array(n);
  const mu = new Float64Array(n);
  const z = new Float64Array(n);
  const sqrtW = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    mu[i] = y[i]! + 0.1;
    eta[i] = Math.log(mu[i]!);
  }
  /** One IRLS step at θ (Infinity: Poisson); false when the design is rank-deficient. */
  const irlsStep = (theta: number): boolean => {
    for (let i = 0; i < n; i++) {
      const m = mu[i]!;
      sqrtW[i] = Math.sqrt(Number.isFinite(theta) ? m / (1 + m / theta) : m);
      z[i] = eta[i]! + (y[i]! - m) / m;
    }
    if (ls.fit(x, n, p, z, sqrtW) < p) return false;
    for (let i = 0; i < n; i++) {
      let e = 0;
      for (let j = 0; j < p; j++) e += x[i + j * n]! * ls.coef[j]!;
      eta[i] = e;
      mu[i] = Math.exp(e);
    }
    return true;
  };
  /** IRLS at θ until the coefficients stop changing (1e-13 relative). */
  const irls = (theta: number): boolean => {
    const previous = new Float64Array(p).fill(NaN);
    for (let k = 0; k < 100; k++) {
      if (!irlsStep(theta)) return false;
      let change = 0;
      for (let j = 0; j < p; j++) change = Math.max(change, Math.abs(ls.coef[j]! - previous[j]!) / (Math.abs(ls.coef[j]!) + 0.1));
      previous.set(ls.coef.subarray(0, p));
      if (change < 1e-13) return true;
    }
    return true;
  };
  if (!irls(Infinity)) return failed(0);
  let theta = thetaMl(y, mu, n);
  let iterations = 0;
  let converged = false;
  let previousLogLik = NaN;
  for (; iterations < 50; iterations++) {
    if (!irls(theta)) return failed(iterations);
    const next = thetaMl(y, mu, n);
    const logLik = Number.isFinite(next) ? twoLogLikelihood(y, mu, n, next) : NaN;
    const thetaChange = Number.isFinite(next) && Number.isFinite(theta) ? Math.abs(Math.log(next / theta)) : next === theta ? 0 : Infinity;
    const logLikChange = Math.abs(logLik - previousLogLik) / Math.abs(logLik);
    theta = next;
    previousLogLik = logLik;
    if (thetaChange < 1e-12 && (logLikChange < 1e-12 || !Number.isFinite(theta))) {
      converged = true;
      break;
    }
  }
  // One more IRLS step at θ̂: the reported β̂, and the SE with W at β̂.
  if (!irlsStep(theta)) return failed(iterations);
  for (let i = 0; i < n; i++) {
    const m = mu[i]!;
    sqrtW[i] = Math.sqrt(Number.isFinite(theta) ? m / (1 + m / theta) : m);
    if (m < EPS10) converged = false;
  }
  const beta = Float64Array.from(ls.coef.subarray(0, p));
  if (ls.fit(x, n, p, z, sqrtW) < p) return failed(iterations);
  const cov = ls.unscaledCovariance();
  const se = new Float64Array(p);
  for (let j = 0; j < p; j++) se[j] = Math.sqrt(cov[j + j * p]!);
  return {
    beta,
    se,
    theta,
    twoLogLik: Number.isFinite(theta) ? twoLogLikelihood(y, mu, n, theta) : NaN,
    target,
    iterations,
    converged,
  };
}

/** The `glm-nb` analysis of the stress test: the log rate ratio, its SE, a z test. */
export function fitGlmNb(data: Dataset, fixed: FixedEffects, options: GlmNbOptions = {}): EffectEstimate {
  const fit = fitGlmNbFull(data, fixed, options);
  const estimate = fit.beta[fit.target]!;
  const se = fit.se[fit.target]!;
  if (!Number.isFinite(estimate)) return notEstimable();
  return { estimate, se, df: Infinity, converged: fit.converged && se > 0 && Number.isFinite(se) };
}
