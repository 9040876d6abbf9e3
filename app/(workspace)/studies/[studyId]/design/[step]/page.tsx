import type { Metadata } from 'next';
import { notFound } from 'next/navigation';
import { DesignWizard } from '@/components/design/design-wizard';
import { StepReview } from '@/components/review/step-review';
import { fieldStep, listFields } from '@/lib/design/fields';
import { suggestableFields } from '@/lib/review/suggestable';
import { Alert } from '@/components/ui/alert';
import { canStudy } from '@/lib/auth/permissions';
import { currentActor } from '@/lib/auth/session';
import { getDesign } from '@/lib/data/designs';
import { getStudy } from '@/lib/data/studies';
import { DESIGN_STEPS } from '@/lib/design/schema';
import { load } from '@/lib/page-guard';

export async function generateMetadata({ params }: { params: Promise<{ step: string }> }): Promise<Metadata> {
  const { step: slug } = await params;
  const step = DESIGN_STEPS.find((s) => s.slug === slug);
  return { title: step ? `Design: ${step.label}` : 'Design' };
}

export default async function DesignStepPage({ params }: { params: Promise<{ studyId: string; step: string }> }) {
  const { studyId, step } = await params;
  const found = DESIGN_STEPS.find((s) => s.slug === step);
  if (!found) notFound();
  const actor = await currentActor();
  const [study, state] = await Promise.all([load(getStudy(actor, studyId), `/studies/${studyId}/design/${step}`), load(getDesign(actor, studyId))]);
  return (
    <div className="space-y-4">
      {!state.readable && (
        <Alert tone="caution" title="The saved design could not be read">
          It was saved by an older version of Unitwise. You are starting from an empty design; the old revision is kept in the history.
        </Alert>
      )}
      <DesignWizard
        studyId={studyId}
        studyTitle={study.title}
        step={found.part}
        initial={state}
        canEdit={canStudy(study.role, 'design.edit') && study.status !== 'archived'}
      />
      <StepReview
        studyId={studyId}
        part={found.part}
        stepLabel={found.label}
        fields={listFields(state.design).filter((f) => f.step === found.part)}
        suggestable={canStudy(study.role, 'suggestion.create') && study.status !== 'archived' ? suggestableFields(state.design).filter((f) => fieldStep(f.path) === found.part) : null}
      />
    </div>
  );
}
