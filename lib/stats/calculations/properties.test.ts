import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { calculationSchema } from './request';
import { clusterMeansPower } from './cluster-means';
import { calculate } from './index';
import { regressionPower } from './regression';
import { twoGroupMeansPower } from './two-group-means';
import { twoProportionsPower } from './two-proportions';

/**
 * Properties over random designs (fast-check, fixed seed so a failure reproduces): power grows
 * with the size and with the effect, and a solved size brackets the target (power at n reaches
 * it, at n − 1 it does not).
 */
const SEED = 20261202;
const RUNS = 60;
/**
 * Where power is within 1e-10 of 1 the distributions' absolute accuracy (1e-10) is all that is
 * left, so "does not decrease" is checked to that slack.
 */
const SLACK = 1e-10;

const alpha = fc.constantFrom(0.05, 0.01, 0.001);
const sides = fc.constantFrom(1 as const, 2 as const);
const target = fc.double({ min: 0.5, max: 0.99, noNaN: true });

function run(input: Record<string, unknown>) {
  return calculate(calculationSchema.parse(input));
}

describe('power increases with the size and with the effect', () => {
  it('two-group means', () => {
    fc.assert(
      fc.property(fc.double({ min: 0.05, max: 2, noNaN: true }), fc.integer({ min: 2, max: 400 }), fc.constantFrom(0.5, 1, 2), alpha, sides, (d, n, ratio, a, s) => {
        const p = (delta: number, size: number) => twoGroupMeansPower({ delta, sd: 1, nPerGroup: size, ratio, alpha: a, sides: s });
        expect(p(d, n + 1)).toBeGreaterThanOrEqual(p(d, n) - SLACK);
        expect(p(d * 1.1, n)).toBeGreaterThanOrEqual(p(d, n) - SLACK);
      }),
      { seed: SEED, numRuns: RUNS },
    );
  });

  it('regression', () => {
    fc.assert(
      fc.property(fc.double({ min: 0.005, max: 0.5, noNaN: true }), fc.integer({ min: 8, max: 500 }), fc.integer({ min: 1, max: 5 }), alpha, (f2, n, k, a) => {
        const p = (e: number, size: number) => regressionPower({ f2: e, n: size, testedPredictors: 1, predictors: k, alpha: a });
        expect(p(f2, n + 1)).toBeGreaterThanOrEqual(p(f2, n) - SLACK);
        expect(p(f2 * 1.1, n)).toBeGreaterThanOrEqual(p(f2, n) - SLACK);
      }),
      { seed: SEED, numRuns: RUNS },
    );
  });

  it('cluster means, in clusters, cluster size and effect', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0.05, max: 1, noNaN: true }),
        fc.integer({ min: 2, max: 200 }),
        fc.integer({ min: 1, max: 200 }),
        fc.double({ min: 0, max: 1, noNaN: true }),
        fc.double({ min: 0, max: 1.5, noNaN: true }),
        sides,
        (d, k, m, icc, cv, s) => {
          const p = (delta: number, clusters: number, size: number) =>
            clusterMeansPower({ delta, sd: 1, icc, clusterSize: size, cv, clustersPerArm: clusters, alpha: 0.05, sides: s });
          expect(p(d, k + 1, m)).toBeGreaterThanOrEqual(p(d, k, m) - SLACK);
          expect(p(d, k, m + 1)).toBeGreaterThanOrEqual(p(d, k, m) - SLACK);
          expect(p(d * 1.1, k, m)).toBeGreaterThanOrEqual(p(d, k, m) - SLACK);
        },
      ),
      { seed: SEED, numRuns: RUNS },
    );
  });

  it('two proportions', () => {
    fc.assert(
      fc.property(fc.double({ min: 0.05, max: 0.6, noNaN: true }), fc.double({ min: 0.01, max: 0.3, noNaN: true }), fc.integer({ min: 2, max: 2000 }), fc.boolean(), (p1, diff, n, cc) => {
        // With the correction, sizes up to 1/|p1 − p2| have no uncorrected equivalent (power is flat below α).
        fc.pre(!cc || n * diff > 2);
        const p = (d: number, size: number) => twoProportionsPower({ p1, p2: p1 + d, n: size, alpha: 0.05, sides: 2, continuityCorrection: cc });
        expect(p(diff, n + 1)).toBeGreaterThanOrEqual(p(diff, n) - SLACK);
        expect(p(diff * 1.1, n)).toBeGreaterThanOrEqual(p(diff, n) - SLACK);
      }),
      { seed: SEED, numRuns: RUNS },
    );
  });
});

describe('a solved size brackets the target: power(n) ≥ target > power(n − 1)', () => {
  const bracket = (input: Record<string, unknown>, sizeName: string, minimum: number) => {
    const out = run(input);
    if (out.feasibility !== 'ok') return;
    const n = out.result[sizeName] as number;
    const t = input.power as number;
    expect(out.result.power as number).toBeGreaterThanOrEqual(t);
    if (n > minimum) {
      const below = run({ ...input, [sizeName]: n - 1, power: undefined, solveFor: 'power' });
      expect(below.result.power as number, `${JSON.stringify(input)}: n ${n}`).toBeLessThan(t);
    }
  };

  it('two-group means, regression, cluster means, repeated measures, two proportions', () => {
    fc.assert(
      fc.property(fc.double({ min: 0.1, max: 1.5, noNaN: true }), target, alpha, sides, fc.double({ min: 0, max: 0.5, noNaN: true }), (d, t, a, s, icc) => {
        bracket({ kind: 'two-group-means', delta: d, sd: 1, power: t, alpha: a, sides: s, ratio: 1.5 }, 'nPerGroup', 2);
        bracket({ kind: 'regression', f2: d * d, power: t, alpha: a, predictors: 3, testedPredictors: 2 }, 'n', 5);
        bracket({ kind: 'cluster-means', delta: d, sd: 1, icc, clusterSize: 12, power: t, alpha: a, sides: s }, 'clustersPerArm', 2);
        bracket({ kind: 'repeated-measures', delta: d, sd: 1, rho: icc, power: t, alpha: a, sides: s }, 'nPerGroup', 2);
        bracket({ kind: 'two-proportions', p1: 0.2, p2: 0.2 + d / 4, power: t, alpha: a, sides: s, continuityCorrection: icc > 0.25 }, 'nPerGroup', 2);
      }),
      { seed: SEED, numRuns: 30 },
    );
  });

  it('a solved effect gives the target power back to 1e-9', () => {
    fc.assert(
      fc.property(fc.integer({ min: 3, max: 500 }), target, alpha, sides, (n, t, a, s) => {
        const out = run({ kind: 'two-group-means', nPerGroup: n, sd: 2, power: t, alpha: a, sides: s });
        expect(Math.abs((out.result.power as number) - t)).toBeLessThan(1e-9);
      }),
      { seed: SEED, numRuns: RUNS },
    );
  });
});
