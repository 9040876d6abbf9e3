import { describe, expect, it, vi } from 'vitest';
import { simulationSpecSchema, type SimulationSpecInput } from './spec';
import { describeSizes } from './cluster-sizes';
import fixture from './fixtures/random.json';
import { COVARIATE, createSimulation, generate, type Simulation } from './generate';
import { Rng } from './rng';
import { expectWithinMcse, sampleMoments } from './test-helpers';

/**
 * The generators reproduce the moments they are built to have. Each check pools many replicates
 * and compares against the intended value within 3 Monte Carlo SE (the SE is estimated from the
 * replicates themselves). Shapes of the heavy-tailed and skewed residuals are tested against
 * SciPy's deciles (`fixtures/random.json`).
 */

// Each test takes well under a second on an idle machine; allow for a shared, loaded one.
vi.setConfig({ testTimeout: 30_000 });

function simulation(input: Partial<SimulationSpecInput> & Pick<SimulationSpecInput, 'design' | 'truth'>, scenarioIndex = 0): Simulation {
  const spec = simulationSpecSchema.parse({ scenarios: [{ violation: 'none' }], analyses: ['ols'], replicates: 100, seed: 7, ...input });
  return createSimulation(spec, scenarioIndex);
}

/** Runs `replicates` replicates and hands each data set to `visit`. */
function eachReplicate(sim: Simulation, replicates: number, effect: number, visit: (r: number) => void): void {
  for (let r = 0; r < replicates; r++) {
    generate(sim, Rng.forReplicate(sim.spec.seed, sim.scenarioName, 'alternative', r), effect);
    visit(r);
  }
}

/** Mean and its MC SE over replicate-level values. */
function meanWithMcse(values: number[]): { mean: number; mcse: number } {
  const { mean, variance, n } = sampleMoments(values);
  return { mean, mcse: Math.sqrt(variance / n) };
}

/**
 * One-way ANOVA of clusters nested in arms (equal sizes m): the unbiased variance components
 * σ²_w = MSW and σ²_b = (MSB − MSW)/m, with the arm means removed.
 */
function anovaComponents(y: Float64Array, groupOf: Int32Array, groups: number, m: number, armOfGroup: (g: number) => number) {
  const sums = new Float64Array(groups);
  for (let i = 0; i < y.length; i++) sums[groupOf[i]!]! += y[i]!;
  const means = sums.map((s) => s / m);
  const armMean = [0, 0];
  const armGroups = [0, 0];
  means.forEach((mu, g) => {
    armMean[armOfGroup(g)]! += mu;
    armGroups[armOfGroup(g)]!++;
  });
  armMean[0]! /= armGroups[0]!;
  armMean[1]! /= armGroups[1]!;
  let ssw = 0;
  for (let i = 0; i < y.length; i++) ssw += (y[i]! - means[groupOf[i]!]!) ** 2;
  let ssb = 0;
  means.forEach((mu, g) => (ssb += m * (mu - armMean[armOfGroup(g)]!) ** 2));
  const msw = ssw / (y.length - groups);
  const msb = ssb / (groups - 2);
  return { within: msw, between: (msb - msw) / m };
}

describe('layout', () => {
  it('lays out 10 classes per arm of 20 pupils: 400 rows, clusters contiguous, arm 2 after arm 1', () => {
    const sim = simulation({ design: { arms: 2, clustersPerArm: 10, clusterSize: 20 }, truth: { effect: 0.3, sd: 1, icc: 0.1 } });
    const { dataset } = sim;
    expect(dataset.n).toBe(400);
    expect(dataset.groups.map((g) => [g.name, g.count])).toEqual([['cluster', 20]]);
    const id = dataset.groups[0]!.id;
    for (let i = 1; i < 400; i++) expect(id[i]! - id[i - 1]!).toBeGreaterThanOrEqual(0);
    expect(Array.from(dataset.treat.slice(0, 200)).every((t) => t === 0)).toBe(true);
    expect(Array.from(dataset.treat.slice(200)).every((t) => t === 1)).toBe(true);
    expect(dataset.time).toBeUndefined();
    expect(sim.fixed).toEqual({ covariates: [], includeTime: false, target: 'treat' });
  });

  it('varies cluster sizes with the requested CV (before rounding exactly; after rounding within 0.02)', () => {
    const sim = simulation({ design: { arms: 2, clustersPerArm: 12, clusterSize: 25, clusterSizeCv: 0.6 }, truth: { effect: 0, sd: 1, icc: 0.05 } });
    const { mean, cv, total } = describeSizes(sim.layout.clusterSizes);
    expect(Math.abs(mean - 25)).toBeLessThan(0.5);
    expect(Math.abs(cv - 0.6)).toBeLessThan(0.02);
    expect(sim.dataset.n).toBe(total);
    expect(Math.min(...sim.layout.clusterSizes)).toBeGreaterThanOrEqual(1);
  });

  it('nests units in clusters and occasions in units for a three-level design, with time and treat:time', () => {
    const sim = simulation({
      design: { arms: 2, clustersPerArm: 3, clusterSize: 4, occasions: 3, times: [0, 2, 6], target: 'treat:time' },
      truth: { effect: 0.1, sd: 1, icc: 0.1, occasionCorrelation: 0.5 },
    });
    const { dataset } = sim;
    expect(dataset.n).toBe(2 * 3 * 4 * 3);
    expect(dataset.groups.map((g) => [g.name, g.count])).toEqual([['cluster', 6], ['unit', 24]]);
    expect(Array.from(dataset.time!.slice(0, 6))).toEqual([0, 2, 6, 0, 2, 6]);
    expect(Array.from(dataset.groups[1]!.id.slice(0, 6))).toEqual([0, 0, 0, 1, 1, 1]);
    expect(sim.fixed).toEqual({ covariates: [], includeTime: true, target: 'treat:time' });
  });

  it('takes unequal arms [n1, n2] for independent units', () => {
    const sim = simulation({ design: { arms: 2, unitsPerArm: [30, 50] }, truth: { effect: 0, sd: 1 } });
    expect(sim.dataset.n).toBe(80);
    expect(sim.dataset.groups).toEqual([]);
    expect(sim.dataset.treat.reduce((s, t) => s + t, 0)).toBe(50);
  });
});

describe('gaussian moments (scenario none)', () => {
  it('recovers arm means, the total SD and the ICC of a cluster design (400 replicates of 40 clusters × 10; within 3 MC SE)', () => {
    const sd = 2;
    const icc = 0.15;
    const effect = 0.7;
    const sim = simulation({ design: { arms: 2, clustersPerArm: 20, clusterSize: 10 }, truth: { effect, sd, icc } });
    const groupOf = sim.dataset.groups[0]!.id;
    const between: number[] = [];
    const within: number[] = [];
    const iccs: number[] = [];
    const diffs: number[] = [];
    const arm1: number[] = [];
    eachReplicate(sim, 400, effect, () => {
      const { y } = sim.dataset;
      const c = anovaComponents(y, groupOf, 40, 10, (g) => (g < 20 ? 0 : 1));
      between.push(c.between);
      within.push(c.within);
      iccs.push(c.between / (c.between + c.within));
      const m1 = sampleMoments(y.subarray(0, 200)).mean;
      arm1.push(m1);
      diffs.push(sampleMoments(y.subarray(200)).mean - m1);
    });
    const b = meanWithMcse(between);
    const w = meanWithMcse(within);
    expectWithinMcse('cluster variance icc·sd²', b.mean, icc * sd * sd, b.mcse);
    expectWithinMcse('residual variance (1 − icc)·sd²', w.mean, (1 - icc) * sd * sd, w.mcse);
    const r = meanWithMcse(iccs);
    // The ANOVA ICC is a ratio estimator with a bias of order 1/clusters; 3 MC SE (0.006) covers it here.
    expectWithinMcse('ANOVA ICC', r.mean, icc, r.mcse);
    const d = meanWithMcse(diffs);
    expectWithinMcse('difference between arm means', d.mean, effect, d.mcse);
    const a = meanWithMcse(arm1);
    expectWithinMcse('arm 1 mean', a.mean, 0, a.mcse);
  });

  it('gives a unit intercept of variance ρ·(1 − icc)·sd² and random slopes of SD randomSlopeSd (repeated measures)', () => {
    const sd = 1.5;
    const rho = 0.6;
    const slopeSd = 0.2;
    const sim = simulation({
      design: { arms: 2, unitsPerArm: 100, occasions: 4, times: [0, 1, 2, 4] },
      truth: { effect: 0, sd, occasionCorrelation: rho, randomSlopeSd: slopeSd },
    });
    const first: number[] = [];
    const last: number[] = [];
    const covFirstSecond: number[] = [];
    eachReplicate(sim, 200, 0, () => {
      const { y } = sim.dataset;
      const at = (t: number) => Array.from({ length: 200 }, (_, u) => y[4 * u + t]!);
      const [y0, y1, y3] = [at(0), at(1), at(3)];
      const m0 = sampleMoments(y0);
      const m1 = sampleMoments(y1);
      first.push(m0.variance);
      last.push(sampleMoments(y3).variance);
      covFirstSecond.push(y0.reduce((s, v, u) => s + (v - m0.mean) * (y1[u]! - m1.mean), 0) / 199);
    });
    const v0 = meanWithMcse(first);
    const v3 = meanWithMcse(last);
    const c01 = meanWithMcse(covFirstSecond);
    expectWithinMcse('Var(y) at time 0 = sd²', v0.mean, sd * sd, v0.mcse);
    expectWithinMcse('Var(y) at time 4 = sd² + 16·slopeSd²', v3.mean, sd * sd + 16 * slopeSd * slopeSd, v3.mcse);
    expectWithinMcse('Cov(y at 0, y at 1) = ρ·sd²', c01.mean, rho * sd * sd, c01.mcse);
  });

  it('puts the effect on the slope for target treat:time: arm difference effect·t at each time', () => {
    const sim = simulation({
      design: { arms: 2, unitsPerArm: 200, occasions: 3, times: [0, 1, 3], target: 'treat:time' },
      truth: { effect: 0.4, sd: 1, occasionCorrelation: 0.3 },
    });
    const diffs: number[][] = [[], [], []];
    eachReplicate(sim, 100, 0.4, () => {
      const { y } = sim.dataset;
      for (let t = 0; t < 3; t++) {
        let a = 0;
        let b = 0;
        for (let u = 0; u < 200; u++) a += y[3 * u + t]!;
        for (let u = 200; u < 400; u++) b += y[3 * u + t]!;
        diffs[t]!.push((b - a) / 200);
      }
    });
    [0, 1, 3].forEach((time, t) => {
      const d = meanWithMcse(diffs[t]!);
      expectWithinMcse(`arm difference at time ${time}`, d.mean, 0.4 * time, d.mcse);
    });
  });

  it('adds the baseline to every row: arm means baseline and baseline + effect (50 replicates of 2 × 200 units)', () => {
    const sim = simulation({ design: { arms: 2, unitsPerArm: 200 }, truth: { effect: -4, sd: 3, baseline: 100 } });
    const arm1: number[] = [];
    const arm2: number[] = [];
    eachReplicate(sim, 50, -4, () => {
      arm1.push(sampleMoments(sim.dataset.y.subarray(0, 200)).mean);
      arm2.push(sampleMoments(sim.dataset.y.subarray(200)).mean);
    });
    const a = meanWithMcse(arm1);
    const b = meanWithMcse(arm2);
    expectWithinMcse('arm 1 mean = baseline', a.mean, 100, a.mcse);
    expectWithinMcse('arm 2 mean = baseline + effect', b.mean, 96, b.mcse);
  });

  it('refills the same arrays and is reproducible: same stream → identical data; the effect only shifts arm 2', () => {
    const sim = simulation({ design: { arms: 2, clustersPerArm: 4, clusterSize: 5 }, truth: { effect: 0.5, sd: 1, icc: 0.2 } });
    const y = sim.dataset.y;
    generate(sim, Rng.forReplicate(3, 'none', 'alternative', 11), 0);
    const atZero = Float64Array.from(y);
    generate(sim, Rng.forReplicate(3, 'none', 'alternative', 12), 0);
    expect(Array.from(y)).not.toEqual(Array.from(atZero));
    generate(sim, Rng.forReplicate(3, 'none', 'alternative', 11), 0.5);
    expect(sim.dataset.y).toBe(y);
    y.forEach((v, i) => expect(Math.abs(v - atZero[i]! - 0.5 * sim.dataset.treat[i]!)).toBeLessThan(1e-12));
  });
});

describe('violations', () => {
  /** Residuals of an independent design with effect 0: the rows are the errors themselves. */
  function residuals(scenario: SimulationSpecInput['scenarios'][number], replicates: number, sd = 1, extra: Partial<SimulationSpecInput['design']> = {}): { sim: Simulation; values: Float64Array } {
    const sim = simulation({ design: { arms: 2, unitsPerArm: 500, ...extra }, truth: { effect: 0, sd }, scenarios: [scenario] });
    const n = sim.dataset.n;
    const values = new Float64Array(n * replicates);
    eachReplicate(sim, replicates, 0, (r) => values.set(sim.dataset.y, r * n));
    return { sim, values };
  }

  /** E[x²] with its MC SE (effect 0: the mean is 0 by construction). */
  function secondMoment(values: Float64Array): { value: number; mcse: number } {
    const squares = Array.from(values, (v) => v * v);
    const { mean, mcse } = meanWithMcse(squares);
    return { value: mean, mcse };
  }

  function decileChi2(values: Float64Array, edges: number[], scale: number): number {
    const counts = new Array<number>(10).fill(0);
    for (const v of values) {
      let bin = 0;
      while (bin < 9 && v * scale > edges[bin]!) bin++;
      counts[bin]!++;
    }
    return counts.reduce((s, c) => s + (c - values.length / 10) ** 2 / (values.length / 10), 0);
  }

  it('heavy-tailed (ν = 5) keeps the SD at sd; with ν = 3 the residuals are sd·t₃/√3 (SciPy deciles)', () => {
    const five = residuals({ violation: 'heavy-tailed', df: 5 }, 100, 2);
    const m = secondMoment(five.values);
    expectWithinMcse('Var of sd·t₅/√(5/3) residuals, sd = 2', m.value, 4, m.mcse);
    const three = residuals({ violation: 'heavy-tailed' }, 100, 2);
    const row = fixture.continuous.find((r) => r.distribution === 'studentT' && r.df === 3)!;
    const chi2 = decileChi2(three.values, row.edges, Math.sqrt(3) / 2);
    expect(chi2 < row.critical, `t₃ deciles: χ² ${chi2.toFixed(2)}, critical ${row.critical.toFixed(2)}`).toBe(true);
  });

  it('skewed keeps the SD at sd and has the standardised log-normal shape (σ_log 0.8, SciPy deciles)', () => {
    const { values } = residuals({ violation: 'skewed' }, 100, 3);
    const m = secondMoment(values);
    expectWithinMcse('Var of skewed residuals, sd = 3', m.value, 9, m.mcse);
    const row = fixture.continuous.find((r) => r.distribution === 'standardisedLogNormal')!;
    const chi2 = decileChi2(values, row.edges, 1 / 3);
    expect(chi2 < row.critical, `log-normal deciles: χ² ${chi2.toFixed(2)}, critical ${row.critical.toFixed(2)}`).toBe(true);
  });

  it('outliers: the second moment gives back the fraction, (E e²/σ² − 1)/(scale² − 1) = 0.05', () => {
    const { values } = residuals({ violation: 'outliers' }, 200);
    const m = secondMoment(values);
    expectWithinMcse('outlier fraction from E e²', (m.value - 1) / 24, 0.05, m.mcse / 24);
  });

  it('unequal-variance by arm: SD in arm 2 is sdRatio × SD in arm 1', () => {
    const { sim, values } = residuals({ violation: 'unequal-variance', sdRatio: 3 }, 100);
    const n = sim.dataset.n;
    const arm = (a: number) => values.filter((_, i) => sim.dataset.treat[i % n] === a);
    const v1 = secondMoment(arm(0));
    const v2 = secondMoment(arm(1));
    expectWithinMcse('Var in arm 1', v1.value, 1, v1.mcse);
    expectWithinMcse('Var in arm 2', v2.value, 9, v2.mcse);
  });

  it('unequal-variance by covariate: SD is 1 + (sdRatio − 1)·x, so E[e²] = ∫(1 + (r − 1)x)² dx', () => {
    const { sim } = residuals({ violation: 'unequal-variance', model: 'covariate', sdRatio: 3 }, 1);
    expect(sim.fixed.covariates).toEqual([COVARIATE]);
    const squares: number[] = [];
    eachReplicate(sim, 100, 0, () => {
      const x = sim.dataset.covariates![COVARIATE]!;
      expect(x.every((v) => v > 0 && v < 1)).toBe(true);
      sim.dataset.y.forEach((e) => squares.push(e * e));
    });
    const m = meanWithMcse(squares);
    // ∫₀¹ (1 + 2x)² dx = 1 + 2 + 4/3.
    expectWithinMcse('E e² with SD 1 + 2x', m.mean, 13 / 3, m.mcse);
  });

  it('unequal-variance by the mean: SD sdRatio^(mean/sd), so with effect = sd arm 2 has SD sdRatio', () => {
    const sim = simulation({ design: { arms: 2, unitsPerArm: 500 }, truth: { effect: 2, sd: 2 }, scenarios: [{ violation: 'unequal-variance', model: 'mean', sdRatio: 1.5 }] });
    const arm1: number[] = [];
    const arm2: number[] = [];
    eachReplicate(sim, 100, 2, () => {
      sim.dataset.y.forEach((v, i) => (i < 500 ? arm1.push(v * v) : arm2.push((v - 2) ** 2)));
    });
    const a = meanWithMcse(arm1);
    const b = meanWithMcse(arm2);
    expectWithinMcse('Var in arm 1 (mean 0)', a.mean, 4, a.mcse);
    expectWithinMcse('Var in arm 2 (mean 1 SD)', b.mean, 4 * 1.5 ** 2, b.mcse);
  });

  it('serial: residuals of successive occasions correlate ar = 0.5', () => {
    const sim = simulation({ design: { arms: 2, unitsPerArm: 200, occasions: 5 }, truth: { effect: 0, sd: 1 }, scenarios: [{ violation: 'serial' }] });
    const lag1: number[] = [];
    const lag2: number[] = [];
    eachReplicate(sim, 100, 0, () => {
      const { y } = sim.dataset;
      for (let u = 0; u < 400; u++) {
        lag1.push(y[5 * u]! * y[5 * u + 1]!);
        lag2.push(y[5 * u + 2]! * y[5 * u + 4]!);
      }
    });
    const l1 = meanWithMcse(lag1);
    const l2 = meanWithMcse(lag2);
    expectWithinMcse('lag-1 covariance', l1.mean, 0.5, l1.mcse);
    expectWithinMcse('lag-2 covariance', l2.mean, 0.25, l2.mcse);
  });

  it('nonlinear (quadratic in time, strength 1): the mean at time t is sd·((t − t₁)/(t_last − t₁))²', () => {
    const sim = simulation({
      design: { arms: 2, unitsPerArm: 100, occasions: 5 },
      truth: { effect: 0, sd: 2 },
      scenarios: [{ violation: 'nonlinear' }],
    });
    expect(sim.fixed.includeTime).toBe(true);
    const means: number[][] = [[], [], [], [], []];
    eachReplicate(sim, 100, 0, () => {
      for (let t = 0; t < 5; t++) {
        let s = 0;
        for (let u = 0; u < 200; u++) s += sim.dataset.y[5 * u + t]!;
        means[t]!.push(s / 200);
      }
    });
    means.forEach((values, t) => {
      const m = meanWithMcse(values);
      expectWithinMcse(`mean at time ${t}`, m.mean, 2 * (t / 4) ** 2, m.mcse);
    });
  });

  it('nonlinear on a covariate: a threshold at x = ½ of height strength·sd, and x is in the fixed effects', () => {
    const sim = simulation({ design: { arms: 2, unitsPerArm: 500 }, truth: { effect: 0, sd: 1 }, scenarios: [{ violation: 'nonlinear', shape: 'threshold', strength: 2 }] });
    expect(sim.fixed.covariates).toEqual([COVARIATE]);
    const jumps: number[] = [];
    eachReplicate(sim, 50, 0, () => {
      const x = sim.dataset.covariates![COVARIATE]!;
      const high = sim.dataset.y.filter((_, i) => x[i]! >= 0.5);
      const low = sim.dataset.y.filter((_, i) => x[i]! < 0.5);
      jumps.push(sampleMoments(high).mean - sampleMoments(low).mean);
    });
    const j = meanWithMcse(jumps);
    expectWithinMcse('jump at the threshold', j.mean, 2, j.mcse);
  });
});

describe('binary and count outcomes', () => {
  it('binary without clustering: P(y = 1) is baseline in arm 1 and expit(logit(baseline) + effect) in arm 2', () => {
    const sim = simulation({ design: { arms: 2, unitsPerArm: 1000 }, truth: { effect: Math.log(2), family: 'binary', baseline: 0.2 } });
    const p1: number[] = [];
    const p2: number[] = [];
    eachReplicate(sim, 50, Math.log(2), () => {
      p1.push(sampleMoments(sim.dataset.y.subarray(0, 1000)).mean);
      p2.push(sampleMoments(sim.dataset.y.subarray(1000)).mean);
    });
    const a = meanWithMcse(p1);
    const b = meanWithMcse(p2);
    expectWithinMcse('P(y = 1) in arm 1', a.mean, 0.2, a.mcse);
    expectWithinMcse('P(y = 1) in arm 2 (odds ratio 2)', b.mean, 0.5 / 1.5, b.mcse);
  });

  it('counts with overdispersion k = 2: mean baseline and variance μ + μ²/k (negative binomial)', () => {
    const sim = simulation({ design: { arms: 2, unitsPerArm: 1000 }, truth: { effect: 0, family: 'count', baseline: 4, overdispersion: 2 } });
    const means: number[] = [];
    const variances: number[] = [];
    eachReplicate(sim, 50, 0, () => {
      const m = sampleMoments(sim.dataset.y);
      means.push(m.mean);
      variances.push(m.variance);
      expect(sim.dataset.y.every((v) => Number.isInteger(v) && v >= 0)).toBe(true);
    });
    const m = meanWithMcse(means);
    const v = meanWithMcse(variances);
    expectWithinMcse('mean count', m.mean, 4, m.mcse);
    expectWithinMcse('variance of counts', v.mean, 4 + 16 / 2, v.mcse);
  });
});
