import { describe, expect, it } from 'vitest';
import { clusterMeansPower } from './cluster-means';
import { expectInputError, expectRelativelyClose, run } from './testing';
import { twoGroupMeansPower } from './two-group-means';

const cluster = { kind: 'cluster-means', delta: 0.3, sd: 1 };

describe('ICC 0 and 1, cluster size 1', () => {
  it.each([2, 7, 30])('cluster size 1 (DE = 1): cluster means on k per arm equal two-group means on k per group (k = %s)', (k) => {
    const byCluster = clusterMeansPower({ delta: 0.5, sd: 1.2, icc: 0.3, clusterSize: 1, cv: 0, clustersPerArm: k, alpha: 0.05, sides: 2 });
    const byUnit = twoGroupMeansPower({ delta: 0.5, sd: 1.2, nPerGroup: k, ratio: 1, alpha: 0.05, sides: 2 });
    expectRelativelyClose(`k ${k}`, byCluster, byUnit, 1e-14);
  });

  it('ICC 0: the same noncentrality as two-group means on m·k per arm; power lower only by the df (2k − 2 instead of 2mk − 2)', () => {
    const out = run({ ...cluster, icc: 0, clusterSize: 10, clustersPerArm: 12 });
    expect(out.result.designEffect).toBe(1);
    const units = run({ kind: 'two-group-means', delta: 0.3, sd: 1, nPerGroup: 120 });
    const clusterPower = out.result.power as number;
    const unitPower = units.result.power as number;
    expect(clusterPower).toBeLessThan(unitPower);
    // With unlimited clusters the df difference vanishes: the same n·δ²/σ² gives the same power.
    const many = clusterMeansPower({ delta: 0.03, sd: 1, icc: 0, clusterSize: 10, cv: 0, clustersPerArm: 12_000, alpha: 0.05, sides: 2 });
    const manyUnits = twoGroupMeansPower({ delta: 0.03, sd: 1, nPerGroup: 120_000, ratio: 1, alpha: 0.05, sides: 2 });
    expectRelativelyClose('k 12000, m 10 vs n 120000', many, manyUnits, 1e-6);
  });

  it('ICC 0 in two proportions equals the unclustered calculation', () => {
    const clustered = run({ kind: 'two-proportions', p1: 0.2, p2: 0.3, power: 0.8, icc: 0, clusterSize: 25 });
    const plain = run({ kind: 'two-proportions', p1: 0.2, p2: 0.3, power: 0.8 });
    expect(clustered.result.nPerGroup).toBe(plain.result.nPerGroup);
    expect(clustered.result.clustersPerArm).toBe(Math.ceil((plain.result.nPerGroup as number) / 25));
  });

  it('ICC 1: more units per cluster add nothing (cv 0)', () => {
    const powers = [1, 5, 50, 5000].map((m) => run({ ...cluster, icc: 1, clusterSize: m, clustersPerArm: 20 }).result.power as number);
    powers.forEach((p) => expectRelativelyClose('ICC 1', p, powers[0]!, 1e-14));
    const solved = run({ ...cluster, icc: 1, clustersPerArm: 20, power: 0.8 });
    expect(solved.feasibility).toBe('unreachable');
    expectRelativelyClose('plateau = power at m = 1', solved.result.plateauPower as number, powers[0]!, 1e-14);
  });
});

describe('extreme targets', () => {
  it('tiny alpha (1e-8) and power 0.999 still solve, and n − 1 falls short', () => {
    const out = run({ kind: 'two-group-means', delta: 0.5, sd: 1, alpha: 1e-8, power: 0.999 });
    const n = out.result.nPerGroup as number;
    expect(out.feasibility).toBe('ok');
    expect(out.result.power as number).toBeGreaterThanOrEqual(0.999);
    expect(twoGroupMeansPower({ delta: 0.5, sd: 1, nPerGroup: n - 1, ratio: 1, alpha: 1e-8, sides: 2 })).toBeLessThan(0.999);
    const reg = run({ kind: 'regression', f2: 0.15, predictors: 3, testedPredictors: 2, alpha: 1e-8, power: 0.999 });
    expect(reg.result.power as number).toBeGreaterThanOrEqual(0.999);
    const prop = run({ kind: 'two-proportions', p1: 0.3, p2: 0.4, alpha: 1e-8, power: 0.999 });
    expect(prop.result.power as number).toBeGreaterThanOrEqual(0.999);
  });

  it('already met: a huge effect reaches the power at the smallest size', () => {
    const out = run({ kind: 'two-group-means', delta: 50, sd: 1, power: 0.8 });
    expect(out.feasibility).toBe('already-met');
    expect(out.result.nPerGroup).toBe(2);
    expect(out.warnings.join(' ')).toMatch(/already reached with the smallest allowed number/);
    const clusters = run({ ...cluster, delta: 20, icc: 0.05, clusterSize: 30, power: 0.8 });
    expect(clusters.feasibility).toBe('already-met');
    expect(clusters.result.clustersPerArm).toBe(2);
  });

  it('unreachable: a tiny effect gives the largest size and its power, no NaN', () => {
    const out = run({ kind: 'two-group-means', delta: 1e-4, sd: 1, power: 0.9 });
    expect(out.feasibility).toBe('unreachable');
    expect(out.result.nPerGroup).toBe(10_000_000);
    expect(out.result.power as number).toBeGreaterThan(0.05);
    expect(out.result.power as number).toBeLessThan(0.9);
  });

  it('the plateau: too few clusters for any cluster size, with the clusters that would reach it', () => {
    const out = run({ ...cluster, icc: 0.1, clustersPerArm: 4, power: 0.9 });
    expect(out.feasibility).toBe('unreachable');
    const plateau = out.result.plateauPower as number;
    // Limit m → ∞: Var(cluster mean) = σ²·ICC, so power of the t test with ncp 0.3/√(2·0.1/4), df 6.
    expectRelativelyClose('plateau', plateau, clusterMeansPower({ delta: 0.3, sd: 1, icc: 0.1, clusterSize: Infinity, cv: 0, clustersPerArm: 4, alpha: 0.05, sides: 2 }), 0);
    expect(plateau).toBeLessThan(0.9);
    const needed = out.result.clustersPerArmNeeded as number;
    expect(clusterMeansPower({ delta: 0.3, sd: 1, icc: 0.1, clusterSize: Infinity, cv: 0, clustersPerArm: needed, alpha: 0.05, sides: 2 })).toBeGreaterThanOrEqual(0.9);
    expect(clusterMeansPower({ delta: 0.3, sd: 1, icc: 0.1, clusterSize: Infinity, cv: 0, clustersPerArm: needed - 1, alpha: 0.05, sides: 2 })).toBeLessThan(0.9);
    expect(out.warnings.join(' ')).toMatch(/power levels off at/);
  });

  it('p2 out of reach below 1: the nearest p2 and its power', () => {
    const out = run({ kind: 'two-proportions', p1: 0.5, nPerGroup: 3, power: 0.99 });
    expect(out.feasibility).toBe('unreachable');
    expect(out.result.p2 as number).toBeGreaterThan(0.999999);
    expect(out.result.p2 as number).toBeLessThan(1);
    expect(out.result.power as number).toBeLessThan(0.99);
  });

  it('p2 below p1 when asked', () => {
    const out = run({ kind: 'two-proportions', p1: 0.5, nPerGroup: 100, power: 0.8, direction: 'lower' });
    const up = run({ kind: 'two-proportions', p1: 0.5, nPerGroup: 100, power: 0.8 });
    // Symmetric about 0.5.
    expectRelativelyClose('p2 below', 1 - (out.result.p2 as number), up.result.p2 as number, 1e-9);
  });
});

describe('adjustments', () => {
  it('dropout inflates each group by 1/(1 − d), rounded up: 64 analysed with 20% loss → 80 to recruit', () => {
    const out = run({ kind: 'two-group-means', delta: 0.5, sd: 1, power: 0.8, dropout: 0.2 });
    expect(out.result).toMatchObject({ nPerGroup: 64, nPerGroupToRecruit: 80, nGroup2ToRecruit: 80, totalAnalysed: 128, totalToRecruit: 160 });
    const uneven = run({ kind: 'two-group-means', delta: 0.5, sd: 1, nPerGroup: 30, ratio: 0.1, dropout: 0.15 });
    // n2 = 0.1·30 = 3 (not 4, though 0.1·30 rounds to 3.0000000000000004); recruit ⌈30/0.85⌉ = 36 and ⌈3/0.85⌉ = 4.
    expect(uneven.result).toMatchObject({ nGroup2: 3, nPerGroupToRecruit: 36, nGroup2ToRecruit: 4, totalAnalysed: 33, totalToRecruit: 40 });
  });

  it('cluster dropout inflates clusters, unit dropout the cluster size', () => {
    const out = run({ ...cluster, icc: 0.05, clusterSize: 20, clustersPerArm: 18, dropout: 0.1, clusterDropout: 0.25 });
    expect(out.result).toMatchObject({ clusterSizeToRecruit: 23, clustersPerArmToRecruit: 24, totalAnalysed: 720, totalToRecruit: 2 * 24 * 23 });
  });

  it('Bonferroni plans each of K outcomes at α/K', () => {
    const out = run({ kind: 'two-group-means', delta: 0.5, sd: 1, power: 0.8, outcomes: 3, multiplicity: 'bonferroni' });
    expectRelativelyClose('alphaAdjusted', out.result.alphaAdjusted as number, 0.05 / 3, 1e-15);
    const direct = run({ kind: 'two-group-means', delta: 0.5, sd: 1, power: 0.8, alpha: 0.05 / 3 });
    expect(out.result.nPerGroup).toBe(direct.result.nPerGroup);
    expect(out.result.alpha).toBe(0.05);
  });

  it('Holm plans at α/K too and says it is the first step, common practice', () => {
    const out = run({ kind: 'regression', f2: 0.1, n: 100, outcomes: 4, multiplicity: 'holm' });
    expect(out.result.alphaAdjusted).toBe(0.0125);
    expect(out.warnings.join(' ')).toMatch(/Holm.*first and most stringent step.*common practice/);
    expect(out.references.join(' ')).toMatch(/Holm \(1979\)/);
  });

  it('several outcomes without adjustment give a warning and α unchanged', () => {
    const out = run({ kind: 'two-group-means', delta: 0.5, sd: 1, power: 0.8, outcomes: 2 });
    expect(out.result.alphaAdjusted).toBe(0.05);
    expect(out.warnings.join(' ')).toMatch(/without adjustment/);
  });
});

describe('inputs that do not fit together', () => {
  it.each([
    ['two unknowns', { kind: 'two-group-means', sd: 1, power: 0.8 }, 'delta', /Only one of power, nPerGroup, delta/],
    ['no unknown', { kind: 'two-group-means', sd: 1, delta: 0.5, nPerGroup: 20, power: 0.8 }, 'nPerGroup', /Leave out one of/],
    ['solveFor something else', { kind: 'two-group-means', sd: 1, delta: 0.5, nPerGroup: 20, power: 0.8, solveFor: 'sd' }, 'solveFor', /solveFor must be one of/],
    ['solveFor with another missing', { kind: 'two-group-means', sd: 1, delta: 0.5, solveFor: 'power' }, 'nPerGroup', /Give nPerGroup to solve for power/],
    ['power at α', { kind: 'two-group-means', sd: 1, delta: 0.5, power: 0.05 }, 'power', /must be above the significance level/],
    ['power below α/K', { kind: 'regression', f2: 0.1, power: 0.01, outcomes: 10, multiplicity: 'bonferroni', alpha: 0.2 }, 'power', /above the significance level/],
    ['predictors < tested', { kind: 'regression', f2: 0.1, n: 50, predictors: 2, testedPredictors: 3 }, 'predictors', /at least testedPredictors/],
    ['n too small for the df', { kind: 'regression', f2: 0.1, n: 5, predictors: 4 }, 'n', /n must be at least 6/],
    ['f2 and slope', { kind: 'regression', f2: 0.1, slope: 1, sdX: 1, residualSd: 1, n: 50 }, 'f2', /not both/],
    ['slope without sdX', { kind: 'regression', slope: 1, residualSd: 1, n: 50 }, 'sdX', /give sdX/],
    ['p1 = p2 when solving n', { kind: 'two-proportions', p1: 0.3, p2: 0.3, power: 0.8 }, 'p2', /p2 equals p1/],
    ['icc without clusterSize', { kind: 'two-proportions', p1: 0.3, p2: 0.4, power: 0.8, icc: 0.05 }, 'clusterSize', /give both icc and clusterSize/],
    ['change with no baseline', { kind: 'repeated-measures', delta: 1, sd: 1, rho: 0.5, baselines: 0, analysis: 'change', power: 0.8 }, 'baselines', /at least one baseline/],
    ['equal times', { kind: 'longitudinal-slopes', slopeDifference: 1, sd: 1, rho: 0.5, times: [2, 2, 2], power: 0.8 }, 'times', /must not all be equal/],
    ['ratio leaving group 2 with one unit', { kind: 'two-group-means', delta: 1, sd: 1, nPerGroup: 10, ratio: 0.1 }, 'nPerGroup', /at least 11/],
  ])('%s', (_case, input, field, message) => expectInputError(input, field, message));

  it('p1 = p2 is fine when solving power: power is the one-tail rate α/2', () => {
    const out = run({ kind: 'two-proportions', p1: 0.3, p2: 0.3, nPerGroup: 100 });
    expectRelativelyClose('power at no difference', out.result.power as number, 0.025, 1e-12);
  });
});

describe('optimal allocation', () => {
  const costs = { kind: 'optimal-allocation', icc: 0.05, costPerCluster: 300, costPerUnit: 10 };

  it('with a target: the clusters per arm of cluster-means (cv 0) at the whole-number size, and the budget they cost', () => {
    const out = run({ ...costs, delta: 0.3, sd: 1, power: 0.8 });
    expect(out.solvedFor).toBe('budget');
    expect(out.result.clusterSizeInteger).toBe(24);
    const direct = run({ kind: 'cluster-means', delta: 0.3, sd: 1, icc: 0.05, clusterSize: 24, power: 0.8 });
    expect(out.result.clustersPerArm).toBe(direct.result.clustersPerArm);
    expect(out.result.power).toBe(direct.result.power);
    expect(out.result.budget).toBe(2 * (direct.result.clustersPerArm as number) * (300 + 24 * 10));
  });

  it('with a budget and a target: what the budget buys and what the target needs', () => {
    const out = run({ ...costs, budget: 20_000, delta: 0.3, sd: 1, power: 0.8 });
    expect(out.result.clustersPerArm).toBe(Math.floor(20_000 / (2 * 540)));
    expect(out.result.clustersPerArmNeeded).toBe(run({ ...costs, delta: 0.3, sd: 1, power: 0.8 }).result.clustersPerArm);
  });

  it('a budget too small for two clusters per arm is unreachable, without a power', () => {
    const out = run({ ...costs, budget: 2000, delta: 0.3, sd: 1 });
    expect(out.feasibility).toBe('unreachable');
    expect(out.result.clustersPerArm).toBe(1);
    expect(out.result.power).toBeNull();
    expect(out.warnings.join(' ')).toMatch(/at least 2 per arm/);
  });

  it('plans at α/K with several outcomes', () => {
    const out = run({ ...costs, delta: 0.3, sd: 1, power: 0.8, outcomes: 2, multiplicity: 'bonferroni' });
    expect(out.result.alphaAdjusted).toBe(0.025);
    expect(out.result.clustersPerArm as number).toBeGreaterThan(run({ ...costs, delta: 0.3, sd: 1, power: 0.8 }).result.clustersPerArm as number);
  });
});

describe('effects solved in other forms', () => {
  it('regression: a slope solved with sdX and residualSd is the f² solved directly, rescaled', () => {
    const bySlope = run({ kind: 'regression', sdX: 4, residualSd: 10, n: 120, predictors: 3, power: 0.8 });
    const byF2 = run({ kind: 'regression', n: 120, predictors: 3, power: 0.8 });
    expect(bySlope.solvedFor).toBe('slope');
    expect(byF2.solvedFor).toBe('f2');
    expectRelativelyClose('f2 from the slope', bySlope.result.f2 as number, byF2.result.f2 as number, 1e-9);
    expectRelativelyClose('slope', bySlope.result.slope as number, (Math.sqrt(byF2.result.f2 as number) * 10) / 4, 1e-9);
    expectRelativelyClose('achieved power', bySlope.result.power as number, 0.8, 1e-9);
  });

  it.each([
    ['repeated-measures', { kind: 'repeated-measures', sd: 2, rho: 0.4, baselines: 2, followUps: 3, analysis: 'change', nPerGroup: 60, power: 0.85 }, 'delta'],
    ['longitudinal-slopes', { kind: 'longitudinal-slopes', sd: 2, rho: 0.4, times: [0, 3, 6, 12], nPerGroup: 60, power: 0.85 }, 'slopeDifference'],
  ])('%s: the effect solved by the published formula gives the target power back', (_kind, input, effectName) => {
    const out = run(input);
    expect(out.solvedFor).toBe(effectName);
    expectRelativelyClose('normal power at the solved effect', out.result.power as number, 0.85, 1e-12);
    const again = run({ ...input, [effectName]: out.result[effectName], power: undefined });
    expectRelativelyClose('power recomputed', again.result.power as number, 0.85, 1e-12);
  });

  it('cluster means: the effect solved gives the target power back to 1e-9', () => {
    const out = run({ kind: 'cluster-means', sd: 1, icc: 0.1, clusterSize: 15, clustersPerArm: 9, power: 0.9 });
    expect(out.solvedFor).toBe('delta');
    expectRelativelyClose('power', out.result.power as number, 0.9, 1e-9);
  });
});

describe('inputs at the far ends of the bounds answer at once', () => {
  it('an effect a billion SDs wide has power 1', () => {
    expect(run({ kind: 'two-group-means', delta: 1e9, sd: 1e-9, nPerGroup: 40 }).result.power).toBe(1);
    expect(run({ kind: 'longitudinal-slopes', slopeDifference: 3, sd: 60, rho: 0.6, times: [9007199254740991, 2, 3, 4, 5, 6, 7, 8], nPerGroup: 40 }).result.power).toBe(1);
    expect(run({ kind: 'regression', f2: 1e4, n: 1e7, predictors: 3 }).result.power).toBe(1);
  });

  it('a tiny alpha with 2 df is refused with what to change', () => {
    expectInputError({ kind: 'two-group-means', sd: 1, nPerGroup: 2, alpha: 1e-10, power: 0.9999 }, 'alpha', /alpha is too small for so few degrees of freedom/);
  });

  it('a best cluster size beyond any cluster is refused, not a crash', () => {
    expectInputError({ kind: 'optimal-allocation', icc: 1e-300, costPerCluster: 1e9, costPerUnit: 1e-300, budget: 1e12 }, 'icc', /best cluster would have no limit on its units/);
    expectInputError({ kind: 'optimal-allocation', icc: 1e-9, costPerCluster: 1e6, costPerUnit: 1, budget: 1e12 }, 'costPerUnit', /best cluster would have [\d,]+ units, more than the 1,000,000/);
  });
});
