import 'server-only';
import { AsyncLocalStorage } from 'node:async_hooks';
import type { ControlledTransaction, Transaction } from 'kysely';
import type { Database } from '@/db/schema';
import { db } from '@/lib/db';

/**
 * The transactions of the data layer. Every write in lib/data goes through `transaction(fn)`.
 *
 * Normally that is a transaction of its own, committed when `fn` resolves. Inside a request
 * scope (`inRequestTransaction`, used by lib/api/idempotency.ts for a request with an
 * Idempotency-Key) every `transaction(fn)` of the request joins ONE transaction, opened at the
 * first write with the scope's `begin` statement and committed by the scope's owner after it
 * has stored the answer in it: the write and its stored answer are kept together or not at all.
 * Work that must wait for the commit (withdrawing queued jobs, say) goes through `afterCommit`.
 */

export interface RequestScope {
  /** The first statement of the request's transaction (claims the idempotency key). */
  begin(trx: Transaction<Database>): Promise<void>;
  /** The request's transaction, once a write opened it. */
  trx?: Promise<ControlledTransaction<Database>>;
  afterCommit: (() => Promise<void>)[];
  /** Set when the request is over: anything still running in its async context (a timer started
   * during the request, say) then gets transactions of its own again. */
  closed: boolean;
}

const scopes = new AsyncLocalStorage<RequestScope>();

function openScope(): RequestScope | undefined {
  const scope = scopes.getStore();
  return scope && !scope.closed ? scope : undefined;
}

export async function transaction<T>(fn: (trx: Transaction<Database>) => Promise<T>): Promise<T> {
  const scope = openScope();
  if (!scope) return db().transaction().execute(fn);
  scope.trx ??= (async () => {
    const trx = await db().startTransaction().execute();
    try {
      await scope.begin(trx);
    } catch (err) {
      await trx.rollback().execute().catch(() => undefined);
      throw err;
    }
    return trx;
  })();
  return fn(await scope.trx);
}

/** Runs `fn` once the current write is committed: at once outside a request scope. */
export async function afterCommit(fn: () => Promise<void>): Promise<void> {
  const scope = openScope();
  if (scope) scope.afterCommit.push(fn);
  else await fn();
}

/** Runs `fn` with every `transaction(...)` inside it joining one transaction that the caller ends. */
export function inRequestTransaction<T>(scope: RequestScope, fn: () => Promise<T>): Promise<T> {
  return scopes.run(scope, fn);
}
