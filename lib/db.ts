import 'server-only';
import type { Kysely } from 'kysely';
import { createDb } from '@/db/client';
import type { Database } from '@/db/schema';
import { env } from './env';

/**
 * The single Kysely instance of the app. Kept on globalThis so that hot reload in development
 * does not open a new pool per edit.
 */
const globalForDb = globalThis as unknown as { unitwiseDb?: Kysely<Database> };

export function db(): Kysely<Database> {
  globalForDb.unitwiseDb ??= createDb(env().DATABASE_URL);
  return globalForDb.unitwiseDb;
}
