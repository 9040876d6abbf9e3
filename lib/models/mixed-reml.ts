/**
 * REML for linear mixed models with nested random intercepts and an optional correlated random
 * slope for time at the innermost level, by the profiled penalised-least-squares formulation of
 * Bates, Mächler, Bolker & Walker (2015, J Stat Softw 67(1), §3):
 *
 *   L_θL_θᵀ = ΛᵀZᵀZΛ + I,   R_ZX = L_θ⁻¹ΛᵀZᵀX,   R_XᵀR_X = XᵀX − R_ZXᵀR_ZX,
 *   c_u = L_θ⁻¹ΛᵀZᵀy,   c_β = R_X⁻ᵀ(Xᵀy − R_ZXᵀc_u),   r²(θ) = yᵀy − ‖c_u‖² − ‖c_β‖²,
 *   d_R(θ) = log|L_θ|² + log|R_X|² + (n − p)·[1 + log(2π r²/(n − p))]   (their eq. 42).
 *
 * Random effects of different outermost groups are independent, so ZᵀZ, ΛᵀZᵀZΛ + I and L_θ are
 * block diagonal, one block per outermost group (its own intercept, its inner groups'
 * intercepts and slopes): the cost per evaluation is linear in the number of outermost groups
 * (cubic in a block's size). ZᵀZ, ZᵀX, Zᵀy and XᵀX, Xᵀy, yᵀy are formed once per data set,
 * with X's columns 1…p−1 and y centred at their means.
 *
 * θ is found by Nelder–Mead (Nelder & Mead 1965) on the unconstrained θ — d_R is unchanged when
 * a level's (λ₁₁, λ₂₁) or an intercept's θ or λ₂₂ changes sign, so the bounded problem of
 * lme4 (diagonal ≥ 0) is the unconstrained one folded — run to a coarse tolerance from lme4's
 * start (1 on the diagonal, 0 off it), then polished by Newton steps on central-difference
 * derivatives, each kept only when the criterion does not rise. When Newton does not settle
 * (a flat or indefinite Hessian, typically at a boundary), a tight simplex search takes over.
 * A diagonal entry that reaches 0 is a boundary (singular) fit, reported and kept as converged.
 *
 * Satterthwaite df: the Hessian of the REML deviance in (θ, σ) and the gradient of Var(β̂_k) by
 * central differences in θ with one Richardson extrapolation (steps h and h/2), the σ parts
 * analytically; then `satterthwaiteDf`.
 *
 * Accuracy (fixtures/mixed.json: sleepstudy, a three-level, a random-slope and a nested
 * random-slope design, and 12 replicates of the stress test's greenhouse and sleep designs,
 * against lme4 1.1-31 and lmerTest 3.1-3): β̂ within 2e-9 of max(|β̂|, SE), SEs within 2e-7,
 * variances within 9e-7, Satterthwaite df within 7e-7 — all relative. Speed: 100–300
 * criterion evaluations (up to ~550 when the fallback search runs), 0.5–1.5 ms per fit for
 * the greenhouse and sleep reference designs (tests/bench/mixed.bench.ts).
 */
import { choleskyDecompose, choleskySolve, spdInverse } from './linalg';
import {
  betweenWithinDf,
  centringMeans,
  reduceFixed,
  satterthwaiteDf,
  thetaLength,
  uncentre,
  type FitOptions,
  type MixedFit,
  type MixedProblem,
  type VarianceComponent,
} from './mixed-model';
import { nelderMead } from './mixed-optimise';
import { fitRandomIntercept } from './mixed-random-intercept';

/** The block structure of Z and the θ-independent cross-products. */
interface Structure {
  n: number;
  p: number;
  /** Per level: 1 (intercept) or 2 (intercept and slope) columns per group; its θ offset. */
  perGroup: number[];
  thetaOffset: number[];
  blocks: number;
  /** Per block: its size q_g and the offsets of its ZᵀZ (q²), ZᵀX (q·p) and Zᵀy (q) entries. */
  q: Int32Array;
  ztzAt: Int32Array;
  ztxAt: Int32Array;
  ztyAt: Int32Array;
  /**
   * Column c of Λ (all blocks' columns in order, block g's from colAt[g]) is
   * θ[thetaA[c]]·e_c + θ[thetaB[c]]·e_{c+1}: its own entry and, for the intercept column of a
   * group with a slope, λ₂₁ in the slope's row. thetaB[c] = −1 where there is none.
   */
  thetaA: Int32Array;
  thetaB: Int32Array;
  colAt: Int32Array;
  ztz: Float64Array;
  ztx: Float64Array;
  zty: Float64Array;
  xtx: Float64Array;
  xty: Float64Array;
  yty: number;
  xMean: Float64Array;
  yMean: number;
  maxQ: number;
}

function buildStructure(problem: MixedProblem): Structure {
  const { n, p, x, y, levels, slope } = problem;
  const depth = levels.length;
  const perGroup = levels.map((_, l) => (slope && l === depth - 1 ? 2 : 1));
  const thetaOffset: number[] = [];
  let t = 0;
  for (const k of perGroup) {
    thetaOffset.push(t);
    t += k === 1 ? 1 : 3;
  }
  // Blocks are runs of rows of one outermost group; inside, columns in order of appearance.
  const outer = levels[0]!.id;
  const blockStart: number[] = [];
  for (let i = 0; i < n; i++) if (i === 0 || outer[i] !== outer[i - 1]) blockStart.push(i);
  blockStart.push(n);
  const blocks = blockStart.length - 1;
  const q = new Int32Array(blocks);
  const rowCol = new Int32Array(n * depth); // column (within the block) of row i's level-l group
  const thetaAList: number[] = [];
  const thetaBList: number[] = [];
  const colAt = new Int32Array(blocks + 1);
  for (let g = 0; g < blocks; g++) {
    let cols = 0;
    colAt[g] = thetaAList.length;
    for (let l = 0; l < depth; l++) {
      const id = levels[l]!.id;
      for (let i = blockStart[g]!; i < blockStart[g + 1]!; i++) {
        if (i === blockStart[g] || id[i] !== id[i - 1]) {
          for (let term = 0; term < perGroup[l]!; term++) {
            const at = thetaOffset[l]!;
            // Template [[λ₁₁, 0], [λ₂₁, λ₂₂]] at θ[at…at+2], or [θ] at θ[at].
            thetaAList.push(perGroup[l] === 1 ? at : term === 0 ? at : at + 2);
            thetaBList.push(perGroup[l] === 2 && term === 0 ? at + 1 : -1);
          }
          cols += perGroup[l]!;
        }
        rowCol[i * depth + l] = cols - perGroup[l]!;
      }
    }
    q[g] = cols;
  }
  colAt[blocks] = thetaAList.length;
  const ztzAt = new Int32Array(blocks + 1);
  const ztxAt = new Int32Array(blocks + 1);
  const ztyAt = new Int32Array(blocks + 1);
  let maxQ = 0;
  for (let g = 0; g < blocks; g++) {
    const qg = q[g]!;
    maxQ = Math.max(maxQ, qg);
    ztzAt[g + 1] = ztzAt[g]! + qg * qg;
    ztxAt[g + 1] = ztxAt[g]! + qg * p;
    ztyAt[g + 1] = ztyAt[g]! + qg;
  }
  const { xMean, yMean } = centringMeans(problem);
  const ztz = new Float64Array(ztzAt[blocks]!);
  const ztx = new Float64Array(ztxAt[blocks]!);
  const zty = new Float64Array(ztyAt[blocks]!);
  const xtx = new Float64Array(p * p);
  const xty = new Float64Array(p);
  let yty = 0;
  const xi = new Float64Array(p);
  // Nonzeros of row i of Z: (column, value) for each level and term.
  const nzCol = new Int32Array(depth * 2);
  const nzVal = new Float64Array(depth * 2);
  for (let g = 0; g < blocks; g++) {
    const qg = q[g]!;
    const zz = ztzAt[g]!;
    const zx = ztxAt[g]!;
    const zy = ztyAt[g]!;
    for (let i = blockStart[g]!; i < blockStart[g + 1]!; i++) {
      const yi = y[i]! - yMean;
      xi[0] = 1;
      for (let c = 1; c < p; c++) xi[c] = x[c * n + i]! - xMean[c]!;
      yty += yi * yi;
      for (let a = 0; a < p; a++) {
        xty[a]! += xi[a]! * yi;
        for (let b = 0; b <= a; b++) xtx[a + b * p]! += xi[a]! * xi[b]!;
      }
      let nz = 0;
      for (let l = 0; l < depth; l++) {
        const col = rowCol[i * depth + l]!;
        nzCol[nz] = col;
        nzVal[nz++] = 1;
        if (perGroup[l] === 2) {
          nzCol[nz] = col + 1;
          nzVal[nz++] = slope![i]!;
        }
      }
      for (let r = 0; r < nz; r++) {
        const cr = nzCol[r]!;
        const vr = nzVal[r]!;
        zty[zy + cr]! += vr * yi;
        for (let a = 0; a < p; a++) ztx[zx + cr + a * qg]! += vr * xi[a]!;
        for (let s = 0; s < nz; s++) ztz[zz + cr + nzCol[s]! * qg]! += vr * nzVal[s]!;
      }
    }
  }
  for (let a = 0; a < p; a++) for (let b = 0; b < a; b++) xtx[b + a * p] = xtx[a + b * p]!;
  return {
    n, p, perGroup, thetaOffset, blocks, q, ztzAt, ztxAt, ztyAt,
    thetaA: Int32Array.from(thetaAList), thetaB: Int32Array.from(thetaBList), colAt,
    ztz, ztx, zty, xtx, xty, yty, xMean, yMean, maxQ,
  };
}

interface Profile {
  deviance: number;
  /** log|L_θ|² + log|R_X|². */
  logDet: number;
  r2: number;
  /** (R_XᵀR_X)⁻¹ and β̂ (centred coordinates), when asked for (null otherwise). */
  mInverse: Float64Array | null;
  beta: Float64Array | null;
}

const FAILED: Profile = { deviance: NaN, logDet: NaN, r2: NaN, mInverse: null, beta: null };

class ProfiledReml {
  private readonly a: Float64Array;
  private readonly rzx: Float64Array;
  private readonly cu: Float64Array;
  private readonly m: Float64Array;
  private readonly v: Float64Array;
  private readonly chol: Float64Array;
  private readonly w: Float64Array;
  /** Λ's entries per column for the current θ (see Structure.thetaA/thetaB). */
  private readonly la: Float64Array;
  private readonly lb: Float64Array;
  evaluations = 0;

  constructor(readonly s: Structure) {
    const q = s.maxQ;
    this.a = new Float64Array(q * q);
    this.rzx = new Float64Array(q * s.p);
    this.cu = new Float64Array(q);
    this.m = new Float64Array(s.p * s.p);
    this.v = new Float64Array(s.p);
    this.chol = new Float64Array(s.p * s.p);
    this.w = new Float64Array(s.p);
    this.la = new Float64Array(s.thetaA.length);
    this.lb = new Float64Array(s.thetaA.length);
  }

  profile(theta: Float64Array, full = false): Profile {
    this.evaluations++;
    const s = this.s;
    const p = s.p;
    const { a, rzx, cu, m, v, la, lb } = this;
    for (let c = 0; c < la.length; c++) {
      la[c] = theta[s.thetaA[c]!]!;
      const b = s.thetaB[c]!;
      lb[c] = b >= 0 ? theta[b]! : 0;
    }
    m.set(s.xtx);
    v.set(s.xty);
    let cu2 = 0;
    let logDetL = 0;
    const ztz = s.ztz;
    const ztx = s.ztx;
    const zty = s.zty;
    for (let g = 0; g < s.blocks; g++) {
      const q = s.q[g]!;
      const zz = s.ztzAt[g]!;
      const zx = s.ztxAt[g]!;
      const zy = s.ztyAt[g]!;
      const c0 = s.colAt[g]!;
      // a ← ΛᵀZᵀZΛ + I (lower triangle), with Λe_c = la_c·e_c + lb_c·e_{c+1}.
      for (let c = 0; c < q; c++) {
        const lac = la[c0 + c]!;
        const lbc = lb[c0 + c]!;
        for (let r = c; r < q; r++) {
          const lar = la[c0 + r]!;
          const lbr = lb[c0 + r]!;
          let t = lac * ztz[zz + r + c * q]!;
          if (lbc !== 0) t += lbc * ztz[zz + r + (c + 1) * q]!;
          let value = lar * t;
          if (lbr !== 0) {
            let u = lac * ztz[zz + r + 1 + c * q]!;
            if (lbc !== 0) u += lbc * ztz[zz + r + 1 + (c + 1) * q]!;
            value += lbr * u;
          }
          a[r + c * q] = value + (r === c ? 1 : 0);
        }
      }
      if (!choleskyDecompose(a, q)) return FAILED;
      // rzx ← L⁻¹ΛᵀZᵀX, cu ← L⁻¹ΛᵀZᵀy (forward substitution, row by row).
      for (let r = 0; r < q; r++) {
        const lar = la[c0 + r]!;
        const lbr = lb[c0 + r]!;
        const d = a[r + r * q]!;
        logDetL += 2 * Math.log(d);
        let ty = lar * zty[zy + r]!;
        if (lbr !== 0) ty += lbr * zty[zy + r + 1]!;
        for (let k = 0; k < r; k++) ty -= a[r + k * q]! * cu[k]!;
        cu[r] = ty / d;
        cu2 += cu[r]! * cu[r]!;
        for (let col = 0; col < p; col++) {
          let tx = lar * ztx[zx + r + col * q]!;
          if (lbr !== 0) tx += lbr * ztx[zx + r + 1 + col * q]!;
          for (let k = 0; k < r; k++) tx -= a[r + k * q]! * rzx[k + col * q]!;
          rzx[r + col * q] = tx / d;
        }
      }
      for (let i = 0; i < p; i++) {
        let tv = 0;
        for (let r = 0; r < q; r++) tv += rzx[r + i * q]! * cu[r]!;
        v[i]! -= tv;
        for (let j = 0; j <= i; j++) {
          let t = 0;
          for (let r = 0; r < q; r++) t += rzx[r + i * q]! * rzx[r + j * q]!;
          m[i + j * p]! -= t;
        }
      }
    }
    for (let i = 0; i < p; i++) for (let j = 0; j < i; j++) m[j + i * p] = m[i + j * p]!;
    const reduced = reduceFixed(m, v, p, this.chol, this.w);
    if (!reduced) return FAILED;
    const logDetM = reduced.logDetM;
    const r2 = s.yty - cu2 - reduced.explained;
    const dfResid = s.n - p;
    const deviance = r2 > 0 ? logDetL + logDetM + dfResid * (1 + Math.log((2 * Math.PI * r2) / dfResid)) : NaN;
    const out: Profile = { deviance, logDet: logDetL + logDetM, r2, mInverse: null, beta: null };
    if (full) {
      const mInverse = new Float64Array(p * p);
      const work = new Float64Array(p * p);
      if (!spdInverse(Float64Array.from(m), p, mInverse, work)) return FAILED;
      const beta = new Float64Array(p);
      for (let i = 0; i < p; i++) {
        let t = 0;
        for (let k = 0; k < p; k++) t += mInverse[i + k * p]! * v[k]!;
        beta[i] = t;
      }
      out.mInverse = mInverse;
      out.beta = beta;
    }
    return out;
  }
}

/** Folds θ into lme4's canonical region: diagonal entries ≥ 0 (same criterion value). */
function canonical(theta: Float64Array, s: Structure): void {
  s.perGroup.forEach((k, l) => {
    const at = s.thetaOffset[l]!;
    if (k === 1) theta[at] = Math.abs(theta[at]!);
    else {
      if (theta[at]! < 0) {
        theta[at] = -theta[at]!;
        theta[at + 1] = -theta[at + 1]!;
      }
      theta[at + 2] = Math.abs(theta[at + 2]!);
    }
  });
}

/**
 * Central-difference step for θ_i. Rounding in d_R (about ε·|d_R|) limits second differences:
 * steps of 1e-4·|θ| gave df that moved by 1e-5 between step sizes; from 3e-3 to 3e-2 (with the
 * Richardson step) they agree to about 1e-7, so 5e-3 sits in the middle of that range.
 */
function stepFor(t: number): number {
  return 5e-3 * Math.max(Math.abs(t), 0.1);
}

/**
 * Gradients of several functions of θ and (when `withHessian`) the Hessian of the first, by
 * central differences. With `richardson`, steps h and h/2 are combined as (4·D(h/2) − D(h))/3,
 * which removes the O(h²) error term; without, step h alone.
 */
function derivatives(
  fs: (theta: Float64Array) => Float64Array,
  theta: Float64Array,
  withHessian: boolean,
  richardson: boolean,
): { gradients: Float64Array[]; hessian: Float64Array } {
  const k = theta.length;
  const shifted = Float64Array.from(theta);
  const at = (i: number, di: number, j = -1, dj = 0): Float64Array => {
    shifted.set(theta);
    shifted[i]! += di;
    if (j >= 0) shifted[j]! += dj;
    return fs(shifted);
  };
  const centre = withHessian ? fs(theta) : null;
  const once = (scale: number) => {
    const h = Array.from(theta, (t) => stepFor(t) * scale);
    let gradients: Float64Array[] = [];
    const hessian = new Float64Array(k * k);
    for (let i = 0; i < k; i++) {
      const plus = at(i, h[i]!);
      const minus = at(i, -h[i]!);
      if (i === 0) gradients = Array.from({ length: plus.length }, () => new Float64Array(k));
      for (let c = 0; c < plus.length; c++) gradients[c]![i] = (plus[c]! - minus[c]!) / (2 * h[i]!);
      if (!centre) continue;
      hessian[i + i * k] = (plus[0]! - 2 * centre[0]! + minus[0]!) / (h[i]! * h[i]!);
      for (let j = 0; j < i; j++) {
        const pp = at(i, h[i]!, j, h[j]!)[0]!;
        const pm = at(i, h[i]!, j, -h[j]!)[0]!;
        const mp = at(i, -h[i]!, j, h[j]!)[0]!;
        const mm = at(i, -h[i]!, j, -h[j]!)[0]!;
        hessian[i + j * k] = hessian[j + i * k] = (pp - pm - mp + mm) / (4 * h[i]! * h[j]!);
      }
    }
    return { gradients, hessian };
  };
  const coarse = once(1);
  if (!richardson) return coarse;
  const fine = once(0.5);
  const extrapolate = (f: number, c: number) => (4 * f - c) / 3;
  return {
    gradients: fine.gradients.map((g, c) => g.map((x, i) => extrapolate(x, coarse.gradients[c]![i]!))),
    hessian: fine.hessian.map((x, i) => extrapolate(x, coarse.hessian[i]!)),
  };
}

/**
 * Newton steps on the profiled deviance from θ, each kept only when the deviance does not rise:
 * the Hessian once (central differences), the gradient afresh at every step (with Richardson
 * extrapolation, so the fixed point is accurate to far below the optimiser's tolerance).
 * `converged` is true when the last Newton step was below 1e-7 relative (θ is then accurate to
 * about that, squared by the next step); false when the Hessian is not positive definite or the
 * steps stay large, and the caller falls back on a tight simplex search.
 */
function polish(reml: ProfiledReml, theta: Float64Array, f0: number): { theta: Float64Array; f: number; converged: boolean } {
  let current = Float64Array.from(theta);
  let fCurrent = f0;
  const k = current.length;
  const dev = (t: Float64Array) => Float64Array.of(reml.profile(t).deviance);
  const chol = derivatives(dev, current, true, false).hessian;
  if (!choleskyDecompose(chol, k)) return { theta: current, f: fCurrent, converged: false };
  for (let iteration = 0; iteration < 6; iteration++) {
    const step = derivatives(dev, current, false, true).gradients[0]!;
    choleskySolve(chol, k, step);
    let size = 0;
    for (let i = 0; i < k; i++) size = Math.max(size, Math.abs(step[i]!) / Math.max(Math.abs(current[i]!), 0.1));
    if (!(size <= 0.05)) break;
    const next = current.map((t, i) => t - step[i]!);
    const fNext = reml.profile(next).deviance;
    // A step that raises the deviance is rounding noise once the steps are tiny.
    if (!(fNext <= fCurrent + 8 * Number.EPSILON * Math.abs(fCurrent))) return { theta: current, f: fCurrent, converged: size <= 1e-7 };
    current = next;
    fCurrent = fNext;
    if (size <= 1e-7) return { theta: current, f: fCurrent, converged: true };
  }
  return { theta: current, f: fCurrent, converged: false };
}

/**
 * Where the simplex search starts: each level's θ from a one-level random-intercept fit of that
 * level alone (cheap, by sufficient statistics), and for a slope level (λ₁₁, 0, λ₁₁/range(time)).
 * Falls back on lme4's start (1 on the diagonal) where a one-level fit fails.
 */
function startingTheta(problem: MixedProblem, s: Structure): Float64Array {
  const start = new Float64Array(thetaLength(problem));
  const { slope, ...rest } = problem;
  let range = 1;
  if (slope) {
    let lo = Infinity;
    let hi = -Infinity;
    for (let i = 0; i < problem.n; i++) {
      lo = Math.min(lo, slope[i]!);
      hi = Math.max(hi, slope[i]!);
    }
    if (hi > lo) range = hi - lo;
  }
  problem.levels.forEach((level, l) => {
    const one = fitRandomIntercept({ ...rest, levels: [level] }, { satterthwaiteFor: [], betweenWithin: false });
    const t = one.converged ? Math.max(one.theta[0]!, 0.05) : 1;
    const at = s.thetaOffset[l]!;
    start[at] = t;
    if (s.perGroup[l] === 2) start[at + 2] = t / range;
  });
  return start;
}

/**
 * Fits the model of `problem` (any number of nested levels, optional slope) by REML. Assumes
 * `checkProblem` has passed. Never throws on numerical trouble: `converged` is false instead.
 */
export function fitProfiledReml(problem: MixedProblem, options: FitOptions = {}): MixedFit {
  const s = buildStructure(problem);
  const { n, p } = s;
  const reml = new ProfiledReml(s);
  const k = thetaLength(problem);
  const start = startingTheta(problem, s);
  const objective = (t: Float64Array) => reml.profile(t).deviance;
  // A coarse simplex search, then Newton; if Newton does not settle, a tight simplex search.
  let nm = nelderMead(objective, start, { ftolRel: 1e-6, xtol: 1e-2 });
  let theta = nm.x;
  if (Number.isFinite(nm.f)) {
    const polished = polish(reml, nm.x, nm.f);
    theta = polished.theta;
    if (!polished.converged) {
      nm = nelderMead(objective, polished.theta, { ftolRel: 1e-13, xtol: 1e-8, step: new Float64Array(k).fill(0.02) });
      theta = nm.x;
    }
  }
  canonical(theta, s);
  const fit = reml.profile(theta, true);
  const sigma2 = fit.r2 / (n - p);
  const sigma = Math.sqrt(sigma2);
  const mInverse = fit.mInverse ?? new Float64Array(p * p).fill(NaN);
  const { beta, vcovBeta, se, contrasts } = uncentre(fit.beta ?? new Float64Array(p).fill(NaN), mInverse, sigma2, s.xMean, s.yMean);
  const quadratic = (mi: Float64Array, a: Float64Array, b: Float64Array) => {
    let t = 0;
    for (let i = 0; i < p; i++) for (let j = 0; j < p; j++) t += a[i]! * mi[i + j * p]! * b[j]!;
    return t;
  };

  // Satterthwaite: φ = (θ, σ); D = logDet(θ) + r²(θ)/σ² + (n − p)·log(2πσ²).
  const wanted = options.satterthwaiteFor ?? contrasts.map((_, c) => c);
  const dfSatterthwaite = new Float64Array(p).fill(NaN);
  let minEigenvalue = 0;
  let hessianScale = 1;
  if (Number.isFinite(fit.deviance)) {
    const fs = (t: Float64Array) => {
      const e = reml.profile(t, true);
      const out = new Float64Array(2 + wanted.length);
      out[0] = e.logDet + e.r2 / sigma2;
      out[1] = e.r2;
      wanted.forEach((c, i) => (out[2 + i] = e.mInverse ? quadratic(e.mInverse, contrasts[c]!, contrasts[c]!) : NaN));
      return out;
    };
    const d = derivatives(fs, theta, true, true);
    const m = k + 1;
    const hessian = new Float64Array(m * m);
    for (let i = 0; i < k; i++) {
      for (let j = 0; j < k; j++) hessian[i + j * m] = d.hessian[i + j * k]!;
      hessian[i + k * m] = hessian[k + i * m] = (-2 * d.gradients[1]![i]!) / (sigma2 * sigma);
    }
    hessian[k + k * m] = (6 * fit.r2) / (sigma2 * sigma2) - (2 * (n - p)) / sigma2;
    for (let i = 0; i < m; i++) hessianScale = Math.max(hessianScale, Math.abs(hessian[i + i * m]!));
    const gradients = wanted.map((c, i) => {
      const g = new Float64Array(m);
      for (let j = 0; j < k; j++) g[j] = sigma2 * d.gradients[2 + i]![j]!;
      g[k] = 2 * sigma * quadratic(mInverse, contrasts[c]!, contrasts[c]!);
      return g;
    });
    const sat = satterthwaiteDf(hessian, m, gradients, wanted.map((c) => vcovBeta[c + c * p]!));
    minEigenvalue = sat.minEigenvalue;
    wanted.forEach((c, i) => (dfSatterthwaite[c] = sat.df[i]!));
  }

  const components: VarianceComponent[] = [];
  let singular = false;
  problem.levels.forEach((level, l) => {
    const at = s.thetaOffset[l]!;
    if (s.perGroup[l] === 1) {
      const t = theta[at]!;
      singular ||= t < 1e-4;
      components.push({ level: level.name, term: '(Intercept)', value: t * t * sigma2 });
    } else {
      const [l11, l21, l22] = [theta[at]!, theta[at + 1]!, theta[at + 2]!];
      singular ||= l11 < 1e-4 || l22 < 1e-4;
      components.push(
        { level: level.name, term: '(Intercept)', value: l11 * l11 * sigma2 },
        { level: level.name, term: 'time', value: (l21 * l21 + l22 * l22) * sigma2 },
        { level: level.name, term: 'covariance', value: l11 * l21 * sigma2 },
      );
    }
  });
  components.push({ level: 'Residual', term: 'residual', value: sigma2 });

  let finite = Number.isFinite(fit.deviance) && sigma > 0;
  for (let i = 0; i < p; i++) finite &&= Number.isFinite(beta[i]!) && Number.isFinite(se[i]!);
  for (let i = 0; i < k; i++) finite &&= Number.isFinite(theta[i]!);
  return {
    names: problem.names,
    beta,
    vcovBeta,
    se,
    theta,
    sigma,
    components,
    remlCriterion: fit.deviance,
    remlLogLik: -fit.deviance / 2,
    iterations: reml.evaluations,
    singular,
    converged: nm.converged && finite && !(minEigenvalue < -1e-6 * hessianScale),
    dfSatterthwaite,
    dfBetweenWithin: options.betweenWithin === false ? new Float64Array(p).fill(NaN) : betweenWithinDf(problem),
  };
}
