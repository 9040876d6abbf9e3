'use client';

import Link from 'next/link';
import { useState } from 'react';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { apiFetch } from '@/lib/api/client';
import type { ThreadDto } from '@/lib/api/review';
import type { ThreadAnchor } from '@/lib/validation/review';
import { CommentComposer } from './comment-composer';
import { reviewHref, useRefreshReview } from './use-review';

/** "Comment" on one anchor: opens a comment box in place; the new thread is linked once saved. */
export function StartThread({ studyId, anchor, label }: { studyId: string; anchor: ThreadAnchor; label: string }) {
  const refresh = useRefreshReview(studyId);
  const [open, setOpen] = useState(false);
  const [created, setCreated] = useState<ThreadDto | null>(null);
  return (
    <div className="space-y-2">
      {open ? (
        <CommentComposer
          studyId={studyId}
          label={`Comment on ${label}`}
          submitLabel="Start thread"
          autoFocus
          onCancel={() => setOpen(false)}
          onSubmit={async (body) => {
            const t = await apiFetch<ThreadDto>(`/api/v1/studies/${studyId}/threads`, { method: 'POST', json: { anchor, body } });
            setCreated(t);
            setOpen(false);
            await refresh();
          }}
        />
      ) : (
        <Button variant="ghost" className="px-2 py-1" onClick={() => setOpen(true)} aria-label={`Comment on ${label}`}>
          Comment
        </Button>
      )}
      {created && (
        <Alert tone="success" live>
          Comment saved.{' '}
          <Link className="font-semibold underline" href={reviewHref(studyId, { thread: created.id })}>
            See the thread
          </Link>
        </Alert>
      )}
    </div>
  );
}
