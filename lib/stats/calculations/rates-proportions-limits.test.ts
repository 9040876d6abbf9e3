import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { clusterProportionsPower } from './cluster-proportions';
import { clusterRatesPower, hayesBennettClusters } from './cluster-rates';
import { p2FromEffect } from './proportion-effect';
import { expectInputError, expectRelativelyClose, run } from './testing';
import { mostPowerfulReduction, twoRatesPower } from './two-rates';

/**
 * The count and binary kinds at their limits: hand calculations of the published formulas,
 * answers at the ends of the ranges ('already-met', 'unreachable', plateaus), inputs that do not
 * fit together, and properties over random designs (fast-check, fixed seed).
 */
/** (z₀.₉₇₅ + z₀.₈)², to the digits of the printed normal table. */
const Z_SUM_SQUARED = (1.959964 + 0.841621) ** 2;

describe('hand calculations of the published formulas', () => {
  it('Poisson log rate ratio (hand calculation): λ0 = 1 per year, RR = 0.5, 1 year → n = 7.8489 × (1 + 2)/(ln 2)² = 49.01 → 50 per group', () => {
    expectRelativelyClose('fractional n', (Z_SUM_SQUARED * 3) / Math.log(2) ** 2, 49.0093, 1e-5);
    expect(run({ kind: 'two-rates', baselineRate: 1, rateRatio: 0.5, power: 0.8 }).result.nPerGroup).toBe(50);
  });

  it('negative binomial, dispersion 0.5 (hand calculation, Zhu & Lakkis 2014 variance at the expected rates): 7.8489 × (1 + 0.5 + 2 + 0.5)/(ln 2)² = 65.35 → 66', () => {
    expect(run({ kind: 'two-rates', baselineRate: 1, rateRatio: 0.5, dispersion: 0.5, power: 0.8 }).result.nPerGroup).toBe(66);
  });

  it('Hayes & Bennett 1999 (hand calculation): λ0 0.5, λ1 0.375, y = 25 × 6 = 150, k = 0.25 → c = 1 + 7.8489 × (0.875/150 + 0.0625 × 0.390625)/0.125² = 16.19 → 17', () => {
    const bracket = 0.875 / 150 + 0.0625 * (0.25 + 0.140625);
    expectRelativelyClose('c', 1 + (Z_SUM_SQUARED * bracket) / 0.125 ** 2, 16.1941, 1e-5);
    const design = { baselineRate: 0.5, rateRatio: 0.75, exposure: 6, dispersion: 0, betweenClusterCv: 0.25, clusterSize: 25 };
    expectRelativelyClose('hayesBennettClusters', hayesBennettClusters(design, 0.05, 2, 0.8), 16.1941, 1e-5);
    expect(run({ kind: 'cluster-rates', ...design, power: 0.8 }).result.clustersPerArm).toBe(17);
  });

  it('Donner & Klar 2000 design effect (hand calculation): 25 per cluster, ICC 0.05 → DE = 1 + 24 × 0.05 = 2.2; k·m/DE units count as independent', () => {
    const out = run({ kind: 'cluster-proportions', p1: 0.55, p2: 0.7, icc: 0.05, clusterSize: 25, clustersPerArm: 16 });
    expectRelativelyClose('DE', out.result.designEffect as number, 2.2, 1e-15);
    expectRelativelyClose('effective n', out.result.effectiveNPerGroup as number, 400 / 2.2, 1e-15);
    const plain = run({ kind: 'two-proportions', p1: 0.55, p2: 0.7, nPerGroup: 2, solveFor: 'power' });
    expect(plain.result.power as number).toBeLessThan(out.result.power as number);
  });

  it('odds ratio 1.5 from p1 = 0.3 (hand calculation): odds 0.3/0.7 × 1.5 = 0.642857 → p2 = 0.45/1.15 = 0.391304', () => {
    expectRelativelyClose('p2', p2FromEffect({ p1: 0.3, oddsRatio: 1.5 })!, 0.45 / 1.15, 1e-15);
    const out = run({ kind: 'two-proportions', p1: 0.3, oddsRatio: 1.5, nPerGroup: 200 });
    expectRelativelyClose('riskRatio', out.result.riskRatio as number, 0.45 / 1.15 / 0.3, 1e-14);
    expect(out.result.power).toBe(run({ kind: 'two-proportions', p1: 0.3, p2: 0.45 / 1.15, nPerGroup: 200 }).result.power);
  });
});

describe('answers at the ends of the ranges', () => {
  it('two rates: already met with a huge effect, unreachable with almost none', () => {
    const met = run({ kind: 'two-rates', baselineRate: 100, rateRatio: 0.1, power: 0.8 });
    expect(met.feasibility).toBe('already-met');
    expect(met.result.nPerGroup).toBe(2);
    const out = run({ kind: 'two-rates', baselineRate: 0.001, rateRatio: 0.9999, power: 0.9 });
    expect(out.feasibility).toBe('unreachable');
    expect(out.result.nPerGroup).toBe(10_000_000);
    expect(out.result.power as number).toBeLessThan(0.9);
    expect(out.warnings.join(' ')).toMatch(/No number of participants in group 1/);
  });

  it('two rates: with few events no reduction reaches the target, and the answer is the most powerful reduction', () => {
    const out = run({ kind: 'two-rates', baselineRate: 0.01, nPerGroup: 100, power: 0.9 });
    expect(out.feasibility).toBe('unreachable');
    const peak = Math.log(out.result.rateRatio as number);
    expectRelativelyClose('peak', -peak, mostPowerfulReduction({ baselineRate: 0.01, exposure: 1, dispersion: 0, nPerGroup: 100, ratio: 1 }), 1e-12);
    const at = (rr: number) => twoRatesPower({ baselineRate: 0.01, rateRatio: rr, exposure: 1, dispersion: 0, nPerGroup: 100, ratio: 1, alpha: 0.05, sides: 2 });
    expect(at(Math.exp(peak * 1.01))).toBeLessThan(out.result.power as number);
    expect(at(Math.exp(peak * 0.99))).toBeLessThan(out.result.power as number);
    expect(out.warnings.join(' ')).toMatch(/No reduction, however large.*power is highest/);
    expect(out.warnings.join(' ')).toMatch(/events are expected in one arm/);
  });

  it('two rates: an increase has no such peak, and is found above 1', () => {
    const out = run({ kind: 'two-rates', baselineRate: 0.01, nPerGroup: 100, power: 0.9, direction: 'higher' });
    expect(out.feasibility).toBe('ok');
    expect(out.result.rateRatio as number).toBeGreaterThan(1);
    expectRelativelyClose('power', out.result.power as number, 0.9, 1e-9);
  });

  it('cluster rates: the plateau when clusters grow, and the clusters that would reach the target', () => {
    const out = run({ kind: 'cluster-rates', baselineRate: 0.5, rateRatio: 0.75, exposure: 6, betweenClusterCv: 0.25, clustersPerArm: 5, power: 0.8 });
    expect(out.feasibility).toBe('unreachable');
    const plateau = out.result.plateauPower as number;
    // Limit y → ∞: V = k²(λ0² + λ1²), power Φ(0.125·√(4/(0.0625·0.390625)) − 1.959964) (hand calculation).
    expectRelativelyClose('plateau', plateau, clusterRatesPower({ baselineRate: 0.5, rateRatio: 0.75, exposure: 6, dispersion: 0, betweenClusterCv: 0.25, clusterSize: Infinity, clustersPerArm: 5, alpha: 0.05, sides: 2 }), 0);
    const needed = out.result.clustersPerArmNeeded as number;
    const atPlateau = (c: number) => clusterRatesPower({ baselineRate: 0.5, rateRatio: 0.75, exposure: 6, dispersion: 0, betweenClusterCv: 0.25, clusterSize: Infinity, clustersPerArm: c, alpha: 0.05, sides: 2 });
    expect(atPlateau(needed)).toBeGreaterThanOrEqual(0.8);
    expect(atPlateau(needed - 1)).toBeLessThan(0.8);
    expect(out.warnings.join(' ')).toMatch(/power levels off at/);
  });

  it('cluster rates: no variation between clusters and no limit on their size gives power 1', () => {
    expect(clusterRatesPower({ baselineRate: 0.5, rateRatio: 0.9, exposure: 1, dispersion: 0, betweenClusterCv: 0, clusterSize: Infinity, clustersPerArm: 2, alpha: 0.05, sides: 2 })).toBe(1);
    const out = run({ kind: 'cluster-rates', baselineRate: 0.5, rateRatio: 0.9, betweenClusterCv: 0, clustersPerArm: 3, power: 0.8 });
    expect(out.feasibility).toBe('ok');
    expect(out.warnings.join(' ')).toMatch(/coefficient of variation of 0 assumes/);
  });

  it('cluster rates: unreachable clusters for a negligible effect; already met for a huge one', () => {
    const out = run({ kind: 'cluster-rates', baselineRate: 1, rateRatio: 0.99999, betweenClusterCv: 0.5, clusterSize: 100, power: 0.8 });
    expect(out.feasibility).toBe('unreachable');
    expect(out.result.clustersPerArm).toBe(1_000_000);
    const met = run({ kind: 'cluster-rates', baselineRate: 5, rateRatio: 0.05, betweenClusterCv: 0.1, clusterSize: 100, power: 0.8 });
    expect(met.feasibility).toBe('already-met');
    expect(met.result.clustersPerArm).toBe(2);
  });

  it('cluster proportions: ICC 0 is two proportions on k·m per arm; the plateau with an ICC', () => {
    const none = run({ kind: 'cluster-proportions', p1: 0.2, p2: 0.3, icc: 0, clusterSize: 10, clustersPerArm: 30 });
    expect(none.result.power).toBe(run({ kind: 'two-proportions', p1: 0.2, p2: 0.3, nPerGroup: 300 }).result.power);
    const out = run({ kind: 'cluster-proportions', p1: 0.2, p2: 0.3, icc: 0.1, clustersPerArm: 5, power: 0.9 });
    expect(out.feasibility).toBe('unreachable');
    expectRelativelyClose(
      'plateau: n = k/ICC',
      out.result.plateauPower as number,
      clusterProportionsPower({ p1: 0.2, p2: 0.3, icc: 0.1, clusterSize: Infinity, cv: 0, clustersPerArm: 5, alpha: 0.05, sides: 2 }),
      0,
    );
    expect(out.result.clustersPerArmNeeded as number).toBeGreaterThan(5);
  });

  it('cluster proportions: with few clusters the t test needs more, and says so', () => {
    const out = run({ kind: 'cluster-proportions', p1: 0.1, p2: 0.2, icc: 0.02, clusterSize: 50, power: 0.8 });
    expect(out.result.clustersPerArm).toBe(8);
    expect(out.result.clustersPerArmByT as number).toBeGreaterThan(8);
    expect(out.result.powerT as number).toBeLessThan(out.result.power as number);
    expect(out.warnings.join(' ')).toMatch(/by the t test \(14 degrees of freedom\)/);
  });
});

describe('inputs that do not fit together', () => {
  it.each([
    ['rate ratio 1 when solving n', { kind: 'two-rates', baselineRate: 1, rateRatio: 1, power: 0.8 }, 'rateRatio', /rateRatio is 1/],
    ['rate ratio 1 when solving clusters', { kind: 'cluster-rates', baselineRate: 1, rateRatio: 1, betweenClusterCv: 0.2, clusterSize: 10, power: 0.8 }, 'rateRatio', /rateRatio is 1/],
    ['ratio leaving group 2 with one participant', { kind: 'two-rates', baselineRate: 1, rateRatio: 0.5, nPerGroup: 10, ratio: 0.1 }, 'nPerGroup', /at least 11/],
    ['two forms of the effect', { kind: 'two-proportions', p1: 0.3, p2: 0.4, oddsRatio: 1.5, power: 0.8 }, 'oddsRatio', /one way only/],
    ['a risk ratio beyond 1', { kind: 'two-proportions', p1: 0.6, riskRatio: 2, power: 0.8 }, 'riskRatio', /between 0 and 1/],
    ['a difference below 0', { kind: 'cluster-proportions', p1: 0.05, difference: -0.1, icc: 0.05, clusterSize: 10, power: 0.8 }, 'difference', /between 0 and 1/],
    ['no effect when solving clusters', { kind: 'cluster-proportions', p1: 0.3, riskRatio: 1, icc: 0.05, clusterSize: 10, power: 0.8 }, 'p2', /equals p1/],
    ['neither clusters nor their size', { kind: 'cluster-rates', baselineRate: 1, rateRatio: 0.8, betweenClusterCv: 0.2, power: 0.8 }, 'clustersPerArm', /Only one of/],
  ])('%s', (_case, input, field, message) => expectInputError(input, field, message));

  it('an effect form is ignored when the effect is solved for', () => {
    const out = run({ kind: 'cluster-proportions', p1: 0.3, riskRatio: 1.2, icc: 0.05, clusterSize: 10, clustersPerArm: 12, power: 0.8, solveFor: 'p2' });
    expect(out.solvedFor).toBe('p2');
    expectRelativelyClose('power', out.result.power as number, 0.8, 1e-9);
  });
});

describe('properties over random designs', () => {
  const SEED = 20261203;
  const SLACK = 1e-10;
  const sides = fc.constantFrom(1 as const, 2 as const);

  it('two rates: power rises with the participants and, for increases, with the rate ratio; solved n brackets the target', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0.01, max: 10, noNaN: true }),
        fc.double({ min: 1.05, max: 4, noNaN: true }),
        fc.double({ min: 0, max: 3, noNaN: true }),
        fc.integer({ min: 2, max: 3000 }),
        fc.double({ min: 0.5, max: 0.95, noNaN: true }),
        sides,
        (rate, rr, kappa, n, target, s) => {
          const p = (ratio: number, size: number) => twoRatesPower({ baselineRate: rate, rateRatio: ratio, exposure: 1, dispersion: kappa, nPerGroup: size, ratio: 1, alpha: 0.05, sides: s });
          expect(p(rr, n + 1)).toBeGreaterThanOrEqual(p(rr, n) - SLACK);
          expect(p(rr * 1.1, n)).toBeGreaterThanOrEqual(p(rr, n) - SLACK);
          expect(p(1 / rr, n + 1)).toBeGreaterThanOrEqual(p(1 / rr, n) - SLACK);
          const out = run({ kind: 'two-rates', baselineRate: rate, rateRatio: 1 / rr, dispersion: kappa, power: target, sides: s });
          if (out.feasibility !== 'ok') return;
          const size = out.result.nPerGroup as number;
          expect(out.result.power as number).toBeGreaterThanOrEqual(target);
          if (size > 2) expect(p(1 / rr, size - 1)).toBeLessThan(target);
        },
      ),
      { seed: SEED, numRuns: 60 },
    );
  });

  it('cluster rates: power rises with clusters, cluster size and the effect either way; solved clusters bracket the target', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0.01, max: 5, noNaN: true }),
        fc.double({ min: 0.1, max: 0.95, noNaN: true }),
        fc.double({ min: 0, max: 1, noNaN: true }),
        fc.integer({ min: 2, max: 300 }),
        fc.integer({ min: 1, max: 500 }),
        fc.double({ min: 0.5, max: 0.95, noNaN: true }),
        (rate, rr, cv, c, m, target) => {
          const p = (ratio: number, clusters: number, size: number) =>
            clusterRatesPower({ baselineRate: rate, rateRatio: ratio, exposure: 1, dispersion: 0.2, betweenClusterCv: cv, clusterSize: size, clustersPerArm: clusters, alpha: 0.05, sides: 2 });
          expect(p(rr, c + 1, m)).toBeGreaterThanOrEqual(p(rr, c, m) - SLACK);
          expect(p(rr, c, m + 1)).toBeGreaterThanOrEqual(p(rr, c, m) - SLACK);
          expect(p(rr * 0.9, c, m)).toBeGreaterThanOrEqual(p(rr, c, m) - SLACK);
          expect(p((1 / rr) * 1.1, c, m)).toBeGreaterThanOrEqual(p(1 / rr, c, m) - SLACK);
          const out = run({ kind: 'cluster-rates', baselineRate: rate, rateRatio: rr, dispersion: 0.2, betweenClusterCv: cv, clusterSize: m, power: target });
          if (out.feasibility !== 'ok') return;
          const clusters = out.result.clustersPerArm as number;
          expect(out.result.power as number).toBeGreaterThanOrEqual(target);
          if (clusters > 2) expect(p(rr, clusters - 1, m)).toBeLessThan(target);
        },
      ),
      { seed: SEED, numRuns: 60 },
    );
  });

  it('cluster proportions: a solved effect or cluster size gives the target back', () => {
    fc.assert(
      fc.property(fc.double({ min: 0.05, max: 0.6, noNaN: true }), fc.double({ min: 0, max: 0.3, noNaN: true }), fc.integer({ min: 4, max: 60 }), fc.integer({ min: 2, max: 80 }), (p1, icc, k, m) => {
        const out = run({ kind: 'cluster-proportions', p1, icc, clusterSize: m, clustersPerArm: k, power: 0.8 });
        if (out.feasibility === 'ok') expect(Math.abs((out.result.power as number) - 0.8)).toBeLessThan(1e-9);
      }),
      { seed: SEED, numRuns: 60 },
    );
  });
});
