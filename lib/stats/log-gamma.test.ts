import { describe, expect, it } from 'vitest';
import fixture from './fixtures/distributions.json';
import { logGamma, stirlingError } from './log-gamma';
import { expectNoMismatches, mismatch } from './test-helpers';

/** Reference: R's lgamma, from `fixtures/generate_distributions.R` (R version in the file). */

describe('logGamma', () => {
  it('matches R’s lgamma to 2e-15 relative, 1e-14 absolute', () => {
    expectNoMismatches(
      fixture.lgamma.map(({ x, value }) =>
        mismatch(`logGamma(${x})`, logGamma(x), value, { relative: 2e-15, absolute: 1e-14 }),
      ),
    );
  });

  it('satisfies log Γ(x + 1) = log Γ(x) + log x across the switch at 15', () => {
    expectNoMismatches(
      [0.3, 1.7, 9.5, 14.2, 14.9, 15, 15.5, 100.25, 1e5 + 0.5].map((x) =>
        mismatch(`logGamma(${x} + 1)`, logGamma(x + 1), logGamma(x) + Math.log(x), {
          relative: 4e-15,
          absolute: 4e-15,
        }),
      ),
    );
  });

  it('is exact at the integers where Γ = 1 and at factorials', () => {
    expect(logGamma(1)).toBe(0);
    expect(logGamma(2)).toBe(0);
    expectNoMismatches([mismatch('logGamma(11)', logGamma(11), Math.log(3628800), { relative: 1e-15 })]);
  });

  it.each([NaN, 0, -1, -0.5, -Infinity])('returns NaN for x = %s', (x) => expect(logGamma(x)).toBeNaN());

  it('returns +∞ for +∞', () => expect(logGamma(Infinity)).toBe(Infinity));
});

describe('stirlingError', () => {
  it('satisfies δ(z) − δ(z + 1) = (z + ½) log(1 + 1/z) − 1 across the switch at 15', () => {
    expectNoMismatches(
      [0.5, 3.7, 13.9, 14.2, 14.5, 15, 40.3, 1e4].map((z) =>
        mismatch(
          `stirlingError(${z}) − stirlingError(${z} + 1)`,
          stirlingError(z) - stirlingError(z + 1),
          (z + 0.5) * Math.log1p(1 / z) - 1,
          { relative: 1e-12, absolute: 1e-14 },
        ),
      ),
    );
  });

  it('is 1/(12z) to leading order', () => {
    expectNoMismatches([mismatch('stirlingError(1e6)', stirlingError(1e6), 1 / 12e6, { relative: 1e-12 })]);
  });
});
