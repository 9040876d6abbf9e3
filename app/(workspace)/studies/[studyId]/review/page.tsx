import type { Metadata } from 'next';
import { Suspense } from 'react';
import { ReviewBoard } from '@/components/review/review-board';
import { PageSkeleton } from '@/components/ui/page-skeleton';
import { canStudy } from '@/lib/auth/permissions';
import { currentActor } from '@/lib/auth/session';
import { getDesign } from '@/lib/data/designs';
import { getStudy } from '@/lib/data/studies';
import { load } from '@/lib/page-guard';
import { suggestableFields } from '@/lib/review/suggestable';

export const metadata: Metadata = { title: 'Review' };

export default async function ReviewPage({ params }: { params: Promise<{ studyId: string }> }) {
  const { studyId } = await params;
  const actor = await currentActor();
  const [study, state] = await Promise.all([load(getStudy(actor, studyId), `/studies/${studyId}/review`), load(getDesign(actor, studyId))]);
  const active = study.status !== 'archived';
  const may = (action: Parameters<typeof canStudy>[1]) => active && canStudy(study.role, action);
  return (
    <Suspense fallback={<PageSkeleton />}>
      <ReviewBoard
        studyId={studyId}
        rights={{ me: actor!.id, role: study.role, active }}
        canDecide={may('suggestion.decide')}
        suggestable={may('suggestion.create') ? suggestableFields(state.design) : null}
      />
    </Suspense>
  );
}
