import { describe, expect, it } from 'vitest';
import {
  designEffect,
  effectiveSampleSize,
  multilevelDesignEffect,
  naiveTypeIError,
} from './design-effect';
import fixture from './fixtures/design_effect.json';

/**
 * Reference values: `fixtures/design_effect.json`, written by
 * `fixtures/generate_design_effect.py` with Debian's SciPy (version in the file's header).
 */

/** Passes when |got − expected| ≤ relative·|expected|; the message says by how much it missed. */
function expectRelativelyClose(input: string, got: number, expected: number, relative: number): void {
  const difference = Math.abs(got - expected);
  const tolerance = relative * Math.abs(expected);
  expect(
    difference <= tolerance,
    `${input}: expected ${expected}, got ${got}, difference ${difference.toExponential(3)}, ` +
      `tolerance ${tolerance.toExponential(3)} (relative ${relative})`,
  ).toBe(true);
}

describe('designEffect', () => {
  it('is Kish’s 1 + (m − 1)·ICC with equal cluster sizes: m = 25, ICC = 0.15 → 4.6', () => {
    expectRelativelyClose('designEffect(m 25, ICC 0.15)', designEffect({ clusterSize: 25, icc: 0.15 }), 4.6, 1e-15);
  });

  it('adds cv²·m·ICC for unequal cluster sizes: cv = 0.25 → 4.6 + 0.0625·25·0.15', () => {
    const got = designEffect({ clusterSize: 25, icc: 0.15, cv: 0.25 });
    expectRelativelyClose('designEffect(m 25, ICC 0.15, cv 0.25)', got, 4.6 + 0.0625 * 25 * 0.15, 1e-15);
    expectRelativelyClose('the same, by hand', got, 4.834375, 1e-15);
  });

  it.each([
    [{ clusterSize: 25, icc: 0 }, 1],
    [{ clusterSize: 25, icc: 0, cv: 0.7 }, 1],
    [{ clusterSize: 1, icc: 0.15 }, 1],
    [{ clusterSize: 1, icc: 1 }, 1],
    [{ clusterSize: 30, icc: 1 }, 30],
  ])('%j → %s', (input, expected) => expect(designEffect(input)).toBe(expected));

  it.each([
    ['ICC below 0', { clusterSize: 25, icc: -0.01 }, /icc must be between 0 and 1, got -0.01/],
    ['ICC above 1', { clusterSize: 25, icc: 1.5 }, /icc must be between 0 and 1, got 1.5/],
    ['m below 1', { clusterSize: 0.5, icc: 0.1 }, /clusterSize must be at least 1, got 0.5/],
    ['negative cv', { clusterSize: 25, icc: 0.1, cv: -0.2 }, /cv must not be negative, got -0.2/],
    ['m NaN', { clusterSize: NaN, icc: 0.1 }, /clusterSize must be a finite number, got NaN/],
    ['m infinite', { clusterSize: Infinity, icc: 0.1 }, /clusterSize must be a finite number, got Infinity/],
    ['ICC NaN', { clusterSize: 25, icc: NaN }, /icc must be a finite number, got NaN/],
    ['cv infinite', { clusterSize: 25, icc: 0.1, cv: Infinity }, /cv must be a finite number, got Infinity/],
  ])('%s throws a RangeError', (_case, input, message) => {
    expect(() => designEffect(input)).toThrow(RangeError);
    expect(() => designEffect(input)).toThrow(message);
  });
});

describe('effectiveSampleSize', () => {
  it('is N / DE: 1000 pupils with DE 4.6 count as about 217 independent ones', () => {
    expectRelativelyClose('effectiveSampleSize(1000, 4.6)', effectiveSampleSize(1000, 4.6), 1000 / 4.6, 1e-15);
    expect(effectiveSampleSize(1000, 1)).toBe(1000);
    expect(effectiveSampleSize(0, 2)).toBe(0);
  });

  it.each([
    [-1, 2, /totalObservations must not be negative, got -1/],
    [NaN, 2, /totalObservations must be a finite number, got NaN/],
    [100, 0, /designEffect must be positive, got 0/],
    [100, -2, /designEffect must be positive, got -2/],
    [100, Infinity, /designEffect must be a finite number, got Infinity/],
  ])('(N %s, DE %s) throws a RangeError', (n, de, message) => {
    expect(() => effectiveSampleSize(n, de)).toThrow(RangeError);
    expect(() => effectiveSampleSize(n, de)).toThrow(message);
  });
});

describe('naiveTypeIError', () => {
  it.each(fixture.naiveTypeIError.map((r) => [r.designEffect, r.alpha, r.naiveTypeIError] as const))(
    'DE %s, α %s → %s (SciPy), to 1e-13 relative',
    (de, alpha, expected) => {
      const got = naiveTypeIError({ designEffect: de, alpha });
      expectRelativelyClose(`naiveTypeIError(DE ${de}, α ${alpha})`, got, expected, 1e-13);
    },
  );

  it('m = 25, ICC = 0.15: a naive test at α = 0.05 rejects a true null 36% of the time', () => {
    const got = naiveTypeIError({ designEffect: designEffect({ clusterSize: 25, icc: 0.15 }) });
    // 2·(1 − Φ(1.959964/√4.6)) = 2·(1 − Φ(0.913840)) ≈ 0.360802 (SciPy 1.10.1: 0.36080201798720424).
    expectRelativelyClose('naiveTypeIError(DE 4.6)', got, 0.36080201798720424, 1e-13);
  });

  it.each([0.05, 0.01, 0.001, 1e-8, 0.5])('with no clustering (ICC 0, DE 1) equals α = %s', (alpha) => {
    const de = designEffect({ clusterSize: 25, icc: 0 });
    expectRelativelyClose(`naiveTypeIError(DE 1, α ${alpha})`, naiveTypeIError({ designEffect: de, alpha }), alpha, 1e-14);
  });

  it('defaults to α = 0.05 and grows with DE towards 1', () => {
    expect(naiveTypeIError({ designEffect: 4.6 })).toBe(naiveTypeIError({ designEffect: 4.6, alpha: 0.05 }));
    const rates = [1, 2, 10, 100, 1e6].map((de) => naiveTypeIError({ designEffect: de }));
    rates.slice(1).forEach((rate, i) => expect(rate).toBeGreaterThan(rates[i]!));
    expect(rates.at(-1)).toBeGreaterThan(0.998);
  });

  it.each([
    ['DE 0', { designEffect: 0 }, /designEffect must be positive, got 0/],
    ['DE NaN', { designEffect: NaN }, /designEffect must be a finite number, got NaN/],
    ['α 0', { designEffect: 2, alpha: 0 }, /alpha must be between 0 and 1, got 0/],
    ['α 1', { designEffect: 2, alpha: 1 }, /alpha must be between 0 and 1, got 1/],
    ['α NaN', { designEffect: 2, alpha: NaN }, /alpha must be a finite number, got NaN/],
  ])('%s throws a RangeError', (_case, input, message) => {
    expect(() => naiveTypeIError(input)).toThrow(RangeError);
    expect(() => naiveTypeIError(input)).toThrow(message);
  });
});

describe('multilevelDesignEffect', () => {
  it.each([
    [25, 0.15],
    [1, 0.3],
    [8, 0],
    [12.5, 0.04],
    [200, 1],
  ])('with one level reduces to Kish: m = %s, ICC = %s', (m, icc) => {
    expect(multilevelDesignEffect([{ observationsPerUnit: m, icc }])).toBe(designEffect({ clusterSize: m, icc }));
  });

  it('adds the levels: 4 leaves per plant (ICC 0.3), 40 leaves per tray (ICC 0.1) → 1 + 3·0.3 + 39·0.1', () => {
    const levels = [
      { observationsPerUnit: 4, icc: 0.3 },
      { observationsPerUnit: 40, icc: 0.1 },
    ];
    expectRelativelyClose('multilevelDesignEffect(plants, trays)', multilevelDesignEffect(levels), 5.8, 1e-15);
    expect(multilevelDesignEffect([...levels].reverse())).toBe(multilevelDesignEffect(levels));
  });

  it('is 1 with no grouping levels', () => expect(multilevelDesignEffect([])).toBe(1));

  it.each([
    ['m below 1', [{ observationsPerUnit: 0, icc: 0.1 }], /levels\[0\]\.observationsPerUnit must be at least 1, got 0/],
    ['m NaN', [{ observationsPerUnit: NaN, icc: 0.1 }], /levels\[0\]\.observationsPerUnit must be a finite number, got NaN/],
    [
      'a negative ICC',
      [{ observationsPerUnit: 4, icc: 0.1 }, { observationsPerUnit: 40, icc: -0.1 }],
      /levels\[1\]\.icc must be between 0 and 1, got -0.1/,
    ],
    [
      'ICCs summing above 1',
      [{ observationsPerUnit: 4, icc: 0.7 }, { observationsPerUnit: 40, icc: 0.6 }],
      /must sum to at most 1, got 1\.3$/,
    ],
  ])('%s throws a RangeError', (_case, levels, message) => {
    expect(() => multilevelDesignEffect(levels)).toThrow(RangeError);
    expect(() => multilevelDesignEffect(levels)).toThrow(message);
  });
});
