/**
 * Shorthands for the calculations' tests on top of lib/stats/test-helpers.ts: a relative
 * tolerance, an exact match for whole sizes, and a single relative comparison. Failures print
 * the inputs, expected and got values, the difference and the tolerance.
 */
import { expectNoMismatches, mismatch, type Mismatch } from '@/lib/stats/test-helpers';

export { expectNoMismatches, type Mismatch };

/** null when |got − expected| ≤ relative·|expected|, else what missed and by how much. */
export function relativeMismatch(input: string, got: number, expected: number, relative: number): Mismatch | null {
  return mismatch(input, got, expected, { relative });
}

/** null when got === expected (whole sizes), else the mismatch. */
export function exactMismatch(input: string, got: number, expected: number): Mismatch | null {
  return mismatch(input, got, expected, {});
}

export function expectRelativelyClose(input: string, got: number, expected: number, relative: number): void {
  expectNoMismatches([relativeMismatch(input, got, expected, relative)]);
}
