import { describe, expect, it } from 'vitest';
import { simulationSpecSchema, type SimulationSpecInput } from './spec';
import { trueEffect, marginalProbability } from './estimand';
import fixture from './fixtures/estimands.json';
import { createSimulation } from './generate';
import { aggregate, runReplicates } from './run';
import { expectRelativelyClose, expectWithinMcse } from './test-helpers';

/**
 * Marginal probabilities against R's integrate() (`fixtures/estimands.json`, written by
 * `fixtures/generate_estimands.R`), the closed forms by hand, and — by simulation — that the
 * analyses of differences are unbiased for the marginal differences the module derives.
 */

const sim = (input: Pick<SimulationSpecInput, 'design' | 'truth'>, analyses: SimulationSpecInput['analyses'] = ['ols']) =>
  createSimulation(simulationSpecSchema.parse({ scenarios: [{ violation: 'none' }], analyses, replicates: 100, seed: 3, ...input }), 0);

describe('marginalProbability', () => {
  it.each(fixture.marginalProbability.map((r) => [r.eta, r.sigma, r.probability] as const))('η %s, σ %s → %s (R integrate) to 1e-11 relative', (eta, sigma, p) => {
    expectRelativelyClose(`marginalProbability(${eta}, ${sigma})`, marginalProbability(eta, sigma), p, 1e-11);
  });

  it('is expit(η) without a random effect', () => {
    expectRelativelyClose('marginalProbability(0.4, 0)', marginalProbability(0.4, 0), 1 / (1 + Math.exp(-0.4)), 1e-15);
  });
});

describe('trueEffect', () => {
  it('is the effect for every difference analysis of a gaussian outcome, the log ratio of means for log-ols', () => {
    const s = sim({ design: { arms: 2, unitsPerArm: 20 }, truth: { effect: 5, sd: 2, baseline: 40 } });
    for (const a of ['ols', 'ols-hc3', 'cluster-robust', 'cluster-means', 'mixed', 'huber'] as const) expect(trueEffect(s, a)).toBe(5);
    expectRelativelyClose('log-ols', trueEffect(s, 'log-ols'), Math.log(45 / 40), 1e-15);
    expect(trueEffect(sim({ design: { arms: 2, unitsPerArm: 20 }, truth: { effect: 5, sd: 2 } }), 'log-ols')).toBeNaN();
  });

  it('counts: the log rate ratio for glm, baseline·(e^effect − 1)·e^(σ²/2) for differences', () => {
    const s = sim({ design: { arms: 2, clustersPerArm: 5, clusterSize: 4 }, truth: { effect: 0.4, icc: 0.2, family: 'count', baseline: 3 } });
    expect(trueEffect(s, 'glm')).toBe(0.4);
    const v = (0.2 * Math.log1p(1 / 3)) / 0.8; // σ²_cluster = icc·v₁/(1 − icc)
    expectRelativelyClose('count difference', trueEffect(s, 'ols'), 3 * Math.expm1(0.4) * Math.exp(v / 2), 1e-14);
  });

  it('binary without random effects: glm gets the effect itself, differences the risk difference', () => {
    const s = sim({ design: { arms: 2, unitsPerArm: 50 }, truth: { effect: Math.log(3), family: 'binary', baseline: 0.25 } });
    expectRelativelyClose('glm', trueEffect(s, 'glm'), Math.log(3), 1e-12);
    expectRelativelyClose('risk difference', trueEffect(s, 'cluster-means'), 0.5 - 0.25, 1e-12);
    expect(trueEffect(s, 'log-ols')).toBeNaN();
  });
});

describe('trueEffect for glmm, glm-nb, cross-overs and marginal truths', () => {
  it('glmm: exactly the conditional effect when its random intercept is the only one; partly marginal when the units’ own effects are left out', () => {
    const alone = sim({ design: { arms: 2, clustersPerArm: 10, clusterSize: 8 }, truth: { effect: 0.8, icc: 0.2, family: 'binary' } }, ['glmm', 'glm']);
    expect(trueEffect(alone, 'glmm')).toBe(0.8);
    const nested = sim({ design: { arms: 2, clustersPerArm: 10, clusterSize: 8, occasions: 3 }, truth: { effect: 0.8, icc: 0.2, occasionCorrelation: 0.5, family: 'binary' } }, ['glmm', 'glm']);
    const partial = trueEffect(nested, 'glmm');
    // Marginal over the unit effect only: between the fully marginal value and the conditional one.
    expect(partial).toBeLessThan(0.8);
    expect(partial).toBeGreaterThan(trueEffect(nested, 'glm'));
    const unitSd = nested.sd.unitIntercept;
    const eta = Math.log(0.3 / 0.7);
    const logit = (p: number) => Math.log(p / (1 - p));
    expectRelativelyClose('glmm, units marginalised', partial, logit(marginalProbability(eta + 0.8, unitSd)) - logit(marginalProbability(eta, unitSd)), 1e-12);
  });

  it('counts: glm, glm-nb and glmm get the log rate ratio; with gamma cluster multipliers (mean 1) the difference in means is baseline·(e^effect − 1)', () => {
    const s = sim({ design: { arms: 2, clustersPerArm: 5, clusterSize: 4 }, truth: { effect: 0.4, family: 'count', baseline: 3, clusterCv: 0.5, clusterDistribution: 'gamma' } }, ['glm', 'glm-nb', 'glmm', 'ols']);
    for (const a of ['glm', 'glm-nb', 'glmm'] as const) expect(trueEffect(s, a)).toBe(0.4);
    expectRelativelyClose('count difference', trueEffect(s, 'ols'), 3 * Math.expm1(0.4), 1e-14);
  });

  it('a marginal binary truth: glm gets the specification’s (marginal) log odds ratio back, glmm the larger conditional one', () => {
    const s = sim({ design: { arms: 2, clustersPerArm: 10, clusterSize: 8 }, truth: { effect: 0.6, icc: 0.1, iccScale: 'proportion', marginal: true, family: 'binary', baseline: 0.2 } }, ['glmm', 'glm']);
    expectRelativelyClose('glm', trueEffect(s, 'glm'), 0.6, 1e-10);
    expect(trueEffect(s, 'glmm')).toBeGreaterThan(0.6);
  });

  it('a binary cross-over: glm gets the average of the per-period marginal log odds ratios, differences the average per-period risk difference', () => {
    const s = sim({ design: { arms: 2, unitsPerArm: 10, crossover: { periods: 2 } }, truth: { effect: 0.5, family: 'binary', baseline: 0.4, occasionCorrelation: 0.3, periodEffects: [0.4] } }, ['glm', 'period-difference']);
    const sigma = s.sd.unitIntercept;
    const eta = Math.log(0.4 / 0.6);
    const logit = (p: number) => Math.log(p / (1 - p));
    const p = (shift: number, arm: number) => marginalProbability(eta + shift + 0.5 * arm, sigma);
    expectRelativelyClose('glm', trueEffect(s, 'glm'), (logit(p(0, 1)) - logit(p(0, 0)) + logit(p(0.4, 1)) - logit(p(0.4, 0))) / 2, 1e-12);
    expectRelativelyClose('period-difference', trueEffect(s, 'period-difference'), (p(0, 1) - p(0, 0) + p(0.4, 1) - p(0.4, 0)) / 2, 1e-12);
    expect(trueEffect(s, 'glmm')).toBe(0.5);
  });
});

describe('by simulation, the marginal estimands are what the analyses estimate (within 3 MC SE)', () => {
  it.each<[string, SimulationSpecInput['truth']]>([
    ['binary, 15 clusters × 20 per arm, ICC 0.2, odds ratio 2', { effect: Math.log(2), icc: 0.2, family: 'binary', baseline: 0.3 }],
    ['counts, 15 clusters × 20 per arm, ICC 0.2, rate ratio 1.5, overdispersion 3', { effect: Math.log(1.5), icc: 0.2, family: 'count', baseline: 2, overdispersion: 3 }],
  ])('%s: cluster-means and glm are unbiased for the marginal values (600 replicates)', (_case, truth) => {
    const spec = simulationSpecSchema.parse({
      design: { arms: 2, clustersPerArm: 15, clusterSize: 20 },
      truth,
      scenarios: [{ violation: 'none' }],
      analyses: ['cluster-means', 'glm'],
      replicates: 600,
      seed: 1988,
    });
    const results = aggregate(spec, [runReplicates(spec, 0, 0, spec.replicates)]).none!;
    for (const a of ['cluster-means', 'glm'] as const) {
      const bias = results[a]!.bias;
      // glm's estimate of a log ratio has a small-sample bias of order 1/n; 3 MC SE (~0.01) covers it here.
      expectWithinMcse(`${a} bias against the marginal value`, bias.value, 0, bias.mcse);
    }
  }, 60_000);
});
