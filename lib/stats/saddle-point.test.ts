import { describe, expect, it } from 'vitest';
import { logGamma } from './log-gamma';
import { devianceTerm, logPoissonDensity } from './saddle-point';
import { expectNoMismatches, mismatch } from './test-helpers';

describe('devianceTerm', () => {
  it('equals x log(x/m) + m − x where that has no cancellation', () => {
    expectNoMismatches(
      [
        [1, 5],
        [10, 3],
        [0.5, 40],
        [1e5, 2e5],
      ].map(([x, m]) => mismatch(`bd0(${x}, ${m})`, devianceTerm(x!, m!), x! * Math.log(x! / m!) + m! - x!, { relative: 1e-14 })),
    );
  });

  it('keeps its relative precision when x ≈ m (series: (x − m)²/(2m) to leading order)', () => {
    const m = 1e6;
    const x = m + 1;
    // bd0 = x log(1 + 1/m) − 1 = 1/(2m) − 1/(6m²) + …
    expectNoMismatches([mismatch('bd0(1e6 + 1, 1e6)', devianceTerm(x, m), 1 / (2 * m) - 1 / (6 * m * m), { relative: 1e-12 })]);
    expect(devianceTerm(5, 5)).toBe(0);
    expect(devianceTerm(0, 7)).toBe(7);
  });
});

describe('logPoissonDensity', () => {
  it('is −m at count 0 and matches the log-gamma formula at moderate counts', () => {
    expect(logPoissonDensity(0, 3.5)).toBe(-3.5);
    expectNoMismatches(
      [
        [1, 2],
        [7, 7.5],
        [2.5, 10],
        [30, 12],
      ].map(([a, m]) =>
        mismatch(`logPois(${a}; ${m})`, logPoissonDensity(a!, m!), a! * Math.log(m!) - m! - logGamma(a! + 1), { absolute: 1e-13 }),
      ),
    );
  });

  it('sums to 1 over the integers, also for large means', () => {
    for (const m of [0.3, 3.7, 250, 5000]) {
      let sum = 0;
      for (let j = 0; j < m + 50 * Math.sqrt(m) + 100; j++) sum += Math.exp(logPoissonDensity(j, m));
      expectNoMismatches([mismatch(`Σ Poisson(j; ${m})`, sum, 1, { absolute: 1e-13 })]);
    }
  });
});
