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
 * - Cross-over (period effects πₜ on the link scale): the same quantities with the intercept moved
 *   by πₜ in period t; glm (which adjusts for period) gets the average over periods of the
 *   per-period marginal log odds ratios, the analyses of differences (with period-difference)
 *   the average of the per-period marginal differences — what they estimate in a balanced
 *   design (AB/BA: exactly ½ of the two periods' differences).
 * - glmm: the log odds ratio conditional on its random intercept (generate.ts picks the level:
 *   clusters, else repeatedly measured units, else blocks), marginal over the other random
 *   effects: exactly the generating conditional effect c when there are no others (then coverage
 *   tests the GLMM itself); otherwise the per-period average of logit(p̄₁) − logit(p̄₀) with p̄
 *   integrated over the other effects' variance only — the approximate target of a GLMM that
 *   leaves them out. For counts c: the log link keeps conditional and marginal ratios equal.
 * - glm-nb: the log rate ratio c.
 * - A marginal truth (truth.marginal): c is solved from the marginal effect (generate.ts), so glm
 *   gets back the specification's effect and glmm the larger conditional one.
 *
 * Non-gaussian outcomes with the slope target get NaN for every analysis: their marginal slopes
 * have no single value. A NaN true value makes bias and coverage NaN (reported as not available).
 */
import type { AnalysisName } from '@/lib/models/types';
import { conditionalEffect, type Simulation } from './generate';
import { logitNormalMoments } from './logit-normal';

const DIFFERENCE_ANALYSES: ReadonlySet<AnalysisName> = new Set(['ols', 'ols-hc3', 'cluster-robust', 'cluster-means', 'mixed', 'huber', 'period-difference']);

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
  const c = conditionalEffect(sim, effect);
  const eta0 = sim.link.intercept;
  const shifts = Array.from(sim.occasionShift);
  const variances = randomEffectVariances(sim);
  if (family === 'count') {
    if (analysis === 'glm' || analysis === 'glm-nb' || analysis === 'glmm' || analysis === 'log-ols') return c;
    if (!DIFFERENCE_ANALYSES.has(analysis)) return NaN;
    return mean(variances.map((v, t) => Math.exp(eta0 + shifts[t]!) * Math.expm1(c) * Math.exp(v / 2)));
  }
  if (analysis === 'log-ols' || !(analysis === 'glm' || analysis === 'glmm' || DIFFERENCE_ANALYSES.has(analysis))) return NaN;
  const p = (arm: number, t: number, v: number) => marginalProbability(eta0 + shifts[t]! + arm * c, Math.sqrt(v));
  const perPeriodLogOdds = (vs: number[]) => mean(vs.map((v, t) => logit(p(1, t, v)) - logit(p(0, t, v))));
  if (analysis === 'glmm') {
    const others = variances.map((v) => Math.max(0, v - glmmLevelVariance(sim)));
    return others.every((v) => v === 0) ? c : perPeriodLogOdds(others);
  }
  if (analysis === 'glm') {
    if (sim.layout.periods > 0) return perPeriodLogOdds(variances);
    return logit(mean(variances.map((v, t) => p(1, t, v)))) - logit(mean(variances.map((v, t) => p(0, t, v))));
  }
  return mean(variances.map((v, t) => p(1, t, v) - p(0, t, v)));
}

/** σ²(t) of the summed normal random effects on the link scale at each occasion's time. */
function randomEffectVariances(sim: Simulation): number[] {
  const { block, cluster, clusterSlope, unitIntercept, unitSlope } = sim.sd;
  return Array.from(sim.layout.times, (t) => block * block + cluster * cluster + unitIntercept * unitIntercept + (unitSlope * t) ** 2 + (clusterSlope * t) ** 2);
}

/** The variance of the random effect the glmm fits (at its grouping level). */
function glmmLevelVariance(sim: Simulation): number {
  const level = sim.analysisOptions.glmm?.level ?? 0;
  const name = sim.dataset.groups[level]?.name;
  const { block, cluster, unitIntercept } = sim.sd;
  if (name === 'block') return block * block;
  if (name === 'cluster') return cluster * cluster;
  if (name === 'unit') return unitIntercept * unitIntercept;
  return 0;
}

function mean(values: number[]): number {
  return values.reduce((s, x) => s + x, 0) / values.length;
}

function logit(p: number): number {
  return Math.log(p / (1 - p));
}

/**
 * ∫ expit(η + σz) φ(z) dz, the marginal probability under a normal random effect of SD σ, by
 * composite Simpson's rule on [−12, 12] with 4,000 intervals (logit-normal.ts; the mass outside
 * is below 4e-33). σ = 0 gives expit(η).
 */
export function marginalProbability(eta: number, sigma: number): number {
  return logitNormalMoments(eta, sigma).mean;
}
