import { describe, expect, it } from 'vitest';
import fixture from './fixtures/metrics.json';
import { computeMetrics, CriticalValues, METRIC_NAMES, type FitColumns } from './metrics';
import { expectRelativelyClose } from './test-helpers';

/**
 * Reference: `fixtures/metrics.json`, written by `fixtures/generate_metrics.R`, which computes
 * the measures of Morris, White & Crowther (2019, Table 6) independently in base R with its t
 * quantiles (versions in the file), from invented fits with non-converged replicates, varying
 * df and one df = ∞.
 */

type JsonFits = { estimate: (number | null)[]; se: number[]; df: (number | null)[]; converged: number[] };

function columns(fits: JsonFits): FitColumns {
  return {
    estimate: fits.estimate.map((v) => v ?? NaN),
    se: fits.se,
    df: fits.df.map((v) => v ?? Infinity),
    converged: fits.converged,
  };
}

describe.each(fixture.cases.map((c) => [c.trueEffect, c.alpha, c] as const))('θ = %s, α = %s', (theta, alpha, c) => {
  const got = computeMetrics(columns(c.alternative), columns(c.null), theta, alpha);

  it.each(METRIC_NAMES.map((name) => [name] as const))('%s and its MC SE match R to 1e-12 relative', (name) => {
    const expected = c.expected[name];
    expectRelativelyClose(`${name} value (θ ${theta}, α ${alpha})`, got[name].value, expected.value, 1e-12);
    expectRelativelyClose(`${name} MC SE (θ ${theta}, α ${alpha})`, got[name].mcse, expected.mcse, 1e-12);
  });
});

describe('computeMetrics by hand', () => {
  const z = 1.9599639845400536; // R 4.2.2 qnorm(0.975); used for df = ∞
  const fits = (estimate: number[], se: number[], converged = estimate.map(() => 1)): FitColumns => ({
    estimate,
    se,
    df: estimate.map(() => Infinity),
    converged,
  });

  it('counts rejections with |est/se| > z and coverage with |est − θ| ≤ z·se', () => {
    const alt = fits([1, 0.5, 3, 2.5], [1, 1, 1, 1]);
    const nul = fits([0.1, -2.5, 0.2, 0.3], [1, 1, 1, 1]);
    const m = computeMetrics(alt, nul, 1, 0.05);
    expect(m.power.value).toBe(0.5); // 3 and 2.5 exceed 1.96
    expect(m.typeIError.value).toBe(0.25);
    expect(m.coverage.value).toBe(0.75); // |3 − 1| = 2 > 1.96
    expectRelativelyClose('bias', m.bias.value, 0.75, 1e-15);
    expectRelativelyClose('ciWidth', m.ciWidth.value, 2 * z, 1e-15);
    expect(m.ciWidth.mcse).toBe(0);
    expect(m.modelSe).toEqual({ value: 1, mcse: 0 });
    expect(m.nonConverged).toEqual({ value: 0, mcse: 0 });
  });

  it('leaves out non-converged and unusable fits and counts them over both runs', () => {
    const alt = fits([1, NaN, 2, 0.5, 7], [1, 1, 1, 1, 0], [1, 0, 1, 1, 1]);
    const nul = fits([0.1, 9, 0.2], [1, 1, 1], [1, 0, 1]);
    const m = computeMetrics(alt, nul, 1, 0.05);
    expect(m.nonConverged.value).toBe(3); // NaN estimate, SE 0, and the null fit marked non-converged
    expectRelativelyClose('nonConverged MC SE', m.nonConverged.mcse, Math.sqrt(8 * (3 / 8) * (5 / 8)), 1e-15);
    expect(m.typeIError.value).toBe(0);
    expectRelativelyClose('bias over 3 usable fits', m.bias.value, (1 + 2 + 0.5) / 3 - 1, 1e-15);
  });

  it('reports coverage and bias as not available when the true value is NaN, the rest as usual', () => {
    const m = computeMetrics(fits([1, 3, 2], [1, 1, 1]), fits([0.1, 2.5, 0], [1, 1, 1]), NaN, 0.05);
    expect([m.coverage.value, m.coverage.mcse, m.bias.value, m.bias.mcse]).toEqual([NaN, NaN, NaN, NaN]);
    expectRelativelyClose('power', m.power.value, 2 / 3, 1e-15);
    expectRelativelyClose('typeIError', m.typeIError.value, 1 / 3, 1e-15);
    expect(m.empiricalSe.value).toBe(1);
  });

  it('gives NaN with NaN MC SE when no fit is usable', () => {
    const m = computeMetrics(fits([1], [1], [0]), fits([1], [1], [0]), 1, 0.05);
    expect(m.power.value).toBeNaN();
    expect(m.bias.mcse).toBeNaN();
    expect(m.nonConverged.value).toBe(2);
  });

  it('uses t quantiles for finite df: t(0.975, 10) = 2.2281388519862744 (R 4.2.2, qt(0.025, 10, lower.tail = FALSE))', () => {
    expectRelativelyClose('t quantile df 10', new CriticalValues(0.05).at(10), 2.2281388519862744, 1e-12);
    expect(() => new CriticalValues(0)).toThrow(/alpha must be between 0 and 1, got 0/);
  });
});
