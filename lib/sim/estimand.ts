/**
 * The true value of the effect each analysis estimates, on that analysis's own scale — what
 * bias and coverage are measured against. Power and the false-positive rate test "no effect",
 * which is 0 on every scale, so they do not need it.
 *
 * - Gaussian outcome: a difference (in means, or in slopes for target treat:time) for ols,
 *   ols-hc3, cluster-robust, cluster-means, mixed and huber: `effect`. log-ols estimates a
 *   difference in mean log outcome, whose value is taken as the log ratio of the arms' means,
 *   ln((baseline + effect)/baseline) — exact when the outcome's spread is small against its
 *   level (the first-order delta method), which is where a log analysis is used; NaN when a mean
 *   is not positive or the target is a slope.
 * - Count outcome (log link): the conditional log rate ratio `effect` is also the marginal one,
 *   since E[exp(η + u)] = exp(η)·E[exp(u)] in both arms (random intercepts and slopes are
 *   independent of the arm); glm and log-ols (a log ratio) get `effect`. The analyses of
 *   differences estimate the marginal difference in mean counts, averaged over the occasions:
 *   baseline·(e^effect − 1)·E[e^(u(t))], E[e^(u)] = exp(σ²(t)/2) for normal random effects of
 *   variance σ²(t) = σ²_cluster + σ²_unit + t²·σ²_slope (the log-normal mean).
 * - Binary outcome (logit link): with random effects the marginal (population-averaged) odds ratio
 *   is smaller than the conditional one, so glm — a marginal logistic regression — estimates the
 *   marginal log odds ratio logit(p̄₁) − logit(p̄₀), and the analyses of differences the marginal
 *   risk difference p̄₁ − p̄₀, each averaged over the occasions, with
 *   p̄ₐ(t) = ∫ expit(logit(baseline) + effect·a + σ(t)·z) φ(z) dz
 *   (Zeger, Liang & Albert 1988, Biometrics 44:1049, on marginal and conditional effects — from
 *   memory), computed by Simpson's rule on z ∈ [−12, 12] with 4,000 intervals (error below 1e-12;
 *   tested against R's integrate() in `estimand.test.ts`). log-ols gets NaN.
 *
 * Non-gaussian outcomes with the slope target get NaN for every analysis: their marginal slopes
 * have no single value. A NaN true value makes bias and coverage NaN (reported as not available).
 */
import type { AnalysisName } from '@/lib/models/types';
import { normalPdf } from '@/lib/stats/normal';
import type { SimulationSpec } from '@/lib/validation/simulations';
import type { Simulation } from './generate';

const DIFFERENCE_ANALYSES: ReadonlySet<AnalysisName> = new Set(['ols', 'ols-hc3', 'cluster-robust', 'cluster-means', 'mixed', 'huber']);

/** The true effect each analysis of `spec` estimates, given the scenario's random-effect SDs. */
export function trueEffect(sim: Simulation, analysis: AnalysisName): number {
  const { spec } = sim;
  const { family, effect } = spec.truth;
  if (family === 'gaussian') {
    if (analysis === 'log-ols') {
      const base = spec.truth.baseline ?? 0;
      return spec.design.target === 'treat' && base > 0 && base + effect > 0 ? Math.log((base + effect) / base) : NaN;
    }
    return effect;
  }
  if (spec.design.target !== 'treat') return NaN;
  const variances = randomEffectVariances(sim);
  const base = baselineOf(spec);
  if (family === 'count') {
    if (analysis === 'glm' || analysis === 'log-ols') return effect;
    if (!DIFFERENCE_ANALYSES.has(analysis)) return NaN;
    return mean(variances.map((v) => base * Math.expm1(effect) * Math.exp(v / 2)));
  }
  if (analysis === 'log-ols' || !(analysis === 'glm' || DIFFERENCE_ANALYSES.has(analysis))) return NaN;
  const intercept = Math.log(base / (1 - base));
  const p0 = variances.map((v) => marginalProbability(intercept, Math.sqrt(v)));
  const p1 = variances.map((v) => marginalProbability(intercept + effect, Math.sqrt(v)));
  if (analysis === 'glm') return logit(mean(p1)) - logit(mean(p0));
  return mean(p1) - mean(p0);
}

/** σ²(t) of the summed random effects on the link scale at each occasion's time. */
function randomEffectVariances(sim: Simulation): number[] {
  const { cluster, unitIntercept, unitSlope } = sim.sd;
  return Array.from(sim.layout.times, (t) => cluster * cluster + unitIntercept * unitIntercept + (unitSlope * t) ** 2);
}

function baselineOf(spec: SimulationSpec): number {
  return spec.truth.baseline ?? (spec.truth.family === 'binary' ? 0.3 : 5);
}

function mean(values: number[]): number {
  return values.reduce((s, x) => s + x, 0) / values.length;
}

function logit(p: number): number {
  return Math.log(p / (1 - p));
}

function expit(x: number): number {
  return x >= 0 ? 1 / (1 + Math.exp(-x)) : Math.exp(x) / (1 + Math.exp(x));
}

const Z_LIMIT = 12;
const INTERVALS = 4000;

/**
 * ∫ expit(η + σz) φ(z) dz, the marginal probability under a normal random effect of SD σ, by
 * composite Simpson's rule on [−12, 12] (the mass outside is below 4e-33). σ = 0 gives expit(η).
 */
export function marginalProbability(eta: number, sigma: number): number {
  if (sigma === 0) return expit(eta);
  const h = (2 * Z_LIMIT) / INTERVALS;
  let sum = 0;
  for (let i = 0; i <= INTERVALS; i++) {
    const z = -Z_LIMIT + i * h;
    const weight = i === 0 || i === INTERVALS ? 1 : i % 2 === 1 ? 4 : 2;
    sum += weight * expit(eta + sigma * z) * normalPdf(z);
  }
  return (sum * h) / 3;
}
