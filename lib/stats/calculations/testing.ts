/**
 * Shorthands for the calculations' tests on top of lib/stats/test-helpers.ts: a relative
 * tolerance, an exact match for whole sizes, a single relative comparison, and a request that
 * must be refused. Failures print the inputs, expected and got values, the difference and the
 * tolerance.
 */
import { expect } from 'vitest';
import { expectNoMismatches, mismatch, type Mismatch } from '@/lib/stats/test-helpers';
import { calculationSchema } from './request';
import { CalculationInputError } from './errors';
import { calculate } from './index';

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

/** Parses and runs a request as the API does. */
export function run(input: Record<string, unknown>) {
  return calculate(calculationSchema.parse(input));
}

/** Runs and expects a CalculationInputError whose fields include `field` and whose message matches. */
export function expectInputError(input: Record<string, unknown>, field: string, message: RegExp): void {
  let caught: unknown;
  try {
    run(input);
  } catch (error) {
    caught = error;
  }
  expect(caught, `${JSON.stringify(input)} should throw`).toBeInstanceOf(CalculationInputError);
  const error = caught as CalculationInputError;
  expect(error.message).toMatch(message);
  expect(Object.keys(error.fields)).toContain(field);
}
