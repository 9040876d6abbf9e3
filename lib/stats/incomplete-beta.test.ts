import { describe, expect, it } from 'vitest';
import fixture from './fixtures/distributions.json';
import { incompleteBetaXY, logIncompleteBetaXY, regularizedIncompleteBeta } from './incomplete-beta';
import { expectNoMismatches, mismatch, tailTolerance } from './test-helpers';

/**
 * Reference: R's pbeta (TOMS 708) with lower.tail = TRUE and FALSE, from
 * `fixtures/generate_distributions.R`, shapes a, b from 0.5 to 5e5 and x from 30 standard
 * deviations below the mean to 30 above.
 */

/**
 * Measured: 3.2e-11 relative, at a = 5e5 and x close to 1 (the continued fraction in x ≈ 1 loses
 * about ε/(1 − x), see incomplete-beta.ts); below 1e-12 for a, b ≤ 1e4.
 */
const RELATIVE = 5e-11;

describe('regularizedIncompleteBeta', () => {
  it('matches R’s pbeta (both tails) to 5e-11 relative for a, b from 0.5 to 5e5', () => {
    expectNoMismatches(
      fixture.beta.flatMap(({ x, a, b, lower, upper }) => [
        mismatch(`I(${x}; ${a}, ${b})`, regularizedIncompleteBeta(x, a, b), lower, tailTolerance(lower, RELATIVE, 1e-15)),
        mismatch(`1 − I(${x}; ${a}, ${b})`, incompleteBetaXY(1 - x, x, b, a), upper, tailTolerance(upper, RELATIVE, 1e-15)),
      ]),
    );
  });

  it('matches R’s pbeta to 1e-12 relative for a, b ≤ 1e4', () => {
    expectNoMismatches(
      fixture.beta
        .filter(({ a, b }) => a <= 1e4 && b <= 1e4)
        .map(({ x, a, b, lower }) =>
          mismatch(`I(${x}; ${a}, ${b})`, regularizedIncompleteBeta(x, a, b), lower, tailTolerance(lower, 1e-12, 1e-15)),
        ),
    );
  });

  it('gives log I where I underflows, consistent with I where it does not', () => {
    expectNoMismatches(
      fixture.beta
        .filter(({ lower }) => lower > 1e-300)
        .map(({ x, a, b, lower }) =>
          mismatch(`logI(${x}; ${a}, ${b})`, logIncompleteBetaXY(x, 1 - x, a, b), Math.log(lower), {
            absolute: 5e-11 * Math.max(1, Math.abs(Math.log(lower))),
          }),
        ),
    );
    // I_0.01(500, 500) ≈ 1e-900 (a binomial tail): finite log, zero value.
    expect(regularizedIncompleteBeta(0.01, 500, 500)).toBe(0);
    expect(logIncompleteBetaXY(0.01, 0.99, 500, 500)).toBeLessThan(-1500);
    expect(logIncompleteBetaXY(0.01, 0.99, 500, 500)).toBeGreaterThan(-2500);
  });

  it('satisfies I_x(a, b) = 1 − I_{1−x}(b, a) and is exact for a = 1 and b = 1', () => {
    expectNoMismatches(
      [0.001, 0.2, 0.5, 0.7, 0.999].flatMap((x) => [
        mismatch(`I(${x}; 1, 3.5)`, regularizedIncompleteBeta(x, 1, 3.5), 1 - (1 - x) ** 3.5, { relative: 1e-14 }),
        mismatch(`I(${x}; 2.5, 1)`, regularizedIncompleteBeta(x, 2.5, 1), x ** 2.5, { relative: 1e-14 }),
        mismatch(
          `I(${x}; 3, 7) + I(1 − x; 7, 3)`,
          regularizedIncompleteBeta(x, 3, 7) + regularizedIncompleteBeta(1 - x, 7, 3),
          1,
          { absolute: 4e-16 },
        ),
      ]),
    );
  });

  it.each([
    [0, 2, 3, 0],
    [1, 2, 3, 1],
  ])('at x = %s (a = %s, b = %s) is %s', (x, a, b, value) => expect(regularizedIncompleteBeta(x, a, b)).toBe(value));

  it.each([
    [NaN, 1, 1],
    [0.5, NaN, 1],
    [0.5, 1, NaN],
    [-0.1, 1, 1],
    [1.1, 1, 1],
    [0.5, 0, 1],
    [0.5, 1, -1],
    [0.5, Infinity, 1],
  ])('returns NaN for x = %s, a = %s, b = %s', (x, a, b) => {
    expect(regularizedIncompleteBeta(x, a, b)).toBeNaN();
    expect(logIncompleteBetaXY(x, 1 - x, a, b)).toBeNaN();
  });
});
