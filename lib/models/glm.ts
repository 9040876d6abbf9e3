/**
 * `glm`: a generalised linear model with canonical link — logistic regression for a 0/1 outcome,
 * Poisson regression (log link) for a count — fitted by iteratively reweighted least squares
 * (Nelder & Wedderburn 1972, J R Stat Soc A 135:370–384; McCullagh & Nelder 1989, Generalized
 * Linear Models, 2nd ed., §2.5), with the model-based standard error √[(XᵀŴX)⁻¹]_tt and a z test
 * (df = Infinity). The effect is on the link scale: a log odds ratio or a log rate ratio.
 *
 * Iteration as R's glm.fit: start from μ = (y + ½)/2 (logistic) or μ = y + 0.1 (Poisson);
 * repeat: working response z = η + (y − μ)/μ′(η), weights W = μ′(η)²/V(μ), β ← weighted LS of z
 * on X (Householder QR), until |D − D_old|/(|D| + 0.1) < tolerance (deviance D). The default
 * tolerance 1e-10 is tighter than R's 1e-8; then one more step from the final β̂ gives the
 * reported estimate and, with W at β̂, the standard error (R's summary uses the W of the
 * step before its last, which differs from that by the last step's change).
 *
 * `converged` is false when the tolerance is not met within maxIterations (25, as R), when the
 * design is rank-deficient, or when fitted probabilities reach 0 or 1 / fitted rates reach 0
 * within 10ε (separation: the MLE does not exist and its SE is meaningless; R warns then).
 *
 * Fast path for intercept + 0/1 treat: the closed forms of the 2 × 2 table (see twoArm).
 *
 * Reference: R's glm(family = binomial / poisson) and summary(), to 1e-6 relative
 * (fixtures/generate_models.R). Throws a RangeError when the outcome suits neither family (and
 * `family` is not given), or does not suit the family given.
 */
import { buildDesignMatrix, isTwoArmComparison } from './design-matrix';
import { notEstimable } from './estimate';
import { LeastSquares } from './least-squares';
import { armTotals } from './two-arm';
import type { Dataset, EffectEstimate, FixedEffects } from './types';

export type GlmFamily = 'binomial' | 'poisson';

export interface GlmOptions {
  /** Default: binomial when every y is 0 or 1, Poisson when every y is a non-negative integer. */
  family?: GlmFamily;
  /** Relative change of the deviance at which the iteration stops (default 1e-10). */
  tolerance?: number;
  /** Default 25, as R. */
  maxIterations?: number;
  /** Use IRLS even when the closed form applies (for tests). */
  general?: boolean;
}

/**
 * Intercept + 0/1 treat: the MLE fits each arm's mean exactly, so the effect is the log odds
 * ratio log(a·d/(b·c)) of the 2 × 2 table with SE √(1/a + 1/b + 1/c + 1/d) (Woolf 1955, Ann
 * Hum Genet 19:251 — from memory), or the
 * log rate ratio log(ȳ₁/ȳ₀) with SE √(1/Σy₁ + 1/Σy₀) — the same numbers IRLS converges to.
 * A zero cell (or a zero total count) puts the MLE at infinity: not converged.
 */
function twoArm(family: GlmFamily, y: Float64Array, treat: Float64Array, n: number): EffectEstimate {
  armTotals(y, treat, n, totals);
  const n0 = totals[0]!;
  const n1 = totals[1]!;
  const s0 = totals[2]!;
  const s1 = totals[3]!;
  if (family === 'poisson') {
    if (s0 === 0 || s1 === 0) return { estimate: NaN, se: NaN, df: Infinity, converged: false };
    return { estimate: Math.log((s1 / n1) / (s0 / n0)), se: Math.sqrt(1 / s1 + 1 / s0), df: Infinity, converged: true };
  }
  const a = s1;
  const b = n1 - s1;
  const c = s0;
  const d = n0 - s0;
  if (a === 0 || b === 0 || c === 0 || d === 0) return { estimate: NaN, se: NaN, df: Infinity, converged: false };
  return {
    estimate: Math.log(a / b) - Math.log(c / d),
    se: Math.sqrt(1 / a + 1 / b + 1 / c + 1 / d),
    df: Infinity,
    converged: true,
  };
}

const EPS10 = 10 * 2 ** -52;

const totals = new Float64Array(4);

/** The family an outcome suits, or null. */
export function glmFamilyOf(y: Float64Array, n: number): GlmFamily | null {
  let binary = true;
  for (let i = 0; i < n; i++) {
    const v = y[i]!;
    if (!(v >= 0 && Number.isInteger(v))) return null;
    if (v > 1) binary = false;
  }
  return binary ? 'binomial' : 'poisson';
}

/** y·log(y/μ) with 0·log 0 = 0. */
function ylogy(y: number, mu: number): number {
  return y > 0 ? y * Math.log(y / mu) : 0;
}

const ls = new LeastSquares();
let xBuffer: Float64Array = new Float64Array(0);
let eta: Float64Array = new Float64Array(0);
let mu: Float64Array = new Float64Array(0);
let work: Float64Array = new Float64Array(0);
let sqrtW: Float64Array = new Float64Array(0);

function ensure(n: number): void {
  if (eta.length < n) {
    eta = new Float64Array(n);
    mu = new Float64Array(n);
    work = new Float64Array(n);
    sqrtW = new Float64Array(n);
  }
}

function inverseLink(family: GlmFamily, e: number): number {
  return family === 'binomial' ? 1 / (1 + Math.exp(-e)) : Math.exp(e);
}

/** Deviance at the current μ. */
function deviance(family: GlmFamily, y: Float64Array, n: number): number {
  let d = 0;
  for (let i = 0; i < n; i++) {
    const m = mu[i]!;
    const v = y[i]!;
    d += family === 'binomial' ? 2 * (ylogy(v, m) + ylogy(1 - v, 1 - m)) : 2 * (ylogy(v, m) - (v - m));
  }
  return d;
}

/** Sets √W (and, when `z` is given, the working response) at the current η, μ. */
function weights(family: GlmFamily, y: Float64Array, n: number, z?: Float64Array): void {
  for (let i = 0; i < n; i++) {
    const m = mu[i]!;
    // Canonical links: μ′(η) = V(μ) = μ(1 − μ) or μ, so W = V(μ).
    const v = family === 'binomial' ? m * (1 - m) : m;
    sqrtW[i] = Math.sqrt(v);
    if (z) z[i] = eta[i]! + (y[i]! - m) / v;
  }
}

export function fitGlm(data: Dataset, fixed: FixedEffects, options: GlmOptions = {}): EffectEstimate {
  const n = data.n;
  const y = data.y;
  const suited = glmFamilyOf(y, n);
  const family = options.family ?? suited;
  if (!family) throw new RangeError('glm needs a 0/1 or a non-negative integer outcome');
  if (suited === null || (family === 'binomial' && suited !== 'binomial')) {
    throw new RangeError(`the outcome does not suit the ${family} family`);
  }
  if (!options.general && isTwoArmComparison(data, fixed)) return twoArm(family, y, data.treat, n);
  const tolerance = options.tolerance ?? 1e-10;
  const maxIterations = options.maxIterations ?? 25;
  const design = buildDesignMatrix(data, fixed, xBuffer);
  xBuffer = design.x;
  const { x, p, target } = design;
  if (n <= p) return notEstimable();
  ensure(n);
  for (let i = 0; i < n; i++) {
    const m = family === 'binomial' ? (y[i]! + 0.5) / 2 : y[i]! + 0.1;
    mu[i] = m;
    eta[i] = family === 'binomial' ? Math.log(m / (1 - m)) : Math.log(m);
  }
  let devOld = deviance(family, y, n);
  let converged = false;
  for (let iteration = 0; iteration < maxIterations; iteration++) {
    weights(family, y, n, work);
    if (ls.fit(x, n, p, work, sqrtW) < p) return notEstimable();
    for (let i = 0; i < n; i++) {
      let e = 0;
      for (let j = 0; j < p; j++) e += x[i + j * n]! * ls.coef[j]!;
      eta[i] = e;
      mu[i] = inverseLink(family, e);
    }
    const dev = deviance(family, y, n);
    if (!Number.isFinite(dev)) break;
    if (Math.abs(dev - devOld) / (Math.abs(dev) + 0.1) < tolerance) {
      converged = true;
      break;
    }
    devOld = dev;
  }
  // Separation or rates at 0: the MLE is at infinity.
  for (let i = 0; i < n; i++) {
    const m = mu[i]!;
    if (family === 'binomial' ? m < EPS10 || m > 1 - EPS10 : m < EPS10) converged = false;
  }
  // One more IRLS step at the final β̂: its coefficients polish the estimate (Newton converges
  // quadratically, so this removes what the deviance criterion left), and its (XᵀWX)⁻¹, with W
  // at β̂, gives the SE.
  weights(family, y, n, work);
  if (ls.fit(x, n, p, work, sqrtW) < p) return { estimate: ls.coef[target]!, se: NaN, df: Infinity, converged: false };
  const estimate = ls.coef[target]!;
  const cov = ls.unscaledCovariance();
  const se = Math.sqrt(cov[target + target * p]!);
  return { estimate, se, df: Infinity, converged: converged && Number.isFinite(se) };
}
