import { describe, expect, it } from 'vitest';
import fixture from './fixtures/random.json';
import { bernoulli, chiSquare, gamma, poisson, standardisedLogNormal, standardisedLogNormalScale, studentT } from './random';
import { Rng } from './rng';
import { expectWithinMcse, sampleMoments } from './test-helpers';

/**
 * Goodness of fit against SciPy: `fixtures/random.json`, written by
 * `fixtures/generate_random.py` (SciPy version in the file). Each case draws 100,000 deviates
 * from a fixed stream, counts them in bins of known probability and compares Pearson's χ² with
 * the upper 0.1% point; sample means are compared within 3 MC SE.
 */
const N = 100_000;

function pearson(counts: number[], probabilities: number[], n: number): number {
  return counts.reduce((s, c, i) => s + (c - n * probabilities[i]!) ** 2 / (n * probabilities[i]!), 0);
}

function sampler(row: (typeof fixture.continuous)[number]): (rng: Rng) => number {
  switch (row.distribution) {
    case 'normal':
      return (rng) => rng.normal();
    case 'gamma':
      return (rng) => gamma(rng, row.shape!);
    case 'chiSquare':
      return (rng) => chiSquare(rng, row.df!);
    case 'studentT':
      return (rng) => studentT(rng, row.df!);
    case 'standardisedLogNormal': {
      const scale = standardisedLogNormalScale(row.sigma!);
      return (rng) => standardisedLogNormal(rng, scale);
    }
    default:
      throw new Error(`no sampler for ${row.distribution}`);
  }
}

describe.each(fixture.continuous.map((row) => [`${row.distribution} ${JSON.stringify(row).match(/"(shape|df|sigma)":[\d.]+/)?.[0] ?? ''}`, row] as const))(
  '%s',
  (label, row) => {
    const rng = Rng.fromKey(`goodness of fit ${label}`);
    const draw = sampler(row);
    const sample = Float64Array.from({ length: N }, () => draw(rng));

    it('fits SciPy’s deciles (Pearson χ² below the 0.1% point)', () => {
      const counts = new Array<number>(10).fill(0);
      for (const x of sample) {
        let bin = 0;
        while (bin < 9 && x > row.edges[bin]!) bin++;
        counts[bin]!++;
      }
      const chi2 = pearson(counts, row.probabilities, N);
      expect(chi2 < row.critical, `${label}: counts ${counts.join(', ')}, χ² ${chi2.toFixed(2)}, critical ${row.critical.toFixed(2)}`).toBe(true);
    });

    it('has SciPy’s mean (within 3 MC SE) where the variance is finite', () => {
      if (!Number.isFinite(row.variance)) return;
      expectWithinMcse(`${label} mean`, sampleMoments(sample).mean, row.mean, Math.sqrt(row.variance / N));
    });
  },
);

describe.each(fixture.poisson.map((row) => [row.mean, row] as const))('Poisson mean %s', (mean, row) => {
  const rng = Rng.fromKey(`goodness of fit poisson ${mean}`);
  const sample = Float64Array.from({ length: N }, () => poisson(rng, mean));

  it('fits SciPy’s probabilities (Pearson χ² below the 0.1% point)', () => {
    const counts = new Array<number>(row.lower.length).fill(0);
    for (const k of sample) {
      let bin = 0;
      while (bin < row.lower.length - 1 && k >= row.lower[bin + 1]!) bin++;
      counts[bin]!++;
    }
    const chi2 = pearson(counts, row.probabilities, N);
    expect(chi2 < row.critical, `Poisson(${mean}): ${row.lower.length} bins, χ² ${chi2.toFixed(2)}, critical ${row.critical.toFixed(2)}`).toBe(true);
    expect(sample.every((k) => Number.isInteger(k) && k >= 0)).toBe(true);
  });

  it('has mean μ and variance μ (within 3 MC SE)', () => {
    const { mean: m, variance } = sampleMoments(sample);
    expectWithinMcse(`Poisson(${mean}) mean`, m, mean, Math.sqrt(row.variance / N));
    // Var(S²) ≈ (μ₄ − σ⁴)/N with μ₄ = μ(1 + 3μ) for the Poisson distribution.
    expectWithinMcse(`Poisson(${mean}) variance`, variance, mean, Math.sqrt((mean * (1 + 3 * mean) - mean * mean) / N));
  });
});

describe('edge cases and bad input', () => {
  const rng = Rng.fromKey('edges');
  it('Poisson(0) is 0; Bernoulli(0) is 0 and Bernoulli(1) is 1', () => {
    expect(poisson(rng, 0)).toBe(0);
    expect(bernoulli(rng, 0)).toBe(0);
    expect(bernoulli(rng, 1)).toBe(1);
  });

  it('Bernoulli(0.3) has mean 0.3 (100,000 draws, within 3 MC SE)', () => {
    let sum = 0;
    for (let i = 0; i < N; i++) sum += bernoulli(rng, 0.3);
    expectWithinMcse('Bernoulli(0.3) mean', sum / N, 0.3, Math.sqrt(0.21 / N));
  });

  it.each([
    ['gamma shape 0', () => gamma(rng, 0), /gamma shape must be a positive finite number, got 0/],
    ['gamma shape NaN', () => gamma(rng, NaN), /gamma shape must be a positive finite number, got NaN/],
    ['t with 0 df', () => studentT(rng, 0), /t degrees of freedom must be positive, got 0/],
    ['Poisson mean −1', () => poisson(rng, -1), /Poisson mean must be between 0 and 1e9, got -1/],
    ['Poisson mean NaN', () => poisson(rng, NaN), /Poisson mean must be between 0 and 1e9, got NaN/],
    ['log-normal σ 0', () => standardisedLogNormalScale(0), /log-normal sigma must be positive, got 0/],
  ])('%s throws a RangeError', (_case, call, message) => {
    expect(call).toThrow(RangeError);
    expect(call).toThrow(message);
  });
});
