import { describe, expect, it } from 'vitest';
import fixture from './fixtures/distributions.json';
import {
  chiSquareCdf,
  chiSquareQuantile,
  chiSquareQuantileUpper,
  chiSquareSf,
  noncentralChiSquareCdf,
  noncentralChiSquareSf,
} from './chi-square';
import { regularizedGammaP, regularizedGammaQ } from './incomplete-gamma';
import { normalCdf } from './normal';
import { expectNoMismatches, largestRelativeError, mismatch, tailTolerance } from './test-helpers';

/**
 * Reference: `fixtures/generate_distributions.R` (R version in the file). Central: pchisq and
 * qchisq. Noncentral: the defining Poisson series Σ dpois(j, λ/2) pchisq(x, k + 2j), each term
 * by R separately ("cdf", "sf"), cross-checked against an independent integral and R's pchisq
 * with ncp (their largest disagreements are in the file's header).
 */

const RELATIVE = 1e-10;
const DFS = [0.5, 1, 2, 5.5, 37.3, 1e3, 1e5, 1e6];
const PS = [1e-12, 1e-10, 1e-8, 1e-5, 1e-3, 0.025, 0.05, 0.2, 0.5];

describe('chiSquareCdf and chiSquareSf', () => {
  it('match R’s pchisq to 1e-10 relative for k from 0.5 to 1e6', () => {
    expectNoMismatches(
      fixture.chiSquare.flatMap(({ x, df, cdf, sf }) => [
        mismatch(`chiSquareCdf(${x}, ${df})`, chiSquareCdf(x, df), cdf, tailTolerance(cdf, RELATIVE, 1e-15)),
        mismatch(`chiSquareSf(${x}, ${df})`, chiSquareSf(x, df), sf, tailTolerance(sf, RELATIVE, 1e-15)),
      ]),
    );
  });

  it('are closed forms for k = 1 and k = 2', () => {
    expectNoMismatches(
      [0.01, 0.5, 3, 20, 300].flatMap((x) => [
        mismatch(`chiSquareSf(${x}, 2)`, chiSquareSf(x, 2), Math.exp(-x / 2), { relative: 1e-14 }),
        mismatch(`chiSquareSf(${x}, 1)`, chiSquareSf(x, 1), 2 * normalCdf(-Math.sqrt(x)), { relative: 1e-13 }),
      ]),
    );
  });

  it('are the incomplete gamma functions: P(k/2, x/2) and Q(k/2, x/2)', () => {
    expect(chiSquareCdf(7, 3)).toBe(regularizedGammaP(1.5, 3.5));
    expect(chiSquareSf(7, 3)).toBe(regularizedGammaQ(1.5, 3.5));
  });

  it.each([
    [0, 0, 1],
    [-3, 0, 1],
    [Infinity, 1, 0],
  ])('at x = %s: cdf %s, sf %s', (x, cdf, sf) => {
    expect(chiSquareCdf(x, 4)).toBe(cdf);
    expect(chiSquareSf(x, 4)).toBe(sf);
  });

  it.each([
    [NaN, 1],
    [1, NaN],
    [1, 0],
    [1, -1],
  ])('return NaN for x = %s, k = %s', (x, df) => {
    expect(chiSquareCdf(x, df)).toBeNaN();
    expect(chiSquareSf(x, df)).toBeNaN();
    expect(noncentralChiSquareCdf(x, df, 1)).toBeNaN();
  });
});

describe('chiSquareQuantile and chiSquareQuantileUpper', () => {
  it('match R’s qchisq to 1e-10 relative', () => {
    expectNoMismatches(
      fixture.chiSquareQuantile.flatMap(({ p, df, lower, upper }) => [
        mismatch(`chiSquareQuantile(${p}, ${df})`, chiSquareQuantile(p, df), lower, { relative: 1e-10 }),
        mismatch(`chiSquareQuantileUpper(${p}, ${df})`, chiSquareQuantileUpper(p, df), upper, { relative: 1e-10 }),
      ]),
    );
  });

  it('invert the tails: cdf(quantile(p)) = p and sf(quantileUpper(q)) = q to 1e-12 relative', () => {
    expectNoMismatches(
      DFS.flatMap((df) =>
        PS.flatMap((p) => [
          mismatch(`chiSquareCdf(chiSquareQuantile(${p}, ${df}))`, chiSquareCdf(chiSquareQuantile(p, df), df), p, { relative: 1e-12 }),
          mismatch(`chiSquareSf(chiSquareQuantileUpper(${p}, ${df}))`, chiSquareSf(chiSquareQuantileUpper(p, df), df), p, { relative: 1e-12 }),
          mismatch(`chiSquareSf(chiSquareQuantile(1 − ${p}, ${df}))`, chiSquareSf(chiSquareQuantile(1 - p, df), df), 1 - (1 - p), { relative: 1e-12 }),
        ]),
      ),
    );
  });

  it.each([
    [0, 0, Infinity],
    [1, Infinity, 0],
  ])('at p = %s: quantile %s, upper quantile %s', (p, lower, upper) => {
    expect(chiSquareQuantile(p, 3)).toBe(lower);
    expect(chiSquareQuantileUpper(p, 3)).toBe(upper);
  });

  it.each([NaN, -0.1, 1.1])('return NaN for p = %s', (p) => {
    expect(chiSquareQuantile(p, 3)).toBeNaN();
    expect(chiSquareQuantileUpper(p, 3)).toBeNaN();
  });
});

describe('noncentralChiSquareCdf and noncentralChiSquareSf', () => {
  it('match the defining Poisson series to 1e-9 relative (1e-13 absolute) for λ up to 5,000', () => {
    expectNoMismatches(
      fixture.noncentralChiSquare.flatMap(({ x, df, ncp, cdf, sf }) => [
        mismatch(`noncentralChiSquareCdf(${x}, ${df}, ${ncp})`, noncentralChiSquareCdf(x, df, ncp), cdf, tailTolerance(cdf, 1e-9, 1e-13)),
        mismatch(`noncentralChiSquareSf(${x}, ${df}, ${ncp})`, noncentralChiSquareSf(x, df, ncp), sf, tailTolerance(sf, 1e-9, 1e-13)),
      ]),
    );
  });

  it('reports the largest relative error against the series', () => {
    const worst = largestRelativeError(
      fixture.noncentralChiSquare.flatMap(({ x, df, ncp, cdf, sf }) => [
        [noncentralChiSquareCdf(x, df, ncp), cdf] as [number, number],
        [noncentralChiSquareSf(x, df, ncp), sf] as [number, number],
      ]),
    );
    expect(worst).toBeLessThan(1e-9);
  });

  it('is the central distribution for λ = 0', () => {
    for (const x of [0.5, 3, 40]) {
      expect(noncentralChiSquareCdf(x, 3, 0)).toBe(chiSquareCdf(x, 3));
      expect(noncentralChiSquareSf(x, 3, 0)).toBe(chiSquareSf(x, 3));
    }
    expectNoMismatches([mismatch('ncχ²(3; 3, 1e-12)', noncentralChiSquareCdf(3, 3, 1e-12), chiSquareCdf(3, 3), { relative: 1e-11 })]);
  });

  it('has cdf + sf = 1 and a cdf that falls as λ grows', () => {
    let previous = 1;
    for (const ncp of [0.1, 1, 10, 100, 1000, 5000]) {
      const x = 1200;
      const cdf = noncentralChiSquareCdf(x, 10, ncp);
      // The Poisson weights carry a relative error of a few 1e-15 (Loader's terms at small counts).
      expect(cdf, `λ = ${ncp}`).toBeLessThanOrEqual(previous + 1e-14);
      previous = cdf;
      expectNoMismatches([mismatch(`cdf + sf at λ = ${ncp}`, cdf + noncentralChiSquareSf(x, 10, ncp), 1, { absolute: 1e-13 })]);
    }
  });

  it('is exact for k = 1: P(|Z + √λ| ≤ √x)', () => {
    expectNoMismatches(
      [0.5, 4, 30].flatMap((ncp) =>
        [0.1, 2, 10, 60].map((x) =>
          mismatch(
            `noncentralChiSquareCdf(${x}, 1, ${ncp})`,
            noncentralChiSquareCdf(x, 1, ncp),
            normalCdf(Math.sqrt(x) - Math.sqrt(ncp)) - normalCdf(-Math.sqrt(x) - Math.sqrt(ncp)),
            { relative: 1e-12, absolute: 1e-15 },
          ),
        ),
      ),
    );
  });

  it.each([
    [0, 0, 1],
    [-1, 0, 1],
    [Infinity, 1, 0],
  ])('at x = %s: cdf %s, sf %s', (x, cdf, sf) => {
    expect(noncentralChiSquareCdf(x, 4, 7)).toBe(cdf);
    expect(noncentralChiSquareSf(x, 4, 7)).toBe(sf);
  });

  it('returns NaN for λ < 0 or NaN, and 0/1 for λ = ∞', () => {
    expect(noncentralChiSquareCdf(3, 4, -1)).toBeNaN();
    expect(noncentralChiSquareSf(3, 4, NaN)).toBeNaN();
    expect(noncentralChiSquareCdf(3, 4, Infinity)).toBe(0);
    expect(noncentralChiSquareSf(3, 4, Infinity)).toBe(1);
  });
});
