/**
 * Single-use tokens sent by e-mail (verification, password reset, invitations). The link holds
 * 32 random bytes; the database holds only their SHA-256, so a copy of the database cannot be
 * turned into working links.
 */
import { createHash, randomBytes } from 'node:crypto';

export function newToken(): { token: string; hash: string } {
  const token = randomBytes(32).toString('base64url');
  return { token, hash: hashToken(token) };
}

export function hashToken(token: string): string {
  return createHash('sha256').update(token).digest('hex');
}

export const TOKEN_LIFETIME = {
  verifyEmailHours: 24,
  resetPasswordMinutes: 60,
  invitationDays: 7,
} as const;
