/**
 * Test data for the end-to-end specs: unique e-mail addresses per run, passwords that pass the
 * app's breached-password check, and a distinct client address per spec.
 */
import { randomBytes } from 'node:crypto';

export const APP_ORIGIN = 'http://localhost:3100';

/** Not in the common-password list, long enough for the sign-up rules. */
export const STRONG_PASSWORD = 'Harbor-Lantern-Quill-47';
export const OTHER_STRONG_PASSWORD = 'Maple-Orbit-Tundra-83';

const runId = `${Date.now().toString(36)}${randomBytes(2).toString('hex')}`;
let counter = 0;

/** A lower-case address no other test or run uses, e.g. `owner.lx2k3a9f1b.1@unitwise.test`. */
export function uniqueEmail(label: string): string {
  counter += 1;
  return `${label}.${runId}.${counter}@unitwise.test`.toLowerCase();
}

/**
 * The app rate-limits sign-ups and resets per client address (lib/rate-limit.ts, last entry of
 * X-Forwarded-For). Every spec presents its own address so that the specs do not share one
 * allowance; each spec stays well below the unscaled limits on its own.
 */
export function distinctClientHeaders(): Record<string, string> {
  const b = randomBytes(3);
  return { 'x-forwarded-for': `10.${b[0]}.${b[1]}.${(b[2]! % 250) + 2}` };
}
