import 'server-only';
import { createHash } from 'node:crypto';
import {
  claimIdempotencyKey,
  findIdempotencyKey,
  IDEMPOTENCY_KEY_HOURS,
  pruneIdempotencyKeys,
  storeIdempotentAnswer,
  type IdempotentAnswer,
  type IdempotentRequest,
  type StoredKey,
} from '@/db/repositories/idempotency';
import { inRequestTransaction, type RequestScope } from '@/lib/data/transaction';
import type { Actor } from '@/lib/auth/session';
import { db } from '@/lib/db';
import { AppError } from '@/lib/errors';
import { logger } from '@/lib/log';

/**
 * Idempotent retries. A client that sends a write (POST, PUT, PATCH, DELETE under /api/v1) with
 * an `Idempotency-Key` header — any 1 to 255 visible characters, a new UUID per write is simplest
 * — can send it again with the same key when the answer was lost, and it is carried out once:
 *
 * - The first request runs as usual, except that all its writes join one transaction
 *   (lib/data/transaction.ts) whose first statement claims the key and whose last stores the
 *   answer (status and body). The write and its stored answer are committed together or not at
 *   all, so a commit that succeeded although its answer never arrived (a database restart, a
 *   dropped connection) is found by the retry, and one that failed left nothing to find.
 * - A retry by the same person with the same key, method, path and body gets the stored answer
 *   again, with `Idempotent-Replayed: true`, without running. The same key with another method,
 *   path or body is refused (409): a key names one request.
 * - A duplicate sent while the first is still running waits for it at the claim (the first
 *   transaction holds the key's row) and then gets its answer; if the first failed, it runs.
 * - Only successful answers are stored: an error changed nothing, so its retry runs again.
 * - Keys belong to one person (two people's equal keys never meet) and are remembered for 24
 *   hours: an older key counts as new. Keys older than that are pruned, at most every 10 minutes,
 *   by the process that stores one.
 * - Without a signed-in person there is nothing to key: the public POST /calculations only
 *   computes, and ignores the header.
 */

export const IDEMPOTENCY_HEADER = 'Idempotency-Key';
export const REPLAYED_HEADER = 'Idempotent-Replayed';

const KEY = /^[\x21-\x7e]{1,255}$/;
/** The largest body any route accepts (a design); a larger one is refused by the route, not keyed. */
const MAX_BODY_BYTES = 2 * 1024 * 1024;
const PRUNE_EVERY_MS = 10 * 60_000;

const log = logger('idempotency');

/** Thrown by the claim when a request with the same key finished first; never leaves this module. */
class KeyTaken extends Error {}

/** SHA-256 of method, path and body, or undefined when the body is larger than any route accepts. */
async function requestHash(req: Request, path: string): Promise<string | undefined> {
  const hash = createHash('sha256').update(`${req.method} ${path}\n`);
  if (Number(req.headers.get('content-length') ?? '0') > MAX_BODY_BYTES) return undefined;
  const body = req.clone().body;
  if (body) {
    const reader = body.getReader();
    let size = 0;
    for (let part = await reader.read(); !part.done; part = await reader.read()) {
      size += part.value.byteLength;
      if (size > MAX_BODY_BYTES) {
        await reader.cancel();
        return undefined;
      }
      hash.update(part.value);
    }
  }
  return hash.digest('hex');
}

function replay(stored: StoredKey, r: IdempotentRequest): Response {
  if (stored.hash !== r.hash) {
    throw new AppError(
      'conflict',
      `This Idempotency-Key was already used in the last ${IDEMPOTENCY_KEY_HOURS} hours for another request (${stored.method} ${stored.path}${stored.method === r.method && stored.path === r.path ? ' with another body' : ''}). Send each new request with a new key.`,
    );
  }
  if (!stored.answer) throw new AppError('conflict', 'A request with this Idempotency-Key is still running. Try again in a moment.', { retryAfterSeconds: 1 });
  const headers: Record<string, string> = { [REPLAYED_HEADER]: 'true' };
  if (stored.answer.body !== null) headers['content-type'] = 'application/json';
  return new Response(stored.answer.body, { status: stored.answer.status, headers });
}

async function rollback(scope: RequestScope): Promise<void> {
  if (!scope.trx) return;
  try {
    await (await scope.trx).rollback().execute();
  } catch {
    // The claim failed (its transaction is already rolled back) or the connection is gone.
  }
}

let lastPrune = 0;

function pruneNowAndThen(): void {
  if (Date.now() - lastPrune < PRUNE_EVERY_MS) return;
  lastPrune = Date.now();
  pruneIdempotencyKeys(db()).then(
    (n) => n > 0 && log.info(`pruned ${n} idempotency keys older than ${IDEMPOTENCY_KEY_HOURS} hours`),
    (err) => log.warn('pruning old idempotency keys failed', err),
  );
}

/**
 * Runs `respond` (the route) for a write, honouring its Idempotency-Key (see above). Without the
 * header, or without a signed-in person, it only calls `respond`.
 */
export async function idempotent(req: Request, actor: Actor | null, respond: () => Promise<Response>): Promise<Response> {
  const key = req.headers.get(IDEMPOTENCY_HEADER);
  if (key === null || !actor) return respond();
  if (!KEY.test(key)) {
    throw new AppError('bad_request', `The ${IDEMPOTENCY_HEADER} header must be 1 to 255 visible characters without spaces, for example a new UUID for each request.`);
  }
  const url = new URL(req.url);
  const path = `${url.pathname}${url.search}`;
  const hash = await requestHash(req, path);
  if (hash === undefined) return respond();
  const r: IdempotentRequest = { userId: actor.id, key, method: req.method, path, hash };

  const stored = await findIdempotencyKey(db(), r.userId, r.key);
  if (stored) return replay(stored, r);

  const scope: RequestScope = {
    async begin(trx) {
      if (!(await claimIdempotencyKey(trx, r))) throw new KeyTaken();
    },
    afterCommit: [],
    closed: false,
  };
  let res: Response;
  let answer: IdempotentAnswer;
  try {
    res = await inRequestTransaction(scope, respond);
    answer = { status: res.status, body: res.body === null ? null : await res.text() };
    if (res.status < 200 || res.status > 299) {
      await rollback(scope);
      return new Response(answer.body, { status: res.status, headers: res.headers });
    }
    if (scope.trx) {
      const trx = await scope.trx;
      await storeIdempotentAnswer(trx, r, answer);
      await trx.commit().execute();
    } else if (!(await claimIdempotencyKey(db(), r, answer))) {
      // Nothing was written; a request with the same key stored its answer meanwhile.
      throw new KeyTaken();
    }
  } catch (err) {
    await rollback(scope);
    // The same key finished first (this one waited for it at the claim, or failed because of
    // what it wrote): its answer is this request's answer.
    const finished = await findIdempotencyKey(db(), r.userId, r.key).catch(() => undefined);
    if (finished) return replay(finished, r);
    if (err instanceof KeyTaken) throw new AppError('conflict', 'A request with this Idempotency-Key was just handled. Try again in a moment.', { retryAfterSeconds: 1 });
    throw err;
  } finally {
    scope.closed = true;
  }
  for (const fn of scope.afterCommit) {
    await fn().catch((err) => log.error('work after a committed write failed', err));
  }
  pruneNowAndThen();
  return new Response(answer.body, { status: res.status, headers: res.headers });
}
