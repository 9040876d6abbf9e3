import { describe, expect, it } from 'vitest';
import fixture from './fixtures/distributions.json';
import { chiSquareCdf, chiSquareSf } from './chi-square';
import { fCdf, fQuantile, fQuantileUpper, fSf } from './f';
import { tSf } from './t';
import { expectNoMismatches, mismatch, tailTolerance } from './test-helpers';

/**
 * Reference: R's pf and qf (lower.tail = TRUE and FALSE), from `fixtures/generate_distributions.R`,
 * d₁ and d₂ from 1 to 1e6.
 */

/** Measured: see the report in f.ts; the claim is 1e-10 relative. */
const RELATIVE = 1e-10;
const DFS: [number, number][] = [
  [1, 1],
  [1, 37.3],
  [3.5, 10],
  [10, 1e3],
  [100, 2],
  [1e3, 1e6],
  [1e6, 1e6],
];
const PS = [1e-12, 1e-10, 1e-8, 1e-5, 1e-3, 0.025, 0.05, 0.2, 0.5];

describe('fCdf and fSf', () => {
  it('match R’s pf to 1e-10 relative (1e-15 absolute) for d₁, d₂ from 1 to 1e6', () => {
    expectNoMismatches(
      fixture.f.flatMap(({ x, df1, df2, cdf, sf }) => [
        mismatch(`fCdf(${x}, ${df1}, ${df2})`, fCdf(x, df1, df2), cdf, tailTolerance(cdf, RELATIVE, 1e-15)),
        mismatch(`fSf(${x}, ${df1}, ${df2})`, fSf(x, df1, df2), sf, tailTolerance(sf, RELATIVE, 1e-15)),
      ]),
    );
  });

  it('agree with t² ~ F(1, ν): P(F > t²) = 2 P(T > t)', () => {
    expectNoMismatches(
      [1, 2.5, 30, 1e4].flatMap((df) =>
        [0.1, 1, 2, 5, 30].map((t) => mismatch(`fSf(${t}², 1, ${df})`, fSf(t * t, 1, df), 2 * tSf(t, df), { relative: 1e-12 })),
      ),
    );
  });

  it('are the scaled chi-square for d₂ = ∞', () => {
    for (const x of [0.1, 1, 3]) {
      expect(fCdf(x, 4, Infinity)).toBe(chiSquareCdf(4 * x, 4));
      expect(fSf(x, 4, Infinity)).toBe(chiSquareSf(4 * x, 4));
    }
    expectNoMismatches([mismatch('fSf(2, 4, 1e9)', fSf(2, 4, 1e9), chiSquareSf(8, 4), { relative: 1e-8 })]);
  });

  it('satisfy P(F(d₁, d₂) ≤ x) = P(F(d₂, d₁) ≥ 1/x)', () => {
    expectNoMismatches(
      DFS.flatMap(([d1, d2]) =>
        [0.3, 1, 4].map((x) => mismatch(`fCdf(${x}, ${d1}, ${d2})`, fCdf(x, d1, d2), fSf(1 / x, d2, d1), { relative: 1e-13 })),
      ),
    );
  });

  it.each([
    [0, 1, 0, 1],
    [-1, 1, 0, 1],
    [Infinity, 3, 1, 0],
  ])('at x = %s (d₁ = %s): cdf %s, sf %s', (x, d1, cdf, sf) => {
    expect(fCdf(x, d1, 5)).toBe(cdf);
    expect(fSf(x, d1, 5)).toBe(sf);
  });

  it.each([
    [NaN, 1, 1],
    [1, NaN, 1],
    [1, 1, NaN],
    [1, 0, 1],
    [1, 1, -1],
  ])('return NaN for x = %s, d₁ = %s, d₂ = %s', (x, d1, d2) => {
    expect(fCdf(x, d1, d2)).toBeNaN();
    expect(fSf(x, d1, d2)).toBeNaN();
  });
});

describe('fQuantile and fQuantileUpper', () => {
  it('match R’s qf to 1e-9 relative where R computes it exactly', () => {
    // R's qf, through qbeta, is inaccurate for small p, and for d₁ or d₂ above 4e5 it returns
    // the chi-square limit instead (3.84145882 for the 0.95 quantile of F(1, 1e6), whose value is
    // 3.84146812).
    expectNoMismatches(
      fixture.fQuantile
        .filter(({ p, df1, df2 }) => p >= 0.05 && df1 <= 4e5 && df2 <= 4e5)
        .flatMap(({ p, df1, df2, lower, upper }) => [
          mismatch(`fQuantile(${p}, ${df1}, ${df2})`, fQuantile(p, df1, df2), lower, { relative: 1e-9 }),
          mismatch(`fQuantileUpper(${p}, ${df1}, ${df2})`, fQuantileUpper(p, df1, df2), upper, { relative: 1e-9 }),
        ]),
    );
  });

  it('are exact for closed forms at small p: F(1, 1) = tan²(πp/2), F(2, 2) = p/(1 − p)', () => {
    // For p = 1e-4, R's qf(p, 1, 1) is 2.46740115006e-8, 3.7e-9 away from tan²(πp/2).
    expectNoMismatches(
      [1e-12, 1e-8, 1e-4, 0.01, 0.3].flatMap((p) => [
        mismatch(`fQuantile(${p}, 1, 1)`, fQuantile(p, 1, 1), Math.tan((Math.PI * p) / 2) ** 2, { relative: 1e-13 }),
        mismatch(`fQuantile(${p}, 2, 2)`, fQuantile(p, 2, 2), p / (1 - p), { relative: 1e-13 }),
        mismatch(`fQuantileUpper(${p}, 2, 2)`, fQuantileUpper(p, 2, 2), (1 - p) / p, { relative: 1e-13 }),
      ]),
    );
  });

  it('invert the tails: cdf(quantile(p)) = p and sf(quantileUpper(q)) = q to 1e-12 relative', () => {
    expectNoMismatches(
      DFS.flatMap(([d1, d2]) =>
        PS.flatMap((p) => [
          mismatch(`fCdf(fQuantile(${p}, ${d1}, ${d2}))`, fCdf(fQuantile(p, d1, d2), d1, d2), p, { relative: 1e-12 }),
          mismatch(`fSf(fQuantileUpper(${p}, ${d1}, ${d2}))`, fSf(fQuantileUpper(p, d1, d2), d1, d2), p, { relative: 1e-12 }),
          mismatch(`fSf(fQuantile(1 − ${p}, ${d1}, ${d2}))`, fSf(fQuantile(1 - p, d1, d2), d1, d2), 1 - (1 - p), { relative: 1e-12 }),
        ]),
      ),
    );
  });

  it.each([
    [0, 0, Infinity],
    [1, Infinity, 0],
  ])('at p = %s: quantile %s, upper quantile %s', (p, lower, upper) => {
    expect(fQuantile(p, 3, 8)).toBe(lower);
    expect(fQuantileUpper(p, 3, 8)).toBe(upper);
  });

  it.each([NaN, -0.1, 1.1])('return NaN for p = %s', (p) => {
    expect(fQuantile(p, 3, 8)).toBeNaN();
    expect(fQuantileUpper(p, 3, 8)).toBeNaN();
  });
});
