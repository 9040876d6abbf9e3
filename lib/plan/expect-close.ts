import { expect } from 'vitest';

/** Test helper: passes when |got − expected| ≤ relative·|expected|; the message prints inputs, expected, got, difference and tolerance. */
export function expectRelativelyClose(input: string, got: number, expected: number, relative: number): void {
  const difference = Math.abs(got - expected);
  const tolerance = relative * Math.abs(expected);
  expect(
    difference <= tolerance,
    `${input}: expected ${expected}, got ${got}, difference ${difference.toExponential(3)}, tolerance ${tolerance.toExponential(3)} (relative ${relative})`,
  ).toBe(true);
}
