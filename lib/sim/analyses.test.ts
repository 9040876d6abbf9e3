import { describe, expect, it } from 'vitest';
import type { SimulationSpecInput } from './spec';
import { analysisApplies, offeredAnalyses } from './analyses';

const spec = (design: SimulationSpecInput['design'], truth: Partial<SimulationSpecInput['truth']> = {}): SimulationSpecInput => ({
  design,
  truth: { effect: 1, sd: 2, ...truth },
  scenarios: [{ violation: 'none' }],
  analyses: ['ols'],
});

describe('offeredAnalyses: only analyses defined for the simulated data', () => {
  it.each([
    ['gaussian, independent units', spec({ arms: 2, unitsPerArm: 30 }), ['ols', 'ols-hc3', 'huber']],
    ['gaussian, clusters', spec({ arms: 2, clustersPerArm: 10, clusterSize: 20 }, { icc: 0.1 }), ['ols', 'ols-hc3', 'cluster-robust', 'cluster-means', 'mixed', 'huber']],
    ['gaussian, occasions', spec({ arms: 2, unitsPerArm: 30, occasions: 4 }), ['ols', 'ols-hc3', 'cluster-robust', 'cluster-means', 'mixed', 'huber']],
    ['gaussian with a positive level (still normal: can be ≤ 0)', spec({ arms: 2, unitsPerArm: 30 }, { baseline: 50 }), ['ols', 'ols-hc3', 'huber']],
    ['binary, clusters', spec({ arms: 2, clustersPerArm: 10, clusterSize: 20 }, { family: 'binary', sd: undefined }), ['ols', 'ols-hc3', 'cluster-robust', 'cluster-means', 'mixed', 'glm', 'glmm']],
    ['count, independent units (counts can be 0)', spec({ arms: 2, unitsPerArm: 30 }, { family: 'count', sd: undefined }), ['ols', 'ols-hc3', 'glm', 'glm-nb']],
    // The treatment varies within units and blocks: a random intercept or clustering on them, never a mean per unit.
    ['gaussian, AB/BA cross-over', spec({ arms: 2, unitsPerArm: 12, crossover: { periods: 2 } }), ['ols', 'ols-hc3', 'cluster-robust', 'mixed', 'huber', 'period-difference']],
    ['gaussian, blocks of units', spec({ arms: 2, unitsPerArm: 10, blocks: 6 }), ['ols', 'ols-hc3', 'cluster-robust', 'mixed', 'huber']],
    ['binary, four-period cross-over', spec({ arms: 2, unitsPerArm: 30, crossover: { periods: 4 } }, { family: 'binary', sd: undefined }), ['ols', 'ols-hc3', 'cluster-robust', 'mixed', 'glm', 'glmm']],
  ] as const)('%s', (_name, s, offered) => {
    expect(offeredAnalyses(s)).toEqual(offered);
  });

  it('never offers the log-scale analysis on the data models there are (no positive outcome)', () => {
    for (const family of ['gaussian', 'binary', 'count'] as const) expect(analysisApplies('log-ols', spec({ arms: 2, unitsPerArm: 30 }, { family }))).toBe(false);
  });
});
