/**
 * The `glmm` analysis: a generalised linear mixed model with one random intercept — logistic
 * for a 0/1 (or binomial) outcome, Poisson with log link for a count — fitted by maximum
 * likelihood with the Laplace approximation (Q = 1 quadrature point, the default) or adaptive
 * Gauss–Hermite quadrature (Q > 1), as lme4's glmer(y ~ treat + … + (1 | cluster), nAGQ = Q).
 * The deviance and its exact gradient are in glmm-criterion.ts.
 *
 * The effect of interest is the coefficient of treat: a conditional (cluster-specific) log odds
 * ratio or log rate ratio. For the logit link it is larger in size than the marginal
 * (population-averaged) log odds ratio that a GLM or a cluster-level analysis of proportions
 * estimates; for the log link the two coincide. Its SE is the model-based one, √[2·H⁻¹]_tt with
 * H the Hessian of the deviance in (β, θ) at the estimates (glmer's default,
 * vcov(use.hessian = TRUE)), and the test is a z test (df = Infinity).
 *
 * Optimisation: β starts from the GLM fit (θ = 0, IRLS), θ from a moment estimate (the spread of
 * the groups' empirical logits or log rates around that fit beyond their sampling error). Newton's
 * method on (β, θ) with the exact gradient and a Hessian from forward differences of that
 * gradient (step 1e-4·max(1, |φ|)); when the Hessian is not positive definite a multiple of the
 * identity is added; steps longer than 5 are shortened, and halved until the deviance falls
 * (Armijo). It stops when the Newton decrement gᵀH⁻¹g falls below 1e-10, takes one more full
 * step (Newton converges quadratically, so this removes what the criterion left) and computes H
 * afresh at the result by central differences for the SE. θ is free to pass through 0 (the
 * deviance is even in θ): σ̂ = |θ̂|.
 *
 * Accuracy (fixtures/glmm.json: lme4's cbpp and eight generated binary and count data sets —
 * cluster-randomised with clusters of unequal size, a covariate, a cross-over with missing
 * periods, pairs with a large variance, a singular fit — at Q = 1 and one to two Q > 1, against
 * lme4 1.1-31's deviance function minimised to 1e-10 in R; see glmm.test.ts for the figures).
 *
 * Convergence: `converged` is false when the decrement does not fall below the tolerance within
 * `maxIterations` (default 100), a value is not finite, the Hessian at the result is not
 * positive definite (unless θ̂ is on the boundary 0), or a fitted conditional probability is
 * within 10ε of 0 or 1 / a fitted rate within 10ε of 0 (separation: the MLE does not exist).
 * A variance estimated as 0 (|θ̂| < 1e-4, lme4's isSingular rule) is a converged fit; the SE
 * then comes from the fixed-effect block of H, and `singular` is true.
 *
 * Bad input (no grouping level, an outcome that does not suit the family, a group id out of
 * range, n ≤ p): throws a RangeError naming the problem.
 */
import { buildDesignMatrix } from './design-matrix';
import { groupingAt } from './estimate';
import { gaussHermite } from './gauss-hermite';
import { glmFamilyOf } from './glm';
import { buildPatterns, GlmmCriterion, type GlmmFamily, type Patterns } from './glmm-criterion';
import { choleskyDecompose, choleskySolve, spdInverse } from './linalg';
import type { Dataset, EffectEstimate, FixedEffects, Grouping } from './types';

export type { GlmmFamily } from './glmm-criterion';

export interface GlmmProblem {
  family: GlmmFamily;
  n: number;
  p: number;
  /** Column-major n × p fixed-effect design; column 0 the intercept. */
  x: Float64Array;
  /** Successes (binomial) or counts. */
  y: Float64Array;
  /** Binomial trials per row (default 1: a 0/1 outcome). */
  trials?: Float64Array;
  /** The grouping level of the random intercept (ids 0 … count − 1). */
  group: Grouping;
  names: string[];
}

export interface GlmmFitOptions {
  /** Gauss–Hermite points: 1 for the Laplace approximation (default), up to 25. */
  quadraturePoints?: number;
  /** Newton iterations (default 100). */
  maxIterations?: number;
}

export interface GlmmFit {
  names: string[];
  beta: Float64Array;
  /** Covariance of β̂, column-major p × p. */
  vcovBeta: Float64Array;
  se: Float64Array;
  /** SD of the random intercept, |θ̂|. */
  sigma: number;
  /** −2 × the approximated log-likelihood at the estimates (with all constants). */
  deviance: number;
  quadraturePoints: number;
  iterations: number;
  /** Evaluations of the deviance (with or without its gradient). */
  evaluations: number;
  singular: boolean;
  converged: boolean;
}

export interface GlmmOptions extends GlmmFitOptions {
  /** Default: binomial when every y is 0 or 1, Poisson when every y is a non-negative integer. */
  family?: GlmmFamily;
  /** Grouping level of the random intercept (default 0, the outermost). */
  level?: number;
}

const DECREMENT_TOLERANCE = 1e-10;
const MAX_STEP = 5;
const SINGULAR_THETA = 1e-4;
const EPS10 = 10 * 2 ** -52;

function checkProblem(problem: GlmmProblem): void {
  const { n, p, x, y, trials, group, family } = problem;
  if (!(n > p)) throw new RangeError(`a GLMM needs more rows than fixed effects, got n = ${n}, p = ${p}`);
  if (x.length < n * p) throw new RangeError(`the design has ${x.length} entries, expected ${n * p}`);
  if (y.length < n) throw new RangeError(`y has ${y.length} values, expected ${n}`);
  if (group.id.length < n) throw new RangeError(`grouping "${group.name}" has ${group.id.length} ids, expected ${n}`);
  if (trials && family !== 'binomial') throw new RangeError('trials apply to the binomial family only');
  for (let i = 0; i < n; i++) {
    const g = group.id[i]!;
    if (!(g >= 0 && g < group.count)) throw new RangeError(`grouping "${group.name}": id ${g} at row ${i} is outside 0…${group.count - 1}`);
    const v = y[i]!;
    const m = trials ? trials[i]! : 1;
    if (!(v >= 0 && Number.isInteger(v))) throw new RangeError(`the ${family} family needs non-negative whole numbers; row ${i} has ${v}`);
    if (family === 'binomial' && !(v <= m && Number.isInteger(m))) throw new RangeError(`binomial row ${i}: ${v} successes out of ${m} trials`);
  }
}

/** Minimises the criterion by modified Newton over φ; returns the final φ and how it went. */
class NewtonSearch {
  readonly k: number;
  private readonly gradient: Float64Array;
  private readonly plus: Float64Array;
  private readonly minus: Float64Array;
  private readonly point: Float64Array;
  readonly hessian: Float64Array;
  private readonly factor: Float64Array;
  private readonly step: Float64Array;
  private readonly trial: Float64Array;

  constructor(
    private readonly criterion: GlmmCriterion,
    readonly dimension: number,
  ) {
    const k = dimension;
    this.k = k;
    this.gradient = new Float64Array(k);
    this.plus = new Float64Array(k);
    this.minus = new Float64Array(k);
    this.point = new Float64Array(k);
    this.hessian = new Float64Array(k * k);
    this.factor = new Float64Array(k * k);
    this.step = new Float64Array(k);
    this.trial = new Float64Array(k);
  }

  /**
   * The Hessian of the deviance at φ over the first `free` coordinates, by differences of the
   * exact gradient, symmetrised (into this.hessian, free × free): central differences (accurate
   * to about 1e-9, for the SE), or forward differences from `atPhi`, the gradient at φ (half the
   * evaluations, accurate to about 1e-4: enough to steer Newton's method).
   */
  computeHessian(phi: Float64Array, free: number, atPhi?: Float64Array): boolean {
    const { point, plus, minus, hessian } = this;
    for (let c = 0; c < free; c++) {
      const h = 1e-4 * Math.max(1, Math.abs(phi[c]!));
      point.set(phi);
      point[c] = phi[c]! + h;
      if (!Number.isFinite(this.criterion.evaluate(point, plus))) return false;
      if (atPhi) {
        for (let r = 0; r < free; r++) hessian[r + c * free] = (plus[r]! - atPhi[r]!) / h;
        continue;
      }
      point[c] = phi[c]! - h;
      if (!Number.isFinite(this.criterion.evaluate(point, minus))) return false;
      for (let r = 0; r < free; r++) hessian[r + c * free] = (plus[r]! - minus[r]!) / (2 * h);
    }
    for (let c = 0; c < free; c++) {
      for (let r = 0; r < c; r++) {
        const v = 0.5 * (hessian[r + c * free]! + hessian[c + r * free]!);
        hessian[r + c * free] = v;
        hessian[c + r * free] = v;
      }
    }
    return true;
  }

  /**
   * Newton iterations over the first `free` coordinates of φ (the rest held), in place.
   * Returns the iterations used and whether the decrement met the tolerance.
   */
  minimise(phi: Float64Array, free: number, maxIterations: number): { iterations: number; converged: boolean } {
    const { gradient, hessian, factor, step, trial } = this;
    for (let iteration = 1; iteration <= maxIterations; iteration++) {
      const f = this.criterion.evaluate(phi, gradient);
      if (!Number.isFinite(f) || !this.computeHessian(phi, free, gradient)) return { iterations: iteration, converged: false };
      // (H + λI)·step = −g, λ = 0 when H is positive definite.
      let scale = 0;
      for (let c = 0; c < free; c++) scale = Math.max(scale, Math.abs(hessian[c + c * free]!));
      let lambda = 0;
      for (;;) {
        factor.set(hessian.subarray(0, free * free));
        for (let c = 0; c < free; c++) factor[c + c * free]! += lambda;
        if (choleskyDecompose(factor, free)) break;
        lambda = lambda === 0 ? 1e-8 * Math.max(scale, 1) : lambda * 10;
        if (!(lambda < 1e12 * Math.max(scale, 1))) return { iterations: iteration, converged: false };
      }
      for (let c = 0; c < free; c++) step[c] = -gradient[c]!;
      choleskySolve(factor, free, step);
      let decrement = 0;
      let longest = 0;
      for (let c = 0; c < free; c++) {
        decrement -= gradient[c]! * step[c]!;
        longest = Math.max(longest, Math.abs(step[c]!));
      }
      const done = lambda === 0 && decrement < DECREMENT_TOLERANCE;
      const shorten = longest > MAX_STEP ? MAX_STEP / longest : 1;
      let alpha = shorten;
      trial.set(phi);
      for (let halving = 0; halving < 40; halving++) {
        for (let c = 0; c < free; c++) trial[c] = phi[c]! + alpha * step[c]!;
        const ft = this.criterion.evaluate(trial);
        if (ft <= f - 1e-4 * alpha * decrement || (done && ft <= f + 1e-9 * Math.abs(f))) break;
        alpha /= 2;
      }
      phi.set(trial);
      if (done) return { iterations: iteration, converged: true };
    }
    return { iterations: maxIterations, converged: false };
  }
}

/**
 * The GLM fit (θ = 0) by IRLS on the patterns, with the analytic information XᵀWX, into φ:
 * the starting point of the GLMM. Stops when the Newton decrement is below 1e-8 (the GLMM's
 * Newton iterations refine everything) or after 50 steps.
 */
function glmStart(patterns: Patterns, phi: Float64Array): { iterations: number } {
  const { p, count, x, s, m, family } = patterns;
  let sumY = 0;
  let sumM = 0;
  for (let k = 0; k < count; k++) {
    sumY += s[k]!;
    sumM += m[k]!;
  }
  const mean = (sumY + 0.5) / (sumM + 1);
  phi.fill(0);
  phi[0] = family === 'binomial' ? Math.log(mean / (1 - mean)) : Math.log(mean);
  const info = new Float64Array(p * p);
  const score = new Float64Array(p);
  for (let iteration = 1; iteration <= 50; iteration++) {
    info.fill(0);
    score.fill(0);
    for (let k = 0; k < count; k++) {
      let eta = 0;
      for (let c = 0; c < p; c++) eta += x[k * p + c]! * phi[c]!;
      let mu: number;
      let w: number;
      if (family === 'binomial') {
        const pr = 1 / (1 + Math.exp(-eta));
        mu = m[k]! * pr;
        w = mu * (1 - pr);
      } else {
        mu = m[k]! * Math.exp(eta);
        w = mu;
      }
      for (let a = 0; a < p; a++) {
        const xa = x[k * p + a]!;
        score[a]! += (s[k]! - mu) * xa;
        for (let b = 0; b <= a; b++) info[a + b * p]! += w * xa * x[k * p + b]!;
      }
    }
    for (let a = 0; a < p; a++) for (let b = 0; b < a; b++) info[b + a * p] = info[a + b * p]!;
    if (!choleskyDecompose(info, p)) return { iterations: iteration };
    const step = Float64Array.from(score);
    choleskySolve(info, p, step);
    let decrement = 0;
    let longest = 0;
    for (let c = 0; c < p; c++) {
      decrement += step[c]! * score[c]!;
      longest = Math.max(longest, Math.abs(step[c]!));
    }
    const shorten = longest > MAX_STEP ? MAX_STEP / longest : 1;
    for (let c = 0; c < p; c++) phi[c]! += shorten * step[c]!;
    if (decrement < 1e-8) return { iterations: iteration };
  }
  return { iterations: 50 };
}

/**
 * A starting value for θ: the variance of the groups' empirical link values around the GLM fit,
 * less their average sampling variance (an ANOVA-style moment estimate on the link scale:
 * link((Σy + ½)/(Σm + 1)) with sampling variance 1/(Σm·p(1 − p)) for the binomial, ln((Σy + ½)/Σm)
 * with 1/(Σm·μ) for the Poisson), floored at 0.1². Only where Newton's method starts.
 */
function momentTheta(patterns: Patterns, phi: Float64Array): number {
  const { p, groups, groupStart, x, s, m, family } = patterns;
  let sum = 0;
  let sumSquares = 0;
  let sampling = 0;
  for (let j = 0; j < groups; j++) {
    let sy = 0;
    let sm = 0;
    let eta = 0;
    for (let k = groupStart[j]!; k < groupStart[j + 1]!; k++) {
      let e = 0;
      for (let c = 0; c < p; c++) e += x[k * p + c]! * phi[c]!;
      sy += s[k]!;
      sm += m[k]!;
      eta += m[k]! * e;
    }
    eta /= sm;
    let residual: number;
    if (family === 'binomial') {
      const pr = (sy + 0.5) / (sm + 1);
      residual = Math.log(pr / (1 - pr)) - eta;
      sampling += 1 / (sm * pr * (1 - pr));
    } else {
      const mu = (sy + 0.5) / sm;
      residual = Math.log(mu) - eta;
      sampling += 1 / (sm * mu);
    }
    sum += residual;
    sumSquares += residual * residual;
  }
  if (groups < 2) return 0.1;
  const variance = (sumSquares - (sum * sum) / groups) / (groups - 1) - sampling / groups;
  return Math.sqrt(Math.max(variance, 0.01));
}

/**
 * Fits the GLMM of `problem`. Never throws on numerical trouble (only on bad input): the result's
 * `converged` is false instead.
 */
export function fitGlmmProblem(problem: GlmmProblem, options: GlmmFitOptions = {}): GlmmFit {
  checkProblem(problem);
  const { family, n, p, x, y, trials, group, names } = problem;
  const quadraturePoints = options.quadraturePoints ?? 1;
  if (!Number.isInteger(quadraturePoints) || quadraturePoints < 1 || quadraturePoints > 25) {
    throw new RangeError(`quadraturePoints must be a whole number from 1 to 25, got ${quadraturePoints}`);
  }
  const maxIterations = options.maxIterations ?? 100;
  const patterns: Patterns = buildPatterns(family, n, p, x, y, group.id, group.count, trials);
  const criterion = new GlmmCriterion(patterns, gaussHermite(quadraturePoints));
  const search = new NewtonSearch(criterion, p + 1);

  // The GLM (θ = 0), then the GLMM from a moment estimate of θ.
  const phi = new Float64Array(p + 1);
  const start = glmStart(patterns, phi);
  phi[p] = momentTheta(patterns, phi);
  const run = search.minimise(phi, p + 1, maxIterations);
  const sigma = Math.abs(phi[p]!);
  const singular = sigma < SINGULAR_THETA;

  // The covariance at the result: 2·H⁻¹ over (β, θ), or over β alone at the boundary.
  const deviance = criterion.evaluate(phi);
  const free = singular ? p : p + 1;
  const hessianOk = search.computeHessian(phi, free);
  const inverse = new Float64Array(free * free);
  const positive = hessianOk && spdInverse(Float64Array.from(search.hessian.subarray(0, free * free)), free, inverse, new Float64Array(free * free));
  const vcovBeta = new Float64Array(p * p);
  const se = new Float64Array(p);
  for (let a = 0; a < p; a++) {
    for (let b = 0; b < p; b++) vcovBeta[a + b * p] = positive ? 2 * inverse[a + b * free]! : NaN;
    se[a] = Math.sqrt(vcovBeta[a + a * p]!);
  }

  let fitted = true;
  const modes = criterion.modes;
  const theta = sigma;
  for (let j = 0; j < patterns.groups; j++) {
    for (let k = patterns.groupStart[j]!; k < patterns.groupStart[j + 1]!; k++) {
      let eta = theta * modes[j]!;
      for (let c = 0; c < p; c++) eta += patterns.x[k * p + c]! * phi[c]!;
      if (family === 'binomial') {
        const pr = 1 / (1 + Math.exp(-eta));
        if (pr < EPS10 || pr > 1 - EPS10) fitted = false;
      } else if (Math.exp(eta) < EPS10) fitted = false;
    }
  }
  const beta = Float64Array.from(phi.subarray(0, p));
  let finite = Number.isFinite(deviance);
  for (let c = 0; c < p; c++) finite &&= Number.isFinite(beta[c]!) && Number.isFinite(se[c]!);
  return {
    names,
    beta,
    vcovBeta,
    se,
    sigma,
    deviance,
    quadraturePoints,
    iterations: start.iterations + run.iterations,
    evaluations: criterion.evaluations,
    singular,
    converged: run.converged && positive && finite && fitted,
  };
}

/** The GLMM problem of a data set and fixed part. */
export function glmmProblem(data: Dataset, fixed: FixedEffects, options: GlmmOptions = {}): { problem: GlmmProblem; target: number } {
  if (data.groups.length === 0) throw new RangeError('the glmm analysis needs a grouping level');
  const group = groupingAt(data, options.level ?? 0);
  const suited = glmFamilyOf(data.y, data.n);
  const family = options.family ?? suited;
  if (!family) throw new RangeError('glmm needs a 0/1 or a non-negative integer outcome');
  if (suited === null || (family === 'binomial' && suited !== 'binomial')) {
    throw new RangeError(`the outcome does not suit the ${family} family`);
  }
  const design = buildDesignMatrix(data, fixed);
  return {
    problem: { family, n: data.n, p: design.p, x: design.x, y: data.y, group, names: design.names },
    target: design.target,
  };
}

/** The full fit (β̂, covariance, σ̂, deviance, …) and the index of the effect of interest. */
export function fitGlmmFull(data: Dataset, fixed: FixedEffects, options: GlmmOptions = {}): GlmmFit & { target: number } {
  const { problem, target } = glmmProblem(data, fixed, options);
  return { ...fitGlmmProblem(problem, options), target };
}

/** The `glmm` analysis of the stress test: the conditional log odds or rate ratio, its SE, a z test. */
export function fitGlmm(data: Dataset, fixed: FixedEffects, options: GlmmOptions = {}): EffectEstimate {
  const fit = fitGlmmFull(data, fixed, options);
  const estimate = fit.beta[fit.target]!;
  const se = fit.se[fit.target]!;
  return { estimate, se, df: Infinity, converged: fit.converged && Number.isFinite(estimate) && se > 0 && Number.isFinite(se) };
}
