'use client';

import { usePathname, useRouter, useSearchParams } from 'next/navigation';
import { useEffect } from 'react';
import { Alert } from '@/components/ui/alert';
import { SelectField } from '@/components/ui/field';
import type { ThreadDto } from '@/lib/api/review';
import { plural } from '@/lib/format';
import type { SuggestableField } from '@/lib/review/suggestable';
import { SuggestForm } from './suggest-form';
import { SuggestionCard } from './suggestion-card';
import { ThreadCard, type ThreadRights } from './thread-card';
import { useMembers, useSuggestions, useThreads } from './use-review';

const KIND_OPTIONS: [string, string][] = [
  ['', 'Anything'],
  ['section', 'Design steps'],
  ['field', 'Design fields'],
  ['finding', 'Findings'],
  ['plan', 'Plan results'],
  ['simulation', 'Stress tests'],
];
const FILTERS = ['anchorKind', 'anchor', 'author', 'state'] as const;

/**
 * The Review tab's list: threads (open, then resolved) and suggestions (waiting, then decided),
 * filtered by what they are about, who wrote in them and their state. The filters live in the
 * address, so a filtered view can be shared and survives a reload; `?thread=` and `?suggestion=`
 * (the links in e-mails and markers) bring one item into view.
 */
export function ReviewBoard({ studyId, rights, canDecide, suggestable }: { studyId: string; rights: ThreadRights; canDecide: boolean; suggestable: SuggestableField[] | null }) {
  const params = useSearchParams();
  const router = useRouter();
  const pathname = usePathname();
  const query = new URLSearchParams();
  for (const k of FILTERS) {
    const v = params.get(k);
    if (v) query.set(k, v);
  }
  const qs = query.toString();
  const threads = useThreads(studyId, qs ? `?${qs}` : '');
  const suggestions = useSuggestions(studyId);
  const members = useMembers(studyId);
  const focusThread = params.get('thread');
  const focusSuggestion = params.get('suggestion');

  useEffect(() => {
    const id = focusThread ? `thread-${focusThread}` : focusSuggestion ? `suggestion-${focusSuggestion}` : null;
    const el = id ? document.getElementById(id) : null;
    if (el) {
      el.scrollIntoView({ block: 'start' });
      el.focus();
    }
  }, [focusThread, focusSuggestion, threads.isSuccess, suggestions.isSuccess]);

  function setFilter(key: (typeof FILTERS)[number], value: string) {
    const next = new URLSearchParams(params.toString());
    if (value) next.set(key, value);
    else next.delete(key);
    next.delete('thread');
    next.delete('suggestion');
    const s = next.toString();
    router.replace(s ? `${pathname}?${s}` : pathname, { scroll: false });
  }

  const items = threads.data?.items ?? [];
  const open = items.filter((t) => t.status === 'open');
  const resolved = items.filter((t) => t.status === 'resolved');
  const showSuggestions = !params.get('anchorKind') || params.get('anchorKind') === 'field';
  const pending = (suggestions.data?.items ?? []).filter((s) => s.status === 'pending');
  const decided = (suggestions.data?.items ?? []).filter((s) => s.status !== 'pending');

  const threadList = (list: ThreadDto[]) => (
    <ol className="space-y-3">
      {list.map((t) => (
        <li key={t.id}>
          <ThreadCard studyId={studyId} thread={t} rights={rights} highlighted={t.id === focusThread} />
        </li>
      ))}
    </ol>
  );

  return (
    <div className="grid gap-6 lg:grid-cols-[1fr_22rem]">
      <div className="space-y-6">
        <form aria-label="Filter threads" className="grid gap-3 rounded-lg border border-line bg-white p-3 sm:grid-cols-3" onSubmit={(e) => e.preventDefault()}>
          <SelectField label="About" value={params.get('anchorKind') ?? ''} onChange={(e) => setFilter('anchorKind', e.target.value)}>
            {KIND_OPTIONS.map(([v, l]) => (
              <option key={v} value={v}>
                {l}
              </option>
            ))}
          </SelectField>
          <SelectField label="Written by" value={params.get('author') ?? ''} onChange={(e) => setFilter('author', e.target.value)}>
            <option value="">Anyone</option>
            {(members.data?.items ?? []).map((m) => (
              <option key={m.userId} value={m.userId}>
                {m.name ?? m.email}
              </option>
            ))}
          </SelectField>
          <SelectField label="State" value={params.get('state') ?? ''} onChange={(e) => setFilter('state', e.target.value)}>
            <option value="">Open and resolved</option>
            <option value="open">Open</option>
            <option value="resolved">Resolved</option>
          </SelectField>
        </form>
        {params.get('anchor') && (
          <p className="text-sm">
            Showing the threads on one item.{' '}
            <button type="button" className="font-semibold text-brand underline" onClick={() => setFilter('anchor', '')}>
              Show all
            </button>
          </p>
        )}
        {threads.isError && <Alert tone="error">The threads could not be loaded: {threads.error.message}</Alert>}
        <section aria-labelledby="open-threads-heading" className="space-y-3">
          <h2 id="open-threads-heading" className="text-lg font-bold">
            Open threads <span className="text-sm font-normal text-muted">({open.length})</span>
          </h2>
          {threads.isPending ? <p className="text-sm text-muted">Loading…</p> : open.length === 0 ? <p className="text-sm text-muted">No open threads{qs ? ' match these filters' : ''}.</p> : threadList(open)}
        </section>
        <section aria-labelledby="resolved-threads-heading" className="space-y-3">
          <h2 id="resolved-threads-heading" className="text-lg font-bold">
            Resolved threads <span className="text-sm font-normal text-muted">({resolved.length})</span>
          </h2>
          {resolved.length === 0 ? <p className="text-sm text-muted">No resolved threads{qs ? ' match these filters' : ''}.</p> : threadList(resolved)}
        </section>
      </div>
      <aside aria-labelledby="suggestions-heading" className="space-y-4">
        <h2 id="suggestions-heading" className="text-lg font-bold">
          Suggested changes
        </h2>
        {!showSuggestions ? (
          <p className="text-sm text-muted">Suggestions change fields of the design; choose “Anything” or “Design fields” to see them.</p>
        ) : (
          <>
            <p className="text-sm text-muted">{plural(pending.length, 'suggestion')} waiting for a decision.</p>
            <ol className="space-y-3">
              {[...pending, ...decided].map((s) => (
                <li key={s.id}>
                  <SuggestionCard studyId={studyId} s={s} canDecide={canDecide} highlighted={s.id === focusSuggestion} />
                </li>
              ))}
            </ol>
          </>
        )}
        {suggestable && (
          <details className="rounded-lg border border-line bg-white p-3">
            <summary className="cursor-pointer text-sm font-semibold">Suggest a change to the design</summary>
            <div className="mt-3">
              <SuggestForm studyId={studyId} fields={suggestable} />
            </div>
          </details>
        )}
      </aside>
    </div>
  );
}
