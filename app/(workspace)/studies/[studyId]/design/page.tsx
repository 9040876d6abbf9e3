import { redirect } from 'next/navigation';
import { currentActor } from '@/lib/auth/session';
import { getDesign } from '@/lib/data/designs';
import { stepStates } from '@/lib/design/progress';
import { DESIGN_STEPS } from '@/lib/design/schema';
import { load } from '@/lib/page-guard';

/** Opens the first step that is not complete yet. */
export default async function DesignIndex({ params }: { params: Promise<{ studyId: string }> }) {
  const { studyId } = await params;
  const state = await load(getDesign(await currentActor(), studyId), `/studies/${studyId}/design`);
  const states = stepStates(state.design);
  const next = DESIGN_STEPS.find((s) => states[s.part] !== 'complete') ?? DESIGN_STEPS[0];
  redirect(`/studies/${studyId}/design/${next.slug}`);
}
