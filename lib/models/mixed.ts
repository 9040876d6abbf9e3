/**
 * The `mixed` analysis: a linear mixed model fitted by REML, with a random intercept at each
 * grouping level of the data set (nested levels, outermost first) and, optionally, a random
 * slope for time at the innermost level, correlated with that level's intercept (lme4's
 * `y ~ treat + … + (1 | tray/plant)` or `(1 + time | volunteer)`). The effect of interest is the
 * coefficient of `treat` or `treat:time`, with its model-based SE and the degrees of freedom of
 * Satterthwaite (1946), as lmerTest reports them, or the cheaper between–within rule of nlme.
 * (Kenward–Roger is not implemented.)
 *
 * Method: the profiled REML criterion of Bates, Mächler, Bolker & Walker (2015, J Stat Softw
 * 67(1), §3). One level with a random intercept goes through per-cluster sufficient statistics
 * and a one-dimensional search (mixed-random-intercept.ts, O(J·p²) per evaluation); nested
 * levels and random slopes through the block-diagonal penalised least squares of mixed-reml.ts.
 *
 * Accuracy (fixtures/mixed.json: 26 data sets — lme4's Dyestuff and sleepstudy, generated
 * cluster, three-level, singular, random-slope and nested random-slope designs, and replicates
 * of the stress test's reference designs — against lme4 1.1-31, lmerTest 3.1-3 and nlme 3.1-162
 * from Debian), measured: β̂ within 2e-9 of max(|β̂|, SE), SEs within 2e-7, variances within
 * 9e-7, the REML criterion within 5e-15, Satterthwaite df within 7e-7 (lmerTest differentiates
 * numerically; its own error is of that order), between–within df exactly.
 *
 * Convergence: `converged` is false when the optimiser runs out of evaluations, a value is not
 * finite, or the fit is not a minimum (the Hessian of the REML deviance has a clearly negative
 * eigenvalue). A variance estimated as 0 (a singular fit) is a legitimate, converged fit, as in
 * lme4; `singular` reports it.
 *
 * Bad input (no grouping level, a missing column, groups not contiguous or not nested, n ≤ p,
 * a random slope without a time column): throws a RangeError naming the problem.
 */
import { buildDesignMatrix } from './design-matrix';
import { checkProblem, type FitOptions, type MixedFit, type MixedProblem } from './mixed-model';
import { fitRandomIntercept } from './mixed-random-intercept';
import { fitProfiledReml } from './mixed-reml';
import type { Dataset, EffectEstimate, FixedEffects, Grouping } from './types';

export type { FitOptions, MixedFit, MixedProblem, VarianceComponent } from './mixed-model';

export interface MixedOptions {
  /**
   * A random slope for time at the innermost grouping level, correlated with its intercept.
   * Default: true when the effect of interest is `treat:time` (a difference in slopes is judged
   * against the spread of the units' slopes), false otherwise.
   */
  randomSlope?: boolean;
  /** Degrees of freedom of the effect's t reference: Satterthwaite (default) or between–within. */
  df?: 'satterthwaite' | 'between-within';
}

export interface MixedFitResult extends MixedFit {
  /** Index of the effect of interest among the coefficients. */
  target: number;
}

/**
 * Fits a mixed model given directly by its fixed-effect design (column 0 the intercept),
 * outcome and groupings — for models outside the `FixedEffects` family (e.g. an intercept-only
 * model for variance components of pilot data). By default computes both df rules for every
 * coefficient; df not computed are NaN.
 */
export function fitLinearMixedModel(problem: MixedProblem, options: FitOptions = {}): MixedFit {
  checkProblem(problem);
  return problem.levels.length === 1 && !problem.slope ? fitRandomIntercept(problem, options) : fitProfiledReml(problem, options);
}

function allSingletons(level: Grouping, n: number): boolean {
  for (let i = 1; i < n; i++) if (level.id[i] === level.id[i - 1]) return false;
  return true;
}

/** The mixed-model problem of a data set and fixed part. */
export function mixedProblem(data: Dataset, fixed: FixedEffects, options: MixedOptions = {}): { problem: MixedProblem; target: number } {
  if (data.groups.length === 0) throw new RangeError('the mixed analysis needs at least one grouping level');
  const design = buildDesignMatrix(data, fixed);
  const randomSlope = options.randomSlope ?? fixed.target === 'treat:time';
  if (randomSlope && !data.time) throw new RangeError('a random slope for time needs the time column');
  // A level whose groups all hold a single row is the residual itself (its variance is not
  // identifiable apart from σ²): it is left out, unless it carries the random slope.
  const levels = data.groups.filter(
    (level, l) => (randomSlope && l === data.groups.length - 1) || !allSingletons(level, data.n),
  );
  if (levels.length === 0) throw new RangeError('the mixed analysis needs a grouping level with more than one row per group');
  const problem: MixedProblem = {
    n: data.n,
    p: design.p,
    x: design.x,
    y: data.y,
    names: design.names,
    levels,
    ...(randomSlope ? { slope: data.time } : {}),
  };
  return { problem, target: design.target };
}

/**
 * The full fit — β̂, its covariance, variance components (σ² per level and residual), the REML
 * criterion, evaluations used, and both df rules for every coefficient — for the pilot-data
 * feature and for checking.
 */
export function fitMixedFull(data: Dataset, fixed: FixedEffects, options: MixedOptions = {}): MixedFitResult {
  const { problem, target } = mixedProblem(data, fixed, options);
  return { ...fitLinearMixedModel(problem), target };
}

/** The `mixed` analysis of the stress test: the effect of interest, its SE and df. */
export function fitMixed(data: Dataset, fixed: FixedEffects, options: MixedOptions = {}): EffectEstimate {
  const { problem, target } = mixedProblem(data, fixed, options);
  const useSatterthwaite = (options.df ?? 'satterthwaite') === 'satterthwaite';
  const fit = fitLinearMixedModel(problem, { satterthwaiteFor: useSatterthwaite ? [target] : [], betweenWithin: !useSatterthwaite });
  const df = useSatterthwaite ? fit.dfSatterthwaite[target]! : fit.dfBetweenWithin[target]!;
  const estimate = fit.beta[target]!;
  const se = fit.se[target]!;
  return {
    estimate,
    se,
    df,
    converged: fit.converged && Number.isFinite(estimate) && se > 0 && Number.isFinite(se) && df > 0,
  };
}
