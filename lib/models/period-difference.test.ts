import { describe, expect, it } from 'vitest';
import fixture from './fixtures/crossover.json';
import { fitMixed } from './mixed';
import { fitPeriodDifference } from './period-difference';
import { expectNoMismatches, mismatch } from '@/lib/stats/test-helpers';
import type { Dataset, FixedEffects } from './types';

/**
 * Reference: `fixtures/crossover.json`, written by `fixtures/generate_crossover.R` (R 4.2.2,
 * lme4 1.1-31): t.test(var.equal = TRUE) on the period differences of a generated AB/BA
 * cross-over (11 + 14 units, one missing its second period), to 1e-12 relative; and lme4's REML
 * fit of y ~ treat + period + (1 | unit) on the complete units, whose estimate and SE it equals
 * (to lme4's convergence, 1e-8), as does lib/models' own REML fit.
 */

const d = fixture.data;
const data: Dataset = {
  n: d.n,
  y: Float64Array.from(d.y),
  treat: Float64Array.from(d.treat),
  covariates: { period2: Float64Array.from(d.period2) },
  groups: [{ name: 'unit', id: Int32Array.from(d.unit), count: d.units }],
};
const fixed: FixedEffects = { covariates: ['period2'], includeTime: false, target: 'treat' };

describe('period-difference', () => {
  it('is R’s two-sample t test on the period differences (estimate, SE, df to 1e-12)', () => {
    const fit = fitPeriodDifference(data, fixed);
    const e = fixture.periodDifference;
    expect(fit.converged).toBe(true);
    expect(fit.df).toBe(e.df);
    expectNoMismatches([mismatch('estimate', fit.estimate, e.estimate, { relative: 1e-12 }), mismatch('SE', fit.se, e.se, { relative: 1e-12 })]);
  });

  it('equals the REML mixed model with unit intercept and period on the complete units (lme4 and lib/models)', () => {
    const fit = fitPeriodDifference(data, fixed);
    const keep = Array.from(d.unit, (u) => d.unit.filter((v) => v === u).length === 2);
    const rows = keep.flatMap((k, i) => (k ? [i] : []));
    const renumber = new Map<number, number>();
    const ids = rows.map((i) => {
      const u = d.unit[i]!;
      if (!renumber.has(u)) renumber.set(u, renumber.size);
      return renumber.get(u)!;
    });
    const complete: Dataset = {
      n: rows.length,
      y: Float64Array.from(rows, (i) => d.y[i]!),
      treat: Float64Array.from(rows, (i) => d.treat[i]!),
      covariates: { period2: Float64Array.from(rows, (i) => d.period2[i]!) },
      groups: [{ name: 'unit', id: Int32Array.from(ids), count: renumber.size }],
    };
    const reml = fitMixed(complete, fixed);
    expectNoMismatches([
      mismatch('lme4 estimate', fit.estimate, fixture.reml.estimate, { relative: 1e-8 }),
      mismatch('lme4 SE', fit.se, fixture.reml.se, { relative: 1e-8 }),
      mismatch('our REML estimate', reml.estimate, fit.estimate, { relative: 1e-8 }),
      mismatch('our REML SE', reml.se, fit.se, { relative: 1e-7 }),
    ]);
  });

  it('refuses data that are not AB/BA, and is not estimable with one sequence', () => {
    const same = { ...data, treat: Float64Array.from(data.treat, (_, i) => (d.unit[i]! < 3 ? 1 : data.treat[i]!)) };
    expect(() => fitPeriodDifference(same, fixed)).toThrow(/same arm in both periods/);
    const three = { ...data, groups: [{ name: 'unit', id: Int32Array.from(d.unit, (u, i) => (i < 3 ? 0 : u)), count: d.units }] };
    expect(() => fitPeriodDifference(three, fixed)).toThrow(/has 3 rows/);
    expect(() => fitPeriodDifference({ ...data, groups: [] }, fixed)).toThrow(/needs the units/);
    // Only the units of sequence AB (treat 0 in their first period).
    const oneSequence = Array.from(d.unit, (_, i) => i).filter((i) => data.treat[i - d.period2[i]!] === 0);
    const ab: Dataset = {
      n: oneSequence.length,
      y: Float64Array.from(oneSequence, (i) => d.y[i]!),
      treat: Float64Array.from(oneSequence, (i) => d.treat[i]!),
      groups: [{ name: 'unit', id: Int32Array.from(oneSequence, (i) => d.unit[i]!), count: d.units }],
    };
    expect(fitPeriodDifference(ab, fixed).converged).toBe(false);
  });
});
