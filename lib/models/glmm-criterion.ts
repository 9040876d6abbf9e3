/**
 * The deviance of a generalised linear mixed model with one random intercept and its exact
 * gradient, for lib/models/glmm.ts:
 *
 *   y_i | b_j ~ binomial(m_i, expit(η_i)) or Poisson(exp(η_i)),   η_i = x_iᵀβ + θ·u_j,
 *   u_j ~ N(0, 1) independently per group j,
 *
 * so the random intercept b_j = θ·u_j has SD |θ| (lme4's spherical random effects with relative
 * covariance factor θ; Bates, Mächler, Bolker & Walker 2015, J Stat Softw 67(1), §2). Both
 * families use their canonical links: ℓ_i(η) = s_i·η − m_i·b(η) + c_i with the cumulant
 * b(η) = ln(1 + e^η) (binomial, m_i trials) or e^η (Poisson, m_i = 1), whose derivatives give
 * the mean m·b′, the weight w = m·b″ and its derivative w′ = m·b‴.
 *
 * The likelihood of group j is the one-dimensional integral
 *   I_j = ∫ exp(g_j(u)) du/√(2π),   g_j(u) = Σ_{i∈j} ℓ_i(x_iᵀβ + θu) − u²/2,
 * approximated by adaptive Gauss–Hermite quadrature centred at the mode û_j and scaled by
 * s_j = D_j^(−1/2), D_j = −g_j″(û_j) = 1 + θ²Σ w_i(û_j) (Liu & Pierce 1994, Biometrika 81:624;
 * Pinheiro & Bates 1995, J Comput Graph Stat 4:12 — from memory):
 *   I_j ≈ s_j Σ_k w_k exp(g_j(û_j + s_j z_k) + z_k²/2),
 * with the Q-point rule (z_k, w_k) of gauss-hermite.ts. Q = 1 is the Laplace approximation
 * e^{g(û)}/√D. The deviance is −2 Σ_j ln I_j: −2 × the approximated log-likelihood with every
 * constant (binomial coefficients, −ln y!), lme4's deviance for nAGQ = 1 and its nAGQ > 1
 * deviance plus the saturated model's (which lme4 leaves out there).
 *
 * The mode. g_j is strictly concave (g″ ≤ −1), so Newton's method on g′(u) = θΣ(s_i − μ_i) − u,
 * kept inside a bracket that shrinks with every step (bisection when a step leaves it), finds û_j
 * from any start; it starts from the previous evaluation's mode and stops when the step is below
 * 1e-14·(1 + |u|). The bracket: û ∈ [−θΣm_i, θΣm_i] (binomial), (−∞, θΣs_i] (Poisson).
 *
 * The gradient in φ = (β, θ), exact for the quadrature formula as it stands (the nodes move with
 * û and s): by the implicit function theorem dû/dφ = g_uφ/D, and with R_k = Σ(s_i − μ_i(u_k)),
 *   d ln I/dφ = −½ (dD/dφ)/D + Σ_k π_k [∂g/∂φ(u_k) + g′(u_k)·(dû/dφ + z_k·ds/dφ)],
 * π_k the normalised terms of the sum; for Q = 1 it reduces to −½ (dD/dφ)/D + ∂g/∂φ(û).
 * θ enters only as θ² and θu, and the deviance is even in θ: evaluated at |θ| with the sign of
 * the θ-derivative restored, so the optimiser may move through 0.
 *
 * Rows with the same group and the same x (and all binomial rows of a group with equal x) share
 * η, so consecutive such rows are merged into one pattern with summed s, m and constants:
 * a cluster-randomised design without covariates costs O(groups) per evaluation.
 */
import type { QuadratureRule } from './gauss-hermite';
import { logGamma } from '@/lib/stats/log-gamma';

export type GlmmFamily = 'binomial' | 'poisson';

/** The data of a GLMM fit, merged into patterns that share η. */
export interface Patterns {
  family: GlmmFamily;
  p: number;
  /** Number of patterns and groups (groups with at least one row). */
  count: number;
  groups: number;
  /** Pattern k's row of X (row-major, count × p). */
  x: Float64Array;
  /** Σ y and Σ trials (binomial) or number of rows (Poisson) per pattern. */
  s: Float64Array;
  m: Float64Array;
  /** Patterns of group j: groupStart[j] … groupStart[j + 1] − 1. */
  groupStart: Int32Array;
  /** Σ of the per-row constants (ln C(m, y) or −ln y!). */
  constant: number;
}

/**
 * Merges consecutive rows with the same group and x into patterns, and orders the patterns by
 * group. `x` is column-major n × p; `trials` (binomial only) defaults to 1 per row.
 */
export function buildPatterns(
  family: GlmmFamily,
  n: number,
  p: number,
  x: Float64Array,
  y: Float64Array,
  groupId: Int32Array,
  groupCount: number,
  trials?: Float64Array,
): Patterns {
  // Pass 1: runs of identical (group, x) rows.
  const runStart: number[] = [];
  for (let i = 0; i < n; i++) {
    let same = i > 0 && groupId[i] === groupId[i - 1];
    for (let c = 0; same && c < p; c++) same = x[i + c * n] === x[i - 1 + c * n];
    if (!same) runStart.push(i);
  }
  const count = runStart.length;
  runStart.push(n);
  // Counting sort of the runs by group.
  const perGroup = new Int32Array(groupCount + 1);
  for (let r = 0; r < count; r++) perGroup[groupId[runStart[r]!]! + 1]!++;
  for (let j = 0; j < groupCount; j++) perGroup[j + 1]! += perGroup[j]!;
  const next = perGroup.slice(0, groupCount);
  const px = new Float64Array(count * p);
  const ps = new Float64Array(count);
  const pm = new Float64Array(count);
  let constant = 0;
  for (let r = 0; r < count; r++) {
    const first = runStart[r]!;
    const k = next[groupId[first]!]!++;
    for (let c = 0; c < p; c++) px[k * p + c] = x[first + c * n]!;
    for (let i = first; i < runStart[r + 1]!; i++) {
      const yi = y[i]!;
      const mi = family === 'binomial' ? (trials ? trials[i]! : 1) : 1;
      ps[k]! += yi;
      pm[k]! += mi;
      if (family === 'poisson') constant -= logGamma(yi + 1);
      else if (mi > 1) constant += logGamma(mi + 1) - logGamma(yi + 1) - logGamma(mi - yi + 1);
    }
  }
  // Groups without rows are dropped from the start index (they contribute nothing).
  const starts: number[] = [];
  for (let j = 0; j < groupCount; j++) if (perGroup[j + 1]! > perGroup[j]!) starts.push(perGroup[j]!);
  starts.push(count);
  return { family, p, count, groups: starts.length - 1, x: px, s: ps, m: pm, groupStart: Int32Array.from(starts), constant };
}

/** ln(1 + e^η) without overflow. */
function log1pExp(eta: number): number {
  return eta > 0 ? eta + Math.log1p(Math.exp(-eta)) : Math.log1p(Math.exp(eta));
}

/**
 * Evaluates the deviance and its gradient; owns the scratch space of one fit (the modes carry
 * over from one evaluation to the next as starting values).
 */
export class GlmmCriterion {
  readonly modes: Float64Array;
  /** D_j at the last evaluation (for the conditional modes' SDs). */
  readonly curvature: Float64Array;
  /** Evaluations so far. */
  evaluations = 0;
  private readonly eta0: Float64Array;
  private readonly a: Float64Array;
  private readonly r: Float64Array;
  private readonly rx: Float64Array;
  private readonly u: Float64Array;
  private readonly wx: Float64Array;
  private readonly w1x: Float64Array;
  private readonly du: Float64Array;
  private readonly dd: Float64Array;
  private readonly groupGradient: Float64Array;
  /** Per group: Σ trials (binomial) and Σ y, for the brackets of the modes. */
  private readonly groupTrials: Float64Array;
  private readonly groupTotals: Float64Array;

  constructor(
    readonly patterns: Patterns,
    readonly rule: QuadratureRule,
  ) {
    const { p, groups } = patterns;
    const q = rule.nodes.length;
    this.modes = new Float64Array(groups);
    this.curvature = new Float64Array(groups);
    this.eta0 = new Float64Array(patterns.count);
    this.a = new Float64Array(q);
    this.r = new Float64Array(q);
    this.u = new Float64Array(q);
    this.rx = new Float64Array(q * p);
    this.wx = new Float64Array(p);
    this.w1x = new Float64Array(p);
    this.du = new Float64Array(p + 1);
    this.dd = new Float64Array(p + 1);
    this.groupGradient = new Float64Array(p + 1);
    this.groupTrials = new Float64Array(groups);
    this.groupTotals = new Float64Array(groups);
    for (let j = 0; j < groups; j++) {
      for (let k = patterns.groupStart[j]!; k < patterns.groupStart[j + 1]!; k++) {
        this.groupTrials[j]! += patterns.m[k]!;
        this.groupTotals[j]! += patterns.s[k]!;
      }
    }
  }

  /**
   * The deviance at φ = (β₀ … β_{p−1}, θ); when `gradient` is given, its gradient in φ is
   * written there. Returns NaN when a mode cannot be found or a value is not finite.
   */
  evaluate(phi: Float64Array, gradient?: Float64Array): number {
    this.evaluations++;
    const { p, count, x, groupStart, groups } = this.patterns;
    const theta = Math.abs(phi[p]!);
    const eta0 = this.eta0;
    for (let k = 0; k < count; k++) {
      let e = 0;
      for (let c = 0; c < p; c++) e += x[k * p + c]! * phi[c]!;
      eta0[k] = e;
    }
    if (gradient) gradient.fill(0, 0, p + 1);
    let logLik = this.patterns.constant;
    for (let j = 0; j < groups; j++) {
      const from = groupStart[j]!;
      const to = groupStart[j + 1]!;
      const mode = this.findMode(j, from, to, theta);
      if (!Number.isFinite(mode)) return NaN;
      const logI = this.groupTerm(j, from, to, theta, mode, gradient ? this.groupGradient : undefined);
      if (!Number.isFinite(logI)) return NaN;
      logLik += logI;
      if (gradient) for (let c = 0; c <= p; c++) gradient[c]! += -2 * this.groupGradient[c]!;
    }
    if (gradient && phi[p]! < 0) gradient[p] = -gradient[p]!;
    return -2 * logLik;
  }

  /** û_j by safeguarded Newton from the stored mode. */
  private findMode(j: number, from: number, to: number, theta: number): number {
    if (theta === 0) {
      this.modes[j] = 0;
      return 0;
    }
    const { s, m, family } = this.patterns;
    const eta0 = this.eta0;
    const binomial = family === 'binomial';
    // The bracket: û ≤ θΣs (and ≥ −θΣm for the binomial); for the Poisson the lower end stays
    // open until a point with g′ > 0 closes it (Newton never steps below such a point's left).
    let hi = theta * (binomial ? this.groupTrials[j]! : this.groupTotals[j]!);
    let lo = binomial ? -hi : -Infinity;
    let u = Math.min(Math.max(this.modes[j]!, lo), hi);
    for (let iteration = 0; iteration < 200; iteration++) {
      let score = 0;
      let weight = 0;
      for (let k = from; k < to; k++) {
        const eta = eta0[k]! + theta * u;
        if (binomial) {
          const mu = 1 / (1 + Math.exp(-eta));
          score += s[k]! - m[k]! * mu;
          weight += m[k]! * mu * (1 - mu);
        } else {
          const mu = m[k]! * Math.exp(eta);
          score += s[k]! - mu;
          weight += mu;
        }
      }
      const g = theta * score - u;
      const step = g / (1 + theta * theta * weight);
      if (!(Math.abs(step) > 1e-14 * (1 + Math.abs(u)))) break;
      if (g > 0) lo = u;
      else hi = u;
      let next = u + step;
      if (!(next > lo && next < hi)) next = Number.isFinite(lo) ? 0.5 * (lo + hi) : hi - 2 * (hi - u) - 1;
      u = next;
    }
    this.modes[j] = u;
    return u;
  }

  /** ln I_j at the mode, and its gradient in φ when asked. */
  private groupTerm(j: number, from: number, to: number, theta: number, mode: number, grad?: Float64Array): number {
    const { p, s, m, x, family } = this.patterns;
    const { nodes, logWeights } = this.rule;
    const q = nodes.length;
    const laplace = q === 1;
    const eta0 = this.eta0;
    // One pass at the mode: Σw, Σw′, Σw·x, Σw′·x, and (Laplace) ℓ(û) and Σ(s − μ)·x.
    let sw = 0;
    let sw1 = 0;
    let residual = 0;
    let loglikMode = 0;
    const { wx, w1x, rx } = this;
    if (grad) {
      wx.fill(0);
      w1x.fill(0);
      if (laplace) rx.fill(0, 0, p);
    }
    for (let k = from; k < to; k++) {
      const eta = eta0[k]! + theta * mode;
      let mu: number;
      let w: number;
      let w1: number;
      if (family === 'binomial') {
        // One exponential for both expit(η) and ln(1 + e^η).
        const ex = Math.exp(-Math.abs(eta));
        const pr = eta >= 0 ? 1 / (1 + ex) : ex / (1 + ex);
        mu = m[k]! * pr;
        w = mu * (1 - pr);
        w1 = w * (1 - 2 * pr);
        if (laplace) loglikMode += s[k]! * eta - m[k]! * (Math.max(eta, 0) + Math.log1p(ex));
      } else {
        mu = m[k]! * Math.exp(eta);
        w = mu;
        w1 = mu;
        if (laplace) loglikMode += s[k]! * eta - mu;
      }
      sw += w;
      sw1 += w1;
      const e = s[k]! - mu;
      residual += e;
      if (grad) {
        for (let c = 0; c < p; c++) {
          const xc = x[k * p + c]!;
          wx[c]! += w * xc;
          w1x[c]! += w1 * xc;
          if (laplace) rx[c]! += e * xc;
        }
      }
    }
    const d = 1 + theta * theta * sw;
    this.curvature[j] = d;
    const scale = 1 / Math.sqrt(d);
    const { a, r, u } = this;
    let logI: number;
    let largest = 0;
    let total = 1;
    if (laplace) {
      a[0] = loglikMode - 0.5 * mode * mode;
      r[0] = residual;
      u[0] = mode;
      logI = a[0] - 0.5 * Math.log(d);
    } else {
      // The quadrature terms a_k = ln w_k + g(u_k) + z_k²/2.
      largest = -Infinity;
      for (let node = 0; node < q; node++) {
        const z = nodes[node]!;
        const uk = mode + scale * z;
        u[node] = uk;
        let loglik = 0;
        let rk = 0;
        if (grad) rx.fill(0, node * p, node * p + p);
        for (let k = from; k < to; k++) {
          const eta = eta0[k]! + theta * uk;
          let mu: number;
          if (family === 'binomial') {
            loglik += s[k]! * eta - m[k]! * log1pExp(eta);
            mu = m[k]! / (1 + Math.exp(-eta));
          } else {
            mu = m[k]! * Math.exp(eta);
            loglik += s[k]! * eta - mu;
          }
          const e = s[k]! - mu;
          rk += e;
          if (grad) for (let c = 0; c < p; c++) rx[node * p + c]! += e * x[k * p + c]!;
        }
        r[node] = rk;
        a[node] = logWeights[node]! + loglik - 0.5 * uk * uk + 0.5 * z * z;
        if (a[node]! > largest) largest = a[node]!;
      }
      total = 0;
      for (let node = 0; node < q; node++) total += Math.exp(a[node]! - largest);
      logI = Math.log(scale) + largest + Math.log(total);
    }
    if (!grad) return logI;

    // dû/dφ and dD/dφ (index p is θ).
    const { du, dd } = this;
    const t2 = theta * theta;
    for (let c = 0; c < p; c++) du[c] = (-theta * wx[c]!) / d;
    du[p] = (residual - theta * mode * sw) / d;
    for (let c = 0; c < p; c++) dd[c] = t2 * w1x[c]! + t2 * theta * sw1 * du[c]!;
    dd[p] = 2 * theta * sw + t2 * mode * sw1 + t2 * theta * sw1 * du[p]!;
    for (let c = 0; c <= p; c++) grad[c] = (-0.5 * dd[c]!) / d;
    for (let node = 0; node < q; node++) {
      const weight = laplace ? 1 : Math.exp(a[node]! - largest) / total;
      const z = nodes[node]!;
      // g′(u_k); 0 at the mode itself (the Laplace node), up to the mode's tolerance.
      const slope = laplace ? 0 : theta * r[node]! - u[node]!;
      for (let c = 0; c <= p; c++) {
        const ds = -0.5 * scale * (dd[c]! / d);
        const direct = c < p ? rx[node * p + c]! : r[node]! * u[node]!;
        grad[c]! += weight * (direct + slope * (du[c]! + z * ds));
      }
    }
    return logI;
  }
}
