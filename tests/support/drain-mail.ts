/**
 * The app queues mail (lib/mail/queue.ts) and a sender in the web server sends it. Integration
 * tests have no sender running: `drainMail()` sends every queued message now, through the mocked
 * lib/mail/send, so that `sentMail` (tests/support/mail.ts) holds what the queue would have sent.
 */
import { db } from '@/lib/db';
import { deliverWaitingMail } from '@/lib/mail/queue';
import { sentMail } from './mail';

export async function drainMail(): Promise<typeof sentMail> {
  await deliverWaitingMail(db());
  return sentMail;
}
