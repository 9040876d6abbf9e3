import 'server-only';
import type { Transaction } from 'kysely';
import type { Database } from '@/db/schema';
import { logActivity } from '@/db/repositories/activity';
import { decideSuggestion, listSuggestions, lockSuggestion } from '@/db/repositories/reviews';
import type { Study } from '@/db/repositories/studies';
import type { Actor } from '@/lib/auth/session';
import { AppError, notFound } from '@/lib/errors';
import { notify } from '@/lib/notifications/notify';
import { personName } from './review-context';

/**
 * Deciding a suggestion, inside the transaction that holds the study's row: accepting it from
 * saveDesign (lib/data/designs.ts), in the transaction that appends its revision, so the revision
 * and "accepted" exist together or not at all; declining it from lib/data/suggestions.ts. A
 * suggestion is decided once: its row is held, and one that is no longer pending is a conflict.
 */
export async function recordDecision(
  trx: Transaction<Database>,
  a: Actor,
  study: Study,
  suggestionId: string,
  decision: { status: 'accepted'; revision: number } | { status: 'declined'; reason: string },
): Promise<void> {
  const locked = await lockSuggestion(trx, study.id, suggestionId);
  if (!locked) throw notFound('The suggestion');
  if (locked.status !== 'pending') throw new AppError('conflict', `This suggestion was already ${locked.status}. Reload to see the decision.`);
  const [s] = await listSuggestions(trx, { studyId: study.id, id: suggestionId });
  const accepted = decision.status === 'accepted';
  await decideSuggestion(trx, suggestionId, {
    status: decision.status,
    by: a.id,
    reason: accepted ? null : decision.reason,
    acceptedRevision: accepted ? decision.revision : null,
  });
  await logActivity(trx, {
    workspaceId: study.workspaceId,
    studyId: study.id,
    actorId: a.id,
    action: accepted ? 'suggestion.accepted' : 'suggestion.declined',
    details: {
      suggestionId,
      path: s!.path,
      label: s!.label,
      suggestedBy: s!.createdBy,
      ...(accepted ? { revision: decision.revision } : { reason: decision.reason }),
    },
  });
  if (s!.createdBy && s!.createdBy !== a.id) {
    await notify(trx, {
      kind: 'decision',
      recipientIds: [s!.createdBy],
      studyId: study.id,
      actorId: a.id,
      subject: `${personName(a)} ${decision.status} your suggestion on ${study.title}`,
      text: accepted
        ? `${personName(a)} accepted your suggestion for ${s!.label}; it is in revision ${decision.revision}.`
        : `${personName(a)} declined your suggestion for ${s!.label}:\n\n${decision.reason}`,
      path: `/studies/${study.id}/review?suggestion=${suggestionId}`,
      dedupeKey: `suggestion:${suggestionId}:${decision.status}`,
    });
  }
}
