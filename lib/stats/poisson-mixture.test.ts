import { describe, expect, it } from 'vitest';
import { logBetaPrefactor, logIncompleteBetaXY } from './incomplete-beta';
import { poissonMixture, type MixtureTerms } from './poisson-mixture';
import { logPoissonDensity } from './saddle-point';
import { expectNoMismatches, mismatch } from './test-helpers';

/** Σⱼ wⱼ I_x(a₀ + j, b) (lower) or Σⱼ wⱼ I_y(b, a₀ + j) (upper), as noncentral-f.ts builds it. */
function betaTerms(x: number, a0: number, b: number, lambda: number, upper: boolean): MixtureTerms {
  const y = 1 - x;
  return {
    lambda,
    shift: 0,
    increasing: upper,
    logTail: (j) => (upper ? logIncompleteBetaXY(y, x, b, a0 + j) : logIncompleteBetaXY(x, y, a0 + j, b)),
    logStep: (j) => logBetaPrefactor(x, y, a0 + j, b) - Math.log(a0 + j),
    stepRatio: (j) => (x * (a0 + j + b)) / (a0 + j + 1),
  };
}

/** The same sum term by term, in logs (slow but independent of the recurrences). */
function bruteForce(terms: MixtureTerms, jMax: number): number {
  const logs: number[] = [];
  for (let j = 0; j <= jMax; j++) logs.push(logPoissonDensity(j + terms.shift, terms.lambda) + terms.logTail(j));
  const top = Math.max(...logs);
  return Math.exp(top + Math.log(logs.reduce((s, l) => s + Math.exp(l - top), 0)));
}

describe('poissonMixture', () => {
  it.each([
    [0.5, 0.5, 0.5, 1012.5, false],
    [0.3, 2.5, 10, 50, false],
    [0.3, 2.5, 10, 50, true],
    [0.9, 1, 3, 2000, true],
    [0.05, 0.5, 20, 3, false],
  ])('matches the term-by-term sum (x = %s, a₀ = %s, b = %s, λ = %s, upper = %s)', (x, a0, b, lambda, upper) => {
    const terms = betaTerms(x, a0, b, lambda, upper);
    const expected = bruteForce(terms, Math.ceil(lambda + 60 * Math.sqrt(lambda) + 200));
    expectNoMismatches([mismatch(`mixture(${x}, ${a0}, ${b}, ${lambda}, ${upper})`, poissonMixture(terms), expected, { relative: 1e-12 })]);
  });

  it('keeps tiny sums far below the term at the Poisson mode (here about 3e-222)', () => {
    const value = poissonMixture(betaTerms(0.5, 0.5, 0.5, 1012.5, false));
    expect(value).toBeGreaterThan(1e-223);
    expect(value).toBeLessThan(1e-221);
  });

  it('sums the weights to 1 when every B is 1', () => {
    for (const lambda of [0.01, 2, 700, 5000]) {
      const total = poissonMixture({ lambda, shift: 0, increasing: true, logTail: () => 0, logStep: () => -Infinity, stepRatio: () => 1 });
      expectNoMismatches([mismatch(`Σ w (λ = ${lambda})`, total, 1, { absolute: 1e-13 })]);
    }
  });
});
