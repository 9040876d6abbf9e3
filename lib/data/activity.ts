import 'server-only';
import { findStudyActivity, listActivityActors, logActivity, type ActivityFilter, type ActivityItem } from '@/db/repositories/activity';
import { ACTIVITY_KINDS, actorWords, describeActivity } from '@/lib/activity/words';
import type { Actor } from '@/lib/auth/session';
import { toCsv } from '@/lib/csv';
import { db } from '@/lib/db';
import { ACTIVITY_PAGE_SIZE, type ActivityQuery } from '@/lib/validation/activity';
import { requireStudy } from './access';
import { transaction } from './transaction';

/**
 * A study's activity log, filtered by kind of event, person and days (UTC), for every member
 * ('activity.read'); exported as CSV, which is itself logged (`activity.exported`).
 */

/** An export holds at most this many entries (newest first); the file says when it was cut. */
export const ACTIVITY_EXPORT_LIMIT = 50_000;

function toFilter(q: Omit<ActivityQuery, 'page'>): ActivityFilter {
  const dayAfter = (d: string) => new Date(Date.parse(`${d}T00:00:00Z`) + 86_400_000);
  return {
    patterns: q.kind ? ACTIVITY_KINDS[q.kind].patterns : undefined,
    actorId: q.actor,
    from: q.from ? new Date(`${q.from}T00:00:00Z`) : undefined,
    before: q.to ? dayAfter(q.to) : undefined,
  };
}

export interface ActivityPage {
  items: ActivityItem[];
  total: number;
  page: number;
  pageSize: number;
}

export async function listActivity(actor: Actor | null, studyId: string, q: ActivityQuery): Promise<ActivityPage> {
  await requireStudy(actor, studyId, 'activity.read');
  const { items, total } = await findStudyActivity(db(), studyId, toFilter(q), {
    limit: ACTIVITY_PAGE_SIZE,
    offset: (q.page - 1) * ACTIVITY_PAGE_SIZE,
  });
  return { items, total, page: q.page, pageSize: ACTIVITY_PAGE_SIZE };
}

/** The people a member can filter the log by: the study's members and anyone who appears in it. */
export async function listActivityPeople(actor: Actor | null, studyId: string) {
  await requireStudy(actor, studyId, 'activity.read');
  return listActivityActors(db(), studyId);
}

export const ACTIVITY_CSV_HEADER = ['Time (UTC)', 'Person', 'E-mail', 'What happened', 'Action', 'Details'];

export async function exportActivityCsv(
  actor: Actor | null,
  studyId: string,
  q: Omit<ActivityQuery, 'page'>,
  options: { now?: Date } = {},
): Promise<{ filename: string; csv: string }> {
  const now = options.now ?? new Date();
  return transaction(async (trx) => {
    const { actor: a, study } = await requireStudy(actor, studyId, 'activity.read', { trx, lock: 'share' });
    const { items, total } = await findStudyActivity(trx, studyId, toFilter(q), { limit: ACTIVITY_EXPORT_LIMIT, offset: 0 });
    const rows = items.map((i) => [
      i.createdAt.toISOString(),
      actorWords(i),
      i.actorEmail ?? '',
      `${actorWords(i)} ${describeActivity(i)}`,
      i.action,
      JSON.stringify(i.details ?? {}),
    ]);
    if (total > items.length) rows.push(['', '', '', `Only the newest ${items.length} of ${total} entries are in this file; narrow the filters to export the rest.`, '', '']);
    await logActivity(trx, {
      workspaceId: study.workspaceId,
      studyId,
      actorId: a.id,
      action: 'activity.exported',
      details: { rows: items.length, ...Object.fromEntries(Object.entries(q).filter(([, v]) => v !== undefined)) },
    });
    const slug = study.title.toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-|-$/g, '').slice(0, 60) || 'study';
    return { filename: `${slug}-activity-${now.toISOString().slice(0, 10)}.csv`, csv: toCsv(ACTIVITY_CSV_HEADER, rows) };
  });
}
