import { sql, type Kysely, type Transaction } from 'kysely';
import type { Database } from '../schema';

type Db = Kysely<Database> | Transaction<Database>;

/** How long a key is remembered; an older key counts as new. */
export const IDEMPOTENCY_KEY_HOURS = 24;

const expired = sql<boolean>`idempotency_keys.created_at < now() - make_interval(hours => ${IDEMPOTENCY_KEY_HOURS})`;

export interface IdempotentRequest {
  userId: string;
  key: string;
  method: string;
  path: string;
  /** SHA-256 (hex) of method, path and body. */
  hash: string;
}

export interface IdempotentAnswer {
  status: number;
  body: string | null;
}

export interface StoredKey {
  method: string;
  path: string;
  hash: string;
  answer: IdempotentAnswer | null;
}

/** The person's key as stored in the last 24 hours, or undefined. */
export async function findIdempotencyKey(db: Db, userId: string, key: string): Promise<StoredKey | undefined> {
  const row = await db
    .selectFrom('idempotency_keys')
    .select(['method', 'path', 'request_hash', 'response_status', 'response_body'])
    .where('user_id', '=', userId)
    .where('key', '=', key)
    .where(sql<boolean>`not ${expired}`)
    .executeTakeFirst();
  if (!row) return undefined;
  return {
    method: row.method,
    path: row.path,
    hash: row.request_hash,
    answer: row.response_status === null ? null : { status: row.response_status, body: row.response_body },
  };
}

/**
 * Claims the key for this request, with its answer when it is already known; true when the key is
 * ours. A row that another transaction has inserted but not yet committed makes this wait for it:
 * if that one commits, the key is taken (false); if it rolls back, the claim goes through. An
 * expired row is taken over.
 */
export async function claimIdempotencyKey(db: Db, r: IdempotentRequest, answer: IdempotentAnswer | null = null): Promise<boolean> {
  const row = await db
    .insertInto('idempotency_keys')
    .values({
      user_id: r.userId,
      key: r.key,
      method: r.method,
      path: r.path,
      request_hash: r.hash,
      response_status: answer?.status ?? null,
      response_body: answer?.body ?? null,
    })
    .onConflict((oc) =>
      oc
        .constraint('idempotency_keys_pkey')
        .doUpdateSet((eb) => ({
          method: eb.ref('excluded.method'),
          path: eb.ref('excluded.path'),
          request_hash: eb.ref('excluded.request_hash'),
          response_status: eb.ref('excluded.response_status'),
          response_body: eb.ref('excluded.response_body'),
          created_at: sql<Date>`now()`,
        }))
        .where(expired),
    )
    .returning('key')
    .executeTakeFirst();
  return row !== undefined;
}

/** Stores the answer with the key this transaction claimed. */
export async function storeIdempotentAnswer(trx: Transaction<Database>, r: IdempotentRequest, answer: IdempotentAnswer): Promise<void> {
  await trx
    .updateTable('idempotency_keys')
    .set({ response_status: answer.status, response_body: answer.body })
    .where('user_id', '=', r.userId)
    .where('key', '=', r.key)
    .execute();
}

/** Deletes keys older than 24 hours; returns how many. */
export async function pruneIdempotencyKeys(db: Db): Promise<number> {
  const r = await db.deleteFrom('idempotency_keys').where(expired).executeTakeFirst();
  return Number(r.numDeletedRows);
}
