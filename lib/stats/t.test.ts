import { describe, expect, it } from 'vitest';
import fixture from './fixtures/distributions.json';
import { normalCdf, normalQuantile, normalSf } from './normal';
import { tCdf, tQuantile, tQuantileUpper, tSf } from './t';
import { expectNoMismatches, mismatch, tailTolerance } from './test-helpers';

/**
 * Reference values: `fixtures/distributions.json`, written by `fixtures/generate_distributions.R`
 * with Debian's R (version in the file): pt with lower.tail = TRUE and FALSE, qt likewise.
 */

/** Measured: 7.5e-12 (at ν = 1e6, see t.ts); the claim is 1e-11. */
const RELATIVE = 1e-11;
const DFS = [1, 1.5, 2.5, 3, 10, 37.3, 100, 1e3, 1e4, 1e5, 1e6];
const PS = [1e-12, 1e-10, 1e-8, 1e-5, 1e-3, 0.01, 0.025, 0.05, 0.2, 0.4, 0.5];

describe('tCdf and tSf', () => {
  it('match R’s pt to 1e-11 relative (1e-15 absolute) over ν from 1 to 1e6 and t across the line', () => {
    expectNoMismatches(
      fixture.t.flatMap(({ t, df, cdf, sf }) => [
        mismatch(`tCdf(${t}, ${df})`, tCdf(t, df), cdf, tailTolerance(cdf, RELATIVE, 1e-15)),
        mismatch(`tSf(${t}, ${df})`, tSf(t, df), sf, tailTolerance(sf, RELATIVE, 1e-15)),
      ]),
    );
  });

  it('are mirror images: tCdf(−t) = tSf(t) exactly', () => {
    for (const { t, df } of fixture.t) expect(tCdf(-t, df), `t = ${t}, ν = ${df}`).toBe(tSf(t, df));
  });

  it('keep tiny upper tails that 1 − cdf loses', () => {
    const row = fixture.t.find((r) => r.t === 1000 && r.df === 10)!;
    expect(1 - tCdf(1000, 10)).toBe(0);
    expectNoMismatches([mismatch('tSf(1000, 10)', tSf(1000, 10), row.sf, { relative: RELATIVE })]);
  });

  it('are the normal distribution for ν = ∞, and Φ(t) − φ(t)(t³ + t)/(4ν) + O(ν⁻²) for large ν', () => {
    for (const t of [-40, -3, -1, 0, 0.5, 2, 8]) {
      expect(tCdf(t, Infinity)).toBe(normalCdf(t));
      expect(tSf(t, Infinity)).toBe(normalSf(t));
    }
    // The first term of the expansion in 1/ν (Fisher 1925; Abramowitz & Stegun 26.7.5, from
    // memory); the next term is of order t⁷/ν², below 1e-10 relative here.
    expectNoMismatches(
      [1e6, 1e7].flatMap((df) =>
        [-3, -1, 0.5, 2].map((t) => {
          const phi = Math.exp(-t * t / 2) / Math.sqrt(2 * Math.PI);
          const expected = normalCdf(t) - (phi * (t ** 3 + t)) / (4 * df);
          return mismatch(`tCdf(${t}, ${df})`, tCdf(t, df), expected, { relative: 1e-9 });
        }),
      ),
    );
  });

  it.each([
    [0, 1, 0.5, 0.5],
    [Infinity, 3, 1, 0],
    [-Infinity, 3, 0, 1],
    [0, 1e6, 0.5, 0.5],
  ])('at t = %s, ν = %s: cdf %s, sf %s', (t, df, cdf, sf) => {
    expect(tCdf(t, df)).toBe(cdf);
    expect(tSf(t, df)).toBe(sf);
  });

  it('is exact for ν = 1 (Cauchy): P(T ≤ t) = atan(−1/t)/π for t < 0', () => {
    expectNoMismatches(
      [-1e3, -10, -1, -0.1].flatMap((t) => [
        mismatch(`tCdf(${t}, 1)`, tCdf(t, 1), Math.atan(-1 / t) / Math.PI, { relative: 1e-14 }),
        mismatch(`tSf(${-t}, 1)`, tSf(-t, 1), Math.atan(-1 / t) / Math.PI, { relative: 1e-14 }),
      ]),
    );
  });

  it.each([
    [NaN, 3],
    [1, NaN],
    [1, 0],
    [1, -2],
  ])('returns NaN for t = %s, ν = %s', (t, df) => {
    expect(tCdf(t, df)).toBeNaN();
    expect(tSf(t, df)).toBeNaN();
  });
});

describe('tQuantile and tQuantileUpper', () => {
  it('match R’s qt to 1e-10 relative', () => {
    expectNoMismatches(
      fixture.tQuantile.flatMap(({ p, df, lower, upper }) => [
        mismatch(`tQuantile(${p}, ${df})`, tQuantile(p, df), lower, { relative: 1e-10, absolute: 1e-14 }),
        mismatch(`tQuantileUpper(${p}, ${df})`, tQuantileUpper(p, df), upper, { relative: 1e-10, absolute: 1e-14 }),
      ]),
    );
  });

  it('invert the tails: cdf(quantile(p)) = p and sf(quantileUpper(q)) = q to 1e-12 relative', () => {
    expectNoMismatches(
      DFS.flatMap((df) =>
        PS.flatMap((p) => [
          mismatch(`tCdf(tQuantile(${p}, ${df}))`, tCdf(tQuantile(p, df), df), p, { relative: 1e-12 }),
          mismatch(`tSf(tQuantileUpper(${p}, ${df}))`, tSf(tQuantileUpper(p, df), df), p, { relative: 1e-12 }),
          mismatch(`tSf(tQuantile(1 − ${p}, ${df}))`, tSf(tQuantile(1 - p, df), df), 1 - (1 - p), { relative: 1e-12 }),
        ]),
      ),
    );
  });

  it('are antisymmetric: tQuantileUpper(q) = −tQuantile(q)', () => {
    expectNoMismatches(
      DFS.flatMap((df) =>
        PS.map((p) => mismatch(`tQuantileUpper(${p}, ${df})`, tQuantileUpper(p, df), -tQuantile(p, df), { relative: 1e-14, absolute: 1e-300 })),
      ),
    );
  });

  it('are the normal quantile for ν = ∞', () => {
    expect(tQuantile(0.025, Infinity)).toBe(normalQuantile(0.025));
    expect(tQuantileUpper(0.025, Infinity)).toBe(-normalQuantile(0.025));
  });

  it.each([
    [0, -Infinity, Infinity],
    [1, Infinity, -Infinity],
    [0.5, 0, 0],
  ])('at p = %s: quantile %s, upper quantile %s', (p, lower, upper) => {
    expect(tQuantile(p, 7)).toBe(lower);
    expect(tQuantileUpper(p, 7)).toBe(upper);
  });

  it.each([NaN, -0.1, 1.1])('return NaN for p = %s', (p) => {
    expect(tQuantile(p, 5)).toBeNaN();
    expect(tQuantileUpper(p, 5)).toBeNaN();
  });

  it('return NaN for ν ≤ 0 or NaN', () => {
    expect(tQuantile(0.3, 0)).toBeNaN();
    expect(tQuantileUpper(0.3, NaN)).toBeNaN();
  });
});
