/**
 * `huber`: Huber M-estimation of the linear model (Huber 1964, Ann Math Stat 35:73–101; Huber
 * 1981, Robust Statistics), ψ(u) = max(−k, min(k, u)) with k = 1.345 (95% efficiency at the
 * normal), scale by the MAD of the residuals, fitted by iteratively reweighted least squares.
 *
 * The iteration is that of MASS::rlm (Venables & Ripley 2002, Modern Applied Statistics with S,
 * 4th ed.) with its defaults, step for step, so the estimates agree with rlm's:
 *   start from OLS; repeat: s = median|e|/0.6745; w_i = min(1, k·s/|e_i|); weighted LS;
 *   stop when ‖e_new − e_old‖/‖e_old‖ ≤ tolerance (1e-4) or after maxIterations (20).
 * The scale reported with the fit is the s of the last iteration (rlm's `s`).
 *
 * Standard error (option `se`):
 * - 'sandwich' (default): the heteroskedasticity-robust sandwich for an M-estimator with the scale
 *   held fixed (Huber 1967, Proc. Fifth Berkeley Symp. 1:221–233 — from memory),
 *     V̂ = s² (XᵀD X)⁻¹ (Σ_i ψ(r_i)² x_i x_iᵀ) (XᵀD X)⁻¹,  r_i = e_i/s,  D = diag(ψ′(r_i)),
 *   which is what sandwich::sandwich() returns for an rlm fit (bread.rlm and estfun.rlm). It
 *   stays valid when the error variance differs between arms, one of the stress-test scenarios.
 * - 'model': Huber's covariance under i.i.d. symmetric errors with his small-sample correction κ,
 *     SE_t = κ·√[Σψ(r_i)²/(n − p)]·s/m·√[(XᵀX)⁻¹]_tt,  m = mean ψ′,  κ = 1 + p·var(ψ′)/(n·m²),
 *   which is what summary(rlm) reports (its default method "XtX").
 * df = n − p in both cases (rlm's residual df, which summary.rlm reports).
 *
 * Fast path for intercept + 0/1 treat: each weighted least-squares step is a pair of weighted
 * arm means, and both SEs have closed forms (see twoArmSandwichSe, twoArmModelSe).
 *
 * Reference: MASS::rlm(psi = psi.huber, k = 1.345) estimates, summary() SEs and
 * sandwich::sandwich() SEs, to 1e-6 relative (fixtures/generate_models.R).
 *
 * `converged` is false when the iteration did not meet its tolerance within maxIterations (rlm
 * warns then), when the design is rank-deficient or n ≤ p, or when the MAD is 0 (more than half
 * the observations fitted exactly: no scale, no standard error).
 */
import { buildDesignMatrix, isTwoArmComparison } from './design-matrix';
import { notEstimable } from './estimate';
import { LeastSquares } from './least-squares';
import type { Dataset, EffectEstimate, FixedEffects } from './types';

export interface HuberOptions {
  /** Tuning constant (default 1.345). */
  k?: number;
  /** Stop when the relative change of the residual vector is at most this (default 1e-4, as rlm). */
  tolerance?: number;
  /** At most this many reweighting steps (default 20, as rlm). */
  maxIterations?: number;
  /** Which standard error (default 'sandwich'; see above). */
  se?: 'sandwich' | 'model';
  /** Use the QR path even when the closed form applies (for tests). */
  general?: boolean;
}

/** Φ⁻¹(0.75) as rlm rounds it. */
const MAD_CONSTANT = 0.6745;

const ls = new LeastSquares();
const sandwichLs = new LeastSquares();
let xBuffer: Float64Array = new Float64Array(0);
let resid: Float64Array = new Float64Array(0);
let previous: Float64Array = new Float64Array(0);
let sorted: Float64Array = new Float64Array(0);
let sqrtW: Float64Array = new Float64Array(0);
let z: Float64Array = new Float64Array(0);

function ensure(n: number, p: number): void {
  if (resid.length < n) {
    resid = new Float64Array(n);
    previous = new Float64Array(n);
    sorted = new Float64Array(n);
    sqrtW = new Float64Array(n);
  }
  if (z.length < p) z = new Float64Array(p);
}

/**
 * Rearranges a[0 … n) so that a[k] is the k-th smallest (0-based), everything before it no
 * larger and everything after it no smaller (Hoare's selection with a median-of-three pivot;
 * expected O(n)).
 */
function select(a: Float64Array, n: number, k: number): number {
  let lo = 0;
  let hi = n - 1;
  while (hi > lo) {
    const mid = (lo + hi) >> 1;
    // Median of three to a[mid], then use it as the pivot.
    if (a[mid]! < a[lo]!) swap(a, mid, lo);
    if (a[hi]! < a[lo]!) swap(a, hi, lo);
    if (a[hi]! < a[mid]!) swap(a, hi, mid);
    const pivot = a[mid]!;
    let i = lo;
    let j = hi;
    while (i <= j) {
      while (a[i]! < pivot) i++;
      while (a[j]! > pivot) j--;
      if (i <= j) {
        swap(a, i, j);
        i++;
        j--;
      }
    }
    if (k <= j) hi = j;
    else if (k >= i) lo = i;
    else break;
  }
  return a[k]!;
}

function swap(a: Float64Array, i: number, j: number): void {
  const t = a[i]!;
  a[i] = a[j]!;
  a[j] = t;
}

/** median(|e|)/0.6745, R's median (mean of the two middle values when n is even). */
function madScale(e: Float64Array, n: number): number {
  const a = sorted;
  for (let i = 0; i < n; i++) a[i] = Math.abs(e[i]!);
  const h = n >> 1;
  if (n % 2 === 1) return select(a, n, h) / MAD_CONSTANT;
  const lower = select(a, n, h - 1);
  // Everything from h − 1 on is ≥ lower: the next order statistic is the smallest of a[h …].
  let upper = Infinity;
  for (let i = h; i < n; i++) if (a[i]! < upper) upper = a[i]!;
  return (lower + upper) / 2 / MAD_CONSTANT;
}

/**
 * The two-arm fast path's weighted least squares: weighted arm means (all weights 1 when `sqrtW`
 * is null), residuals into `resid`; returns m₁ − m₀, or NaN when an arm has no weight.
 */
function twoArmStep(y: Float64Array, treat: Float64Array, n: number, weighted: boolean): number {
  let w0 = 0;
  let w1 = 0;
  let s0 = 0;
  let s1 = 0;
  for (let i = 0; i < n; i++) {
    const w = weighted ? sqrtW[i]! * sqrtW[i]! : 1;
    if (treat[i] === 1) {
      w1 += w;
      s1 += w * y[i]!;
    } else {
      w0 += w;
      s0 += w * y[i]!;
    }
  }
  if (!(w0 > 0 && w1 > 0)) return NaN;
  let m0 = s0 / w0;
  let m1 = s1 / w1;
  // A second pass: the weighted mean of the deviations corrects the rounding of the first.
  let c0 = 0;
  let c1 = 0;
  for (let i = 0; i < n; i++) {
    const w = weighted ? sqrtW[i]! * sqrtW[i]! : 1;
    if (treat[i] === 1) c1 += w * (y[i]! - m1);
    else c0 += w * (y[i]! - m0);
  }
  m0 += c0 / w0;
  m1 += c1 / w1;
  for (let i = 0; i < n; i++) resid[i] = y[i]! - (treat[i] === 1 ? m1 : m0);
  return m1 - m0;
}

export function fitHuber(data: Dataset, fixed: FixedEffects, options: HuberOptions = {}): EffectEstimate {
  const k = options.k ?? 1.345;
  const tolerance = options.tolerance ?? 1e-4;
  const maxIterations = options.maxIterations ?? 20;
  const n = data.n;
  const twoArm = !options.general && isTwoArmComparison(data, fixed);
  const design = twoArm ? null : buildDesignMatrix(data, fixed, xBuffer);
  if (design) xBuffer = design.x;
  const p = design ? design.p : 2;
  if (n <= p) return notEstimable();
  ensure(n, p);
  // One weighted least-squares step (unweighted at the start); residuals into `resid`.
  const step = (weighted: boolean): number => {
    if (!design) return twoArmStep(data.y, data.treat, n, weighted);
    if (ls.fit(design.x, n, p, data.y, weighted ? sqrtW : undefined) < p) return NaN;
    resid.set(ls.residuals.subarray(0, n));
    return ls.coef[design.target]!;
  };
  let estimate = step(false);
  if (Number.isNaN(estimate)) return notEstimable();
  let scale = NaN;
  let done = false;
  for (let iteration = 0; iteration < maxIterations; iteration++) {
    previous.set(resid.subarray(0, n));
    scale = madScale(resid, n);
    if (scale === 0) return notEstimable();
    const ks = k * scale;
    for (let i = 0; i < n; i++) {
      const a = Math.abs(resid[i]!);
      sqrtW[i] = a <= ks ? 1 : Math.sqrt(ks / a);
    }
    estimate = step(true);
    if (Number.isNaN(estimate)) return notEstimable();
    let diff = 0;
    let old = 0;
    for (let i = 0; i < n; i++) {
      const d = previous[i]! - resid[i]!;
      diff += d * d;
      old += previous[i]! * previous[i]!;
    }
    if (Math.sqrt(diff / Math.max(1e-20, old)) <= tolerance) {
      done = true;
      break;
    }
  }
  let se: number;
  if (design) {
    const { x, target } = design;
    se = options.se === 'model' ? modelSe(x, n, p, target, scale, k) : sandwichSe(x, n, p, target, scale, k);
  } else {
    se = options.se === 'model' ? twoArmModelSe(data.treat, n, scale, k) : twoArmSandwichSe(data.treat, n, scale, k);
  }
  return { estimate, se, df: n - p, converged: done && Number.isFinite(se) };
}

/**
 * The sandwich SE for intercept + 0/1 treat: XᵀDX is diagonal by arm with the arms' counts of
 * observations inside ±k·s, so Var = s²·Σ_a Σ_{i∈a} ψ(r_i)² / n_in,a².
 */
function twoArmSandwichSe(treat: Float64Array, n: number, s: number, k: number): number {
  let in0 = 0;
  let in1 = 0;
  let psi0 = 0;
  let psi1 = 0;
  for (let i = 0; i < n; i++) {
    const r = resid[i]! / s;
    const psi = r > k ? k : r < -k ? -k : r;
    const inside = Math.abs(r) <= k ? 1 : 0;
    if (treat[i] === 1) {
      in1 += inside;
      psi1 += psi * psi;
    } else {
      in0 += inside;
      psi0 += psi * psi;
    }
  }
  if (in0 === 0 || in1 === 0) return NaN;
  return s * Math.sqrt(psi0 / (in0 * in0) + psi1 / (in1 * in1));
}

/** summary.rlm's SE for intercept + 0/1 treat: [(XᵀX)⁻¹]_tt = 1/n₀ + 1/n₁. */
function twoArmModelSe(treat: Float64Array, n: number, s: number, k: number): number {
  let n1 = 0;
  for (let i = 0; i < n; i++) if (treat[i] === 1) n1++;
  return huberStddev(n, 2, s, k) * Math.sqrt(1 / (n - n1) + 1 / n1);
}

/** summary.rlm's κ·√[Σψ(r_i)²/(n − p)]·s/m. */
function huberStddev(n: number, p: number, s: number, k: number): number {
  let sumPsi2 = 0;
  let inside = 0;
  for (let i = 0; i < n; i++) {
    const r = resid[i]! / s;
    const psi = r > k ? k : r < -k ? -k : r;
    sumPsi2 += psi * psi;
    if (Math.abs(r) <= k) inside++;
  }
  const m = inside / n;
  // var(ψ′) with divisor n − 1, ψ′ being 0/1.
  const varPsiPrime = (inside * (1 - m)) / (n - 1);
  const kappa = 1 + (p * varPsiPrime) / (n * m * m);
  return Math.sqrt((s * s * sumPsi2) / (n - p)) * (kappa / m);
}

/** sandwich::sandwich() for rlm; NaN when fewer than p observations lie inside ±k·s. */
function sandwichSe(x: Float64Array, n: number, p: number, target: number, s: number, k: number): number {
  // (XᵀDX)⁻¹ from the QR of the rows with ψ′ = 1 (|r| ≤ k; D is 0/1 for Huber's ψ).
  for (let i = 0; i < n; i++) sqrtW[i] = Math.abs(resid[i]! / s) <= k ? 1 : 0;
  if (sandwichLs.fit(x, n, p, resid, sqrtW) < p) return NaN;
  const cov = sandwichLs.unscaledCovariance();
  for (let j = 0; j < p; j++) z[j] = cov[j + target * p]!;
  let v = 0;
  for (let i = 0; i < n; i++) {
    const r = resid[i]! / s;
    const psi = r > k ? k : r < -k ? -k : r;
    let zx = 0;
    for (let j = 0; j < p; j++) zx += z[j]! * x[i + j * n]!;
    const t = zx * psi;
    v += t * t;
  }
  return s * Math.sqrt(v);
}

/** summary.rlm's standard error (method "XtX"). */
function modelSe(x: Float64Array, n: number, p: number, target: number, s: number, k: number): number {
  const stddev = huberStddev(n, p, s, k);
  // (XᵀX)⁻¹ from the unweighted QR.
  if (sandwichLs.fit(x, n, p, resid) < p) return NaN;
  const cov = sandwichLs.unscaledCovariance();
  return stddev * Math.sqrt(cov[target + target * p]!);
}
