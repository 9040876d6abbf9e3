/**
 * Seeds a demo study's review in progress (db/demo/review.ts): its threads with their comments
 * (mentions stored as ids), resolved where the demo says so, and its pending suggestions, each
 * logged in the activity like the real actions, so the study reads as "in review". People the
 * database does not know (not in the workspace) are left out with what they wrote.
 */
import type { Transaction } from 'kysely';
import type { Database } from './schema';
import { logActivity } from './repositories/activity';
import { insertComment, insertSuggestion, insertThread, setThreadStatus } from './repositories/reviews';
import type { DemoReview } from './demo/review';
import { fieldLabel, fieldValue } from '../lib/design/fields';
import type { Design } from '../lib/design/schema';
import { anchorFingerprint, anchorKey, anchorLabel } from '../lib/review/anchors';
import { commentText, excerpt, mentionedIds, mentionToken } from '../lib/review/mentions';
import { runChecks } from '../lib/rules/registry';

export async function insertDemoReview(
  trx: Transaction<Database>,
  study: { id: string; workspaceId: string; revision: number },
  design: Design,
  review: DemoReview,
  ids: Map<string, string>,
): Promise<void> {
  const { findings } = runChecks(design);
  const names = new Map<string, string>();
  if (ids.size > 0) {
    const rows = await trx.selectFrom('User').select(['id', 'name', 'email']).where('id', 'in', [...ids.values()]).execute();
    for (const r of rows) names.set(r.id, r.name ?? r.email);
  }
  const body = (text: string) => text.replace(/@\{([^}]+)\}/g, (_, email: string) => (ids.has(email) ? mentionToken(ids.get(email)!) : email.split('@')[0]!));
  const base = { workspaceId: study.workspaceId, studyId: study.id };

  for (const t of review.threads) {
    const starter = ids.get(t.comments[0]!.by);
    const label = anchorLabel(t.anchor, design, findings);
    const fingerprint = anchorFingerprint(t.anchor, design, findings);
    if (!starter || label === undefined || fingerprint === undefined) continue;
    const key = anchorKey(t.anchor);
    const threadId = await insertThread(trx, { studyId: study.id, anchorKind: t.anchor.kind, anchorKey: key, anchor: t.anchor, anchorLabel: label, fingerprint, revision: study.revision, createdBy: starter });
    let first = true;
    for (const c of t.comments) {
      const author = ids.get(c.by);
      if (!author) continue;
      const text = body(c.text);
      const commentId = await insertComment(trx, { threadId, authorId: author, body: text, mentions: mentionedIds(text) });
      const details = { threadId, commentId, anchor: key, anchorLabel: label, excerpt: excerpt(commentText(text, names)) };
      await logActivity(trx, { ...base, actorId: author, action: first ? 'comment.created' : 'comment.replied', details });
      first = false;
    }
    const resolver = t.resolvedBy && ids.get(t.resolvedBy);
    if (resolver) {
      await setThreadStatus(trx, threadId, 'resolved', resolver);
      await logActivity(trx, { ...base, actorId: resolver, action: 'comment.resolved', details: { threadId, anchor: key, anchorLabel: label } });
    }
  }

  for (const s of review.suggestions) {
    const by = ids.get(s.by);
    if (!by) continue;
    const label = fieldLabel(design, s.path);
    const suggestionId = await insertSuggestion(trx, { studyId: study.id, path: s.path, label, oldValue: fieldValue(design, s.path) ?? null, newValue: s.value, reason: s.reason, revision: study.revision, createdBy: by });
    await logActivity(trx, { ...base, actorId: by, action: 'suggestion.created', details: { suggestionId, path: s.path, label, revision: study.revision, excerpt: excerpt(s.reason) } });
  }
}
