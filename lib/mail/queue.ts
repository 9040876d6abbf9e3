/**
 * The one way the app sends e-mail: a durable queue in PostgreSQL.
 *
 * `queueMail` writes the message (table `mail`) and a pg-boss job that names it through the
 * caller's transaction, so a message exists exactly when the action that causes it committed,
 * and an answer never waits for an SMTP server. The web server's sender (lib/mail/sender.ts)
 * takes the jobs and calls `deliverMail`; a failed attempt is retried with growing delays
 * (MAIL_RETRY: about an hour in all), after which the message is `failed` for good.
 *
 * Never twice. A message is taken for sending by one conditional UPDATE (queued or retrying →
 * sending), so of two jobs or senders that hold the same message, one sends and the other finds
 * it `sending` (and tries again later) or `sent` (and stops). After the SMTP server accepted it,
 * the message is marked `sent` (retried a few times if the database hiccups). What remains is
 * one window: when the sender dies, or cannot reach the database for good, between the SMTP
 * server's acceptance and that update, the message stays `sending`; after STALE_SENDING_SECONDS
 * a retry takes it again and it goes out a second time (at least once, not at most once: a lost
 * sign-in link is worse than a second copy). Both copies carry the same Message-ID, by which
 * receiving servers and mail programs can tell them apart as one.
 */
import { randomUUID } from 'node:crypto';
import type { Kysely, Transaction } from 'kysely';
import type PgBoss from 'pg-boss';
import type { Database } from '@/db/schema';
import { claimMail, insertMail, listWaitingMail, mailStatus, markMailAttemptFailed, markMailSent } from '@/db/repositories/mail';
import { getBoss } from '@/lib/jobs/boss';
import { bossDb } from '@/lib/jobs/queue';
import { logger } from '@/lib/log';
import { sendMail, type Mail } from './send';

export const MAIL_QUEUE = 'mail';

/** Retries of a failed attempt: after about 15–30 s, then doubling (15 × 2^n s, up to twice that). */
export const MAIL_RETRY = { limit: 7, delaySeconds: 15 } as const;
/** One attempt (SMTP connect, greeting, transfer: lib/mail/send.ts) ends well within this. */
const JOB_EXPIRE_SECONDS = 120;
/** A message left `sending` this long belongs to a sender that died. */
export const STALE_SENDING_SECONDS = 300;

export type MailKind =
  | 'verify-email'
  | 'already-registered'
  | 'reset-password'
  | 'magic-link'
  | 'invitation'
  | 'notification'
  | 'notification-digest';

export interface MailJob {
  mailId: string;
}

export interface QueuedMail {
  kind: MailKind;
  /** Names the cause, e.g. `reset-password:<token hash>`: one cause queues one message. */
  idempotencyKey: string;
  mail: Mail;
  /**
   * Written and queued like any other, never sent: for an address without an account, so that
   * the answer costs the same work whether the address has one or not.
   */
  suppressed?: boolean;
}

const log = logger('mail');
const queueReady = new WeakMap<PgBoss, Promise<unknown>>();

/** The process's pg-boss with the mail queue created. */
export async function mailBoss(): Promise<PgBoss> {
  const boss = await getBoss();
  let ready = queueReady.get(boss);
  if (!ready) {
    ready = boss.createQueue(MAIL_QUEUE, {
      name: MAIL_QUEUE,
      retryLimit: MAIL_RETRY.limit,
      retryDelay: MAIL_RETRY.delaySeconds,
      retryBackoff: true,
      expireInSeconds: JOB_EXPIRE_SECONDS,
    });
    queueReady.set(boss, ready);
    ready.catch(() => queueReady.delete(boss));
  }
  await ready;
  return boss;
}

/**
 * Writes a message and its job through `trx`. Returns the message's id (the earlier one when
 * the idempotency key was queued before; no second job then). Call `wakeMailSender()` after the
 * transaction has committed, so that this process's sender looks at once.
 */
export async function queueMail(trx: Transaction<Database>, q: QueuedMail): Promise<string> {
  const boss = await mailBoss();
  const id = await insertMail(trx, {
    idempotencyKey: q.idempotencyKey,
    kind: q.kind,
    recipient: q.mail.to,
    subject: q.mail.subject,
    text: q.suppressed ? null : q.mail.text,
    html: q.suppressed ? null : q.mail.html,
    status: q.suppressed ? 'suppressed' : 'queued',
    headers: q.mail.headers,
  });
  if (!id) {
    const earlier = await trx.selectFrom('mail').select('id').where('idempotency_key', '=', q.idempotencyKey).executeTakeFirstOrThrow();
    return earlier.id;
  }
  await enqueueDelivery(boss, trx, id);
  return id;
}

/** A job that sends message `mailId` (a new message, or a failed one queued again). */
export async function enqueueDelivery(boss: PgBoss, trx: Kysely<Database> | Transaction<Database>, mailId: string): Promise<void> {
  const data: MailJob = { mailId };
  await boss.insert(
    [
      {
        id: randomUUID(),
        name: MAIL_QUEUE,
        data,
        retryLimit: MAIL_RETRY.limit,
        retryDelay: MAIL_RETRY.delaySeconds,
        retryBackoff: true,
        expireInSeconds: JOB_EXPIRE_SECONDS,
      },
    ],
    { db: bossDb(trx) },
  );
}

/** Thrown when another sender is sending the message right now: the job tries again later. */
export class MailBusy extends Error {
  constructor(id: string) {
    super(`message ${id} is being sent by another sender`);
    this.name = 'MailBusy';
  }
}

export type Delivery = 'sent' | 'settled';

/**
 * One attempt at message `id`: sends it when it is waiting, does nothing when it was sent, failed
 * for good, suppressed or deleted (`settled`). A failed attempt is recorded (`retrying`, or
 * `failed` when `final`) and rethrown, so that the job is retried.
 */
export async function deliverMail(db: Kysely<Database>, id: string, options: { final: boolean }): Promise<Delivery> {
  const mail = await claimMail(db, id, STALE_SENDING_SECONDS);
  if (!mail) {
    if ((await mailStatus(db, id)) === 'sending') throw new MailBusy(id);
    return 'settled';
  }
  try {
    await sendMail({
      to: mail.recipient,
      subject: mail.subject,
      text: mail.text,
      html: mail.html,
      messageId: `<${mail.id}@unitwise.mail>`,
      ...(mail.headers ? { headers: mail.headers } : {}),
    });
  } catch (err) {
    const message = (err as Error).message || String(err);
    log.warn(`attempt ${mail.attempts} at message ${mail.id} failed${options.final ? ' (no retries left)' : ''}: ${message}`);
    await markMailAttemptFailed(db, mail.id, message, options.final);
    throw err;
  }
  await markSentPersistently(db, mail.id);
  return 'sent';
}

/** The message went out: record it even through a short database hiccup (see the file's note). */
async function markSentPersistently(db: Kysely<Database>, id: string): Promise<void> {
  for (let attempt = 1; ; attempt++) {
    try {
      await markMailSent(db, id);
      return;
    } catch (err) {
      if (attempt >= 5) {
        log.error(`message ${id} was sent but could not be marked sent; it may go out again after ${STALE_SENDING_SECONDS} s`, err);
        throw err;
      }
      await new Promise((r) => setTimeout(r, 500 * 2 ** attempt));
    }
  }
}

/**
 * Sends every waiting message now, in this process, oldest first, and returns how many were
 * sent. For tests (which read the captured mail afterwards) and for flushing the queue by hand;
 * the web server's sender does the same job by job.
 */
export async function deliverWaitingMail(db: Kysely<Database>, options: { final?: boolean } = {}): Promise<number> {
  let sent = 0;
  for (const id of await listWaitingMail(db, 1_000)) {
    if ((await deliverMail(db, id, { final: options.final ?? false })) === 'sent') sent += 1;
  }
  return sent;
}
