import { describe, expect, it } from 'vitest';
import { brentRoot, expandBracket } from './root';
import { expectNoMismatches, mismatch } from './test-helpers';

describe('brentRoot', () => {
  it.each([
    ['x² − 2', (x: number) => x * x - 2, 0, 2, Math.SQRT2],
    ['cos x − x', (x: number) => Math.cos(x) - x, 0, 1, 0.7390851332151607],
    ['e^x − 10', (x: number) => Math.exp(x) - 10, -5, 5, Math.log(10)],
    ['x³ (triple root)', (x: number) => x * x * x, -1, 2, 0],
    ['step at 0.3', (x: number) => (x < 0.3 ? -1 : 1), 0, 1, 0.3],
  ])('finds the root of %s to full precision', (_name, f, lo, hi, root) => {
    expectNoMismatches([mismatch(`${_name}`, brentRoot(f, lo, hi), root, { relative: 1e-14, absolute: 1e-15 })]);
  });

  it('needs few evaluations on a smooth function', () => {
    let calls = 0;
    brentRoot(
      (x) => {
        calls++;
        return Math.exp(x) - 1 - 2 * x;
      },
      1,
      3,
    );
    expect(calls).toBeLessThan(15);
  });

  it('stops at the requested x tolerance', () => {
    const x = brentRoot((v) => v - 1 / 3, 0, 1, { xTolerance: 1e-3 });
    expect(Math.abs(x - 1 / 3)).toBeLessThan(1e-3);
  });

  it('returns an endpoint that is itself a root', () => {
    expect(brentRoot((x) => x - 1, 1, 5)).toBe(1);
    expect(brentRoot((x) => x - 5, 1, 5)).toBe(5);
  });

  it('throws a RangeError when the ends do not bracket a root', () => {
    expect(() => brentRoot((x) => x * x + 1, -1, 1)).toThrow(RangeError);
    expect(() => brentRoot(() => NaN, 0, 1)).toThrow(RangeError);
    expect(() => brentRoot((x) => x, -Infinity, 1)).toThrow(RangeError);
  });
});

describe('expandBracket', () => {
  it('widens an interval until the sign changes', () => {
    const bracket = expandBracket((x) => x - 100, 0, 1)!;
    expect(bracket.lo).toBeLessThanOrEqual(100);
    expect(bracket.hi).toBeGreaterThanOrEqual(100);
    expect(brentRoot((x) => x - 100, bracket.lo, bracket.hi)).toBe(100);
  });

  it('respects the limits and gives up without a sign change', () => {
    const bracket = expandBracket((x) => x + 5, 1, 2, { min: 0 });
    expect(bracket).toBeNull();
    expect(expandBracket((x) => x * x + 1, -1, 1)).toBeNull();
  });
});
