/**
 * Data generation for the stress test: from a specification's design and truth and one of its
 * scenarios, refill a reusable `Dataset` with one replicate's data.
 *
 * Model (gaussian family), for unit u of cluster c at occasion t with time tₜ:
 *
 *   y = baseline + μ + a_c + b_u + s_u·tₜ + e,
 *   μ = effect·treat              (target 'treat'), or effect·treat·tₜ (target 'treat:time'),
 *   a_c ~ N(0, icc·sd²),                         the cluster's random intercept,
 *   b_u ~ N(0, ρ·(1 − icc)·sd²),                 the unit's random intercept (with occasions),
 *   s_u ~ N(0, randomSlopeSd²),                  the unit's random slope on time,
 *   (+ c_c·tₜ, c_c ~ N(0, clusterSlopeSd²),      the cluster's random slope, when given)
 *   e   with variance σ²_e = (1 − ρ)(1 − icc)·sd², the residual,
 *
 * where ρ = occasionCorrelation (0 without occasions) and baseline the first arm's mean (default
 * 0; a level well above sd gives the positive outcome log-ols needs). So at s_u = 0 the total
 * variance is sd², icc is the share between clusters, and two occasions of one unit correlate
 * icc + ρ·(1 − icc). (The nested random-intercept model, e.g. Hayes & Moulton 2017, ch. 2;
 * Diggle, Heagerty, Liang & Zeger 2002, ch. 5.) The first arm has treat = 0, the second 1.
 *
 * Scenarios change the residual e (never the random effects) or the mean:
 * - `none`: e = σ_e·Z.
 * - `skewed`: e = σ_e·L, L the standardised log-normal with σ_log (`random.ts`): SD unchanged.
 * - `heavy-tailed`: e = σ_e·t_ν/√(ν/(ν − 2)): SD unchanged, ν > 2.
 * - `outliers`: e = σ_e·Z, multiplied by `scale` with probability `fraction` (a contaminated
 *   normal: Var e = σ²_e·(1 + fraction·(scale² − 1))).
 * - `unequal-variance`: e = σ_e·k·Z with k = sdRatio in arm 2 and 1 in arm 1 (`arm`); k =
 *   1 + (sdRatio − 1)·x for a unit covariate x ~ U(0, 1), so sdRatio is the ratio between x = 1
 *   and x = 0 (`covariate`); k = sdRatio^((μ + a_c + b_u + s_u·tₜ)/sd), sdRatio per SD of the
 *   row's conditional mean (`mean`; under zero effect only the random effects move it).
 * - `nonlinear`: μ gains strength·sd·h(v), v ∈ [0, 1] the predictor on its range — time
 *   (tₜ − t₁)/(t_last − t₁), or a unit covariate x ~ U(0, 1) that the analysis adjusts for
 *   linearly — with h(v) = v² (quadratic), ln(1 + 9v)/ln 10 (logarithmic) or 1{v ≥ ½} (threshold).
 * - `serial`: within a unit, e follows a stationary AR(1) across successive occasions:
 *   e₁ = σ_e·Z₁, eₜ = ar·eₜ₋₁ + σ_e·√(1 − ar²)·Zₜ.
 *
 * Blocks (design.blocks): a block intercept a_k ~ N(0, blockIcc·sd²) joins the sum, and the shares
 * of the rest are taken from 1 − icc − blockIcc instead of 1 − icc. Cross-over (design.crossover):
 * each row's treatment is its sequence's arm at that period, period t adds periodEffects[t − 2]
 * (t ≥ 2), and the `carry-over` scenario adds its size (fraction × the run's effect, or a fixed
 * size) to every row whose previous period had arm 2.
 *
 * Binary and count families use the same random effects on the link scale, with the level-one
 * variance fixed by the family: π²/3 for the logit (the latent-variable ICC, Snijders & Bosker
 * 2012, Multilevel Analysis 2nd ed., §17.4) and ln(1 + 1/baseline) for the log link (Nakagawa &
 * Schielzeth 2010, Biol Rev 85:935, from memory); the link-scale total
 * T = v₁/((1 − icc − blockIcc)(1 − ρ)) replaces sd² above. Binary: y ~ Bernoulli(expit(logit(baseline) + effect·treat + …)). Count:
 * y ~ Poisson(λ·G), λ = exp(ln(baseline) + effect·treat + …) and G ~ Gamma(k, 1/k) when
 * `overdispersion` k is given (negative binomial, Var = λ + λ²/k), else G = 1. `baseline` is the
 * first arm's probability or mean for a cluster and unit with zero random effects.
 *
 * Other parametrisations of the truth (lib/sim/spec.ts):
 * - Binary, iccScale `proportion`: the cluster SD σ on the logit scale is the one whose
 *   logit-normal cluster probabilities have the requested ICC on the proportion scale in the
 *   first arm, Var(P_c)/(p̄(1 − p̄)) (logit-normal.ts; Donner & Klar 2000) — so a model-based
 *   GLMM is correctly specified and the ICC the sample-size formulas use is the generated one.
 * - Count, clusterCv: the clusters' rate multipliers have that coefficient of variation:
 *   e^{a_c} with a_c ~ N(0, ln(1 + cv²)) (log-normal), or G_c ~ Gamma(1/cv², cv²) with mean 1
 *   (gamma: Poisson cluster totals are then negative binomial, Hayes & Bennett 1999's model),
 *   drawn as a_c = ln G_c.
 * - marginal: `baseline` is the first arm's population-averaged probability or mean count (at
 *   time 0 and period 1) and, for binary, `effect` the marginal log odds ratio: the intercept η₀
 *   solves E[expit(η₀ + √V·Z)] = baseline and the conditional effect c solves
 *   E[expit(η₀ + c + √V·Z)] = expit(logit(baseline) + effect), V the summed random-effect
 *   variance (count: η₀ = ln(baseline) − V/2, c = effect).
 *
 * Order of draws from the replicate's stream (fixed by the specification, so data are
 * reproducible): the blocks' intercepts in block order (with blocks); the clusters' intercepts
 * (or gamma multipliers) in cluster order; the clusters' slopes in cluster order (when
 * clusterSlopeSd > 0); then per unit in unit order its intercept and its slope (each only when
 * its SD is above 0) and its covariate x (when the scenario uses one); then per row in row order the residual (for outliers: the uniform, then
 * the normal; for counts: the gamma factor, then the Poisson draw).
 */
import type { AnalysisOptions } from '@/lib/models';
import type { AnalysisName, Dataset, FixedEffects } from '@/lib/models/types';
import { scenarioKey, type Scenario, type SimulationSpec } from './spec';
import { allocateDataset, buildLayout, periodColumn, type Layout } from './layout';
import { interceptForMarginal, sigmaForIcc } from './logit-normal';
import { bernoulli, gamma, poisson, standardisedLogNormal, standardisedLogNormalScale, studentT } from './random';
import type { Rng } from './rng';

/** The name of the simulated covariate in `Dataset.covariates` and `FixedEffects.covariates`. */
export const COVARIATE = 'x';

/** Everything one worker needs to generate replicates of one scenario, allocated once. */
export interface Simulation {
  spec: SimulationSpec;
  scenario: Scenario;
  /** The scenario's key in results (its name, by default its violation). */
  scenarioName: string;
  layout: Layout;
  /** Refilled by every `generate` call: y and the covariate; treat, time and groups never change. */
  dataset: Dataset;
  /** The fixed part every analysis fits for this design and scenario. */
  fixed: FixedEffects;
  /** SDs of the components on the outcome's scale (gaussian) or the link scale. */
  sd: { block: number; cluster: number; clusterSlope: number; unitIntercept: number; unitSlope: number; residual: number; total: number };
  /**
   * Binary and count: the linear predictor of the first arm at zero random effects (period 1),
   * and the shape 1/cv² of gamma cluster multipliers (0 when the cluster effects are normal).
   */
  link: { intercept: number; clusterGammaShape: number };
  /** The mean shift of each occasion (cross-over period effects; 0 otherwise). */
  occasionShift: Float64Array;
  /** Options each analysis is fitted with for this design (e.g. the glmm's grouping level). */
  analysisOptions: Partial<Record<AnalysisName, AnalysisOptions>>;
  /** Per-unit scratch space: intercepts, slopes and the covariate. */
  scratch: { blockEffect: Float64Array; clusterEffect: Float64Array; clusterSlope: Float64Array; unitIntercept: Float64Array; unitSlope: Float64Array; covariate: Float64Array };
  /** Conditional effects already solved for (marginal binary truths). */
  conditional: Map<number, number>;
}

/** Does the scenario need the unit covariate x? */
function usesCovariate(spec: SimulationSpec, scenario: Scenario): boolean {
  if (scenario.violation === 'unequal-variance') return scenario.model === 'covariate';
  if (scenario.violation === 'nonlinear') return nonlinearOn(spec, scenario) === 'covariate';
  return false;
}

function nonlinearOn(spec: SimulationSpec, scenario: Extract<Scenario, { violation: 'nonlinear' }>): 'time' | 'covariate' {
  return scenario.on ?? (spec.design.occasions !== undefined ? 'time' : 'covariate');
}

/**
 * The fixed effects every analysis should fit: intercept + treat; time and treat × time for the
 * slope target (y ~ treat·time); time also when the scenario makes the true relation with time
 * curved (the analysis fits it as a line); the covariate x when the scenario generates one. The
 * truth has no time trend otherwise, so time is left out: with every unit measured at the same
 * times it is balanced across arms and would not change the estimate of treat in a linear model,
 * while a summary analysis of cluster means would see it as a constant column. A cross-over adds
 * its period indicators (period2, …): every analysis of a cross-over adjusts for period.
 */
export function fixedEffectsFor(spec: SimulationSpec, scenario: Scenario): FixedEffects {
  const curvedInTime = scenario.violation === 'nonlinear' && nonlinearOn(spec, scenario) === 'time';
  const periods = spec.design.crossover?.periods ?? 0;
  const periodColumns = Array.from({ length: Math.max(0, periods - 1) }, (_, k) => periodColumn(k + 2));
  return {
    covariates: [...(usesCovariate(spec, scenario) ? [COVARIATE] : []), ...periodColumns],
    includeTime: spec.design.target === 'treat:time' || curvedInTime,
    target: spec.design.target,
  };
}

/** Allocates the layout, the data set and the scratch space for one scenario of a specification. */
export function createSimulation(spec: SimulationSpec, scenarioIndex: number): Simulation {
  const scenario = spec.scenarios[scenarioIndex];
  if (!scenario) throw new RangeError(`scenarioIndex must be between 0 and ${spec.scenarios.length - 1}, got ${scenarioIndex}`);
  const layout = buildLayout(spec.design);
  const fixed = fixedEffectsFor(spec, scenario);
  const dataset = allocateDataset(layout, fixed.covariates);
  const { truth } = spec;
  const rho = truth.occasionCorrelation;
  const rest = 1 - truth.icc - truth.blockIcc;
  const total = truth.family === 'gaussian' ? truth.sd! : Math.sqrt(levelOneVariance(spec) / (rest * (1 - rho)));
  const sd = {
    block: total * Math.sqrt(truth.blockIcc),
    cluster: total * Math.sqrt(truth.icc),
    clusterSlope: truth.clusterSlopeSd,
    unitIntercept: total * Math.sqrt(rho * rest),
    unitSlope: truth.randomSlopeSd,
    residual: total * Math.sqrt((1 - rho) * rest),
    total,
  };
  const link = { intercept: 0, clusterGammaShape: 0 };
  if (truth.family === 'binary' && truth.iccScale === 'proportion') {
    const base = baselineOf(spec);
    sd.cluster = sigmaForIcc(truth.icc, truth.marginal ? { marginal: base } : { eta: Math.log(base / (1 - base)) });
    sd.total = Math.sqrt(sd.cluster * sd.cluster + levelOneVariance(spec));
  }
  if (truth.clusterCv !== undefined) {
    if (truth.clusterDistribution === 'gamma') link.clusterGammaShape = 1 / (truth.clusterCv * truth.clusterCv);
    else sd.cluster = Math.sqrt(Math.log1p(truth.clusterCv * truth.clusterCv));
  }
  if (truth.family !== 'gaussian') {
    const base = baselineOf(spec);
    const variance = sd.block ** 2 + sd.cluster ** 2 + sd.unitIntercept ** 2;
    if (truth.family === 'binary') link.intercept = truth.marginal ? interceptForMarginal(base, Math.sqrt(variance)) : Math.log(base / (1 - base));
    else link.intercept = Math.log(base) - (truth.marginal ? variance / 2 : 0);
  }
  const occasionShift = new Float64Array(layout.occasions);
  truth.periodEffects?.forEach((shift, k) => (occasionShift[k + 1] = shift));
  const scratch = {
    blockEffect: new Float64Array(layout.blockCount),
    clusterEffect: new Float64Array(layout.clusterCount),
    clusterSlope: new Float64Array(layout.clusterCount),
    unitIntercept: new Float64Array(layout.unitCount),
    unitSlope: new Float64Array(layout.unitCount),
    covariate: new Float64Array(layout.unitCount),
  };
  return {
    spec,
    scenario,
    scenarioName: scenarioKey(scenario),
    layout,
    dataset,
    fixed,
    sd,
    link,
    occasionShift,
    analysisOptions: analysisOptionsFor(dataset.groups.map((g) => g.name)),
    scratch,
    conditional: new Map(),
  };
}

/**
 * The options the design's data need (`names`: its grouping levels, outermost first):
 * - glmm: its random intercept at the clusters when the design has them (the level the
 *   treatment is assigned at), else at the units measured repeatedly (cross-over, occasions),
 *   else at the blocks;
 * - cluster-means: with blocks, the means of the clusters (the blocks hold both arms, so their
 *   means carry no contrast).
 * The other analyses take their defaults (cluster-robust clusters on the outermost level, which
 * with blocks is the blocks: coarser than the clusters, and valid).
 */
function analysisOptionsFor(names: string[]): Simulation['analysisOptions'] {
  const cluster = names.indexOf('cluster');
  const unit = names.indexOf('unit');
  const options: Simulation['analysisOptions'] = { glmm: { level: cluster >= 0 ? cluster : unit >= 0 ? unit : 0 } };
  if (names[0] === 'block' && cluster >= 0) options['cluster-means'] = { level: cluster };
  return options;
}

/**
 * The effect on the link scale given the effect of the specification's scale: the same, except
 * for a marginal binary truth, where the conditional log odds ratio c is solved from the marginal
 * one (see the module comment).
 */
export function conditionalEffect(sim: Simulation, effect: number): number {
  const { truth } = sim.spec;
  if (!(truth.family === 'binary' && truth.marginal) || effect === 0) return effect;
  const known = sim.conditional.get(effect);
  if (known !== undefined) return known;
  const base = baselineOf(sim.spec);
  const { sd } = sim;
  const sigma = Math.sqrt(sd.block ** 2 + sd.cluster ** 2 + sd.unitIntercept ** 2);
  const target = 1 / (1 + Math.exp(-(Math.log(base / (1 - base)) + effect)));
  const c = interceptForMarginal(target, sigma) - sim.link.intercept;
  sim.conditional.set(effect, c);
  return c;
}

/** The family's level-one variance on the link scale (see the module comment). */
function levelOneVariance(spec: SimulationSpec): number {
  const { family } = spec.truth;
  if (family === 'binary') return (Math.PI * Math.PI) / 3;
  return Math.log1p(1 / baselineOf(spec));
}

/** The first arm's probability (binary, default 0.3) or mean count (count, default 5). */
export function baselineOf(spec: SimulationSpec): number {
  return spec.truth.baseline ?? (spec.truth.family === 'binary' ? 0.3 : 5);
}

/**
 * Refills `sim.dataset` with one replicate drawn from `rng`, with the given true effect (the
 * planned effect for the alternative run, 0 for the paired null run). Returns the data set.
 */
export function generate(sim: Simulation, rng: Rng, effect: number): Dataset {
  const { layout, dataset, sd, scratch, scenario, spec } = sim;
  const { blockEffect, clusterEffect, clusterSlope, unitIntercept, unitSlope, covariate } = scratch;
  const { unitCount, occasions, times, clusterOfUnit, blockOfUnit, treatOfRow, carriedOfRow } = layout;

  for (let b = 0; b < layout.blockCount; b++) blockEffect[b] = sd.block > 0 ? sd.block * rng.normal() : 0;
  const shape = sim.link.clusterGammaShape;
  for (let c = 0; c < layout.clusterCount; c++) {
    if (shape > 0) clusterEffect[c] = Math.log(gamma(rng, shape) / shape);
    else clusterEffect[c] = sd.cluster > 0 ? sd.cluster * rng.normal() : 0;
  }
  if (sd.clusterSlope > 0) for (let c = 0; c < layout.clusterCount; c++) clusterSlope[c] = sd.clusterSlope * rng.normal();
  const needsX = sim.fixed.covariates.includes(COVARIATE);
  for (let u = 0; u < unitCount; u++) {
    unitIntercept[u] = sd.unitIntercept > 0 ? sd.unitIntercept * rng.normal() : 0;
    unitSlope[u] = sd.unitSlope > 0 ? sd.unitSlope * rng.normal() : 0;
    if (needsX) covariate[u] = rng.uniform();
  }
  if (needsX) {
    const x = dataset.covariates![COVARIATE]!;
    for (let u = 0, row = 0; u < unitCount; u++) for (let t = 0; t < occasions; t++, row++) x[row] = covariate[u]!;
  }

  // The conditional mean of each row (fixed part + random effects), written into y.
  const y = dataset.y;
  const slopeTarget = spec.design.target === 'treat:time';
  const curve = scenario.violation === 'nonlinear' ? nonlinearCurve(sim, scenario) : undefined;
  const shift = sim.occasionShift;
  const linkEffect = conditionalEffect(sim, effect);
  const carry = scenario.violation === 'carry-over' ? (scenario.size ?? scenario.fraction * linkEffect) : 0;
  for (let u = 0, row = 0; u < unitCount; u++) {
    const c = clusterOfUnit[u]!;
    const b = blockOfUnit[u]!;
    const base = (b >= 0 ? blockEffect[b]! : 0) + (c >= 0 ? clusterEffect[c]! : 0) + unitIntercept[u]!;
    const slope = unitSlope[u]! + (c >= 0 ? clusterSlope[c]! : 0);
    for (let t = 0; t < occasions; t++, row++) {
      const time = times[t]!;
      let mean = base + slope * time + shift[t]! + (treatOfRow[row] === 1 ? linkEffect * (slopeTarget ? time : 1) : 0);
      if (carriedOfRow[row] === 1) mean += carry;
      if (curve) mean += curve(u, t);
      y[row] = mean;
    }
  }

  if (spec.truth.family === 'binary') return fillBinary(sim, rng);
  if (spec.truth.family === 'count') return fillCount(sim, rng);
  addResiduals(sim, rng);
  const level = spec.truth.baseline ?? 0;
  if (level !== 0) for (let i = 0; i < layout.n; i++) y[i]! += level;
  return dataset;
}

/** strength·sd·h(v) for unit u at occasion t (see the module comment). */
function nonlinearCurve(sim: Simulation, scenario: Extract<Scenario, { violation: 'nonlinear' }>): (u: number, t: number) => number {
  const height = scenario.strength * sim.sd.total;
  const h =
    scenario.shape === 'quadratic'
      ? (v: number) => v * v
      : scenario.shape === 'logarithmic'
        ? (v: number) => Math.log1p(9 * v) / Math.LN10
        : (v: number) => (v >= 0.5 ? 1 : 0);
  if (nonlinearOn(sim.spec, scenario) === 'covariate') {
    const x = sim.scratch.covariate;
    return (u) => height * h(x[u]!);
  }
  const { times } = sim.layout;
  const first = times[0]!;
  const range = times[times.length - 1]! - first;
  const curveAt = Float64Array.from(times, (t) => height * h((t - first) / range));
  return (_u, t) => curveAt[t]!;
}

/** Adds the scenario's residuals to the conditional means in y (gaussian family). */
function addResiduals(sim: Simulation, rng: Rng): void {
  const { scenario, dataset, layout } = sim;
  const y = dataset.y;
  const n = layout.n;
  const s = sim.sd.residual;
  switch (scenario.violation) {
    case 'none':
    case 'nonlinear':
    case 'carry-over':
      for (let i = 0; i < n; i++) y[i]! += s * rng.normal();
      return;
    case 'skewed': {
      const scale = standardisedLogNormalScale(scenario.sigmaLog);
      for (let i = 0; i < n; i++) y[i]! += s * standardisedLogNormal(rng, scale);
      return;
    }
    case 'heavy-tailed': {
      const nu = scenario.df;
      const factor = s / Math.sqrt(nu / (nu - 2));
      for (let i = 0; i < n; i++) y[i]! += factor * studentT(rng, nu);
      return;
    }
    case 'outliers': {
      const { fraction, scale } = scenario;
      for (let i = 0; i < n; i++) {
        const k = rng.uniform() < fraction ? scale : 1;
        y[i]! += k * s * rng.normal();
      }
      return;
    }
    case 'unequal-variance': {
      const { sdRatio, model } = scenario;
      if (model === 'arm') {
        const treat = dataset.treat;
        for (let i = 0; i < n; i++) y[i]! += (treat[i] === 1 ? sdRatio : 1) * s * rng.normal();
      } else if (model === 'covariate') {
        const x = dataset.covariates![COVARIATE]!;
        for (let i = 0; i < n; i++) y[i]! += (1 + (sdRatio - 1) * x[i]!) * s * rng.normal();
      } else {
        const logRatio = Math.log(sdRatio) / sim.sd.total;
        for (let i = 0; i < n; i++) y[i]! += Math.exp(logRatio * y[i]!) * s * rng.normal();
      }
      return;
    }
    case 'serial': {
      const { ar } = scenario;
      const innovation = s * Math.sqrt(1 - ar * ar);
      const T = layout.occasions;
      for (let u = 0, row = 0; u < layout.unitCount; u++) {
        let e = s * rng.normal();
        y[row++]! += e;
        for (let t = 1; t < T; t++, row++) {
          e = ar * e + innovation * rng.normal();
          y[row]! += e;
        }
      }
      return;
    }
  }
}

/** Binary outcomes: y holds the linear predictor without the intercept; replaced by 0/1. */
function fillBinary(sim: Simulation, rng: Rng): Dataset {
  const { dataset } = sim;
  const y = dataset.y;
  const intercept = sim.link.intercept;
  for (let i = 0; i < dataset.n; i++) y[i] = bernoulli(rng, 1 / (1 + Math.exp(-(intercept + y[i]!))));
  return dataset;
}

/** Count outcomes: y holds the linear predictor without the intercept; replaced by counts. */
function fillCount(sim: Simulation, rng: Rng): Dataset {
  const { dataset, spec } = sim;
  const y = dataset.y;
  const intercept = sim.link.intercept;
  const k = spec.truth.overdispersion;
  for (let i = 0; i < dataset.n; i++) {
    let mean = Math.exp(intercept + y[i]!);
    if (k !== undefined) mean *= gamma(rng, k) / k;
    y[i] = poisson(rng, Math.min(mean, 1e9));
  }
  return dataset;
}
