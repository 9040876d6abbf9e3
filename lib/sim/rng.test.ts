import { describe, expect, it } from 'vitest';
import { Rng } from './rng';
import { expectWithinMcse, sampleMoments } from './test-helpers';

function draw(rng: Rng, count: number, what: 'uniform' | 'normal'): number[] {
  return Array.from({ length: count }, () => (what === 'uniform' ? rng.uniform() : rng.normal()));
}

/** Pearson correlation of two equally long samples. */
function correlation(x: number[], y: number[]): number {
  const mx = sampleMoments(x).mean;
  const my = sampleMoments(y).mean;
  let sxy = 0;
  let sxx = 0;
  let syy = 0;
  x.forEach((xi, i) => {
    sxy += (xi - mx) * (y[i]! - my);
    sxx += (xi - mx) ** 2;
    syy += (y[i]! - my) ** 2;
  });
  return sxy / Math.sqrt(sxx * syy);
}

describe('Rng streams', () => {
  it('gives the same sequence for the same (seed, scenario, hypothesis, replicate)', () => {
    const a = draw(Rng.forReplicate(42, 'none', 'alternative', 7), 50, 'normal');
    const b = draw(Rng.forReplicate(42, 'none', 'alternative', 7), 50, 'normal');
    expect(b).toEqual(a);
  });

  it.each([
    ['another seed', Rng.forReplicate(43, 'none', 'alternative', 7)],
    ['another scenario', Rng.forReplicate(42, 'skewed', 'alternative', 7)],
    ['the null run', Rng.forReplicate(42, 'none', 'null', 7)],
    ['another replicate', Rng.forReplicate(42, 'none', 'alternative', 8)],
  ])('gives a different sequence for %s', (_case, other) => {
    const a = draw(Rng.forReplicate(42, 'none', 'alternative', 7), 20, 'uniform');
    const b = draw(other, 20, 'uniform');
    expect(b.filter((v, i) => v === a[i])).toEqual([]);
  });

  it('saves and restores its state mid-stream, including a pending polar-method deviate', () => {
    const rng = Rng.forReplicate(1, 'none', 'alternative', 0);
    draw(rng, 7, 'uniform');
    rng.normal(); // leaves the pair's second deviate pending
    const saved = JSON.parse(JSON.stringify(rng.state()));
    expect(saved.spareNormal).not.toBeNull();
    const ahead = [...draw(rng, 5, 'normal'), ...draw(rng, 5, 'uniform')];
    const restored = Rng.restore(saved);
    expect([...draw(restored, 5, 'normal'), ...draw(restored, 5, 'uniform')]).toEqual(ahead);
  });

  it.each([
    [-1, 0, /seed must be a non-negative whole number, got -1/],
    [1.5, 0, /seed must be a non-negative whole number, got 1.5/],
    [1, -3, /replicate must be a non-negative whole number, got -3/],
  ])('refuses seed %s, replicate %s', (seed, replicate, message) => {
    expect(() => Rng.forReplicate(seed, 'none', 'alternative', replicate)).toThrow(message);
  });

  it('draws uniforms on (0, 1) with mean 1/2 and variance 1/12 (100,000 draws, within 3 MC SE)', () => {
    const u = draw(Rng.fromKey('uniform moments'), 100_000, 'uniform');
    expect(u.every((v) => v > 0 && v < 1)).toBe(true);
    const { mean, variance, n } = sampleMoments(u);
    expectWithinMcse('mean of U(0,1)', mean, 0.5, Math.sqrt(1 / 12 / n));
    // Var(S²) for U(0,1): (μ₄ − σ⁴)/n with μ₄ = 1/80, σ⁴ = 1/144.
    expectWithinMcse('variance of U(0,1)', variance, 1 / 12, Math.sqrt((1 / 80 - 1 / 144) / n));
  });

  it('gives uncorrelated streams to adjacent replicates and to the paired null run (|r| within 3 SE of 0)', () => {
    const here: number[] = [];
    const next: number[] = [];
    const paired: number[] = [];
    for (let r = 0; r < 200; r++) {
      here.push(...draw(Rng.forReplicate(2026, 'none', 'alternative', r), 250, 'normal'));
      next.push(...draw(Rng.forReplicate(2026, 'none', 'alternative', r + 1), 250, 'normal'));
      paired.push(...draw(Rng.forReplicate(2026, 'none', 'null', r), 250, 'normal'));
    }
    const se = 1 / Math.sqrt(here.length);
    expectWithinMcse('corr(replicate r, replicate r + 1)', correlation(here, next), 0, se);
    expectWithinMcse('corr(alternative r, null r)', correlation(here, paired), 0, se);
  });
});
