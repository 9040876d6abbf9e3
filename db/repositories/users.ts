import type { Kysely, Transaction } from 'kysely';
import type { Database, EmailTokenPurpose } from '../schema';

type Db = Kysely<Database> | Transaction<Database>;

export interface User {
  id: string;
  name: string | null;
  email: string;
  emailVerified: Date | null;
}

export async function findUserByEmail(db: Db, email: string): Promise<(User & { passwordHash: string | null }) | undefined> {
  const row = await db
    .selectFrom('User')
    .leftJoin('user_credentials', 'user_credentials.user_id', 'User.id')
    .select(['User.id', 'User.name', 'User.email', 'User.emailVerified', 'user_credentials.password_hash'])
    .where('User.email', '=', email.toLowerCase())
    .executeTakeFirst();
  if (!row) return undefined;
  return { id: row.id, name: row.name, email: row.email, emailVerified: row.emailVerified, passwordHash: row.password_hash };
}

/**
 * Locks the person's row until the transaction ends: checks of what one person may have at once
 * (e.g. stress tests queued or running) and the write they guard happen one at a time.
 */
export async function lockUser(trx: Transaction<Database>, userId: string): Promise<void> {
  await trx.selectFrom('User').select('id').where('id', '=', userId).forNoKeyUpdate().execute();
}

export async function findUserById(db: Db, id: string): Promise<User | undefined> {
  return db.selectFrom('User').select(['id', 'name', 'email', 'emailVerified']).where('id', '=', id).executeTakeFirst();
}

export async function insertUser(db: Db, user: { name: string; email: string; emailVerified?: Date | null }): Promise<User> {
  return db
    .insertInto('User')
    .values({ id: crypto.randomUUID(), name: user.name, email: user.email.toLowerCase(), emailVerified: user.emailVerified ?? null })
    .returning(['id', 'name', 'email', 'emailVerified'])
    .executeTakeFirstOrThrow();
}

export async function setPasswordHash(db: Db, userId: string, hash: string): Promise<void> {
  await db
    .insertInto('user_credentials')
    .values({ user_id: userId, password_hash: hash })
    .onConflict((oc) => oc.column('user_id').doUpdateSet({ password_hash: hash, updated_at: new Date() }))
    .execute();
}

export async function markEmailVerified(db: Db, userId: string): Promise<void> {
  await db.updateTable('User').set({ emailVerified: new Date() }).where('id', '=', userId).where('emailVerified', 'is', null).execute();
}

export async function insertEmailToken(
  db: Db,
  token: { userId: string; purpose: EmailTokenPurpose; hash: string; expiresAt: Date },
): Promise<void> {
  await db
    .insertInto('email_tokens')
    .values({ user_id: token.userId, purpose: token.purpose, token_hash: token.hash, expires_at: token.expiresAt })
    .execute();
}

/**
 * Inserts a token for the account with this address, if there is one, in one statement: the
 * same work whether the address has an account or not. Returns the account's id when it does.
 */
export async function insertEmailTokenForAddress(
  db: Db,
  token: { email: string; purpose: EmailTokenPurpose; hash: string; expiresAt: Date },
): Promise<{ userId: string } | undefined> {
  const row = await db
    .insertInto('email_tokens')
    .columns(['user_id', 'purpose', 'token_hash', 'expires_at'])
    .expression((eb) =>
      eb
        .selectFrom('User')
        .select(['User.id', eb.val(token.purpose).as('purpose'), eb.val(token.hash).as('token_hash'), eb.val(token.expiresAt).as('expires_at')])
        .where('User.email', '=', token.email.toLowerCase()),
    )
    .returning('user_id')
    .executeTakeFirst();
  return row ? { userId: row.user_id } : undefined;
}

/**
 * Marks a token used and returns its user, in one statement, so two clicks on the same link
 * cannot both succeed. Returns undefined for unknown, used or expired tokens.
 */
export async function useEmailToken(db: Db, purpose: EmailTokenPurpose, hash: string): Promise<{ userId: string } | undefined> {
  const row = await db
    .updateTable('email_tokens')
    .set({ used_at: new Date() })
    .where('token_hash', '=', hash)
    .where('purpose', '=', purpose)
    .where('used_at', 'is', null)
    .where('expires_at', '>', new Date())
    .returning('user_id')
    .executeTakeFirst();
  return row ? { userId: row.user_id } : undefined;
}

export async function deleteSessionsOfUser(db: Db, userId: string): Promise<void> {
  await db.deleteFrom('Session').where('userId', '=', userId).execute();
}

export async function insertSession(db: Db, session: { userId: string; sessionToken: string; expires: Date }): Promise<void> {
  await db.insertInto('Session').values(session).execute();
}

export async function findSessionUser(db: Db, sessionToken: string): Promise<User | undefined> {
  return db
    .selectFrom('Session')
    .innerJoin('User', 'User.id', 'Session.userId')
    .select(['User.id', 'User.name', 'User.email', 'User.emailVerified'])
    .where('Session.sessionToken', '=', sessionToken)
    .where('Session.expires', '>', new Date())
    .executeTakeFirst();
}
