import seedrandom from 'seedrandom';
import { describe, expect, it } from 'vitest';
import { fitClusterMeans } from './cluster-means';
import { fitClusterRobust } from './cr2';
import { fitGlm } from './glm';
import { fitOlsHc3 } from './hc3';
import { fitHuber } from './huber';
import { analyse } from './index';
import { fitMixed } from './mixed';
import { fitLogOls } from './log-ols';
import { fitOls } from './ols';
import type { Dataset, EffectEstimate, FixedEffects } from './types';

/**
 * The closed-form fast paths (intercept + 0/1 treat) against the general QR paths on the same
 * data, to 1e-12 relative; and what the analyses do with data they cannot fit.
 */

const TWO_ARM: FixedEffects = { covariates: [], includeTime: false, target: 'treat' };

/** Standard normal deviates by Box–Muller from a seeded generator. */
function normals(rng: () => number, n: number): Float64Array {
  const out = new Float64Array(n);
  for (let i = 0; i < n; i += 2) {
    const r = Math.sqrt(-2 * Math.log(1 - rng()));
    const a = 2 * Math.PI * rng();
    out[i] = r * Math.cos(a);
    if (i + 1 < n) out[i + 1] = r * Math.sin(a);
  }
  return out;
}

/**
 * A two-arm cluster design: `sizes[g]` rows in cluster g, clusters alternately in arm 0 and 1
 * (or, with `withinClusters`, treat alternating inside each cluster); ICC 0.1 around `mean`.
 */
function clusterData(seed: string, sizes: number[], withinClusters = false, mean = 0): Dataset {
  const rng = seedrandom(seed);
  const n = sizes.reduce((s, m) => s + m, 0);
  const e = normals(rng, n);
  const u = normals(rng, sizes.length);
  const y = new Float64Array(n);
  const treat = new Float64Array(n);
  const id = new Int32Array(n);
  let i = 0;
  sizes.forEach((m, g) => {
    for (let k = 0; k < m; k++, i++) {
      treat[i] = withinClusters ? k % 2 : g % 2;
      id[i] = g;
      y[i] = mean + 0.3 * treat[i]! + Math.sqrt(0.1) * u[g]! + Math.sqrt(0.9) * e[i]!;
    }
  });
  return { n, y, treat, groups: [{ name: 'cluster', id, count: sizes.length }] };
}

/**
 * |fast − general| ≤ relative·|general|; for the estimate, a difference of two arm means, at
 * least relative·|ȳ| (`level`): both paths round the means at that level, so a tolerance relative
 * to the difference alone cannot be met when the mean is far from 0.
 */
function expectClose(label: string, got: EffectEstimate, expected: EffectEstimate, relative: number, level = 0): void {
  for (const key of ['estimate', 'se', 'df'] as const) {
    if (got[key] === Infinity && expected[key] === Infinity) continue;
    const difference = Math.abs(got[key] - expected[key]);
    const tolerance = relative * Math.max(Math.abs(expected[key]), key === 'estimate' ? level : 0);
    expect(
      difference <= tolerance,
      `${label} ${key}: general path ${expected[key]}, fast path ${got[key]}, difference ` +
        `${difference.toExponential(3)}, tolerance ${tolerance.toExponential(3)} (relative ${relative})`,
    ).toBe(true);
  }
  expect(got.converged && expected.converged).toBe(true);
}

/** |ȳ|: the level at which both paths round the arm means. */
function level(data: Dataset): number {
  return Math.abs(data.y.reduce((a, b) => a + b, 0) / data.n);
}

const DESIGNS: [string, Dataset][] = [
  ['20 clusters × 20 (the benchmark design)', clusterData('bench', Array<number>(20).fill(20))],
  ['9 clusters of unequal size', clusterData('unequal', [3, 8, 5, 12, 2, 7, 9, 4, 6])],
  ['unequal sizes, mean 1e4 (cancellation)', clusterData('offset', [5, 9, 6, 11, 4, 8], false, 1e4)],
  ['a cluster of one in each arm', clusterData('singletons', [1, 1, 6, 5, 7, 4])],
];

describe('fast path = general path to 1e-12 relative', () => {
  describe.each(DESIGNS)('%s', (_name, data) => {
    it.each([
      ['ols', fitOls],
      ['ols-hc3', fitOlsHc3],
      ['cluster-robust', fitClusterRobust],
      ['cluster-means', fitClusterMeans],
    ] as const)('%s', (label, fit) => {
      expectClose(label, fit(data, TWO_ARM), fit(data, TWO_ARM, { general: true }), 1e-12, level(data));
    });
  });

  describe.each(DESIGNS)('huber and glm on %s', (_name, data) => {
    it.each(['sandwich', 'model'] as const)('huber, SE %s', (se) => {
      expectClose('huber', fitHuber(data, TWO_ARM, { se }), fitHuber(data, TWO_ARM, { se, general: true }), 1e-12, level(data));
    });

    it('glm logistic and Poisson', () => {
      const binary = { ...data, y: data.y.map((v) => (v > level(data) * Math.sign(v) ? 1 : 0)) };
      expectClose('logistic', fitGlm(binary, TWO_ARM), fitGlm(binary, TWO_ARM, { general: true }), 1e-12);
      const counts = { ...data, y: data.y.map((v, i) => (i % 7) + (v > 0 ? 2 : 0)) };
      expectClose('Poisson', fitGlm(counts, TWO_ARM), fitGlm(counts, TWO_ARM, { general: true }), 1e-12);
    });
  });

  it('cluster-robust and cluster-means fall back to the general path when treat varies within clusters', () => {
    const data = clusterData('within', [6, 8, 5, 7], true);
    expect(fitClusterRobust(data, TWO_ARM)).toEqual(fitClusterRobust(data, TWO_ARM, { general: true }));
    expect(fitClusterMeans(data, TWO_ARM)).toEqual(fitClusterMeans(data, TWO_ARM, { general: true }));
  });

  it('cluster-robust without grouping levels is CR2 with one observation per cluster', () => {
    const clustered = clusterData('single', [1, 1, 1, 1, 1, 1, 1, 1, 1, 1]);
    const flat: Dataset = { ...clustered, groups: [] };
    expectClose('cr2', fitClusterRobust(flat, TWO_ARM), fitClusterRobust(clustered, TWO_ARM, { general: true }), 1e-12);
  });
});

describe('data the analyses cannot fit', () => {
  const data = clusterData('edge', [4, 5, 6, 3]);
  const notConverged = { estimate: NaN, se: NaN, df: NaN, converged: false };

  it('a missing covariate or time column throws a RangeError naming it', () => {
    expect(() => fitOls(data, { covariates: ['age'], includeTime: false, target: 'treat' })).toThrow(/no column "age"/);
    expect(() => fitOls(data, { covariates: [], includeTime: true, target: 'treat' })).toThrow(/no column "time"/);
    expect(() => fitOls({ ...data, y: data.y.subarray(1) }, TWO_ARM)).toThrow(/column "y" has 17 values, expected 18/);
  });

  it('a group id out of range throws a RangeError', () => {
    const bad: Dataset = { ...data, groups: [{ name: 'cluster', id: data.groups[0]!.id, count: 2 }] };
    expect(() => fitClusterRobust(bad, TWO_ARM)).toThrow(/outside 0 … 1/);
    expect(() => fitClusterRobust(data, TWO_ARM, { level: 1 })).toThrow(/level 1 does not exist/);
  });

  it('a rank-deficient design (a covariate equal to treat) is not converged', () => {
    const collinear: Dataset = { ...data, covariates: { copy: data.treat } };
    const fixed: FixedEffects = { covariates: ['copy'], includeTime: false, target: 'treat' };
    for (const name of ['ols', 'ols-hc3', 'cluster-robust', 'huber', 'log-ols'] as const) {
      expect(analyse(name, { ...collinear, y: data.y.map((v) => Math.exp(v)) }, fixed), name).toEqual(notConverged);
    }
  });

  it('log-ols is not converged when an outcome is not positive', () => {
    const y = data.y.map((v) => Math.exp(v));
    expect(fitLogOls({ ...data, y }, TWO_ARM).converged).toBe(true);
    y[3] = 0;
    expect(fitLogOls({ ...data, y }, TWO_ARM)).toEqual(notConverged);
  });

  it('log-ols reports the log ratio: ratios of 2 in every pair give log 2', () => {
    const y = Float64Array.from({ length: 8 }, (_, i) => (i % 2 === 1 ? 2 : 1) * (1 + Math.floor(i / 2)));
    const treat = Float64Array.from({ length: 8 }, (_, i) => i % 2);
    const got = fitLogOls({ n: 8, y, treat, groups: [] }, TWO_ARM);
    expect(Math.abs(got.estimate - Math.LN2)).toBeLessThan(1e-15);
  });

  it('glm flags complete separation as not converged and refuses unsuitable outcomes', () => {
    const treat = Float64Array.from({ length: 12 }, (_, i) => (i < 6 ? 0 : 1));
    const separated: Dataset = { n: 12, y: treat.slice(), treat, groups: [] };
    expect(fitGlm(separated, TWO_ARM).converged).toBe(false);
    expect(() => fitGlm({ ...separated, y: separated.y.map((v) => v + 0.5) }, TWO_ARM)).toThrow(RangeError);
    expect(() => fitGlm({ ...separated, y: separated.y.map((v) => v * 3) }, TWO_ARM, { family: 'binomial' })).toThrow(
      /does not suit the binomial family/,
    );
  });

  it('huber with maxIterations 1 on data with outliers reports no convergence', () => {
    const y = data.y.slice();
    y[0] = 40;
    y[7] = -30;
    expect(fitHuber({ ...data, y }, TWO_ARM, { maxIterations: 1 }).converged).toBe(false);
    expect(fitHuber({ ...data, y }, TWO_ARM).converged).toBe(true);
  });

  it('hc3 with an arm of one observation (leverage 1) is not converged', () => {
    const treat = Float64Array.from({ length: 6 }, (_, i) => (i === 0 ? 1 : 0));
    const d: Dataset = { n: 6, y: Float64Array.from([1, 2, 3, 5, 4, 2]), treat, groups: [] };
    expect(fitOlsHc3(d, TWO_ARM).converged).toBe(false);
    expect(fitOlsHc3(d, TWO_ARM, { general: true }).converged).toBe(false);
  });
});

describe('analyse', () => {
  const data = clusterData('registry', [5, 7, 6, 8, 4, 9]);
  const positive = { ...data, y: data.y.map((v) => Math.exp(v)) };
  const binary = { ...data, y: data.y.map((v) => (v > 0 ? 1 : 0)) };

  it.each([
    ['ols', data, fitOls],
    ['ols-hc3', data, fitOlsHc3],
    ['cluster-robust', data, fitClusterRobust],
    ['cluster-means', data, fitClusterMeans],
    ['mixed', data, fitMixed],
    ['huber', data, fitHuber],
    ['log-ols', positive, fitLogOls],
    ['glm', binary, fitGlm],
  ] as const)('dispatches %s to its fit', (name, d, fit) => {
    expect(analyse(name, d, TWO_ARM)).toEqual(fit(d, TWO_ARM));
  });

  it('passes the options on', () => {
    expect(analyse('huber', data, TWO_ARM, { se: 'model' })).toEqual(fitHuber(data, TWO_ARM, { se: 'model' }));
    expect(analyse('huber', data, TWO_ARM, { se: 'model' })).not.toEqual(fitHuber(data, TWO_ARM));
  });

  it('refuses an unknown analysis', () => {
    expect(() => analyse('anova' as 'ols', data, TWO_ARM)).toThrow(/unknown analysis "anova"/);
  });
});
