'use client';

import { plural } from '@/lib/format';
import Link from 'next/link';
import { useCallback, useEffect, useMemo, useRef, useState } from 'react';
import { Alert } from '@/components/ui/alert';
import { Badge } from '@/components/ui/badge';
import { apiFetch, ApiError } from '@/lib/api/client';
import type { DesignSaved } from '@/lib/api/dto';
import { stepStates } from '@/lib/design/progress';
import { DESIGN_STEPS, type Design, type DesignPart } from '@/lib/design/schema';
import { runChecks } from '@/lib/rules/registry';
import { StepThreadCount } from '@/components/review/step-review';
import { DesignDiagram } from './design-diagram';
import { DiagramExport } from './diagram-export';
import { guardUnsaved, trackSave } from './leave-guard';
import { AnalysisStep } from './steps/analysis-step';
import { AssignmentStep } from './steps/assignment-step';
import { AssumptionsStep } from './steps/assumptions-step';
import { OccasionsStep } from './steps/occasions-step';
import { OutcomeStep } from './steps/outcome-step';
import { StructureStep } from './steps/structure-step';
import type { StepProps } from './steps/types';

type SaveState =
  | { kind: 'saved'; at: string | null; by: string | null }
  | { kind: 'pending' }
  | { kind: 'saving' }
  | { kind: 'error'; message: string }
  | { kind: 'conflict'; message: string };

const STEP_COMPONENTS: { [P in DesignPart]: (p: StepProps<P>) => React.ReactNode } = {
  outcome: OutcomeStep,
  structure: StructureStep,
  assignment: AssignmentStep,
  occasions: OccasionsStep,
  assumptions: AssumptionsStep,
  analysis: AnalysisStep,
};

const DRAFT_KEY = (studyId: string) => `unitwise:design-draft:${studyId}`;
const AUTOSAVE_MS = 800;

/**
 * The Design tab: one page per part of the design, autosaved as revisions. Every valid change is
 * saved after a short pause; the draft (even when invalid) is also kept in this browser, so a
 * reload, a lost connection or a conflict loses nothing. The diagram and the checks update live.
 */
export function DesignWizard({
  studyId,
  studyTitle,
  step,
  initial,
  canEdit,
}: {
  studyId: string;
  studyTitle: string;
  step: DesignPart;
  initial: { revision: number; design: Design; savedAt: string | null; savedBy: string | null };
  canEdit: boolean;
}) {
  const [design, setDesign] = useState<Design>(initial.design);
  const [save, setSave] = useState<SaveState>({ kind: 'saved', at: initial.savedAt, by: initial.savedBy });
  // A field of the current step shows an error: nothing is saved, so the status never says "Saved".
  const [invalid, setInvalid] = useState(false);
  const revision = useRef(initial.revision);
  const timer = useRef<ReturnType<typeof setTimeout> | null>(null);
  const latest = useRef(design);
  latest.current = design;

  const flush = useCallback(async () => {
    if (!canEdit) return;
    setSave({ kind: 'saving' });
    try {
      const res = await trackSave(
        apiFetch<DesignSaved>(`/api/v1/studies/${studyId}/design`, {
          method: 'PUT',
          json: { baseRevision: revision.current, design: latest.current },
        }),
      );
      revision.current = res.revision;
      if (res.merged) setDesign(res.design);
      window.localStorage.removeItem(DRAFT_KEY(studyId));
      setSave({ kind: 'saved', at: res.savedAt, by: res.savedBy });
    } catch (err) {
      if (err instanceof ApiError && err.status === 409) setSave({ kind: 'conflict', message: err.message });
      else setSave({ kind: 'error', message: (err as Error).message });
    }
  }, [canEdit, studyId]);

  const schedule = useCallback(() => {
    if (timer.current) clearTimeout(timer.current);
    setSave({ kind: 'pending' });
    timer.current = setTimeout(() => void flush(), AUTOSAVE_MS);
  }, [flush]);

  // A draft left by an earlier visit (saved on top of the same revision) comes back.
  useEffect(() => {
    const raw = window.localStorage.getItem(DRAFT_KEY(studyId));
    if (!raw) return;
    try {
      const draft = JSON.parse(raw) as { baseRevision: number; design: Design };
      if (draft.baseRevision === initial.revision && JSON.stringify(draft.design) !== JSON.stringify(initial.design)) {
        setDesign(draft.design);
        schedule();
      }
    } catch {
      window.localStorage.removeItem(DRAFT_KEY(studyId));
    }
  }, [studyId, initial.revision, initial.design, schedule]);

  // Leaving with a pending save: save now.
  useEffect(() => {
    return () => {
      if (timer.current) {
        clearTimeout(timer.current);
        void flush();
      }
    };
  }, [flush]);

  const onValid = useCallback(
    (part: DesignPart, value: unknown) => {
      setDesign((d) => {
        const next = { ...d, [part]: value } as Design;
        window.localStorage.setItem(DRAFT_KEY(studyId), JSON.stringify({ baseRevision: revision.current, design: next }));
        return next;
      });
      schedule();
    },
    [schedule, studyId],
  );
  const onDraft = useCallback((valid: boolean) => {
    setInvalid(!valid);
  }, []);

  // Edits that would be lost by leaving: a field with an error or a refused save; at unload also a save not sent yet.
  const lost = useRef({ unsavable: false, waiting: false });
  lost.current = {
    unsavable: canEdit && (invalid || save.kind === 'error' || save.kind === 'conflict'),
    waiting: canEdit && (save.kind === 'pending' || save.kind === 'saving'),
  };
  useEffect(
    () =>
      guardUnsaved(
        () => lost.current.unsavable || lost.current.waiting,
        () => lost.current.unsavable,
      ),
    [],
  );

  const states = stepStates(design);
  const checks = useMemo(() => runChecks(design), [design]);
  const counts = { blocker: 0, warning: 0, advice: 0 };
  for (const f of checks.findings) counts[f.severity] += 1;
  const stepIndex = DESIGN_STEPS.findIndex((s) => s.part === step);
  const current = DESIGN_STEPS[stepIndex]!;
  const Step = STEP_COMPONENTS[step] as (p: StepProps<DesignPart>) => React.ReactNode;
  const slugTitle = studyTitle.toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-|-$/g, '').slice(0, 60) || 'study';

  return (
    <div className="grid gap-6 lg:grid-cols-[12rem_1fr_24rem]">
      <nav aria-label="Design steps">
        <ol className="space-y-1">
          {DESIGN_STEPS.map((s, i) => (
            <li key={s.slug}>
              <Link
                href={`/studies/${studyId}/design/${s.slug}`}
                aria-current={s.part === step ? 'step' : undefined}
                className={`flex items-center justify-between rounded-md px-3 py-2 text-sm ${s.part === step ? 'bg-brand-light font-semibold text-brand-dark' : 'hover:bg-slate-100'}`}
              >
                <span>
                  {i + 1}. {s.label}
                  <StepThreadCount studyId={studyId} part={s.part} />
                </span>
                <span className="text-xs text-muted">
                  {states[s.part] === 'complete' ? (
                    <>
                      <span aria-hidden="true">✓</span>
                      <span className="sr-only">complete</span>
                    </>
                  ) : states[s.part] === 'started' ? (
                    'started'
                  ) : (
                    <span className="sr-only">not started</span>
                  )}
                </span>
              </Link>
            </li>
          ))}
        </ol>
      </nav>

      <section aria-labelledby="step-heading" className="@container min-w-0 space-y-4">
        <div className="flex flex-wrap items-center justify-between gap-2">
          <h2 id="step-heading" className="text-xl font-bold">
            {current.label}
          </h2>
          <p role="status" aria-live="polite" className="text-sm text-muted">
            {!canEdit
              ? 'Read only: your role cannot edit the design.'
              : invalid
                ? 'Not saved: fix the highlighted fields to save'
                : save.kind === 'saving'
                  ? 'Saving…'
                  : save.kind === 'pending'
                    ? 'Unsaved changes…'
                    : save.kind === 'saved'
                      ? save.at
                        ? `Saved · revision ${revision.current}${save.by ? ` by ${save.by}` : ''}`
                        : 'Nothing saved yet'
                      : 'Not saved'}
          </p>
        </div>
        {(save.kind === 'error' || save.kind === 'conflict') && (
          <Alert tone="error" live title={save.kind === 'conflict' ? 'Someone else saved the design' : 'Your change was not saved'}>
            {save.message}{' '}
            {save.kind === 'error' && (
              <button type="button" className="font-semibold underline" onClick={() => void flush()}>
                Try again
              </button>
            )}
          </Alert>
        )}
        <div className="rounded-lg border border-line bg-white p-5">
          <Step key={step} value={design[step]} design={design} onValid={(v) => onValid(step, v)} onDraft={onDraft} disabled={!canEdit} />
        </div>
        <div className="flex justify-between">
          {stepIndex > 0 ? (
            <Link href={`/studies/${studyId}/design/${DESIGN_STEPS[stepIndex - 1]!.slug}`} className="text-sm font-semibold text-brand underline">
              ← {DESIGN_STEPS[stepIndex - 1]!.label}
            </Link>
          ) : (
            <span />
          )}
          {stepIndex < DESIGN_STEPS.length - 1 ? (
            <Link href={`/studies/${studyId}/design/${DESIGN_STEPS[stepIndex + 1]!.slug}`} className="text-sm font-semibold text-brand underline">
              {DESIGN_STEPS[stepIndex + 1]!.label} →
            </Link>
          ) : (
            <Link href={`/studies/${studyId}/checks`} className="text-sm font-semibold text-brand underline">
              See the checks →
            </Link>
          )}
        </div>
      </section>

      <aside aria-label="Diagram and checks" className="space-y-4">
        <div className="rounded-lg border border-line bg-white p-3">
          <h2 className="mb-2 text-sm font-bold">Diagram</h2>
          <DesignDiagram design={design} id="design-diagram" width={380} title={`Design of ${studyTitle}`} />
          <div className="mt-2">
            <DiagramExport svgId="design-diagram" fileName={`${slugTitle}-diagram`} />
          </div>
        </div>
        <div className="rounded-lg border border-line bg-white p-3" aria-live="polite">
          <h2 className="text-sm font-bold">Checks</h2>
          <p className="mt-1 flex flex-wrap gap-2 text-sm">
            <Badge tone={counts.blocker ? 'caution' : 'ok'}>{plural(counts.blocker, 'blocker')}</Badge>
            <Badge>{plural(counts.warning, 'warning')}</Badge>
            <Badge>{counts.advice} advice</Badge>
          </p>
          <ul className="mt-2 space-y-1 text-sm">
            {checks.findings
              .filter((f) => f.severity === 'blocker')
              .map((f) => (
                <li key={`${f.ruleId}:${f.key}`} className="rounded border-l-4 border-danger bg-danger-light px-2 py-1 text-danger">
                  <span className="font-semibold">{f.title}.</span> {f.found}
                </li>
              ))}
          </ul>
          <Link href={`/studies/${studyId}/checks`} className="mt-2 inline-block text-sm font-semibold text-brand underline">
            All findings and the recommended analysis
          </Link>
        </div>
      </aside>
    </div>
  );
}
