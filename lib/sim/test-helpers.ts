/**
 * Assertions shared by the simulation tests: Monte Carlo comparisons state how many Monte Carlo
 * SEs they allow, and every failure prints the inputs, expected, got, difference and tolerance.
 */
import { expect } from 'vitest';
import { expectNoMismatches, mismatch } from '@/lib/stats/test-helpers';

/** Passes when |got − expected| ≤ k·mcse (a Monte Carlo comparison at k standard errors). */
export function expectWithinMcse(input: string, got: number, expected: number, mcse: number, k = 3): void {
  const difference = Math.abs(got - expected);
  const tolerance = k * mcse;
  expect(
    difference <= tolerance,
    `${input}: expected ${expected}, got ${got}, difference ${difference.toExponential(3)}, ` +
      `tolerance ${tolerance.toExponential(3)} (${k} Monte Carlo SE of ${mcse.toExponential(3)})`,
  ).toBe(true);
}

/** Passes when |got − expected| ≤ relative·|expected| (lib/stats's helpers print the failure). */
export function expectRelativelyClose(input: string, got: number, expected: number, relative: number): void {
  expectNoMismatches([mismatch(input, got, expected, { relative })]);
}

/** Mean and (n − 1)-denominator variance, by the two-pass method. */
export function sampleMoments(values: ArrayLike<number>): { mean: number; variance: number; n: number } {
  const n = values.length;
  let sum = 0;
  for (let i = 0; i < n; i++) sum += values[i]!;
  const mean = sum / n;
  let ss = 0;
  for (let i = 0; i < n; i++) ss += (values[i]! - mean) ** 2;
  return { mean, variance: ss / (n - 1), n };
}
