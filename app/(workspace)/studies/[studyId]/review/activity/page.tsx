import type { Metadata } from 'next';
import Link from 'next/link';
import { Alert } from '@/components/ui/alert';
import { buttonClass } from '@/components/ui/button';
import { ACTIVITY_KIND_IDS, ACTIVITY_KINDS, actorWords, describeActivity } from '@/lib/activity/words';
import { currentActor } from '@/lib/auth/session';
import { listActivity, listActivityPeople } from '@/lib/data/activity';
import { formatCount, formatDateTime, plural } from '@/lib/format';
import { load } from '@/lib/page-guard';
import { activityQuerySchema, type ActivityQuery } from '@/lib/validation/activity';

export const metadata: Metadata = { title: 'Activity' };

type Search = Record<string, string | string[] | undefined>;

/** The filters as they go into a link: only those that are set, the page last. */
function queryString(q: Partial<ActivityQuery>, page?: number): string {
  const p = new URLSearchParams();
  for (const key of ['kind', 'actor', 'from', 'to'] as const) if (q[key]) p.set(key, String(q[key]));
  if (page && page > 1) p.set('page', String(page));
  const s = p.toString();
  return s ? `?${s}` : '';
}

const control = 'mt-1 block w-full rounded-md border border-line bg-white px-3 py-2 text-sm text-ink';

/**
 * The study's activity log: every member can read it, filter it by kind of event, person and
 * days (the filters live in the address, so a filtered view can be shared and survives a
 * reload), page through it and download what the filters select as CSV.
 */
export default async function ActivityPage({ params, searchParams }: { params: Promise<{ studyId: string }>; searchParams: Promise<Search> }) {
  const { studyId } = await params;
  const raw = await searchParams;
  const first = (v: string | string[] | undefined) => (Array.isArray(v) ? v[0] : v) || undefined;
  const parsed = activityQuerySchema.safeParse({ kind: first(raw.kind), actor: first(raw.actor), from: first(raw.from), to: first(raw.to), page: first(raw.page) });
  const query: ActivityQuery = parsed.success ? parsed.data : { page: 1 };
  const actor = await currentActor();
  const here = `/studies/${studyId}/review/activity`;
  const [page, people] = await Promise.all([load(listActivity(actor, studyId, query), here), load(listActivityPeople(actor, studyId), here)]);
  const pages = Math.max(1, Math.ceil(page.total / page.pageSize));
  const filtered = Boolean(query.kind || query.actor || query.from || query.to);

  return (
    <div className="space-y-5">
      <div className="flex flex-wrap items-baseline justify-between gap-3">
        <h2 className="text-xl font-bold">Activity</h2>
        <a href={`/api/v1/studies/${studyId}/activity/export${queryString(query)}`} className={buttonClass('secondary')} download>
          Download CSV
        </a>
      </div>

      <form method="get" action={here} role="search" aria-label="Filter the activity" className="grid gap-3 rounded-lg border border-line bg-white p-4 sm:grid-cols-2 lg:grid-cols-5">
        <div>
          <label htmlFor="activity-kind" className="block text-sm font-semibold">
            Kind of event
          </label>
          <select id="activity-kind" name="kind" defaultValue={query.kind ?? ''} className={control}>
            <option value="">All kinds</option>
            {ACTIVITY_KIND_IDS.map((k) => (
              <option key={k} value={k}>
                {ACTIVITY_KINDS[k].label}
              </option>
            ))}
          </select>
        </div>
        <div>
          <label htmlFor="activity-actor" className="block text-sm font-semibold">
            Person
          </label>
          <select id="activity-actor" name="actor" defaultValue={query.actor ?? ''} className={control}>
            <option value="">Everyone</option>
            {people.map((p) => (
              <option key={p.id} value={p.id}>
                {p.name ?? p.email}
              </option>
            ))}
          </select>
        </div>
        <div>
          <label htmlFor="activity-from" className="block text-sm font-semibold">
            From (UTC)
          </label>
          <input id="activity-from" name="from" type="date" defaultValue={query.from ?? ''} className={control} />
        </div>
        <div>
          <label htmlFor="activity-to" className="block text-sm font-semibold">
            To (UTC, included)
          </label>
          <input id="activity-to" name="to" type="date" defaultValue={query.to ?? ''} className={control} />
        </div>
        <div className="flex items-end gap-2">
          <button type="submit" className={buttonClass('primary')}>
            Show
          </button>
          {filtered && (
            <Link href={here} className="px-2 py-2 text-sm font-semibold text-brand underline">
              Clear
            </Link>
          )}
        </div>
      </form>

      {!parsed.success && (
        <Alert tone="error" title="These filters could not be used">
          {parsed.error.issues[0]?.message} Showing everything instead.
        </Alert>
      )}

      <p className="text-sm text-muted" aria-live="polite">
        {page.total === 0
          ? filtered
            ? 'Nothing matches these filters.'
            : 'Nothing has happened in this study yet.'
          : `${plural(page.total, 'event')}${filtered ? ' match these filters' : ''}, newest first.${pages > 1 ? ` Page ${formatCount(page.page)} of ${formatCount(pages)}.` : ''}`}
      </p>

      {page.items.length > 0 && (
        <ol className="divide-y divide-line rounded-lg border border-line bg-white" aria-label="Events">
          {page.items.map((a) => (
            <li key={a.id} className="flex flex-wrap items-baseline justify-between gap-x-4 gap-y-1 px-4 py-3 text-sm">
              <p>
                <span className="font-semibold">{actorWords(a)}</span> {describeActivity(a)}
              </p>
              <time dateTime={a.createdAt.toISOString()} className="text-xs text-muted">
                {formatDateTime(a.createdAt)}
              </time>
            </li>
          ))}
        </ol>
      )}

      {pages > 1 && (
        <nav aria-label="Pages of activity" className="flex items-center justify-between text-sm">
          {page.page > 1 ? (
            <Link href={`${here}${queryString(query, page.page - 1)}`} className="font-semibold text-brand underline" rel="prev">
              Newer events
            </Link>
          ) : (
            <span />
          )}
          {page.page < pages && (
            <Link href={`${here}${queryString(query, page.page + 1)}`} className="font-semibold text-brand underline" rel="next">
              Older events
            </Link>
          )}
        </nav>
      )}
    </div>
  );
}
