'use client';

import { useState } from 'react';
import { Alert } from '@/components/ui/alert';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { TextAreaField } from '@/components/ui/field';
import { apiFetch, ApiError } from '@/lib/api/client';
import type { SuggestionDto } from '@/lib/api/review';
import { formatDateTime } from '@/lib/format';
import { useRefreshReview } from './use-review';

const STATUS: Record<SuggestionDto['status'], { label: string; tone: 'brand' | 'ok' | 'neutral' }> = {
  pending: { label: 'Waiting for a decision', tone: 'brand' },
  accepted: { label: 'Accepted', tone: 'ok' },
  declined: { label: 'Declined', tone: 'neutral' },
};

/**
 * A suggested change: field, old → new, the reason, and for an owner or editor Accept and Decline.
 * When the field changed since the suggestion was made the card says so, shows the current value,
 * and Accept stays off until the person ticks that they have checked it against that value.
 */
export function SuggestionCard({ studyId, s, canDecide, highlighted = false }: { studyId: string; s: SuggestionDto; canDecide: boolean; highlighted?: boolean }) {
  const refresh = useRefreshReview(studyId);
  const [confirmed, setConfirmed] = useState(false);
  const [declining, setDeclining] = useState(false);
  const [reason, setReason] = useState('');
  const [message, setMessage] = useState<{ tone: 'error' | 'success'; text: string } | null>(null);
  const [busy, setBusy] = useState(false);
  const headingId = `suggestion-${s.id}-heading`;

  async function decide(action: 'accept' | 'decline') {
    setBusy(true);
    setMessage(null);
    try {
      const json = action === 'accept' ? (s.changedSince ? { confirmedCurrentValue: s.currentValue } : {}) : { reason };
      const after = await apiFetch<SuggestionDto>(`/api/v1/studies/${studyId}/suggestions/${s.id}/${action}`, { method: 'POST', json });
      setMessage({ tone: 'success', text: action === 'accept' ? `Accepted: the design is now at revision ${after.acceptedRevision}.` : 'Declined; the suggester is told why.' });
      setDeclining(false);
      await refresh();
    } catch (e) {
      setMessage({ tone: 'error', text: e instanceof ApiError ? e.message : 'That did not work. Try again.' });
      await refresh();
    } finally {
      setBusy(false);
    }
  }

  return (
    <article id={`suggestion-${s.id}`} aria-labelledby={headingId} tabIndex={-1} className={`rounded-lg border bg-white p-4 ${highlighted ? 'border-brand ring-2 ring-brand' : 'border-line'}`}>
      <div className="flex flex-wrap items-center gap-2">
        <Badge tone={STATUS[s.status].tone}>{STATUS[s.status].label}</Badge>
        <h3 id={headingId} className="font-bold">
          {s.label}
        </h3>
        {s.changedSince && <Badge tone="caution">Field changed since the suggestion</Badge>}
      </div>
      <p className="mt-1 text-xs text-muted">
        Suggested by {s.createdByName ?? 'a former member'} on {formatDateTime(s.createdAt)}, on revision {s.revision}
      </p>
      <p className="mt-2 text-sm">
        <span className="line-through decoration-muted">{s.oldText}</span> <span aria-hidden="true">→</span>
        <span className="sr-only"> changed to </span> <span className="font-semibold">{s.newText}</span>
      </p>
      <p className="mt-1 whitespace-pre-wrap text-sm">
        <span className="font-semibold">Reason: </span>
        {s.reason}
      </p>
      {s.status !== 'pending' && (
        <p className="mt-2 text-sm">
          {s.status === 'accepted' ? 'Accepted' : 'Declined'} by {s.decidedByName ?? 'a former member'}
          {s.decidedAt ? ` on ${formatDateTime(s.decidedAt)}` : ''}
          {s.acceptedRevision !== null ? `, in revision ${s.acceptedRevision}` : ''}
          {s.decisionReason ? `: ${s.decisionReason}` : '.'}
        </p>
      )}
      {s.status === 'pending' && s.changedSince && (
        <div className="mt-2">
          <Alert tone="caution" title="The field changed after this suggestion was made">
            {s.currentText === null
              ? 'The design no longer has this field, so the suggestion cannot be applied.'
              : `It was ${s.oldText} when suggested and is ${s.currentText} now. Check that the suggestion still makes sense before accepting it.`}
          </Alert>
        </div>
      )}
      {message && (
        <div className="mt-2">
          <Alert tone={message.tone} live>
            {message.text}
          </Alert>
        </div>
      )}
      {s.status === 'pending' && canDecide && (
        <div className="mt-3 space-y-2">
          {s.changedSince && s.currentText !== null && (
            <label className="flex items-start gap-2 text-sm">
              <input type="checkbox" className="mt-1" checked={confirmed} onChange={(e) => setConfirmed(e.target.checked)} />
              <span>
                I have checked the current value ({s.currentText}) and still want to change it to {s.newText}.
              </span>
            </label>
          )}
          {declining ? (
            <form
              className="space-y-2"
              onSubmit={(e) => {
                e.preventDefault();
                void decide('decline');
              }}
            >
              <TextAreaField label="Why decline it?" help="The suggester is told." rows={2} value={reason} onChange={(e) => setReason(e.target.value)} required autoFocus />
              <div className="flex gap-2">
                <Button type="submit" variant="danger" disabled={busy || !reason.trim()}>
                  Decline suggestion
                </Button>
                <Button variant="secondary" onClick={() => setDeclining(false)}>
                  Cancel
                </Button>
              </div>
            </form>
          ) : (
            <div className="flex flex-wrap gap-2">
              <Button disabled={busy || (s.changedSince && (!confirmed || s.currentText === null))} onClick={() => void decide('accept')}>
                Accept
              </Button>
              <Button variant="secondary" disabled={busy} onClick={() => setDeclining(true)}>
                Decline…
              </Button>
            </div>
          )}
        </div>
      )}
    </article>
  );
}
