import { expect } from 'vitest';

/**
 * Comparison helpers for the numerical tests of lib/stats: every failure lists the inputs, the
 * expected and computed values, their difference and the tolerance that was exceeded.
 */

export interface Tolerance {
  relative?: number;
  absolute?: number;
}

export interface Mismatch {
  input: string;
  expected: number;
  got: number;
  difference: number;
  tolerance: number;
}

/** Below this, reference values are subnormal or underflow: compare absolutely. */
export const TINY = 1e-300;

/** Allowed |got − expected|: the larger of the relative and the absolute tolerance. */
export function allowed(expected: number, { relative = 0, absolute = 0 }: Tolerance): number {
  return Math.max(relative * Math.abs(expected), absolute);
}

/** null when |got − expected| is within tolerance (equal infinities and two NaNs match). */
export function mismatch(input: string, got: number, expected: number, tol: Tolerance): Mismatch | null {
  if (got === expected || (Number.isNaN(got) && Number.isNaN(expected))) return null;
  const difference = Math.abs(got - expected);
  const tolerance = allowed(expected, tol);
  return difference <= tolerance ? null : { input, expected, got, difference, tolerance };
}

/** Fails with every mismatch listed (the first 20): input, expected, got, difference, tolerance. */
export function expectNoMismatches(mismatches: (Mismatch | null)[]): void {
  const found = mismatches.filter((m): m is Mismatch => m !== null);
  const report = found
    .slice(0, 20)
    .map(
      (m) =>
        `${m.input}: expected ${m.expected}, got ${m.got}, difference ${m.difference.toExponential(3)}, ` +
        `tolerance ${m.tolerance.toExponential(3)}`,
    )
    .join('\n');
  expect(found.length, `${found.length} value(s) outside tolerance:\n${report}`).toBe(0);
}

/** A relative tolerance where the value exceeds 1e-300, plus an absolute floor. */
export function tailTolerance(expected: number, relative: number, absolute = TINY): Tolerance {
  return Math.abs(expected) > TINY ? { relative, absolute } : { absolute: Math.max(absolute, TINY) };
}

/** The largest |got − expected| / |expected| over the pairs with |expected| > 1e-300. */
export function largestRelativeError(pairs: [got: number, expected: number][]): number {
  let worst = 0;
  for (const [got, expected] of pairs) {
    if (Math.abs(expected) > TINY) worst = Math.max(worst, Math.abs(got - expected) / Math.abs(expected));
  }
  return worst;
}
