import type { Metadata } from 'next';
import Link from 'next/link';
import { PlanningCaution } from '@/components/calculations/planning-caution';
import { kindInfo } from '@/components/calculations/kinds';
import { PlanWorkbench } from '@/components/plan/plan-workbench';
import { Alert } from '@/components/ui/alert';
import { planResultDto } from '@/lib/api/dto';
import { canStudy } from '@/lib/auth/permissions';
import { currentActor } from '@/lib/auth/session';
import { getDesign } from '@/lib/data/designs';
import { listPlanResults } from '@/lib/data/plans';
import { getStudy } from '@/lib/data/studies';
import { load } from '@/lib/page-guard';
import { designStepHref, planFromDesign, type PlanAssumption } from '@/lib/plan/from-design';
import { runChecks } from '@/lib/rules/registry';
import { formatNumber } from '@/lib/format';

export const metadata: Metadata = { title: 'Plan' };

const ORIGIN: Record<PlanAssumption['source']['kind'], string> = {
  published: 'Published',
  pilot: 'Pilot data',
  expert: 'Expert judgement',
  none: 'No source given',
  design: 'The design',
  derived: 'Worked out',
};

function sourceText(a: PlanAssumption): string {
  const s = a.source;
  return [ORIGIN[s.kind], s.citation, s.detail, s.certainty && s.kind !== 'design' && s.kind !== 'derived' ? `${s.certainty} certainty` : undefined].filter(Boolean).join(' · ');
}

function valueText(v: PlanAssumption['value']): string {
  return typeof v === 'number' ? formatNumber(v, 6) : v;
}

export default async function PlanPage({ params }: { params: Promise<{ studyId: string }> }) {
  const { studyId } = await params;
  const actor = await currentActor();
  const [study, state, saved] = await Promise.all([
    load(getStudy(actor, studyId), `/studies/${studyId}/plan`),
    load(getDesign(actor, studyId)),
    load(listPlanResults(actor, studyId)),
  ]);
  const { recommendation } = runChecks(state.design);
  const draft = planFromDesign(state.design, recommendation);
  const canSave = canStudy(study.role, 'calculation.save') && study.status !== 'archived';
  const info = draft.kind ? kindInfo(draft.kind) : undefined;

  return (
    <div className="space-y-6">
      <div className="grid gap-6 lg:grid-cols-[1fr_24rem]">
        <section aria-labelledby="choice-heading" className="space-y-3 rounded-lg border border-line bg-white p-5">
          <h2 id="choice-heading" className="text-xl font-bold">
            {info ? `${info.title}, for revision ${state.revision}` : `No calculation yet for revision ${state.revision}`}
          </h2>
          <div>
            <h3 className="text-sm font-bold">Why this calculation</h3>
            <ul className="mt-1 list-disc space-y-1 pl-5 text-sm">
              {draft.rationale.map((r) => (
                <li key={r}>{r}</li>
              ))}
            </ul>
          </div>
          {draft.notes.length > 0 && (
            <div>
              <h3 className="text-sm font-bold">What it does not take credit for</h3>
              <ul className="mt-1 list-disc space-y-1 pl-5 text-sm">
                {draft.notes.map((n) => (
                  <li key={n}>{n}</li>
                ))}
              </ul>
            </div>
          )}
          <p className="text-sm text-muted">
            The recommended analysis is on the{' '}
            <Link href={`/studies/${studyId}/checks`} className="text-brand underline">
              Checks
            </Link>{' '}
            tab. Numbers come from the saved design;{' '}
            <Link href={`/studies/${studyId}/design/assumptions`} className="text-brand underline">
              edit the assumptions
            </Link>{' '}
            to change them for everyone.
          </p>
        </section>
        <aside className="space-y-3">
          <PlanningCaution />
          {draft.missing.length > 0 && (
            <Alert tone="caution" title="Needed before the answer can be worked out">
              <ul className="list-disc space-y-1 pl-5">
                {draft.missing.map((m) => (
                  <li key={m.input}>
                    {m.text}
                    {m.step && (
                      <>
                        {' '}
                        <Link href={designStepHref(studyId, m.step)} className="font-semibold underline">
                          Fill it in on the Design tab
                        </Link>
                      </>
                    )}
                  </li>
                ))}
              </ul>
            </Alert>
          )}
        </aside>
      </div>

      {draft.assumptions.length > 0 && (
        <section aria-labelledby="assumptions-heading" className="rounded-lg border border-line bg-white p-5">
          <h2 id="assumptions-heading" className="text-lg font-bold">
            Assumptions and where they come from
          </h2>
          <div className="overflow-x-auto">
            <table className="mt-2 w-full text-left text-sm" data-testid="plan-assumptions">
              <caption className="sr-only">Each number the calculation starts from, with its source</caption>
              <thead>
                <tr className="border-b border-line">
                  <th scope="col" className="py-1 pr-3">
                    Assumption
                  </th>
                  <th scope="col" className="py-1 pr-3 text-right">
                    Value
                  </th>
                  <th scope="col" className="py-1">
                    Source
                  </th>
                </tr>
              </thead>
              <tbody>
                {draft.assumptions.map((a) => (
                  <tr key={`${a.name}-${a.input ?? ''}`} className="border-b border-line/60 align-top">
                    <th scope="row" className="py-1 pr-3 font-normal">
                      {a.name}
                    </th>
                    <td className="py-1 pr-3 text-right font-semibold tabular-nums">{valueText(a.value)}</td>
                    <td className="py-1">{sourceText(a)}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        </section>
      )}

      {draft.kind && (
        <PlanWorkbench
          studyId={studyId}
          revision={state.revision}
          draft={{ ...draft, kind: draft.kind }}
          canSave={canSave}
          saved={saved.map(planResultDto)}
        />
      )}
    </div>
  );
}
