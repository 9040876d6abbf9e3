import 'server-only';
import bcrypt from 'bcryptjs';
import { dictionary } from '@zxcvbn-ts/language-common';

/**
 * Password hashing with bcrypt (cost 10, about 130 ms here) and a check against a shipped list
 * of 49,000 passwords common in breach corpora (@zxcvbn-ts/language-common).
 */
const COST = 10;

let common: Set<string> | undefined;

export function isCommonPassword(password: string): boolean {
  common ??= new Set((dictionary['passwords-common'] as string[]).map((p) => p.toLowerCase()));
  const lower = password.toLowerCase();
  if (common.has(lower)) return true;
  // A single repeated character or a plain run of digits is as weak as a listed password.
  return /^(.)\1+$/.test(password) || /^\d+$/.test(password);
}

export const COMMON_PASSWORD_MESSAGE =
  'This password appears in lists of commonly used or breached passwords. Choose another one.';

export function hashPassword(password: string): Promise<string> {
  return bcrypt.hash(password, COST);
}

export function verifyPassword(password: string, hash: string): Promise<boolean> {
  return bcrypt.compare(password, hash);
}

/** A hash to compare against when the account does not exist, so timing does not reveal it. */
let dummyHash: Promise<string> | undefined;
export async function burnComparison(password: string): Promise<void> {
  dummyHash ??= bcrypt.hash('unitwise-timing-equaliser', COST);
  await bcrypt.compare(password, await dummyHash);
}
