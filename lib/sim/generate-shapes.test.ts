import { describe, expect, it, vi } from 'vitest';
import { simulationSpecSchema, type SimulationSpecInput } from './spec';
import { marginalProbability } from './estimand';
import { conditionalEffect, createSimulation, generate, type Simulation } from './generate';
import { logitNormalMoments, proportionIcc } from './logit-normal';
import { Rng } from './rng';
import { expectWithinMcse, sampleMoments } from './test-helpers';

/**
 * The data generators of the design shapes beyond two arms of clusters or units — binary
 * outcomes with the ICC on the proportion scale, clustered counts with a between-cluster CV,
 * cross-overs with period effects and carry-over, blocks holding both arms — against the
 * moments their models imply, within 3 Monte Carlo SE over many replicates with fixed seeds.
 * The theoretical values come from the model's definition (generate.ts) and, for logit-normal
 * probabilities, from logit-normal.ts (Simpson integration, tested against R's integrate() in
 * estimand.test.ts). Moment estimators are chosen unbiased, so that no estimator bias eats into
 * the tolerance:
 * - E[P²] of a cluster's probability: Σ_c s_c(s_c − 1) / Σ_c m_c(m_c − 1) over clusters (two
 *   distinct members of a cluster are both 1 with probability E[P²]);
 * - between-cluster variance of true rates: the variance of the cluster means minus the mean
 *   within-cluster variance over m (one-way ANOVA);
 * - covariances of two rows with known means: the mean of the products of their deviations.
 */

vi.setConfig({ testTimeout: 60_000 });

function simulation(input: Partial<SimulationSpecInput> & Pick<SimulationSpecInput, 'design' | 'truth'>): Simulation {
  const spec = simulationSpecSchema.parse({ scenarios: [{ violation: 'none' }], analyses: ['ols'], replicates: 100, seed: 17, ...input });
  return createSimulation(spec, 0);
}

function eachReplicate(sim: Simulation, replicates: number, effect: number, visit: () => void): void {
  for (let r = 0; r < replicates; r++) {
    generate(sim, Rng.forReplicate(sim.spec.seed, sim.scenarioName, 'alternative', r), effect);
    visit();
  }
}

function meanWithMcse(values: number[]): { mean: number; mcse: number } {
  const { mean, variance, n } = sampleMoments(values);
  return { mean, mcse: Math.sqrt(variance / n) };
}

/** Per replicate, over the clusters of one arm: (Σ s(s − 1)/Σ m(m − 1), Σ s/Σ m). */
function clusterPairMoments(sim: Simulation, arm: number): { second: number; mean: number } {
  const { y, treat, groups } = sim.dataset;
  const id = groups[0]!.id;
  const s = new Float64Array(groups[0]!.count);
  const m = new Float64Array(groups[0]!.count);
  for (let i = 0; i < sim.dataset.n; i++) {
    if (treat[i] !== arm) continue;
    s[id[i]!]! += y[i]!;
    m[id[i]!]! += 1;
  }
  let pairs = 0;
  let both = 0;
  let total = 0;
  let events = 0;
  for (let c = 0; c < s.length; c++) {
    pairs += m[c]! * (m[c]! - 1);
    both += s[c]! * (s[c]! - 1);
    total += m[c]!;
    events += s[c]!;
  }
  return { second: both / pairs, mean: events / total };
}

describe('binary outcomes in clusters', () => {
  it('iccScale proportion: E[P] is the baseline’s logit-normal mean and E[P²] gives the ICC asked for (0.05 at baseline 0.2; 300 replicates of 2 × 40 clusters of 12)', () => {
    const sim = simulation({ design: { arms: 2, clustersPerArm: 40, clusterSize: 12 }, truth: { effect: 0, family: 'binary', baseline: 0.2, icc: 0.05, iccScale: 'proportion' } });
    const sigma = sim.sd.cluster;
    const theory = logitNormalMoments(Math.log(0.2 / 0.8), sigma);
    expect(Math.abs(proportionIcc(Math.log(0.2 / 0.8), sigma) - 0.05)).toBeLessThan(1e-10);
    const seconds: number[] = [];
    const means: number[] = [];
    eachReplicate(sim, 300, 0, () => {
      const { second, mean } = clusterPairMoments(sim, 0);
      seconds.push(second);
      means.push(mean);
    });
    const s2 = meanWithMcse(seconds);
    const m = meanWithMcse(means);
    expectWithinMcse('E[P] (first arm)', m.mean, theory.mean, m.mcse);
    expectWithinMcse('E[P²] (first arm)', s2.mean, theory.second, s2.mcse);
    // The ICC these imply, (E[P²] − p̄²)/(p̄(1 − p̄)), is 0.05 by construction of σ.
    expect(Math.abs((theory.second - theory.mean ** 2) / (theory.mean * (1 - theory.mean)) - 0.05)).toBeLessThan(1e-10);
  });

  it('the latent-scale ICC (the default) gives the proportion-scale ICC of its logit-normal model: checkable against theory', () => {
    const sim = simulation({ design: { arms: 2, clustersPerArm: 40, clusterSize: 10 }, truth: { effect: 0, family: 'binary', baseline: 0.3, icc: 0.15 } });
    // Latent ICC 0.15: σ² = 0.15/(1 − 0.15)·π²/3.
    const sigma = Math.sqrt(((0.15 / 0.85) * Math.PI ** 2) / 3);
    expect(Math.abs(sim.sd.cluster - sigma)).toBeLessThan(1e-14);
    const theory = logitNormalMoments(Math.log(0.3 / 0.7), sigma);
    const seconds: number[] = [];
    eachReplicate(sim, 300, 0, () => seconds.push(clusterPairMoments(sim, 1).second));
    const s2 = meanWithMcse(seconds);
    expectWithinMcse('E[P²] (second arm, no effect)', s2.mean, theory.second, s2.mcse);
  });

  it('marginal: the arms’ population proportions are the baseline and expit(logit(baseline) + marginal log OR)', () => {
    const sim = simulation({
      design: { arms: 2, clustersPerArm: 40, clusterSize: 12 },
      truth: { effect: 0.7, family: 'binary', baseline: 0.25, icc: 0.1, iccScale: 'proportion', marginal: true },
    });
    const c = conditionalEffect(sim, 0.7);
    expect(c).toBeGreaterThan(0.7);
    const p1 = 1 / (1 + Math.exp(-(Math.log(0.25 / 0.75) + 0.7)));
    expect(Math.abs(marginalProbability(sim.link.intercept + c, sim.sd.cluster) - p1)).toBeLessThan(1e-12);
    expect(Math.abs(proportionIcc(sim.link.intercept, sim.sd.cluster) - 0.1)).toBeLessThan(1e-10);
    const arm0: number[] = [];
    const arm1: number[] = [];
    eachReplicate(sim, 300, 0.7, () => {
      arm0.push(clusterPairMoments(sim, 0).mean);
      arm1.push(clusterPairMoments(sim, 1).mean);
    });
    const a = meanWithMcse(arm0);
    const b = meanWithMcse(arm1);
    expectWithinMcse('marginal proportion, arm 1', a.mean, 0.25, a.mcse);
    expectWithinMcse('marginal proportion, arm 2', b.mean, p1, b.mcse);
  });
});

describe('counts in clusters', () => {
  /** Per replicate: grand mean, between-cluster variance of true rates (ANOVA), mean within-cluster variance. */
  function components(sim: Simulation): { mean: number; between: number; within: number } {
    const { y, groups } = sim.dataset;
    const id = groups[0]!.id;
    const clusters = groups[0]!.count;
    const m = sim.spec.design.clusterSize!;
    const means = new Float64Array(clusters);
    for (let i = 0; i < sim.dataset.n; i++) means[id[i]!]! += y[i]! / m;
    let within = 0;
    for (let i = 0; i < sim.dataset.n; i++) within += (y[i]! - means[id[i]!]!) ** 2;
    within /= clusters * (m - 1);
    const { mean, variance } = sampleMoments(means);
    return { mean, between: variance - within / m, within };
  }

  it.each([
    ['log-normal', 'log-normal' as const],
    ['gamma', 'gamma' as const],
  ])('clusterCv 0.5 (%s) with negative-binomial rows (k = 2): mean, between-cluster variance μ²cv², within-cluster variance μ + μ²(1 + cv²)/k', (_label, distribution) => {
    const sim = simulation({
      design: { arms: 2, clustersPerArm: 30, clusterSize: 15 },
      truth: { effect: 0, family: 'count', baseline: 3, clusterCv: 0.5, clusterDistribution: distribution, overdispersion: 2, marginal: true },
    });
    const means: number[] = [];
    const between: number[] = [];
    const within: number[] = [];
    eachReplicate(sim, 300, 0, () => {
      const c = components(sim);
      means.push(c.mean);
      between.push(c.between);
      within.push(c.within);
      expect(sim.dataset.y.every((v) => Number.isInteger(v) && v >= 0)).toBe(true);
    });
    const mu = 3;
    const cv2 = 0.25;
    const m = meanWithMcse(means);
    const b = meanWithMcse(between);
    const w = meanWithMcse(within);
    expectWithinMcse('mean count (marginal baseline)', m.mean, mu, m.mcse);
    expectWithinMcse('variance of the clusters’ true means', b.mean, mu * mu * cv2, b.mcse);
    expectWithinMcse('within-cluster variance', w.mean, mu + (mu * mu * (1 + cv2)) / 2, w.mcse);
  });
});

describe('cross-over', () => {
  it('AB/BA: treatment by sequence and period, period indicators, unit ids; the arm-2 rows carried over', () => {
    const sim = simulation({ design: { arms: 2, unitsPerArm: [2, 3], crossover: { periods: 2 } }, truth: { effect: 1, sd: 1, occasionCorrelation: 0.5 } });
    const { dataset, layout, fixed } = sim;
    expect(dataset.n).toBe(10);
    expect(Array.from(dataset.treat)).toEqual([0, 1, 0, 1, 1, 0, 1, 0, 1, 0]);
    expect(Array.from(dataset.covariates!.period2!)).toEqual([0, 1, 0, 1, 0, 1, 0, 1, 0, 1]);
    expect(Array.from(layout.carriedOfRow)).toEqual([0, 0, 0, 0, 0, 1, 0, 1, 0, 1]);
    expect(dataset.groups.map((g) => [g.name, g.count])).toEqual([['unit', 5]]);
    expect(fixed).toEqual({ covariates: ['period2'], includeTime: false, target: 'treat' });
  });

  it('default sequences ABBA/BAAB for 4 periods, and the ones given', () => {
    const four = simulation({ design: { arms: 2, unitsPerArm: 2, crossover: { periods: 4 } }, truth: { effect: 1, sd: 1 } });
    expect(Array.from(four.dataset.treat.subarray(4, 12))).toEqual([0, 1, 1, 0, 1, 0, 0, 1]);
    const given = simulation({ design: { arms: 2, unitsPerArm: 2, crossover: { periods: 3, sequences: ['ABA', 'BAB'] } }, truth: { effect: 1, sd: 1 } });
    expect(Array.from(given.dataset.treat.subarray(0, 3))).toEqual([0, 1, 0]);
    expect(Array.from(given.dataset.treat.subarray(6, 9))).toEqual([1, 0, 1]);
  });

  it('gaussian: each period’s mean by sequence is period effect + effect·treat + carry-over, and two periods of a unit covary ρ·sd² (AB/BA, 100 replicates of 2 × 100)', () => {
    const sd = 2;
    const rho = 0.6;
    const sim = simulation({
      design: { arms: 2, unitsPerArm: 100, crossover: { periods: 2 } },
      truth: { effect: 1, sd, occasionCorrelation: rho, periodEffects: [0.5], baseline: 10 },
      scenarios: [{ violation: 'carry-over', size: -0.8 }],
    });
    const cells: number[][] = [[], [], [], []];
    const cov: number[] = [];
    eachReplicate(sim, 100, 1, () => {
      const { y } = sim.dataset;
      const sums = [0, 0, 0, 0];
      let products = 0;
      for (let u = 0; u < 200; u++) {
        const sequence = u < 100 ? 0 : 1;
        sums[sequence * 2]! += y[2 * u]! / 100;
        sums[sequence * 2 + 1]! += y[2 * u + 1]! / 100;
        const expected = sequence === 0 ? [10, 11.5] : [11, 10.5 - 0.8];
        products += (y[2 * u]! - expected[0]!) * (y[2 * u + 1]! - expected[1]!);
      }
      sums.forEach((s, k) => cells[k]!.push(s));
      cov.push(products / 200);
    });
    // AB: period 1 A (10), period 2 B (10 + 0.5 + 1); BA: period 1 B (11), period 2 A after B (10 + 0.5 − 0.8).
    [10, 11.5, 11, 9.7].forEach((expected, k) => {
      const c = meanWithMcse(cells[k]!);
      expectWithinMcse(`mean of sequence ${k < 2 ? 'AB' : 'BA'}, period ${(k % 2) + 1}`, c.mean, expected, c.mcse);
    });
    const c = meanWithMcse(cov);
    expectWithinMcse('covariance of a unit’s two periods', c.mean, rho * sd * sd, c.mcse);
  });

  it('carry-over as a fraction follows the run’s effect: none under the null', () => {
    const sim = simulation({
      design: { arms: 2, unitsPerArm: 3, crossover: { periods: 2 } },
      truth: { effect: 1, sd: 1 },
      scenarios: [{ violation: 'carry-over', fraction: 0.5 }],
    });
    const rng = () => Rng.forReplicate(1, 'carry-over', 'null', 0);
    generate(sim, rng(), 0);
    const atNull = Float64Array.from(sim.dataset.y);
    generate(sim, rng(), 1);
    // Effect 1: treated rows +1, carried rows +0.5.
    sim.dataset.y.forEach((v, i) => expect(v - atNull[i]!).toBeCloseTo(sim.layout.treatOfRow[i]! + 0.5 * sim.layout.carriedOfRow[i]!, 12));
  });

  it('binary, 4 periods: each period’s proportion is the logit-normal mean of its linear predictor', () => {
    const periods = [0, 0.4, -0.3, 0.2];
    const sim = simulation({
      design: { arms: 2, unitsPerArm: 100, crossover: { periods: 4 } },
      truth: { effect: 0.8, family: 'binary', baseline: 0.3, occasionCorrelation: 0.4, periodEffects: periods.slice(1) },
    });
    const sigma = sim.sd.unitIntercept;
    const cells: number[][] = Array.from({ length: 8 }, () => []);
    eachReplicate(sim, 150, 0.8, () => {
      const { y } = sim.dataset;
      const sums = new Array<number>(8).fill(0);
      for (let u = 0; u < 200; u++) for (let t = 0; t < 4; t++) sums[(u < 100 ? 0 : 4) + t]! += y[4 * u + t]! / 100;
      sums.forEach((s, k) => cells[k]!.push(s));
    });
    const sequences = ['ABBA', 'BAAB'];
    for (let k = 0; k < 8; k++) {
      const treated = sequences[k < 4 ? 0 : 1]![k % 4] === 'B' ? 1 : 0;
      const expected = marginalProbability(Math.log(0.3 / 0.7) + periods[k % 4]! + 0.8 * treated, sigma);
      const c = meanWithMcse(cells[k]!);
      expectWithinMcse(`proportion, sequence ${sequences[k < 4 ? 0 : 1]}, period ${(k % 4) + 1}`, c.mean, expected, c.mcse);
    }
  });
});

describe('blocks holding both arms', () => {
  it('clusters randomised within blocks: layout nests clusters in blocks, both arms in every block', () => {
    const sim = simulation({ design: { arms: 2, blocks: 3, clustersPerArm: 2, clusterSize: 4 }, truth: { effect: 1, sd: 1, icc: 0.1, blockIcc: 0.2 } });
    const { dataset } = sim;
    expect(dataset.n).toBe(3 * 2 * 2 * 4);
    expect(dataset.groups.map((g) => [g.name, g.count])).toEqual([['block', 3], ['cluster', 12]]);
    expect(Array.from(dataset.treat.subarray(0, 16))).toEqual([...new Array(8).fill(0), ...new Array(8).fill(1)]);
    expect(Array.from(dataset.groups[1]!.id.subarray(16, 20))).toEqual([4, 4, 4, 4]);
    expect(sim.analysisOptions).toEqual({ glmm: { level: 1 }, 'cluster-means': { level: 1 } });
  });

  it('gaussian: two units of one cluster covary (blockIcc + icc)·sd², of one block in different clusters blockIcc·sd², of different blocks 0', () => {
    const sd = 1.5;
    const sim = simulation({ design: { arms: 2, blocks: 10, clustersPerArm: 2, clusterSize: 5 }, truth: { effect: 0.5, sd, icc: 0.2, blockIcc: 0.3 } });
    const sameCluster: number[] = [];
    const sameBlock: number[] = [];
    const otherBlock: number[] = [];
    const perBlock = 20;
    eachReplicate(sim, 200, 0.5, () => {
      const { y, treat } = sim.dataset;
      const dev = (i: number) => y[i]! - 0.5 * treat[i]!;
      let a = 0;
      let b = 0;
      let c = 0;
      for (let k = 0; k < 10; k++) {
        const first = k * perBlock;
        a += dev(first) * dev(first + 1);
        b += dev(first) * dev(first + 5);
        c += dev(first) * dev(((k + 1) % 10) * perBlock + 2);
      }
      sameCluster.push(a / 10);
      sameBlock.push(b / 10);
      otherBlock.push(c / 10);
    });
    const a = meanWithMcse(sameCluster);
    const b = meanWithMcse(sameBlock);
    const c = meanWithMcse(otherBlock);
    expectWithinMcse('covariance within a cluster', a.mean, 0.5 * sd * sd, a.mcse);
    expectWithinMcse('covariance within a block', b.mean, 0.3 * sd * sd, b.mcse);
    expectWithinMcse('covariance between blocks', c.mean, 0, c.mcse);
  });
});

describe('clusters measured over time with their own trends (clusterSlopeSd)', () => {
  it('two units of one cluster covary icc·sd² + t²·clusterSlopeSd² at time t, and the units of different clusters not at all', () => {
    const sd = 1;
    const slope = 0.3;
    const sim = simulation({
      design: { arms: 2, clustersPerArm: 20, clusterSize: 2, occasions: 4, target: 'treat:time' },
      truth: { effect: 0, sd, icc: 0.2, occasionCorrelation: 0.3, clusterSlopeSd: slope },
    });
    const at: number[][] = [[], [], [], []];
    const apart: number[] = [];
    eachReplicate(sim, 400, 0, () => {
      const { y } = sim.dataset;
      // Rows: cluster c, unit k (0, 1), occasion t at ((2c + k)·4 + t).
      for (let t = 0; t < 4; t++) {
        let s = 0;
        for (let c = 0; c < 40; c++) s += y[8 * c + t]! * y[8 * c + 4 + t]!;
        at[t]!.push(s / 40);
      }
      let s = 0;
      for (let c = 0; c < 39; c++) s += y[8 * c + 3]! * y[8 * (c + 1) + 3]!;
      apart.push(s / 39);
    });
    at.forEach((values, t) => {
      const m = meanWithMcse(values);
      expectWithinMcse(`covariance of two units of a cluster at time ${t}`, m.mean, 0.2 * sd * sd + t * t * slope * slope, m.mcse);
    });
    const a = meanWithMcse(apart);
    expectWithinMcse('covariance of units of different clusters at time 3', a.mean, 0, a.mcse);
  });
});
