import type { ReactNode } from 'react';
import { CloseVersionOnLeave } from '@/components/design/close-version-on-leave';
import { canStudy } from '@/lib/auth/permissions';
import { currentActor } from '@/lib/auth/session';
import { getStudy } from '@/lib/data/studies';
import { load } from '@/lib/page-guard';

/** The Design tab: its steps share this layout, so leaving the tab (not a step) ends the author's version. */
export default async function DesignLayout({ children, params }: { children: ReactNode; params: Promise<{ studyId: string }> }) {
  const { studyId } = await params;
  const study = await load(getStudy(await currentActor(), studyId), `/studies/${studyId}/design`);
  const canEdit = canStudy(study.role, 'design.edit') && study.status !== 'archived';
  return (
    <>
      {canEdit && <CloseVersionOnLeave studyId={studyId} />}
      {children}
    </>
  );
}
