'use client';

import { formatDateTime } from '@/lib/format';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import { Alert } from '@/components/ui/alert';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { TextAreaField } from '@/components/ui/field';
import { ThreadMarker } from '@/components/review/thread-marker';
import { apiFetch } from '@/lib/api/client';
import type { FindingNoteDto } from '@/lib/api/dto';
import type { Finding } from '@/lib/rules/types';
import { numberText, proseParts } from './finding-numbers';

const SEVERITY: Record<Finding['severity'], { label: string; border: string }> = {
  blocker: { label: 'Blocker', border: 'border-danger' },
  warning: { label: 'Warning', border: 'border-caution' },
  advice: { label: 'Advice', border: 'border-brand' },
};

/** A finding's sentence, with the models it quotes set as code. */
function Prose({ text }: { text: string }) {
  return proseParts(text).map((p, i) =>
    p.code ? (
      <code key={i} className="rounded bg-slate-100 px-1 py-0.5">
        {p.text}
      </code>
    ) : (
      p.text
    ),
  );
}

/** The findings of the rules module, each with its reasoning, and a history of "addressed" notes. */
export function FindingsList({ studyId, findings, canAddress }: { studyId: string; findings: Finding[]; canAddress: boolean }) {
  const queryClient = useQueryClient();
  const notes = useQuery({ queryKey: ['finding-notes', studyId], queryFn: () => apiFetch<{ items: FindingNoteDto[] }>(`/api/v1/studies/${studyId}/finding-notes`) });
  const [open, setOpen] = useState<string | null>(null);
  const [reason, setReason] = useState('');
  const add = useMutation({
    mutationFn: (body: { ruleId: string; key: string; status: 'addressed' | 'reopened'; reason: string }) =>
      apiFetch(`/api/v1/studies/${studyId}/finding-notes`, { method: 'POST', json: body }),
    onSuccess: async () => {
      setOpen(null);
      setReason('');
      await queryClient.invalidateQueries({ queryKey: ['finding-notes', studyId] });
    },
  });
  const history = (f: Finding) => (notes.data?.items ?? []).filter((n) => n.ruleId === f.ruleId && n.key === f.key);

  if (findings.length === 0) {
    return <Alert tone="success">No findings for this design as described so far. Complete the Design steps to let every check run.</Alert>;
  }

  return (
    <ol className="space-y-4">
      {findings.map((f) => {
        const id = `${f.ruleId}:${f.key}`;
        const h = history(f);
        const addressed = h[0]?.status === 'addressed';
        return (
          <li key={id} id={`finding-${f.ruleId}-${f.key}`}>
            <article aria-labelledby={`f-${id}`} className={`rounded-lg border-l-4 ${SEVERITY[f.severity].border} border-y border-r border-y-line border-r-line bg-white p-4`}>
              <div className="flex flex-wrap items-center gap-2">
                <Badge tone={f.severity === 'blocker' ? 'caution' : 'neutral'}>{SEVERITY[f.severity].label}</Badge>
                {addressed && <Badge tone="ok">Addressed</Badge>}
                <h3 id={`f-${id}`} className="font-bold">
                  {f.title}
                </h3>
              </div>
              <div className="mt-1">
                <ThreadMarker studyId={studyId} anchor={{ kind: 'finding', ruleId: f.ruleId, key: f.key }} label={`the finding “${f.title}”`} />
              </div>
              <dl className="mt-2 space-y-2 text-sm">
                <div>
                  <dt className="font-semibold">What we found</dt>
                  <dd>
                    <Prose text={f.found} />
                  </dd>
                </div>
                <div>
                  <dt className="font-semibold">Why it matters</dt>
                  <dd>
                    <Prose text={f.why} />
                  </dd>
                </div>
                <div>
                  <dt className="font-semibold">What to do</dt>
                  <dd>
                    <Prose text={f.todo} />
                  </dd>
                </div>
                {f.model && (
                  <div>
                    <dt className="font-semibold">Model</dt>
                    <dd>
                      <code className="rounded bg-slate-100 px-1.5 py-0.5">{f.model}</code>
                    </dd>
                  </div>
                )}
                {f.numbers && Object.keys(f.numbers).length > 0 && (
                  <div>
                    <dt className="font-semibold">Numbers</dt>
                    <dd>{Object.entries(f.numbers).map(([k, v]) => numberText(k, v)).join(' · ')}</dd>
                  </div>
                )}
                <div>
                  <dt className="font-semibold">Sources</dt>
                  <dd>
                    <ul>
                      {f.citations.map((c) => (
                        <li key={c.short}>{c.full}</li>
                      ))}
                    </ul>
                  </dd>
                </div>
              </dl>
              {h.length > 0 && (
                <details className="mt-2 text-sm">
                  <summary className="cursor-pointer font-semibold">History ({h.length})</summary>
                  <ul className="mt-1 space-y-1">
                    {h.map((n) => (
                      <li key={n.id}>
                        {n.actorName ?? 'Someone'} marked it {n.status} at revision {n.revision} ({formatDateTime(n.createdAt)}): {n.reason}
                      </li>
                    ))}
                  </ul>
                </details>
              )}
              {canAddress &&
                (open === id ? (
                  <form
                    className="mt-3 space-y-2"
                    onSubmit={(e) => {
                      e.preventDefault();
                      add.mutate({ ruleId: f.ruleId, key: f.key, status: addressed ? 'reopened' : 'addressed', reason });
                    }}
                  >
                    <TextAreaField label={addressed ? 'Why reopen it?' : 'How is it addressed?'} rows={2} value={reason} onChange={(e) => setReason(e.target.value)} required />
                    <div aria-live="polite">{add.isError && <Alert tone="error">{(add.error as Error).message}</Alert>}</div>
                    <div className="flex gap-2">
                      <Button type="submit" disabled={add.isPending || reason.trim().length === 0}>
                        {addressed ? 'Reopen' : 'Mark addressed'}
                      </Button>
                      <Button variant="secondary" onClick={() => setOpen(null)}>
                        Cancel
                      </Button>
                    </div>
                  </form>
                ) : (
                  <Button variant="secondary" className="mt-3" onClick={() => setOpen(id)}>
                    {addressed ? 'Reopen' : 'Mark addressed'}
                    <span className="sr-only">: {f.title}</span>
                  </Button>
                ))}
            </article>
          </li>
        );
      })}
    </ol>
  );
}
