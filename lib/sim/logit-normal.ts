/**
 * The logit-normal distribution of a cluster's probability, P = expit(η + σZ), Z ~ N(0, 1): its
 * moments, and the parameters that give a binary outcome a chosen marginal probability and a
 * chosen intracluster correlation on the proportion scale.
 *
 * For clusters of binary outcomes y ~ Bernoulli(P) given P, two outcomes of one cluster have
 * correlation ρ = Var(P) / (p̄(1 − p̄)), p̄ = E[P]: the ICC on the proportion scale, the one the
 * sample-size formulas of Donner & Klar (2000, Design and Analysis of Cluster Randomization
 * Trials, §2.3 and ch. 5) and the ANOVA estimator of clustered proportions use. Given (η, σ),
 *   p̄ = ∫ expit(η + σz) φ(z) dz,   E[P²] = ∫ expit(η + σz)² φ(z) dz,
 * by composite Simpson's rule on z ∈ [−12, 12] with 4,000 intervals (the rule of
 * estimand.ts's marginalProbability, error below 1e-12; the mass outside is below 4e-33).
 *
 * - `interceptForMarginal(p̄, σ)`: η with E[P] = p̄ — Newton's method on η (dp̄/dη = E[P(1 − P)]),
 *   from the approximation logit(p̄)·√(1 + c²σ²), c = 16√3/(15π) (Zeger, Liang & Albert 1988,
 *   Biometrics 44:1049 — from memory; only the start), to 1e-13.
 * - `sigmaForIcc(ρ, …)`: σ with proportion-scale ICC ρ, either at a fixed η (the conditional
 *   baseline) or keeping p̄ fixed (the marginal baseline) — Brent's root on σ ∈ [0, 40]; the ICC
 *   rises from 0 at σ = 0 towards 1.
 *
 * Valid range: 0 < p̄ < 1, 0 ≤ ρ < 1 and reachable (ρ ≤ ICC at σ = 40, above 0.99 for
 * |η| < 10). Bad input: throws a RangeError saying what to change.
 */
import { brentRoot } from '@/lib/stats/root';
import { normalPdf } from '@/lib/stats/normal';

const Z_LIMIT = 12;
const INTERVALS = 4000;
const SIGMA_MAX = 40;

function expit(x: number): number {
  return x >= 0 ? 1 / (1 + Math.exp(-x)) : Math.exp(x) / (1 + Math.exp(x));
}

/** Simpson nodes and weights (weight × φ(z) × h/3), computed once. */
const nodes = new Float64Array(INTERVALS + 1);
const weights = new Float64Array(INTERVALS + 1);
{
  const h = (2 * Z_LIMIT) / INTERVALS;
  for (let i = 0; i <= INTERVALS; i++) {
    const z = -Z_LIMIT + i * h;
    const w = i === 0 || i === INTERVALS ? 1 : i % 2 === 1 ? 4 : 2;
    nodes[i] = z;
    weights[i] = (w * normalPdf(z) * h) / 3;
  }
}

/** E[P] and E[P²] for P = expit(η + σZ). */
export function logitNormalMoments(eta: number, sigma: number): { mean: number; second: number } {
  if (sigma === 0) {
    const p = expit(eta);
    return { mean: p, second: p * p };
  }
  let mean = 0;
  let second = 0;
  for (let i = 0; i <= INTERVALS; i++) {
    const p = expit(eta + sigma * nodes[i]!);
    mean += weights[i]! * p;
    second += weights[i]! * p * p;
  }
  return { mean, second };
}

/** The proportion-scale ICC Var(P)/(p̄(1 − p̄)) of P = expit(η + σZ). */
export function proportionIcc(eta: number, sigma: number): number {
  const { mean, second } = logitNormalMoments(eta, sigma);
  return (second - mean * mean) / (mean * (1 - mean));
}

/** η such that E[expit(η + σZ)] = p (see the module comment). */
export function interceptForMarginal(p: number, sigma: number): number {
  if (!(p > 0 && p < 1)) throw new RangeError(`a marginal probability must be between 0 and 1, got ${p}`);
  const logit = Math.log(p / (1 - p));
  if (sigma === 0) return logit;
  const c = (16 * Math.sqrt(3)) / (15 * Math.PI);
  let eta = logit * Math.sqrt(1 + c * c * sigma * sigma);
  for (let iteration = 0; iteration < 100; iteration++) {
    const { mean, second } = logitNormalMoments(eta, sigma);
    const slope = mean - second;
    if (!(slope > 0)) break;
    const step = (mean - p) / slope;
    eta -= Math.max(-5, Math.min(5, step));
    if (Math.abs(step) < 1e-13 * (1 + Math.abs(eta))) break;
  }
  return eta;
}

/**
 * σ giving the proportion-scale ICC `icc`: at the fixed intercept `eta` ({ eta }) or with the
 * marginal probability `marginal` kept ({ marginal }).
 */
export function sigmaForIcc(icc: number, at: { eta: number } | { marginal: number }): number {
  if (!(icc >= 0 && icc < 1)) throw new RangeError(`an ICC must be at least 0 and below 1, got ${icc}`);
  if (icc === 0) return 0;
  const iccAt = (sigma: number) => proportionIcc('eta' in at ? at.eta : interceptForMarginal(at.marginal, sigma), sigma);
  const highest = iccAt(SIGMA_MAX);
  if (!(highest > icc)) {
    throw new RangeError(`an ICC of ${icc} on the proportion scale cannot be reached with this baseline; lower the ICC or move the baseline away from 0 or 1`);
  }
  return brentRoot((sigma) => iccAt(sigma) - icc, 0, SIGMA_MAX, { xTolerance: 1e-12 });
}
