'use client';

import Link from 'next/link';
import { plural } from '@/lib/format';
import type { ThreadAnchor } from '@/lib/validation/review';
import { anchorKey } from '@/lib/review/anchors';
import { useReviewRights } from './review-rights';
import { StartThread } from './start-thread';
import { reviewHref, useThreads } from './use-review';

/**
 * Where comments live: on a finding, a Plan result or a stress test, the number of threads on it
 * (linking to them on the Review tab) and, for members who may comment, a way to start one there.
 * All markers of a page share one polled list of the study's threads.
 */
export function ThreadMarker({ studyId, anchor, label }: { studyId: string; anchor: ThreadAnchor; label: string }) {
  const { canComment } = useReviewRights();
  const threads = useThreads(studyId);
  const key = anchorKey(anchor);
  const mine = (threads.data?.items ?? []).filter((t) => t.anchorKey === key);
  const open = mine.filter((t) => t.status === 'open').length;
  return (
    <div className="flex flex-wrap items-start gap-2 text-sm" data-testid="thread-marker">
      {mine.length > 0 && (
        <Link
          href={mine.length === 1 ? reviewHref(studyId, { thread: mine[0]!.id }) : reviewHref(studyId, { anchor: key })}
          className={`inline-flex items-center rounded-full border px-2 py-0.5 text-xs font-semibold ${open > 0 ? 'border-brand bg-brand-light text-brand-dark' : 'border-line bg-slate-100 text-ink'}`}
          aria-label={`${open > 0 ? plural(open, 'open comment thread') : plural(mine.length, 'resolved comment thread')} on ${label}`}
        >
          <span aria-hidden="true">💬&nbsp;</span>
          {open > 0 ? `${open} open` : `${mine.length} resolved`}
        </Link>
      )}
      {canComment && <StartThread studyId={studyId} anchor={anchor} label={label} />}
    </div>
  );
}
