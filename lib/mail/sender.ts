/**
 * The mail sender: a pg-boss subscription to the mail queue (lib/mail/queue.ts) that runs inside
 * the web server, started by instrumentation.ts when the server starts. Every web server process
 * runs one; pg-boss gives each job to one of them. The web server is the process that has the
 * SMTP settings and that must run for any mail to be caused, so `npm start`, `npm start --
 * --no-worker` and the end-to-end suite all send mail without further setup, and a stress-test
 * worker on another machine (`npm run worker`) needs no SMTP settings.
 *
 * Messages are taken by `consume()` (lib/jobs/consume.ts), not pg-boss's `work()`: a database that
 * drops while a message is marked sent is waited out instead of ending the web server with an
 * unhandled rejection, and a message is never marked twice.
 *
 * Starts in the background: while the database cannot be reached it tries again (2 s, growing to
 * 30 s), and messages wait in the queue meanwhile. Once an hour it deletes settled messages older
 * than MAIL_RETENTION_DAYS, a thousand at a time. Every DIGEST_POLL_SECONDS it queues the daily
 * digests that are due (lib/notifications/digest.ts; safe to run on several servers at once).
 */
import type PgBoss from 'pg-boss';
import { deleteSettledMail } from '@/db/repositories/mail';
import { db } from '@/lib/db';
import { consume, Wakeup } from '@/lib/jobs/consume';
import { logger } from '@/lib/log';
import { sendDueDigests } from '@/lib/notifications/digest';
import { deliverMail, mailBoss, MAIL_QUEUE, type MailJob } from './queue';

export const MAIL_RETENTION_DAYS = 30;
/** An idle sender looks for new messages this often; a message queued by this process wakes it at once. */
const POLL_SECONDS = 2;
/** How often the sender looks for digests that are due; a digest goes out within this of its hour. */
const DIGEST_POLL_SECONDS = 300;

const log = logger('mail');

interface Running {
  boss: PgBoss;
  stop: AbortController;
  done: Promise<void>;
  wake: Wakeup;
  timer: NodeJS.Timeout;
  digestTimer: NodeJS.Timeout;
}

const holder = globalThis as unknown as { unitwiseMailSender?: { started: Promise<Running | undefined>; stopped: boolean } };

async function subscribe(): Promise<Running> {
  const boss = await mailBoss();
  const stop = new AbortController();
  const wake = new Wakeup();
  const done = consume<MailJob>(
    boss,
    MAIL_QUEUE,
    async (job) => {
      await deliverMail(db(), job.data.mailId, { final: job.retryCount >= job.retryLimit });
    },
    { signal: stop.signal, pollSeconds: POLL_SECONDS, wake },
  );
  const timer = setInterval(() => void pruneSettledMail(), 3600_000);
  timer.unref();
  void pruneSettledMail();
  const digestTimer = setInterval(() => void queueDueDigests(wake), DIGEST_POLL_SECONDS * 1000);
  digestTimer.unref();
  void queueDueDigests(wake);
  log.info('sending queued mail');
  return { boss, stop, done, wake, timer, digestTimer };
}

async function queueDueDigests(wake: Wakeup): Promise<void> {
  try {
    if (await sendDueDigests(db())) wake.ring();
  } catch (err) {
    log.warn(`could not queue the daily digests: ${(err as Error).message}`);
  }
}

async function pruneSettledMail(): Promise<void> {
  try {
    const before = new Date(Date.now() - MAIL_RETENTION_DAYS * 24 * 3600_000);
    const n = await deleteSettledMail(db(), before, 1_000);
    if (n) log.info(`deleted ${n} messages settled more than ${MAIL_RETENTION_DAYS} days ago`);
  } catch (err) {
    log.warn(`could not delete old messages: ${(err as Error).message}`);
  }
}

/** Starts this process's sender once; resolves when it is subscribed (or was stopped first). */
export function startMailSender(): Promise<Running | undefined> {
  if (holder.unitwiseMailSender) return holder.unitwiseMailSender.started;
  const state = { stopped: false, started: Promise.resolve<Running | undefined>(undefined) };
  state.started = (async () => {
    for (let attempt = 1; !state.stopped; attempt++) {
      try {
        return await subscribe();
      } catch (err) {
        const wait = Math.min(30, 2 * attempt);
        log.warn(`cannot reach the mail queue yet (${(err as Error).message}); trying again in ${wait} s`);
        await new Promise((r) => setTimeout(r, wait * 1000));
      }
    }
    return undefined;
  })();
  holder.unitwiseMailSender = state;
  return state.started;
}

/** Wakes this process's sender, if it runs here, to look at the queue now. */
export function wakeMailSender(): void {
  void holder.unitwiseMailSender?.started.then((running) => running?.wake.ring());
}

/** Stops taking messages (tests); the process's pg-boss keeps running. */
export async function stopMailSender(): Promise<void> {
  const state = holder.unitwiseMailSender;
  holder.unitwiseMailSender = undefined;
  if (!state) return;
  state.stopped = true;
  const running = await state.started;
  if (!running) return;
  clearInterval(running.timer);
  clearInterval(running.digestTimer);
  running.stop.abort();
  await running.done;
}
