/**
 * `cluster-robust`: ordinary least squares with the CR2 cluster-robust ("bias-reduced
 * linearisation") standard error of Bell & McCaffrey (2002, Survey Methodology 28:169–181) and
 * the Satterthwaite degrees of freedom of Pustejovsky & Tipton (2018, J Bus Econ Stat
 * 36:672–683), for the working model Var(y) = σ²I:
 *
 *   V̂ = M Σ_g X_gᵀ A_g e_g e_gᵀ A_g X_g M,   M = (XᵀX)⁻¹,   A_g = (I − H_gg)^(−1/2),
 *
 * H_gg = X_g M X_gᵀ the block of the hat matrix for cluster g; the inverse square root is the
 * symmetric one, with eigenvalues of I − H_gg below 1e-12 given weight 0 (a pseudo-inverse, as
 * clubSandwich does). For the coefficient t, Var(β̂_t) = Σ_g (p_gᵀe_g)² with p_g = A_g X_g M e_t,
 * and with Ω_gh = p_gᵀ(I − H)_gh p_h the Satterthwaite df is (Σ_g Ω_gg)² / Σ_g Σ_h Ω_gh².
 *
 * Computation. With X = QR (thin Q) and z = R⁻ᵀe_t, H_gg = Q_g Q_gᵀ, so everything reduces to the
 * p × p matrix C_g = Q_gᵀQ_g: A_g X_g M e_t = Q_g S_g z with S_g = (I − C_g)^(−1/2) (same
 * eigenvalue rule), and Ω = diag(‖p_g‖²) − KᵀK with columns k_g = C_g S_g z. Cost O(n p² + G p³),
 * never an n_g × n_g matrix. Fast path for intercept + 0/1 treat with clusters nested in arms:
 * X_g has identical rows, H_gg = J/n_a, and
 *   Var = Σ_g E_g² / (n_a² (1 − n_g/n_a)),  E_g = Σ_{i∈g}(y_i − ȳ_a),
 * with the df from the same Ω in closed form (block diagonal by arm, diagonal minus rank one).
 *
 * The clusters are the groups at `level` (default 0, the outermost); a data set without grouping
 * levels is treated as one observation per cluster (CR2 then equals HC2). Reference:
 * clubSandwich::coef_test(lm, vcov = "CR2", test = "Satterthwaite"), estimates, SEs and df
 * matched to 1e-6 relative or better (fixtures/generate_models.R).
 *
 * Returns a non-converged result when the design is rank-deficient or n ≤ p.
 */
import { buildDesignMatrix, isTwoArmComparison } from './design-matrix';
import { badGroupId, clustersOf, notEstimable } from './estimate';
import { LeastSquares } from './least-squares';
import { solveUpperTransposed, symmetricEigen } from './linalg';
import { TwoArmSums } from './two-arm';
import type { Dataset, EffectEstimate, FixedEffects, Grouping } from './types';

export interface Cr2Options {
  /** Grouping level whose groups are the clusters (default 0, the outermost). */
  level?: number;
  /** Use the QR path even when the closed form applies (for tests). */
  general?: boolean;
}

/** Eigenvalues of I − H_gg at or below this get weight 0, as in clubSandwich's matrix_power. */
const EIGEN_TOLERANCE = 1e-12;

/** (1 − λ)^(−1/2) for an eigenvalue λ of H_gg, or 0 when 1 − λ is (numerically) 0. */
function inverseRoot(oneMinusLambda: number): number {
  return oneMinusLambda > EIGEN_TOLERANCE ? 1 / Math.sqrt(oneMinusLambda) : 0;
}

const sums = new TwoArmSums();

function twoArmFast(data: Dataset, grouping: Grouping): EffectEstimate | null {
  sums.compute(data.y, data.treat, data.n, grouping);
  if (!sums.nestedInArms) return null;
  const { n0, n1, clusterSize, clusterArm, clusterResidualSum } = sums;
  let v = 0;
  let e = 0;
  let sumD2 = 0;
  let sumDV = 0;
  let armV0 = 0;
  let armV1 = 0;
  for (let g = 0; g < sums.clusters; g++) {
    const a = clusterArm[g];
    if (a === -1) continue; // an empty cluster
    const ng = clusterSize[g]!;
    const na = a === 1 ? n1 : n0;
    const s2 = 1 / (na * na);
    const f = inverseRoot(1 - ng / na);
    const f2s2 = f * f * s2;
    const eg = clusterResidualSum[g]!;
    v += f2s2 * eg * eg;
    const d = ng * f2s2;
    const v2 = (f2s2 * ng * ng) / na;
    e += d - v2;
    sumD2 += d * d;
    sumDV += d * v2;
    if (a === 1) armV1 += v2;
    else armV0 += v2;
  }
  const omega2 = sumD2 - 2 * sumDV + armV0 * armV0 + armV1 * armV1;
  return { estimate: sums.mean1 - sums.mean0, se: Math.sqrt(v), df: (e * e) / omega2, converged: true };
}

const ls = new LeastSquares();
let xBuffer: Float64Array = new Float64Array(0);
let order: Int32Array = new Int32Array(0);
let start: Int32Array = new Int32Array(0);
// p-sized scratch: z, u_g, y_g, k_g; p × p: C_g, its copy, eigenvectors, S_g, KKᵀ; eigenvalues.
let z: Float64Array = new Float64Array(0);
let u: Float64Array = new Float64Array(0);
let yg: Float64Array = new Float64Array(0);
let kg: Float64Array = new Float64Array(0);
let lambda: Float64Array = new Float64Array(0);
let c: Float64Array = new Float64Array(0);
let cCopy: Float64Array = new Float64Array(0);
let vecs: Float64Array = new Float64Array(0);
let kk: Float64Array = new Float64Array(0);

function ensureScratch(n: number, p: number, count: number): void {
  if (order.length < n) order = new Int32Array(n);
  if (start.length < count + 1) start = new Int32Array(count + 1);
  if (z.length < p) {
    z = new Float64Array(p);
    u = new Float64Array(p);
    yg = new Float64Array(p);
    kg = new Float64Array(p);
    lambda = new Float64Array(p);
    c = new Float64Array(p * p);
    cCopy = new Float64Array(p * p);
    vecs = new Float64Array(p * p);
    kk = new Float64Array(p * p);
  }
}

/** Rows sorted by cluster (a counting sort): rows of cluster g are order[start[g] … start[g+1]). */
function sortRows(grouping: Grouping, n: number): void {
  const { id, count } = grouping;
  start.fill(0, 0, count + 1);
  for (let i = 0; i < n; i++) {
    const g = id[i]!;
    if (!(g >= 0 && g < count)) badGroupId(grouping.name, i, g, count);
    start[g + 1]!++;
  }
  for (let g = 0; g < count; g++) start[g + 1]! += start[g]!;
  for (let i = 0; i < n; i++) {
    const g = id[i]!;
    order[start[g]!] = i;
    start[g]!++;
  }
  for (let g = count; g > 0; g--) start[g] = start[g - 1]!;
  start[0] = 0;
}

function general(data: Dataset, fixed: FixedEffects, grouping: Grouping): EffectEstimate {
  const n = data.n;
  const design = buildDesignMatrix(data, fixed, xBuffer);
  xBuffer = design.x;
  const { p, target } = design;
  if (n <= p || ls.fit(design.x, n, p, data.y) < p) return notEstimable();
  ensureScratch(n, p, grouping.count);
  sortRows(grouping, n);
  z.fill(0, 0, p);
  z[target] = 1;
  solveUpperTransposed(ls.qr, n, p, z);
  const q = ls.thinQ();
  const e = ls.residuals;
  kk.fill(0, 0, p * p);
  let v = 0;
  let expectation = 0;
  let sumD2 = 0;
  let sumDK = 0;
  for (let g = 0; g < grouping.count; g++) {
    const from = start[g]!;
    const to = start[g + 1]!;
    if (to === from) continue;
    // C_g = Q_gᵀQ_g (upper triangle) and u_g = Q_gᵀe_g.
    c.fill(0, 0, p * p);
    u.fill(0, 0, p);
    for (let r = from; r < to; r++) {
      const i = order[r]!;
      const ei = e[i]!;
      for (let a = 0; a < p; a++) {
        const qa = q[i + a * n]!;
        u[a]! += qa * ei;
        for (let b = a; b < p; b++) c[a + b * p]! += qa * q[i + b * n]!;
      }
    }
    for (let a = 0; a < p; a++) for (let b = a + 1; b < p; b++) c[b + a * p] = c[a + b * p]!;
    cCopy.set(c.subarray(0, p * p));
    symmetricEigen(cCopy, p, lambda, vecs);
    // y_g = S_g z = W diag((1 − λ)^(−1/2)) Wᵀ z.
    yg.fill(0, 0, p);
    for (let k = 0; k < p; k++) {
      let wz = 0;
      for (let a = 0; a < p; a++) wz += vecs[a + k * p]! * z[a]!;
      wz *= inverseRoot(1 - lambda[k]!);
      for (let a = 0; a < p; a++) yg[a]! += vecs[a + k * p]! * wz;
    }
    // p_gᵀe_g = y_gᵀu_g;  k_g = C_g y_g;  ‖p_g‖² = y_gᵀC_g y_g;  ‖k_g‖².
    let pe = 0;
    let d = 0;
    let k2 = 0;
    for (let a = 0; a < p; a++) {
      pe += yg[a]! * u[a]!;
      let s = 0;
      for (let b = 0; b < p; b++) s += c[a + b * p]! * yg[b]!;
      kg[a] = s;
      d += yg[a]! * s;
      k2 += s * s;
    }
    for (let a = 0; a < p; a++) for (let b = 0; b < p; b++) kk[a + b * p]! += kg[a]! * kg[b]!;
    v += pe * pe;
    expectation += d - k2;
    sumD2 += d * d;
    sumDK += d * k2;
  }
  let kkNorm2 = 0;
  for (let a = 0; a < p * p; a++) kkNorm2 += kk[a]! * kk[a]!;
  const omega2 = sumD2 - 2 * sumDK + kkNorm2;
  return {
    estimate: ls.coef[target]!,
    se: Math.sqrt(v),
    df: (expectation * expectation) / omega2,
    converged: true,
  };
}

export function fitClusterRobust(data: Dataset, fixed: FixedEffects, options: Cr2Options = {}): EffectEstimate {
  const grouping = clustersOf(data, options.level);
  if (!options.general && isTwoArmComparison(data, fixed)) {
    if (data.n <= 2) return notEstimable();
    const fast = twoArmFast(data, grouping);
    if (fast) return fast;
  }
  return general(data, fixed, grouping);
}
