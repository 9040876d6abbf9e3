/**
 * Rate limits kept in PostgreSQL, so that every app process shares one count.
 *
 * Each key is a paced allowance (the generic cell rate algorithm): `limit` attempts may come at
 * once, after which attempts are let through one per `windowSeconds / limit`. A row holds one
 * time, `paced_until`: where the key's attempts so far reach when each takes one spacing. A new
 * attempt is allowed while `max(paced_until, now) + spacing` lies at most one window ahead.
 * Compared with a fixed window, a burst at a window's edge cannot double the limit, and somebody
 * slowed by the limit gets their next attempt after one spacing (90 s for sign-in), not after the
 * window has run out.
 *
 * An attempt usually checks several keys at once (the address, the client, everybody: see
 * `accountChecks`) in one statement, all or nothing: when any key refuses, no key is consumed.
 * A refusal writes nothing, so the refused path (the one a flood takes) costs a read, never a
 * write on a hot row. A row whose `paced_until` has passed means the same as no row; each
 * process deletes such rows now and then (`pruneRateLimits`, at most PRUNE_BATCH per minute).
 */
import { sql, type Kysely } from 'kysely';
import type { Database } from '@/db/schema';
import { AppError } from './errors';
import { logger } from './log';

export interface Limit {
  /** Attempts allowed at once, and per window on average. */
  limit: number;
  windowSeconds: number;
}

/**
 * Every limit of the app. "Per address" keys are the e-mail address an attempt is about; "per
 * client" keys are the caller's network address, known only behind a trusted proxy
 * (TRUST_PROXY=true, see `clientAddress`); "overall" keys count everybody together and sit far
 * above ordinary use, as the last resort against a flood from many places. See README,
 * "Rate limits".
 */
export const LIMITS = {
  signInPerAddress: { limit: 10, windowSeconds: 15 * 60 },
  signInPerClient: { limit: 50, windowSeconds: 15 * 60 },
  // 22 a second on average: more bcrypt comparisons than a small server can make, so one caller
  // saturates the server before it reaches this.
  signInOverall: { limit: 20_000, windowSeconds: 15 * 60 },
  signUpPerAddress: { limit: 3, windowSeconds: 60 * 60 },
  signUpPerClient: { limit: 10, windowSeconds: 60 * 60 },
  signUpOverall: { limit: 500, windowSeconds: 60 * 60 },
  resetPerAddress: { limit: 5, windowSeconds: 60 * 60 },
  resetPerClient: { limit: 20, windowSeconds: 60 * 60 },
  resetOverall: { limit: 1_000, windowSeconds: 60 * 60 },
  magicLinkPerAddress: { limit: 5, windowSeconds: 60 * 60 },
  magicLinkPerClient: { limit: 20, windowSeconds: 60 * 60 },
  magicLinkOverall: { limit: 1_000, windowSeconds: 60 * 60 },
  verifyResendPerAddress: { limit: 5, windowSeconds: 60 * 60 },
  invitationsPerUser: { limit: 30, windowSeconds: 60 * 60 },
  /** Per client behind a trusted proxy, or per signed-in user. */
  calculationsPerClient: { limit: 600, windowSeconds: 60 },
  /** Callers that cannot be told apart (no proxy, not signed in) share this one. */
  calculationsAnonymous: { limit: 6_000, windowSeconds: 60 },
} satisfies Record<string, Limit>;

/** Test servers scale the limits up (RATE_LIMIT_SCALE) so that one browser can run every spec. */
function scaled(limit: Limit): number {
  const scale = Number(process.env.RATE_LIMIT_SCALE ?? '1');
  return Math.max(1, Math.floor(limit.limit * (Number.isFinite(scale) && scale > 0 ? scale : 1)));
}

export interface Check {
  key: string;
  limit: Limit;
}

export interface RateResult {
  allowed: boolean;
  /** Attempts left before the tightest key refuses. */
  remaining: number;
  /** When refused: seconds until every refusing key allows an attempt again. */
  retryAfterSeconds: number;
  /** The keys that refused (empty when allowed). */
  refused: string[];
}

interface Row {
  key: string;
  /** Seconds from now to max(paced_until, now) + spacing: the key's reach with this attempt. */
  reach: number;
  window_seconds: number;
  spacing: number;
  taken: boolean;
}

/**
 * Checks every key and, when all allow the attempt, consumes one attempt of each, in one
 * statement. Under concurrent attempts the check is repeated on each row's newest version before
 * it is updated, so a key never lets through more than its limit; an attempt refused there may
 * have consumed its other keys, which errs on the safe side.
 */
export async function consumeAll(db: Kysely<Database>, checks: readonly Check[]): Promise<RateResult> {
  // One row per key: an upsert cannot touch the same row twice.
  const unique = [...new Map(checks.map((c) => [c.key, c])).values()];
  if (unique.length === 0) return { allowed: true, remaining: Number.POSITIVE_INFINITY, retryAfterSeconds: 0, refused: [] };
  maybePrune(db);
  const keys = unique.map((c) => c.key);
  const windows = unique.map((c) => c.limit.windowSeconds);
  const spacings = unique.map((c) => c.limit.windowSeconds / scaled(c.limit));
  const { rows } = await sql<Row>`
    with wanted as (
      select * from unnest(${keys}::text[], ${windows}::int[], ${spacings}::float8[]) as w(key, window_seconds, spacing)
    ),
    current as (
      select w.key, w.window_seconds, w.spacing,
             greatest(r.paced_until, now()) + make_interval(secs => w.spacing) as reach_at
      from wanted w left join rate_limits r on r.key = w.key
    ),
    taken as (
      insert into rate_limits as r (key, paced_until, window_seconds)
      select key, now() + make_interval(secs => spacing), window_seconds from current
      where not exists (select 1 from current c where c.reach_at > now() + make_interval(secs => c.window_seconds))
      -- Rows are locked in one order by every statement, so two attempts never wait on each other.
      order by key
      on conflict (key) do update
        set paced_until = greatest(r.paced_until, now()) + (excluded.paced_until - now()),
            window_seconds = excluded.window_seconds
        where greatest(r.paced_until, now()) + (excluded.paced_until - now()) <= now() + make_interval(secs => excluded.window_seconds)
      returning r.key
    )
    select c.key, extract(epoch from c.reach_at - now())::float8 as reach, c.window_seconds, c.spacing,
           exists (select 1 from taken t where t.key = c.key) as taken
    from current c`.execute(db);

  const allowed = rows.length > 0 && rows.every((r) => r.taken);
  if (allowed) {
    const remaining = Math.min(...rows.map((r) => Math.floor((r.window_seconds - r.reach) / r.spacing)));
    return { allowed, remaining: Math.max(0, remaining), retryAfterSeconds: 0, refused: [] };
  }
  // A key refuses when its reach passes the window, and allows again once the reach is back
  // within it. With no such key, a concurrent attempt took the last allowance of the keys that
  // were not taken.
  const over = rows.filter((r) => r.reach > r.window_seconds);
  const wait = Math.max(0, ...over.map((r) => r.reach - r.window_seconds));
  return {
    allowed: false,
    remaining: 0,
    retryAfterSeconds: Math.max(1, Math.ceil(wait)),
    refused: (over.length ? over : rows.filter((r) => !r.taken)).map((r) => r.key),
  };
}

export function consume(db: Kysely<Database>, key: string, limit: Limit): Promise<RateResult> {
  return consumeAll(db, [{ key, limit }]);
}

/** The `rate_limited` error for a refused attempt: what was limited and when to try again. */
export function rateLimited(result: RateResult, what: string): AppError {
  const minutes = Math.ceil(result.retryAfterSeconds / 60);
  const when = result.retryAfterSeconds < 60 ? `${result.retryAfterSeconds} seconds` : `${minutes} minute${minutes === 1 ? '' : 's'}`;
  return new AppError('rate_limited', `Too many ${what}. Try again in ${when}.`, { retryAfterSeconds: result.retryAfterSeconds });
}

/** Consumes one attempt of every key and throws `rate_limited` when any refuses. */
export async function enforceAll(db: Kysely<Database>, checks: readonly Check[], what: string): Promise<void> {
  const r = await consumeAll(db, checks);
  if (!r.allowed) throw rateLimited(r, what);
}

export function enforce(db: Kysely<Database>, key: string, limit: Limit, what: string): Promise<void> {
  return enforceAll(db, [{ key, limit }], what);
}

export type AccountAction = 'sign-in' | 'sign-up' | 'reset' | 'magic-link';

const ACCOUNT_LIMITS: Record<AccountAction, { perAddress: Limit; perClient: Limit; overall: Limit }> = {
  'sign-in': { perAddress: LIMITS.signInPerAddress, perClient: LIMITS.signInPerClient, overall: LIMITS.signInOverall },
  'sign-up': { perAddress: LIMITS.signUpPerAddress, perClient: LIMITS.signUpPerClient, overall: LIMITS.signUpOverall },
  reset: { perAddress: LIMITS.resetPerAddress, perClient: LIMITS.resetPerClient, overall: LIMITS.resetOverall },
  'magic-link': { perAddress: LIMITS.magicLinkPerAddress, perClient: LIMITS.magicLinkPerClient, overall: LIMITS.magicLinkOverall },
};

/** The key of an account action's per-address limit. */
export function addressKey(action: AccountAction, address: string): string {
  return `${action}:address:${address.trim().toLowerCase()}`;
}

/**
 * The keys an account action checks: the address it is about (so an attacked account is slowed,
 * and nobody else), the client when it can be known, and everybody together.
 */
export function accountChecks(action: AccountAction, address: string, headers: Headers): Check[] {
  const limits = ACCOUNT_LIMITS[action];
  const client = clientAddress(headers);
  return [
    { key: addressKey(action, address), limit: limits.perAddress },
    ...(client ? [{ key: `${action}:client:${client}`, limit: limits.perClient }] : []),
    { key: `${action}:overall`, limit: limits.overall },
  ];
}

const ACTION_WORDS: Record<AccountAction, string> = {
  'sign-in': 'sign-in attempts',
  'sign-up': 'sign-ups',
  reset: 'password reset requests',
  'magic-link': 'sign-in links',
};

/** The `rate_limited` error for a refused account action, naming which limit refused. */
export function accountLimitError(action: AccountAction, result: RateResult): AppError {
  const words = ACTION_WORDS[action];
  if (result.refused.some((key) => key === `${action}:overall`)) {
    return rateLimited(result, `${words} are reaching Unitwise right now`);
  }
  if (result.refused.some((key) => key.startsWith(`${action}:client:`))) return rateLimited(result, `${words} from your network`);
  return rateLimited(result, `${words} for this address`);
}

/**
 * The client's network address, or null when it cannot be known. X-Forwarded-For is written by
 * the client unless a reverse proxy sets it, so it counts only when TRUST_PROXY=true says such a
 * proxy is in front. A proxy appends the address it saw to whatever the client sent, so the
 * last entry is the one to trust. An IPv6 client gets its /64 network, which one subscriber
 * usually holds whole.
 */
export function clientAddress(headers: Headers): string | null {
  if (process.env.TRUST_PROXY !== 'true') return null;
  const forwarded = headers.get('x-forwarded-for');
  const raw = (forwarded ? forwarded.split(',').at(-1) : headers.get('x-real-ip'))?.trim();
  if (!raw) return null;
  return ipv6Network(raw) ?? raw.toLowerCase();
}

/** The /64 prefix of an IPv6 address (an IPv4-mapped one gives its IPv4 address); null for IPv4. */
function ipv6Network(address: string): string | null {
  if (!address.includes(':')) return null;
  const mapped = /^::ffff:(\d+\.\d+\.\d+\.\d+)$/i.exec(address);
  if (mapped) return mapped[1]!;
  const [head = '', tail] = address.toLowerCase().split('::');
  const left = head ? head.split(':') : [];
  const right = tail ? tail.split(':') : [];
  const groups = tail === undefined ? left : [...left, ...Array(Math.max(0, 8 - left.length - right.length)).fill('0'), ...right];
  return `${groups.slice(0, 4).map((g) => g.replace(/^0+(?=.)/, '')).join(':')}::/64`;
}

const PRUNE_BATCH = 1_000;
const PRUNE_EVERY_MS = 60_000;
const holder = globalThis as unknown as { unitwiseRatePrunedAt?: number };
const log = logger('rate-limit');

/** Deletes up to `batch` rows whose allowance is whole again (they mean the same as no row). */
export async function pruneRateLimits(db: Kysely<Database>, batch = PRUNE_BATCH): Promise<number> {
  const r = await db
    .deleteFrom('rate_limits')
    .where('key', 'in', (qb) => qb.selectFrom('rate_limits').select('key').where('paced_until', '<', sql<Date>`now()`).limit(batch))
    .where('paced_until', '<', sql<Date>`now()`)
    .executeTakeFirst();
  return Number(r.numDeletedRows);
}

/** At most once a minute per process, in the background: the request does not wait for it. */
function maybePrune(db: Kysely<Database>): void {
  const now = Date.now();
  if (now - (holder.unitwiseRatePrunedAt ?? 0) < PRUNE_EVERY_MS) return;
  holder.unitwiseRatePrunedAt = now;
  pruneRateLimits(db).catch((err: Error) => log.warn(`could not delete old rows: ${err.message}`));
}
