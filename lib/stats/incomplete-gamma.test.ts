import { describe, expect, it } from 'vitest';
import fixture from './fixtures/distributions.json';
import {
  logRegularizedGammaP,
  logRegularizedGammaQ,
  regularizedGammaP,
  regularizedGammaQ,
} from './incomplete-gamma';
import { expectNoMismatches, mismatch, tailTolerance } from './test-helpers';

/**
 * Reference: R's pchisq (P(k/2, x/2)) from `fixtures/generate_distributions.R`, a from 0.25 to 5e5.
 */

describe('regularizedGammaP and regularizedGammaQ', () => {
  it('match R’s pgamma (as pchisq) to 1e-10 relative for a from 0.25 to 5e5', () => {
    expectNoMismatches(
      fixture.chiSquare.flatMap(({ x, df, cdf, sf }) => [
        mismatch(`P(${df / 2}, ${x / 2})`, regularizedGammaP(df / 2, x / 2), cdf, tailTolerance(cdf, 1e-10, 1e-15)),
        mismatch(`Q(${df / 2}, ${x / 2})`, regularizedGammaQ(df / 2, x / 2), sf, tailTolerance(sf, 1e-10, 1e-15)),
      ]),
    );
  });

  it('give logs consistent with the values, and finite logs where the values underflow', () => {
    expectNoMismatches(
      fixture.chiSquare
        .filter(({ cdf, sf }) => cdf > 1e-300 && sf > 1e-300)
        .flatMap(({ x, df, cdf, sf }) => [
          mismatch(`logP(${df / 2}, ${x / 2})`, logRegularizedGammaP(df / 2, x / 2), Math.log(cdf), { absolute: 1e-10 * Math.max(1, -Math.log(cdf)) }),
          mismatch(`logQ(${df / 2}, ${x / 2})`, logRegularizedGammaQ(df / 2, x / 2), Math.log(sf), { absolute: 1e-10 * Math.max(1, -Math.log(sf)) }),
        ]),
    );
    // Q(1, x) = e^(−x) exactly: log Q(1, 2000) = −2000 although Q underflows.
    expect(regularizedGammaQ(1, 2000)).toBe(0);
    expectNoMismatches([mismatch('logQ(1, 2000)', logRegularizedGammaQ(1, 2000), -2000, { relative: 1e-14 })]);
  });

  it('are exact for a = 1: P = 1 − e^(−x)', () => {
    expectNoMismatches(
      [1e-8, 0.3, 1, 5, 40].map((x) => mismatch(`P(1, ${x})`, regularizedGammaP(1, x), -Math.expm1(-x), { relative: 1e-14 })),
    );
  });

  it.each([
    [2, 0, 0, 1],
    [2, Infinity, 1, 0],
  ])('at a = %s, x = %s: P %s, Q %s', (a, x, p, q) => {
    expect(regularizedGammaP(a, x)).toBe(p);
    expect(regularizedGammaQ(a, x)).toBe(q);
  });

  it.each([
    [NaN, 1],
    [1, NaN],
    [0, 1],
    [-1, 1],
    [1, -1],
    [Infinity, 1],
  ])('return NaN for a = %s, x = %s', (a, x) => {
    expect(regularizedGammaP(a, x)).toBeNaN();
    expect(regularizedGammaQ(a, x)).toBeNaN();
    expect(logRegularizedGammaP(a, x)).toBeNaN();
  });
});
