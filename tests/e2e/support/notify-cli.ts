/**
 * Causes a review notification from outside the browser, through the real notify() and the
 * durable mail queue, so that the running web server's sender delivers it to the outbox. The
 * callers (comments, suggestions, sign-offs) are built in other branches; until they land, the
 * notification specs use this. Run by tests/e2e/support/notify.ts as
 *
 *   node --conditions=react-server --import tsx tests/e2e/support/notify-cli.ts '<json>'
 *
 * with {"to": e-mail of a study owner, "studyId", "kind", "subject", "text", "path", "dedupeKey"}.
 * It adds a consultant (the actor) to the study first. `react-server` lets `server-only` load.
 */
import { randomUUID } from 'node:crypto';
import { upsertStudyMember } from '@/db/repositories/studies';
import { insertUser } from '@/db/repositories/users';
import { db } from '@/lib/db';
import { stopBoss } from '@/lib/jobs/boss';
import { notify, type NotificationEvent } from '@/lib/notifications/notify';

async function main(): Promise<void> {
  const input = JSON.parse(process.argv[2] ?? '{}') as Omit<NotificationEvent, 'recipientIds' | 'actorId'> & { to: string };
  const recipient = await db().selectFrom('User').select('id').where('email', '=', input.to.toLowerCase()).executeTakeFirstOrThrow();
  const actor = await insertUser(db(), { name: 'Dr Ama Owusu', email: `ama.owusu.${randomUUID().slice(0, 8)}@e2e.example`, emailVerified: new Date() });
  await upsertStudyMember(db(), input.studyId, actor.id, 'consultant');
  const { to: _to, ...event } = input;
  await db()
    .transaction()
    .execute((trx) => notify(trx, { ...event, recipientIds: [recipient.id], actorId: actor.id }));
  await stopBoss();
  await db().destroy();
}

void main();
