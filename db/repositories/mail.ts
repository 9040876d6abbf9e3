import { sql, type Kysely, type Transaction } from 'kysely';
import type { Database, MailStatus } from '../schema';

type Db = Kysely<Database> | Transaction<Database>;

export interface NewMail {
  idempotencyKey: string;
  kind: string;
  recipient: string;
  subject: string;
  /** Null for a suppressed message, which is never sent. */
  text: string | null;
  html: string | null;
  status: 'queued' | 'suppressed';
  headers?: Record<string, string>;
}

/** Inserts a message; returns its id, or undefined when its idempotency key was queued before. */
export async function insertMail(db: Db, mail: NewMail): Promise<string | undefined> {
  const row = await db
    .insertInto('mail')
    .values({
      idempotency_key: mail.idempotencyKey,
      kind: mail.kind,
      recipient: mail.recipient,
      subject: mail.subject,
      text: mail.text,
      html: mail.html,
      status: mail.status,
      headers: mail.headers ? JSON.stringify(mail.headers) : null,
    })
    .onConflict((oc) => oc.constraint('mail_idempotency_key_key').doNothing())
    .returning('id')
    .executeTakeFirst();
  return row?.id;
}

export interface ClaimedMail {
  id: string;
  recipient: string;
  subject: string;
  text: string;
  html: string;
  attempts: number;
  headers?: Record<string, string>;
}

/**
 * Takes a message for sending, in one statement: a queued or retrying one, or one left `sending`
 * for longer than `staleSeconds` by a sender that died. Anything else (sent, failed, suppressed,
 * being sent right now, gone) gives undefined.
 */
export async function claimMail(db: Db, id: string, staleSeconds: number): Promise<ClaimedMail | undefined> {
  const row = await db
    .updateTable('mail')
    .set({ status: 'sending', claimed_at: sql`now()`, updated_at: sql`now()`, attempts: sql`attempts + 1` })
    .where('id', '=', id)
    .where('text', 'is not', null)
    .where((eb) =>
      eb.or([
        eb('status', 'in', ['queued', 'retrying']),
        eb.and([eb('status', '=', 'sending'), eb('claimed_at', '<', sql<Date>`now() - make_interval(secs => ${staleSeconds})`)]),
      ]),
    )
    .returning(['id', 'recipient', 'subject', 'text', 'html', 'attempts', 'headers'])
    .executeTakeFirst();
  if (!row) return undefined;
  const { headers, ...rest } = row;
  return { ...rest, text: row.text ?? '', html: row.html ?? '', ...(headers ? { headers } : {}) };
}

export async function mailStatus(db: Db, id: string): Promise<MailStatus | undefined> {
  const row = await db.selectFrom('mail').select('status').where('id', '=', id).executeTakeFirst();
  return row?.status;
}

/** Marks a message sent and erases its bodies and extra headers, which may hold links. */
export async function markMailSent(db: Db, id: string): Promise<void> {
  await db
    .updateTable('mail')
    .set({ status: 'sent', sent_at: sql`now()`, updated_at: sql`now()`, text: null, html: null, headers: null, last_error: null })
    .where('id', '=', id)
    .where('status', '=', 'sending')
    .execute();
}

/** Records a failed attempt: `retrying` while the queue will try again, `failed` after the last. */
export async function markMailAttemptFailed(db: Db, id: string, error: string, final: boolean): Promise<void> {
  await db
    .updateTable('mail')
    .set({ status: final ? 'failed' : 'retrying', last_error: error.slice(0, 500), updated_at: sql`now()` })
    .where('id', '=', id)
    .where('status', '=', 'sending')
    .execute();
}

/** Ids of the messages waiting to be sent, oldest first. */
export async function listWaitingMail(db: Db, limit: number): Promise<string[]> {
  const rows = await db
    .selectFrom('mail')
    .select('id')
    .where('status', 'in', ['queued', 'retrying'])
    .orderBy('created_at')
    .limit(limit)
    .execute();
  return rows.map((r) => r.id);
}

/** Deletes up to `batch` messages that were settled (sent, failed, suppressed) and were created before `before`. */
export async function deleteSettledMail(db: Db, before: Date, batch: number): Promise<number> {
  const r = await db
    .deleteFrom('mail')
    .where('id', 'in', (qb) =>
      qb.selectFrom('mail').select('id').where('status', 'in', ['sent', 'failed', 'suppressed']).where('created_at', '<', before).limit(batch),
    )
    .executeTakeFirst();
  return Number(r.numDeletedRows);
}
