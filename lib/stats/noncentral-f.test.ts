import { describe, expect, it } from 'vitest';
import fixture from './fixtures/distributions.json';
import { noncentralChiSquareCdf } from './chi-square';
import { fCdf, fSf } from './f';
import { noncentralFCdf, noncentralFSf } from './noncentral-f';
import { noncentralTSf } from './noncentral-t';
import { expectNoMismatches, mismatch, tailTolerance } from './test-helpers';

/**
 * Reference: `fixtures/generate_distributions.R` (R version in the file): the defining Poisson
 * series Σ dpois(j, λ/2) pbeta(u, d₁/2 + j, d₂/2), each term by R's pbeta separately ("cdf",
 * "sf"); cross-checks are an integral over the numerator ("cdfW", "sfW") and R's pf with ncp
 * ("cdfR", "sfR", AS 226/R84, documented by R as accurate to about 1e-9 absolute).
 */

describe('noncentralFCdf and noncentralFSf', () => {
  it('match the Poisson series to 1e-9 relative (1e-13 absolute) for λ up to 5,000', () => {
    expectNoMismatches(
      fixture.noncentralF.flatMap(({ x, df1, df2, ncp, cdf, sf }) => [
        mismatch(`noncentralFCdf(${x}, ${df1}, ${df2}, ${ncp})`, noncentralFCdf(x, df1, df2, ncp), cdf, tailTolerance(cdf, 1e-9, 1e-13)),
        mismatch(`noncentralFSf(${x}, ${df1}, ${df2}, ${ncp})`, noncentralFSf(x, df1, df2, ncp), sf, tailTolerance(sf, 1e-9, 1e-13)),
      ]),
    );
  });

  it('agree with R’s pf with ncp within its documented 1e-9', () => {
    expectNoMismatches(
      fixture.noncentralF.map(({ x, df1, df2, ncp, cdfR }) =>
        mismatch(`noncentralFCdf(${x}, ${df1}, ${df2}, ${ncp})`, noncentralFCdf(x, df1, df2, ncp), cdfR, { absolute: 2e-9 }),
      ),
    );
  });

  it('are the central F for λ = 0', () => {
    for (const x of [0.2, 1, 5]) {
      expect(noncentralFCdf(x, 3, 12, 0)).toBe(fCdf(x, 3, 12));
      expect(noncentralFSf(x, 3, 12, 0)).toBe(fSf(x, 3, 12));
    }
    expectNoMismatches([mismatch('ncF(2; 3, 12, 1e-12)', noncentralFCdf(2, 3, 12, 1e-12), fCdf(2, 3, 12), { relative: 1e-11 })]);
  });

  it('agree with the noncentral t: P(F(1, ν, δ²) > t²) = P(T > t) + P(T < −t)', () => {
    expectNoMismatches(
      [3, 30, 1e3].flatMap((df) =>
        [0.5, 2, 8].map((ncp) => {
          const t = 2.2;
          const expected = noncentralTSf(t, df, ncp) + noncentralTSf(t, df, -ncp);
          return mismatch(`noncentralFSf(${t}², 1, ${df}, ${ncp}²)`, noncentralFSf(t * t, 1, df, ncp * ncp), expected, { relative: 1e-11 });
        }),
      ),
    );
  });

  it('tend to the noncentral chi-square as d₂ grows', () => {
    expect(noncentralFCdf(2, 4, Infinity, 6)).toBe(noncentralChiSquareCdf(8, 4, 6));
    expectNoMismatches([mismatch('ncF(2; 4, 1e9, 6)', noncentralFCdf(2, 4, 1e9, 6), noncentralChiSquareCdf(8, 4, 6), { relative: 1e-7 })]);
  });

  it('have an upper tail (power) that grows with λ and cdf + sf = 1', () => {
    for (const [df1, df2] of [
      [1, 10],
      [4, 200],
      [30, 1e4],
    ]) {
      let previous = 0;
      for (const ncp of [0.1, 1, 5, 20, 100, 500, 2000, 5000]) {
        const x = 3;
        const sf = noncentralFSf(x, df1!, df2!, ncp);
        expect(sf, `d = (${df1}, ${df2}), λ = ${ncp}`).toBeGreaterThanOrEqual(previous - 1e-13); // rounding near 1
        previous = sf;
        expectNoMismatches([mismatch(`cdf + sf (λ = ${ncp})`, noncentralFCdf(x, df1!, df2!, ncp) + sf, 1, { absolute: 1e-13 })]);
      }
    }
  });

  it.each([
    [0, 0, 1],
    [-2, 0, 1],
    [Infinity, 1, 0],
  ])('at x = %s: cdf %s, sf %s', (x, cdf, sf) => {
    expect(noncentralFCdf(x, 3, 9, 4)).toBe(cdf);
    expect(noncentralFSf(x, 3, 9, 4)).toBe(sf);
  });

  it('handle λ = ∞ and bad input', () => {
    expect(noncentralFCdf(2, 3, 9, Infinity)).toBe(0);
    expect(noncentralFSf(2, 3, 9, Infinity)).toBe(1);
    for (const [x, d1, d2, ncp] of [
      [NaN, 3, 9, 1],
      [1, 0, 9, 1],
      [1, 3, -9, 1],
      [1, 3, 9, -1],
      [1, 3, 9, NaN],
      [1, Infinity, 9, 1],
    ]) {
      expect(noncentralFCdf(x!, d1!, d2!, ncp!)).toBeNaN();
      expect(noncentralFSf(x!, d1!, d2!, ncp!)).toBeNaN();
    }
  });

  it('answer λ far beyond x with 0 and 1 at once', () => {
    // A regression with f2 = 10,000 on 10 million observations: λ = 1e11.
    expect(noncentralFSf(3, 1, 1e7, 1e11)).toBe(1);
    expect(noncentralFCdf(3, 1, 1e7, 1e11)).toBe(0);
    expect(noncentralFSf(2, 3, 10, 1e15)).toBe(1);
  });
});
