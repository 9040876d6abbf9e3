'use client';

import Link from 'next/link';
import { useState } from 'react';
import { Alert } from '@/components/ui/alert';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { apiFetch, ApiError } from '@/lib/api/client';
import type { ThreadDto } from '@/lib/api/review';
import { canResolveThread, canStudy } from '@/lib/auth/permissions';
import type { StudyRole } from '@/db/schema';
import { formatDateTime } from '@/lib/format';
import { CommentComposer } from './comment-composer';
import { CommentText } from './comment-text';
import { useRefreshReview } from './use-review';

const KIND_WORDS: Record<ThreadDto['anchor']['kind'], string> = {
  section: 'Design step',
  field: 'Design field',
  finding: 'Finding',
  plan: 'Plan result',
  simulation: 'Stress test',
};

/** Who is looking: their id, their role, and whether the study takes changes (not archived). */
export interface ThreadRights {
  me: string;
  role: StudyRole;
  active: boolean;
}

/** One thread: what it is about, its comments, and replying, resolving and reopening. */
export function ThreadCard({ studyId, thread, rights, highlighted = false }: { studyId: string; thread: ThreadDto; rights: ThreadRights; highlighted?: boolean }) {
  const refresh = useRefreshReview(studyId);
  const [replying, setReplying] = useState(false);
  const [message, setMessage] = useState<{ tone: 'error' | 'success'; text: string } | null>(null);
  const [busy, setBusy] = useState(false);
  const canComment = rights.active && canStudy(rights.role, 'comment.create');
  const mayResolve = rights.active && canResolveThread(rights.role, thread.createdById === rights.me);
  const base = `/api/v1/studies/${studyId}/threads/${thread.id}`;
  const headingId = `thread-${thread.id}-heading`;

  async function setStatus(to: 'resolve' | 'reopen') {
    setBusy(true);
    setMessage(null);
    try {
      await apiFetch(`${base}/${to}`, { method: 'POST', json: to === 'resolve' ? { seenCommentId: thread.comments.at(-1)?.id } : undefined });
      setMessage({ tone: 'success', text: to === 'resolve' ? 'Thread resolved.' : 'Thread reopened.' });
      await refresh();
    } catch (e) {
      setMessage({ tone: 'error', text: e instanceof ApiError ? e.message : 'That did not work. Try again.' });
      await refresh();
    } finally {
      setBusy(false);
    }
  }

  return (
    <article
      id={`thread-${thread.id}`}
      aria-labelledby={headingId}
      tabIndex={-1}
      className={`rounded-lg border bg-white p-4 ${highlighted ? 'border-brand ring-2 ring-brand' : 'border-line'}`}
    >
      <div className="flex flex-wrap items-center gap-2">
        <Badge tone={thread.status === 'open' ? 'brand' : 'ok'}>{thread.status === 'open' ? 'Open' : 'Resolved'}</Badge>
        <span className="text-xs font-semibold uppercase tracking-wide text-muted">{KIND_WORDS[thread.anchor.kind]}</span>
        <h3 id={headingId} className="font-bold">
          <Link href={thread.anchorHref} className="text-brand underline">
            {thread.anchorLabel}
          </Link>
        </h3>
        {thread.changedSince && <Badge tone="caution">Changed since this comment</Badge>}
      </div>
      <p className="mt-1 text-xs text-muted">
        Started by {thread.createdByName ?? 'a former member'} on {formatDateTime(thread.createdAt)}, on revision {thread.revision}
        {thread.status === 'resolved' && thread.resolvedAt ? ` · resolved by ${thread.resolvedByName ?? 'a former member'} on ${formatDateTime(thread.resolvedAt)}` : ''}
      </p>
      <ol className="mt-3 space-y-3">
        {thread.comments.map((c) => (
          <li key={c.id} className="border-l-2 border-line pl-3">
            <p className="text-xs">
              <span className="font-semibold">{c.authorName ?? 'A former member'}</span> <span className="text-muted">· {formatDateTime(c.createdAt)}</span>
            </p>
            <CommentText comment={c} />
          </li>
        ))}
      </ol>
      {message && (
        <div className="mt-3">
          <Alert tone={message.tone} live>
            {message.text}
          </Alert>
        </div>
      )}
      <div className="mt-3 space-y-3">
        {replying ? (
          <CommentComposer
            studyId={studyId}
            label={`Reply on ${thread.anchorLabel}`}
            submitLabel="Reply"
            autoFocus
            onCancel={() => setReplying(false)}
            onSubmit={async (body) => {
              await apiFetch(`${base}/replies`, { method: 'POST', json: { body } });
              setReplying(false);
              setMessage({ tone: 'success', text: thread.status === 'resolved' ? 'Reply added; the thread is open again.' : 'Reply added.' });
              await refresh();
            }}
          />
        ) : (
          <div className="flex flex-wrap gap-2">
            {canComment && (
              <Button variant="secondary" onClick={() => setReplying(true)}>
                Reply
              </Button>
            )}
            {mayResolve && (
              <Button variant="secondary" disabled={busy} onClick={() => void setStatus(thread.status === 'open' ? 'resolve' : 'reopen')}>
                {thread.status === 'open' ? 'Resolve' : 'Reopen'}
              </Button>
            )}
          </div>
        )}
      </div>
    </article>
  );
}
