'use client';

import Link from 'next/link';
import { useState } from 'react';
import { SelectField } from '@/components/ui/field';
import type { ThreadDto } from '@/lib/api/review';
import { fieldStep } from '@/lib/design/fields';
import type { DesignPart } from '@/lib/design/schema';
import { plural } from '@/lib/format';
import type { SuggestableField } from '@/lib/review/suggestable';
import type { ThreadAnchor } from '@/lib/validation/review';
import { useReviewRights } from './review-rights';
import { StartThread } from './start-thread';
import { SuggestForm } from './suggest-form';
import { reviewHref, useThreads } from './use-review';

/** Threads on a step or on one of its fields. */
function onStep(t: ThreadDto, part: DesignPart): boolean {
  if (t.anchor.kind === 'section') return t.anchor.part === part;
  return t.anchor.kind === 'field' && !!t.anchor.path && fieldStep(t.anchor.path) === part;
}

/** The number of open threads on a step, inside its link in the wizard's step list (not interactive itself). */
export function StepThreadCount({ studyId, part }: { studyId: string; part: DesignPart }) {
  const threads = useThreads(studyId);
  const open = (threads.data?.items ?? []).filter((t) => t.status === 'open' && onStep(t, part)).length;
  if (open === 0) return null;
  return (
    <span className="ml-1 rounded-full bg-brand px-1.5 text-xs font-semibold text-white" data-testid="step-threads">
      {open}
      <span className="sr-only"> open {open === 1 ? 'thread' : 'threads'}</span>
    </span>
  );
}

/**
 * Below a wizard step: the threads on the step and its fields (each linking to the Review tab),
 * starting a thread on the step or one field of it, and — for those who may — suggesting a change
 * to a field of the step instead of editing it.
 */
export function StepReview({
  studyId,
  part,
  stepLabel,
  fields,
  suggestable,
}: {
  studyId: string;
  part: DesignPart;
  stepLabel: string;
  fields: { path: string; label: string }[];
  suggestable: SuggestableField[] | null;
}) {
  const { canComment } = useReviewRights();
  const threads = useThreads(studyId);
  const [target, setTarget] = useState('');
  const mine = (threads.data?.items ?? []).filter((t) => onStep(t, part));
  const open = mine.filter((t) => t.status === 'open');
  const anchor: ThreadAnchor = target ? { kind: 'field', path: target } : { kind: 'section', part };
  const targetLabel = target ? (fields.find((f) => f.path === target)?.label ?? target) : `the ${stepLabel} step`;

  return (
    <section aria-labelledby="step-review-heading" className="space-y-3 rounded-lg border border-line bg-white p-4">
      <h2 id="step-review-heading" className="text-base font-bold">
        Comments on this step
      </h2>
      {mine.length === 0 ? (
        <p className="text-sm text-muted">No threads on this step or its fields yet.</p>
      ) : (
        <>
          <p className="text-sm">
            {plural(open.length, 'open thread')}
            {mine.length > open.length ? `, ${mine.length - open.length} resolved` : ''}.
          </p>
          <ul className="space-y-1 text-sm">
            {mine.map((t) => (
              <li key={t.id}>
                <Link href={reviewHref(studyId, { thread: t.id })} className="text-brand underline">
                  {t.anchorLabel}
                </Link>{' '}
                <span className="text-muted">
                  — {t.status === 'open' ? 'open' : 'resolved'}, {plural(t.comments.length, 'comment')}
                  {t.changedSince ? ', changed since' : ''}
                </span>
              </li>
            ))}
          </ul>
        </>
      )}
      {canComment && (
        <div className="space-y-2 border-t border-line pt-3">
          <SelectField label="Comment on" value={target} onChange={(e) => setTarget(e.target.value)}>
            <option value="">The whole step</option>
            {fields.map((f) => (
              <option key={f.path} value={f.path}>
                {f.label}
              </option>
            ))}
          </SelectField>
          <StartThread key={target} studyId={studyId} anchor={anchor} label={targetLabel} />
        </div>
      )}
      {suggestable && suggestable.length > 0 && (
        <details className="border-t border-line pt-3">
          <summary className="cursor-pointer text-sm font-semibold">Suggest a change to a field of this step</summary>
          <div className="mt-3">
            <SuggestForm studyId={studyId} fields={suggestable} />
          </div>
        </details>
      )}
    </section>
  );
}
