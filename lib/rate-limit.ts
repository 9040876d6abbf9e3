/**
 * Fixed-window rate limits kept in PostgreSQL, so that every app process shares one count.
 * One upsert per attempt: a row per key holds the start of its window and the attempts in it.
 */
import { sql, type Kysely } from 'kysely';
import type { Database } from '@/db/schema';
import { AppError } from './errors';

export interface Limit {
  /** Attempts allowed per window. */
  limit: number;
  windowSeconds: number;
}

export const LIMITS = {
  signInPerEmail: { limit: 10, windowSeconds: 15 * 60 },
  signInPerIp: { limit: 50, windowSeconds: 15 * 60 },
  signUpPerIp: { limit: 5, windowSeconds: 60 * 60 },
  magicLinkPerEmail: { limit: 5, windowSeconds: 60 * 60 },
  resetPerEmail: { limit: 5, windowSeconds: 60 * 60 },
  resetPerIp: { limit: 20, windowSeconds: 60 * 60 },
  verifyResendPerEmail: { limit: 5, windowSeconds: 60 * 60 },
  invitationsPerUser: { limit: 30, windowSeconds: 60 * 60 },
  calculationsPerIp: { limit: 600, windowSeconds: 60 },
} satisfies Record<string, Limit>;

/** Test servers scale the limits up (RATE_LIMIT_SCALE) so that one browser can run every spec. */
function scaled(limit: Limit): number {
  const scale = Number(process.env.RATE_LIMIT_SCALE ?? '1');
  return Math.max(1, Math.floor(limit.limit * (Number.isFinite(scale) && scale > 0 ? scale : 1)));
}

export interface RateResult {
  allowed: boolean;
  remaining: number;
  retryAfterSeconds: number;
}

export async function consume(db: Kysely<Database>, key: string, limit: Limit): Promise<RateResult> {
  const window = `${limit.windowSeconds} seconds`;
  const row = await db
    .insertInto('rate_limits')
    .values({ key, window_start: sql<Date>`now()`, count: 1 })
    .onConflict((oc) =>
      oc.column('key').doUpdateSet({
        count: sql<number>`case when rate_limits.window_start < now() - ${window}::interval then 1 else rate_limits.count + 1 end`,
        window_start: sql<Date>`case when rate_limits.window_start < now() - ${window}::interval then now() else rate_limits.window_start end`,
      }),
    )
    .returning(['count', sql<number>`extract(epoch from (window_start + ${window}::interval - now()))`.as('seconds_left')])
    .executeTakeFirstOrThrow();
  const max = scaled(limit);
  return {
    allowed: row.count <= max,
    remaining: Math.max(0, max - row.count),
    retryAfterSeconds: Math.max(1, Math.ceil(Number(row.seconds_left))),
  };
}

/** Consumes one attempt and throws `rate_limited` when the window is used up. */
export async function enforce(db: Kysely<Database>, key: string, limit: Limit, what: string): Promise<void> {
  const r = await consume(db, key, limit);
  if (!r.allowed) {
    const minutes = Math.ceil(r.retryAfterSeconds / 60);
    throw new AppError('rate_limited', `Too many ${what}. Try again in ${minutes} minute${minutes === 1 ? '' : 's'}.`, {
      retryAfterSeconds: r.retryAfterSeconds,
    });
  }
}

/**
 * The client's address for per-network limits. X-Forwarded-For is written by the client unless a
 * reverse proxy replaces it, so it is trusted only when TRUST_PROXY=true says such a proxy is in
 * front. Otherwise every caller shares one network bucket; the per-address (e-mail) limits still
 * apply to each account.
 */
export function clientIp(headers: Headers): string {
  if (process.env.TRUST_PROXY !== 'true') return 'shared';
  const forwarded = headers.get('x-forwarded-for');
  if (forwarded) return forwarded.split(',')[0]!.trim();
  return headers.get('x-real-ip') ?? 'unknown';
}
