/**
 * Random deviates drawn from an `Rng` stream: gamma, chi-square, Student t, Poisson, Bernoulli
 * and the standardised log-normal. (Standard normal deviates are `rng.normal()`, the polar
 * method, because its spare deviate is part of the stream's state.)
 *
 * Every function is exact up to floating point (rejection methods, no approximations), takes
 * its generator as the first argument and never calls Math.random. Bad parameters throw a
 * RangeError naming the argument; the callers validate specifications first, so these checks
 * guard against programming errors only. Tests (`random.test.ts`) compare sample moments and
 * goodness of fit against SciPy-generated probabilities (`fixtures/random.json`).
 */
import { logGamma } from '@/lib/stats/log-gamma';
import type { Rng } from './rng';

/**
 * Gamma(shape a, scale 1), mean a, variance a.
 *
 * Source: Marsaglia & Tsang (2000), "A simple method for generating gamma variables", ACM TOMS
 * 26(3):363–372: for a ≥ 1, d = a − 1/3, c = 1/√(9d); draw x ~ N(0, 1), v = (1 + c·x)³, accept
 * d·v when v > 0 and ln U < x²/2 + d − d·v + d·ln v (with the squeeze U < 1 − 0.0331·x⁴ first).
 * For a < 1 their boost: Gamma(a) = Gamma(a + 1)·U^(1/a).
 *
 * Valid range: 0 < a < ∞ (tested from 0.5 to 50). Bad input: throws RangeError.
 */
export function gamma(rng: Rng, shape: number): number {
  if (!(shape > 0) || !Number.isFinite(shape)) throw new RangeError(`gamma shape must be a positive finite number, got ${shape}`);
  if (shape < 1) return gamma(rng, shape + 1) * Math.pow(rng.uniform(), 1 / shape);
  const d = shape - 1 / 3;
  const c = 1 / Math.sqrt(9 * d);
  for (;;) {
    let x: number;
    let v: number;
    do {
      x = rng.normal();
      v = 1 + c * x;
    } while (v <= 0);
    v = v * v * v;
    const u = rng.uniform();
    const x2 = x * x;
    if (u < 1 - 0.0331 * x2 * x2) return d * v;
    if (Math.log(u) < 0.5 * x2 + d * (1 - v + Math.log(v))) return d * v;
  }
}

/** χ²_ν = 2·Gamma(ν/2) (the definition); ν > 0, not necessarily whole. */
export function chiSquare(rng: Rng, df: number): number {
  return 2 * gamma(rng, df / 2);
}

/**
 * Student t with ν degrees of freedom: Z / √(χ²_ν/ν), Z ~ N(0, 1) independent of χ²_ν (the
 * definition). Variance ν/(ν − 2) for ν > 2. Valid range: ν > 0. Bad input: throws RangeError.
 */
export function studentT(rng: Rng, df: number): number {
  if (!(df > 0)) throw new RangeError(`t degrees of freedom must be positive, got ${df}`);
  const z = rng.normal();
  return z / Math.sqrt(chiSquare(rng, df) / df);
}

/** 1 with probability p, else 0 (U < p). Valid range: 0 ≤ p ≤ 1. */
export function bernoulli(rng: Rng, p: number): 0 | 1 {
  return rng.uniform() < p ? 1 : 0;
}

/** Below this mean, the multiplication method; from it on, PTRS. */
const PTRS_MIN_MEAN = 10;

/**
 * Poisson(μ).
 *
 * Source: for μ < 10, the multiplication method (Knuth, The Art of Computer Programming vol. 2,
 * 3rd ed., §3.4.1, Algorithm Q): the number of uniforms whose running product stays above e^(−μ);
 * O(μ) uniforms. For μ ≥ 10, Hörmann's transformed rejection with squeeze, PTRS (Hörmann 1993,
 * "The transformed rejection method for generating Poisson random variables", Insurance:
 * Mathematics and Economics 12:39–45), constants as published (b = 0.931 + 2.53√μ,
 * a = −0.059 + 0.02483·b, 1/α = 1.1239 + 1.1328/(b − 3.4), v_r = 0.9277 − 3.6224/(b − 2));
 * about 1.1 uniform pairs per deviate, any μ. The acceptance test uses log Γ(k + 1) from
 * lib/stats/log-gamma.ts.
 *
 * Valid range: 0 ≤ μ ≤ 1e9 (μ = 0 gives 0). Bad input: throws RangeError.
 */
export function poisson(rng: Rng, mean: number): number {
  if (!(mean >= 0) || mean > 1e9) throw new RangeError(`Poisson mean must be between 0 and 1e9, got ${mean}`);
  if (mean === 0) return 0;
  if (mean < PTRS_MIN_MEAN) {
    const limit = Math.exp(-mean);
    let k = 0;
    let product = rng.uniform();
    while (product > limit) {
      k++;
      product *= rng.uniform();
    }
    return k;
  }
  const logMean = Math.log(mean);
  const b = 0.931 + 2.53 * Math.sqrt(mean);
  const a = -0.059 + 0.02483 * b;
  const invAlpha = 1.1239 + 1.1328 / (b - 3.4);
  const vr = 0.9277 - 3.6224 / (b - 2);
  for (;;) {
    const u = rng.uniform() - 0.5;
    const v = rng.uniform();
    const us = 0.5 - Math.abs(u);
    const k = Math.floor(((2 * a) / us + b) * u + mean + 0.43);
    if (us >= 0.07 && v <= vr) return k;
    if (k < 0 || (us < 0.013 && v > us)) continue;
    if (Math.log(v) + Math.log(invAlpha) - Math.log(a / (us * us) + b) <= -mean + k * logMean - logGamma(k + 1)) return k;
  }
}

/**
 * A right-skewed deviate with mean 0 and SD 1: the standardised log-normal
 * (e^(σZ) − e^(σ²/2)) / √((e^(σ²) − 1)·e^(σ²)), Z ~ N(0, 1). Its mean e^(σ²/2) and variance
 * (e^(σ²) − 1)e^(σ²) are the log-normal's (Johnson, Kotz & Balakrishnan 1994, Continuous
 * Univariate Distributions vol. 1, ch. 14); skewness (e^(σ²) + 2)√(e^(σ²) − 1), 3.69 for σ = 0.8.
 * Valid range: σ > 0 (σ ≤ 3 keeps the sample moments usable). `standardisedLogNormalScale`
 * precomputes the two constants.
 */
export function standardisedLogNormal(rng: Rng, scale: LogNormalScale): number {
  return (Math.exp(scale.sigma * rng.normal()) - scale.mean) / scale.sd;
}

export interface LogNormalScale {
  sigma: number;
  mean: number;
  sd: number;
}

export function standardisedLogNormalScale(sigma: number): LogNormalScale {
  if (!(sigma > 0) || !Number.isFinite(sigma)) throw new RangeError(`log-normal sigma must be positive, got ${sigma}`);
  const s2 = sigma * sigma;
  return { sigma, mean: Math.exp(s2 / 2), sd: Math.sqrt(Math.expm1(s2) * Math.exp(s2)) };
}
