import { describe, expect, it } from 'vitest';
import fixture from './fixtures/distributions.json';
import { noncentralTCdf, noncentralTSf } from './noncentral-t';
import { normalCdf } from './normal';
import { tCdf, tSf } from './t';
import { expectNoMismatches, mismatch, tailTolerance, type Tolerance } from './test-helpers';

/**
 * Reference: `fixtures/generate_distributions.R` (R version in the file). "cdf"/"sf" are
 * numerical integrals (R's integrate at rel.tol 1e-13) of positive integrands, cross-checked
 * against a second, independent integral ("cdfV"/"sfV"; the largest disagreement is in the
 * file's header); "cdfR"/"sfR" are R's pt with ncp, given only where |δ| ≤ 37.62 (beyond, pt
 * switches to a normal approximation).
 */

type Row = (typeof fixture.noncentralT)[number];

/** Both series have positive terms: t ≥ 0 with δ ≥ 0, or t ≤ 0 with δ ≤ 0. */
const allPositive = ({ t, ncp }: Row) => (t >= 0 && ncp >= 0) || (t <= 0 && ncp <= 0);

/**
 * The two integral references disagree by up to about 1e-10 in a few places (see the file's
 * header); their disagreement is the uncertainty of the reference and is added to the tolerance.
 */
function withReferenceUncertainty(expected: number, other: number, { relative = 0, absolute = 0 }: Tolerance): Tolerance {
  return { absolute: absolute + relative * Math.abs(expected) + Math.abs(expected - other) };
}

describe('noncentralTCdf and noncentralTSf', () => {
  it('match the integral references to 1e-12 absolute over ν from 1 to 1e6 and |δ| ≤ 60', () => {
    expectNoMismatches(
      fixture.noncentralT.flatMap(({ t, df, ncp, cdf, sf, cdfV, sfV }) => [
        mismatch(`noncentralTCdf(${t}, ${df}, ${ncp})`, noncentralTCdf(t, df, ncp), cdf, withReferenceUncertainty(cdf, cdfV, { absolute: 1e-12 })),
        mismatch(`noncentralTSf(${t}, ${df}, ${ncp})`, noncentralTSf(t, df, ncp), sf, withReferenceUncertainty(sf, sfV, { absolute: 1e-12 })),
      ]),
    );
  });

  it('match them to 1e-9 relative where both series are positive (small tails included)', () => {
    expectNoMismatches(
      fixture.noncentralT.filter(allPositive).flatMap(({ t, df, ncp, cdf, sf, cdfV, sfV }) => [
        mismatch(`noncentralTCdf(${t}, ${df}, ${ncp})`, noncentralTCdf(t, df, ncp), cdf, withReferenceUncertainty(cdf, cdfV, tailTolerance(cdf, 1e-9))),
        mismatch(`noncentralTSf(${t}, ${df}, ${ncp})`, noncentralTSf(t, df, ncp), sf, withReferenceUncertainty(sf, sfV, tailTolerance(sf, 1e-9))),
      ]),
    );
  });

  it('report how close they come to the nearer of the two references', () => {
    let worstAbsolute = 0;
    for (const { t, df, ncp, cdf, sf, cdfV, sfV } of fixture.noncentralT) {
      const c = noncentralTCdf(t, df, ncp);
      const s = noncentralTSf(t, df, ncp);
      worstAbsolute = Math.max(worstAbsolute, Math.min(Math.abs(c - cdf), Math.abs(c - cdfV)), Math.min(Math.abs(s - sf), Math.abs(s - sfV)));
    }
    expect(worstAbsolute).toBeLessThan(1e-12);
  });

  it('match R’s pt where it is exact (|δ| ≤ 37.62 and ν ≤ 4e5) to 1e-11 absolute', () => {
    // Beyond either limit R's pt uses a normal approximation (A&S 26.7.10).
    expectNoMismatches(
      fixture.noncentralT
        .filter((row) => row.cdfR !== null && row.df <= 4e5)
        .map(({ t, df, ncp, cdfR }) =>
          mismatch(`noncentralTCdf(${t}, ${df}, ${ncp})`, noncentralTCdf(t, df, ncp), cdfR!, { absolute: 1e-11 }),
        ),
    );
  });

  it('are right where jstat 1.9.6 fails (ν = 100, δ = 26 to 60: jstat returns 0)', () => {
    const rows = fixture.noncentralT.filter(({ df, ncp }) => df === 100 && ncp >= 25);
    expect(rows.length).toBeGreaterThan(10);
    expectNoMismatches(
      rows.map(({ t, df, ncp, sf, sfV }) =>
        mismatch(`noncentralTSf(${t}, ${df}, ${ncp})`, noncentralTSf(t, df, ncp), sf, withReferenceUncertainty(sf, sfV, tailTolerance(sf, 1e-9))),
      ),
    );
  });

  it('are the central t for δ = 0 and the shifted normal for ν = ∞', () => {
    for (const t of [-3, -0.5, 0, 1, 4]) {
      expect(noncentralTCdf(t, 7, 0)).toBe(tCdf(t, 7));
      expect(noncentralTSf(t, 7, 0)).toBe(tSf(t, 7));
      expect(noncentralTCdf(t, Infinity, 1.5)).toBe(normalCdf(t - 1.5));
      expectNoMismatches([
        mismatch(`noncentralTCdf(${t}, 7, 1e-10)`, noncentralTCdf(t, 7, 1e-10), tCdf(t, 7), { absolute: 1e-10 }),
        mismatch(`noncentralTCdf(${t}, 1e9, 1.5)`, noncentralTCdf(t, 1e9, 1.5), normalCdf(t - 1.5), { absolute: 1e-8 }),
      ]);
    }
  });

  it('satisfy the reflection P(T ≤ t; ν, δ) = P(T ≥ −t; ν, −δ) exactly, and cdf + sf = 1', () => {
    for (const { t, df, ncp } of fixture.noncentralT) {
      expect(noncentralTCdf(t, df, ncp)).toBe(noncentralTSf(-t, df, -ncp));
      expectNoMismatches([
        mismatch(`cdf + sf (${t}, ${df}, ${ncp})`, noncentralTCdf(t, df, ncp) + noncentralTSf(t, df, ncp), 1, { absolute: 5e-13 }),
      ]);
    }
  });

  it('have an upper tail that grows with δ (power grows with the effect)', () => {
    for (const df of [3, 40, 1e4]) {
      let previous = 0;
      for (let ncp = -10; ncp <= 60; ncp += 0.5) {
        const sf = noncentralTSf(2.5, df, ncp);
        expect(sf, `ν = ${df}, δ = ${ncp}`).toBeGreaterThanOrEqual(previous - 5e-13); // absolute error near 1
        previous = sf;
      }
    }
  });

  it('give P(T ≤ 0) = Φ(−δ)', () => {
    expectNoMismatches(
      [-30, -2, 0.7, 10, 60].map((ncp) =>
        mismatch(`noncentralTCdf(0, 5, ${ncp})`, noncentralTCdf(0, 5, ncp), normalCdf(-ncp), { relative: 1e-15 }),
      ),
    );
  });

  it.each([
    [Infinity, 1, 0],
    [-Infinity, 0, 1],
  ])('at t = %s: cdf %s, sf %s', (t, cdf, sf) => {
    expect(noncentralTCdf(t, 4, 2)).toBe(cdf);
    expect(noncentralTSf(t, 4, 2)).toBe(sf);
  });

  it('handle δ = ±∞ and bad input', () => {
    expect(noncentralTCdf(3, 4, Infinity)).toBe(0);
    expect(noncentralTSf(3, 4, -Infinity)).toBe(0);
    for (const [t, df, ncp] of [
      [NaN, 3, 1],
      [1, NaN, 1],
      [1, 3, NaN],
      [1, 0, 1],
      [1, -1, 1],
    ]) {
      expect(noncentralTCdf(t!, df!, ncp!)).toBeNaN();
      expect(noncentralTSf(t!, df!, ncp!)).toBeNaN();
    }
  });

  it('answer δ far beyond t with 0 and 1 at once, and NaN where the series would not end in time', () => {
    // An effect a billion SDs wide (the Plan asked with sd 1e-9): every digit is 0 or 1.
    expect(noncentralTSf(2, 78, 1e9)).toBe(1);
    expect(noncentralTCdf(2, 78, 1e9)).toBe(0);
    expect(noncentralTCdf(-2, 78, -1e9)).toBe(1);
    expect(noncentralTSf(-2, 78, -1e9)).toBe(0);
    expect(noncentralTSf(2, 1, 1e4)).toBe(1);
    // δ near an equally far t (a tiny alpha with 2 df): more terms than poissonMixture sums.
    expect(noncentralTSf(1e7, 2, 1e7)).toBeNaN();
    expect(noncentralTCdf(1e7, 2, 1e7)).toBeNaN();
  });
});
