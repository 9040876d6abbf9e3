/**
 * The linear mixed model shared by the REML fitters of lib/models: the problem (fixed-effect
 * design, outcome, nested groupings, an optional random slope), the fitted result, and the two
 * rules for the degrees of freedom of a fixed effect.
 *
 *   y = Xβ + Σₗ Zₗbₗ + e,   e ~ N(0, σ²I),   bₗ ~ N(0, σ²·ΛₗΛₗᵀ) independently per group,
 *
 * with a random intercept for every grouping level and, optionally, a random slope for time at
 * the innermost level (correlated with that level's intercept, as lme4's (1 + time | unit)).
 * Λₗ is lower triangular: θ = σ_u/σ for an intercept alone, (λ₁₁, λ₂₁, λ₂₂) for an intercept
 * and a slope — the relative covariance factor of Bates, Mächler, Bolker & Walker (2015, J Stat
 * Softw 67(1), §2–3).
 */
import { choleskyDecompose, symmetricEigen } from './linalg';
import type { Grouping } from './types';

export interface MixedProblem {
  n: number;
  p: number;
  /** Column-major n × p fixed-effect design; column 0 must be the intercept (all ones). */
  x: Float64Array;
  y: Float64Array;
  /** Column names (for messages and the result). */
  names: string[];
  /** Grouping levels, outermost first; each group's rows contiguous, inner groups nested in outer ones. */
  levels: Grouping[];
  /** Time of each row when the innermost level has a random slope for it. */
  slope?: Float64Array;
}

export interface VarianceComponent {
  /** Name of the grouping level, or 'Residual'. */
  level: string;
  /** '(Intercept)' or 'time' for a variance, 'covariance' for the intercept–slope covariance, 'residual'. */
  term: '(Intercept)' | 'time' | 'covariance' | 'residual';
  /** The variance (or covariance), on the outcome's squared scale. */
  value: number;
}

export interface MixedFit {
  names: string[];
  beta: Float64Array;
  /** Covariance of β̂, column-major p × p: σ̂²·(XᵀV⁻¹X)⁻¹ evaluated at the REML estimates. */
  vcovBeta: Float64Array;
  se: Float64Array;
  /** Relative covariance parameters, outermost level first ((λ₁₁, λ₂₁, λ₂₂) for a slope level). */
  theta: Float64Array;
  sigma: number;
  /** Variance components, outermost level first, then the residual. */
  components: VarianceComponent[];
  /** −2 × the REML log-likelihood at the optimum (lme4's REMLcrit). */
  remlCriterion: number;
  /** The REML log-likelihood at the optimum, −remlCriterion / 2 (lme4's logLik(fit, REML = TRUE)). */
  remlLogLik: number;
  /** Evaluations of the profiled criterion. */
  iterations: number;
  /** A variance on the boundary 0 (a diagonal θ below 1e-4, lme4's isSingular rule). */
  singular: boolean;
  /** False on optimiser failure, non-finite values or a non-positive-definite result. */
  converged: boolean;
  /** Satterthwaite df of each coefficient (NaN where not computed). */
  dfSatterthwaite: Float64Array;
  /** Between–within df of each coefficient. */
  dfBetweenWithin: Float64Array;
}

export interface FitOptions {
  /** Coefficients whose Satterthwaite df to compute (default: all; [] for none). */
  satterthwaiteFor?: number[];
  /** Compute the between–within df (default true; NaN otherwise). */
  betweenWithin?: boolean;
}

/**
 * The fixed-effect end of the profiled criterion: with M = R_XᵀR_X (p × p, column-major) and
 * v = the reduced Xᵀy, factors M in `chol` (overwritten; M itself is read from `m`), and returns
 * log det M and ‖R_X⁻ᵀv‖² (the part of the residual sum of squares the fixed effects explain),
 * or null when M is not positive definite. `w` receives R_X⁻ᵀv.
 */
export function reduceFixed(m: Float64Array, v: Float64Array, p: number, chol: Float64Array, w: Float64Array): { logDetM: number; explained: number } | null {
  chol.set(m.subarray(0, p * p));
  if (!choleskyDecompose(chol, p)) return null;
  let logDetM = 0;
  let explained = 0;
  for (let a = 0; a < p; a++) {
    logDetM += 2 * Math.log(chol[a + a * p]!);
    let t = v[a]!;
    for (let b = 0; b < a; b++) t -= chol[a + b * p]! * w[b]!;
    w[a] = t / chol[a + a * p]!;
    explained += w[a]! * w[a]!;
  }
  return { logDetM, explained };
}

/** Theta entries of a level: 1 for a random intercept, 3 for an intercept and a slope. */
export function thetaLength(problem: MixedProblem): number {
  return problem.levels.length + (problem.slope ? 2 : 0);
}

/**
 * Checks the problem's shape: lengths, id ranges, contiguous groups, nesting, an intercept in
 * column 0, and n > p. Throws a RangeError naming what is wrong.
 */
export function checkProblem(problem: MixedProblem): void {
  const { n, p, x, y, levels } = problem;
  if (!(n > p)) throw new RangeError(`a mixed model needs more rows than fixed effects, got n = ${n}, p = ${p}`);
  if (x.length < n * p) throw new RangeError(`the design has ${x.length} entries, expected ${n * p}`);
  if (y.length < n) throw new RangeError(`y has ${y.length} values, expected ${n}`);
  if (problem.slope && problem.slope.length < n) throw new RangeError(`time has ${problem.slope.length} values, expected ${n}`);
  if (levels.length === 0) throw new RangeError('a mixed model needs at least one grouping level');
  for (let i = 0; i < n; i++) {
    if (x[i] !== 1) throw new RangeError('column 0 of the design must be the intercept (all ones)');
  }
  levels.forEach((level, l) => {
    const { id, count } = level;
    if (id.length < n) throw new RangeError(`grouping "${level.name}" has ${id.length} ids, expected ${n}`);
    const seen = new Uint8Array(count);
    for (let i = 0; i < n; i++) {
      const g = id[i]!;
      if (!(g >= 0 && g < count)) throw new RangeError(`grouping "${level.name}": id ${g} at row ${i} is outside 0…${count - 1}`);
      if (i > 0 && g !== id[i - 1] && seen[g]) {
        throw new RangeError(`grouping "${level.name}": the rows of group ${g} are not contiguous`);
      }
      if (l > 0 && i > 0 && g === id[i - 1] && levels[l - 1]!.id[i] !== levels[l - 1]!.id[i - 1]) {
        throw new RangeError(`grouping "${level.name}": group ${g} spans two groups of "${levels[l - 1]!.name}" (not nested)`);
      }
      seen[g] = 1;
    }
  });
}

/** Number of groups with at least one row. */
function groupsPresent(level: Grouping, n: number): number {
  let m = 0;
  for (let i = 0; i < n; i++) if (i === 0 || level.id[i] !== level.id[i - 1]) m++;
  return m;
}

/**
 * Between–within ("containment") degrees of freedom of each fixed effect, by the rule of nlme's
 * lme (Pinheiro & Bates 2000, Mixed-Effects Models in S and S-PLUS, §2.4.2 — not in the
 * product's list of methods; section from memory, the rule checked against nlme 3.1-162 in
 * fixtures/mixed.json): the rows are split
 * into strata — the outermost level's groups, each inner level's groups beyond the outer ones,
 * and the residual — with m₁, m₂ − m₁, …, n − m_Q units; a column that varies within groups of
 * level l (innermost such l) is estimated in the stratum below l, otherwise in the outermost
 * stratum; each stratum loses one df per column estimated in it (the outermost one also the
 * intercept's), and a column's df is its stratum's. The intercept gets the largest.
 *
 * For a two-arm cluster trial with J clusters this gives J − 2 for the treatment; for a
 * within-unit time effect, n − J − (number of within columns).
 */
export function betweenWithinDf(problem: MixedProblem): Float64Array {
  const { n, p, x, levels } = problem;
  const strata = levels.length + 1;
  const df = new Float64Array(strata);
  let previous = 0;
  levels.forEach((level, l) => {
    const m = groupsPresent(level, n);
    df[l] = m - previous;
    previous = m;
  });
  df[strata - 1] = n - previous;
  const stratumOf = new Int32Array(p);
  for (let c = 1; c < p; c++) {
    const col = c * n;
    let innermost = -1;
    for (let l = levels.length - 1; l >= 0 && innermost < 0; l--) {
      const id = levels[l]!.id;
      for (let i = 1; i < n; i++) {
        if (id[i] === id[i - 1] && x[col + i] !== x[col + i - 1]) {
          innermost = l;
          break;
        }
      }
    }
    stratumOf[c] = innermost + 1;
    df[innermost + 1]! -= 1;
  }
  df[0]! -= 1;
  const out = new Float64Array(p);
  let largest = -Infinity;
  for (let s = 0; s < strata; s++) largest = Math.max(largest, df[s]!);
  out[0] = largest;
  for (let c = 1; c < p; c++) out[c] = df[stratumOf[c]!]!;
  return out;
}

/**
 * Satterthwaite (1946) degrees of freedom for a variance estimate v = Var(ℓᵀβ̂)(φ̂) that depends
 * on the variance parameters φ: df = 2v² / (gᵀAg), with g = ∂v/∂φ and A = 2·H⁻¹ the asymptotic
 * covariance of φ̂ from the Hessian H of the REML deviance (−2 log-likelihood) — the computation
 * of lmerTest (Kuznetsova, Brockhoff & Christensen 2017, J Stat Softw 82(13); not in the
 * product's list of methods), including its handling of a singular H: a Moore–Penrose inverse
 * over the eigenvalues above 1e-8.
 *
 * `hessian` (m × m, column-major) is overwritten. Returns the df and the smallest eigenvalue of
 * H (negative when the fit is not a minimum). gᵀAg = 0 gives df = Infinity.
 */
export function satterthwaiteDf(
  hessian: Float64Array,
  m: number,
  gradients: Float64Array[],
  variances: ArrayLike<number>,
): { df: Float64Array; minEigenvalue: number } {
  const values = new Float64Array(m);
  const vectors = new Float64Array(m * m);
  symmetricEigen(hessian, m, values, vectors);
  let minEigenvalue = Infinity;
  for (let k = 0; k < m; k++) minEigenvalue = Math.min(minEigenvalue, values[k]!);
  const df = new Float64Array(gradients.length);
  gradients.forEach((g, c) => {
    let quad = 0;
    for (let k = 0; k < m; k++) {
      const lambda = values[k]!;
      if (!(lambda > 1e-8)) continue;
      let proj = 0;
      for (let i = 0; i < m; i++) proj += vectors[i + k * m]! * g[i]!;
      quad += (2 * proj * proj) / lambda;
    }
    const v = variances[c]!;
    df[c] = quad > 0 ? (2 * v * v) / quad : Infinity;
  });
  return { df, minEigenvalue };
}

/** The means the fitters centre at: of y, and of the columns 1…p−1 of X (xMean[0] = 0). */
export function centringMeans(problem: MixedProblem): { xMean: Float64Array; yMean: number } {
  const { n, p, x, y } = problem;
  const xMean = new Float64Array(p);
  let yMean = 0;
  for (let i = 0; i < n; i++) yMean += y[i]!;
  yMean /= n;
  for (let c = 1; c < p; c++) {
    let s = 0;
    for (let i = 0; i < n; i++) s += x[c * n + i]!;
    xMean[c] = s / n;
  }
  return { xMean, yMean };
}

/**
 * The fitters centre the columns 1…p−1 and y at their means; the coefficient of column k ≥ 1 is
 * unchanged, the intercept becomes β₀ = β₀ᶜ − Σ x̄_c·β_c (+ ȳ). This is the contrast ℓ with
 * β_k = ℓᵀβᶜ (+ ȳ for k = 0) in centred coordinates.
 */
export function centredContrast(xMean: Float64Array, k: number): Float64Array {
  const p = xMean.length;
  const l = new Float64Array(p);
  if (k === 0) {
    l[0] = 1;
    for (let c = 1; c < p; c++) l[c] = -xMean[c]!;
  } else l[k] = 1;
  return l;
}

/**
 * β̂, its covariance and SEs in the original coordinates from the centred fit: β̂ᶜ, M⁻¹ =
 * (XᶜᵀV⁻¹Xᶜ)⁻¹·σ² / σ², σ̂², and the centring means. Also returns the contrasts ℓ_k (β_k = ℓ_kᵀβᶜ,
 * + ȳ for the intercept), which the Satterthwaite gradients need.
 */
export function uncentre(
  betaCentred: Float64Array,
  mInverse: Float64Array,
  sigma2: number,
  xMean: Float64Array,
  yMean: number,
): { beta: Float64Array; vcovBeta: Float64Array; se: Float64Array; contrasts: Float64Array[] } {
  const p = xMean.length;
  const contrasts = Array.from({ length: p }, (_, k) => centredContrast(xMean, k));
  const beta = new Float64Array(p);
  const vcovBeta = new Float64Array(p * p);
  const se = new Float64Array(p);
  for (let a = 0; a < p; a++) {
    let b = a === 0 ? yMean : 0;
    for (let i = 0; i < p; i++) b += contrasts[a]![i]! * betaCentred[i]!;
    beta[a] = b;
    for (let c = 0; c < p; c++) {
      let t = 0;
      for (let i = 0; i < p; i++) for (let j = 0; j < p; j++) t += contrasts[a]![i]! * mInverse[i + j * p]! * contrasts[c]![j]!;
      vcovBeta[a + c * p] = sigma2 * t;
    }
    se[a] = Math.sqrt(vcovBeta[a + a * p]!);
  }
  return { beta, vcovBeta, se, contrasts };
}
