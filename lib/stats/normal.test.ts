import { describe, expect, it } from 'vitest';
import fixture from './fixtures/normal.json';
import { normalCdf, normalPdf, normalQuantile, normalSf } from './normal';
import { expectNoMismatches, mismatch, tailTolerance, TINY, type Tolerance } from './test-helpers';

/**
 * Reference values: `fixtures/normal.json`, written by `fixtures/generate_normal.py` with
 * Debian's SciPy (version in the file's header) plus 80-digit values from Python's decimal.
 */

const EPS = 2 ** -52;

/**
 * The accuracy claimed in normal.ts, checked against the 80-digit values. (Measured: below
 * 8e-16. A version without Cody's splitting of exp(−x²/2) misses it by about x²·ε/2 ≈ 8e-14.)
 */
const EXACT_RELATIVE = 1e-14;

/**
 * SciPy's ndtr rounds x/√2 before erfc, and its pdf rounds x² before exp: errors of order x²·ε
 * in the far tail (up to 2e-13 at |x| ≈ 35, measured against the exact values). The
 * comparison with SciPy is at 1e-13 relative, widened by that much.
 */
function scipyTolerance(x: number, expected: number): Tolerance {
  return tailTolerance(expected, Math.max(1e-13, 4 * EPS * x * x));
}

describe('normalCdf and normalSf', () => {
  it('match exact (80-digit) values to 1e-14 relative over −38 ≤ x ≤ 38', () => {
    expectNoMismatches(
      fixture.cdf.flatMap(({ x, cdfExact, sfExact }) => [
        mismatch(`normalCdf(${x})`, normalCdf(x), cdfExact, tailTolerance(cdfExact, EXACT_RELATIVE)),
        mismatch(`normalSf(${x})`, normalSf(x), sfExact, tailTolerance(sfExact, EXACT_RELATIVE)),
      ]),
    );
  });

  it('match SciPy to 1e-13 relative, widened by SciPy’s own far-tail error', () => {
    expectNoMismatches(
      fixture.cdf.flatMap(({ x, cdf, sf }) => [
        mismatch(`normalCdf(${x})`, normalCdf(x), cdf, scipyTolerance(x, cdf)),
        mismatch(`normalSf(${x})`, normalSf(x), sf, scipyTolerance(x, sf)),
      ]),
    );
  });

  it.each([8.3, 37.5])('keeps the upper tail at x = %s that 1 − Φ(x) loses', (x) => {
    const row = fixture.cdf.find((r) => r.x === x)!;
    expect(1 - normalCdf(x)).toBe(0);
    expectNoMismatches([mismatch(`normalSf(${x})`, normalSf(x), row.sfExact, { relative: 1e-13 })]);
  });

  it('is symmetric: Φ(−x) = 1 − Φ(x) and sf(x) = Φ(−x) exactly', () => {
    for (const { x } of fixture.cdf) {
      expect(normalSf(x)).toBe(normalCdf(-x));
      if (Math.abs(x) < 8) {
        expectNoMismatches([
          mismatch(`Φ(${-x}) + Φ(${x})`, normalCdf(-x) + normalCdf(x), 1, { absolute: 2 * EPS }),
        ]);
      }
    }
  });

  it.each([
    [0, 0.5, 0.5],
    [-0, 0.5, 0.5],
    [Infinity, 1, 0],
    [-Infinity, 0, 1],
    [-39, 0, 1],
    [39, 1, 0],
    [Number.MAX_VALUE, 1, 0],
    [-Number.MAX_VALUE, 0, 1],
  ])('at x = %s: cdf %s, sf %s', (x, cdf, sf) => {
    expect(normalCdf(x)).toBe(cdf);
    expect(normalSf(x)).toBe(sf);
  });

  it('returns NaN for NaN', () => {
    expect(normalCdf(NaN)).toBeNaN();
    expect(normalSf(NaN)).toBeNaN();
  });
});

describe('normalPdf', () => {
  it('matches exact (80-digit) values to 1e-14 relative', () => {
    expectNoMismatches(
      fixture.cdf.map(({ x, pdfExact }) =>
        mismatch(`normalPdf(${x})`, normalPdf(x), pdfExact, tailTolerance(pdfExact, EXACT_RELATIVE)),
      ),
    );
  });

  it('matches SciPy to 1e-13 relative, widened by SciPy’s own far-tail error', () => {
    expectNoMismatches(
      fixture.cdf.map(({ x, pdf }) => mismatch(`normalPdf(${x})`, normalPdf(x), pdf, scipyTolerance(x, pdf))),
    );
  });

  it.each([
    [0, 0.3989422804014327],
    [Infinity, 0],
    [-Infinity, 0],
    [Number.MAX_VALUE, 0],
    [39, 0],
  ])('at x = %s is %s', (x, pdf) => expect(normalPdf(x)).toBe(pdf));

  it('returns NaN for NaN', () => expect(normalPdf(NaN)).toBeNaN());
});

describe('normalQuantile', () => {
  it('matches exact (80-digit) values to 1e-14 relative (1e-15 absolute near p = 0.5)', () => {
    expectNoMismatches(
      fixture.quantile.map(({ p, xExact }) =>
        mismatch(`normalQuantile(${p})`, normalQuantile(p), xExact, { relative: EXACT_RELATIVE, absolute: 1e-15 }),
      ),
    );
  });

  it('matches SciPy to 1e-12 relative (1e-15 absolute near p = 0.5)', () => {
    expectNoMismatches(
      fixture.quantile.map(({ p, x }) =>
        mismatch(`normalQuantile(${p})`, normalQuantile(p), x, { relative: 1e-12, absolute: 1e-15 }),
      ),
    );
  });

  it.each([
    [0.5, 0],
    [0, -Infinity],
    [1, Infinity],
    [-0, -Infinity],
  ])('at p = %s is %s', (p, x) => expect(normalQuantile(p)).toBe(x));

  it.each([NaN, -1e-300, -0.5, 1 + 2 ** -52, 2, Infinity, -Infinity])('returns NaN for p = %s', (p) => {
    expect(normalQuantile(p)).toBeNaN();
  });

  it('is antisymmetric: Φ⁻¹(1 − p) = −Φ⁻¹(p) exactly for p = 2⁻ᵏ, where 1 − p is exact', () => {
    for (let k = 2; k <= 52; k++) {
      const p = 2 ** -k;
      expect(normalQuantile(1 - p), `p = 2^-${k}`).toBe(-normalQuantile(p));
    }
  });
});

describe('inverse identities', () => {
  const grid = Array.from({ length: 741 }, (_, i) => -37 + i * 0.1);

  it('Φ⁻¹(Φ(x)) = x for −37 ≤ x ≤ 0 and −Φ⁻¹(sf(x)) = x for 0 ≤ x ≤ 37, to 1e-13 relative', () => {
    expectNoMismatches(
      grid.flatMap((x) => {
        const tol = { relative: 1e-13, absolute: 1e-15 };
        return x <= 0
          ? [mismatch(`normalQuantile(normalCdf(${x}))`, normalQuantile(normalCdf(x)), x, tol)]
          : [mismatch(`-normalQuantile(normalSf(${x}))`, -normalQuantile(normalSf(x)), x, tol)];
      }),
    );
  });

  it('Φ⁻¹(Φ(x)) = x for 0 < x ≤ 5, within the rounding of Φ(x) near 1', () => {
    // Φ(x) carries an absolute error of up to ε/2 near 1, worth ε/(2φ(x)) in x.
    expectNoMismatches(
      grid
        .filter((x) => x > 0 && x <= 5)
        .map((x) =>
          mismatch(`normalQuantile(normalCdf(${x}))`, normalQuantile(normalCdf(x)), x, {
            relative: 1e-13,
            absolute: (2 * EPS) / normalPdf(x),
          }),
        ),
    );
  });

  it('Φ(Φ⁻¹(p)) = p for 1e-300 < p < 0.5, to 1e-13 relative plus Φ’s amplification', () => {
    // A relative error δ in z becomes about z²·δ in Φ(z) in the lower tail; δ ≤ 1e-15.
    expectNoMismatches(
      fixture.quantile
        .filter(({ p }) => p > TINY && p < 0.5)
        .map(({ p }) => {
          const z = normalQuantile(p);
          return mismatch(`normalCdf(normalQuantile(${p}))`, normalCdf(z), p, {
            relative: 1e-13 + 1e-15 * z * z,
          });
        }),
    );
  });
});
