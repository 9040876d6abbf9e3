import Link from 'next/link';
import type { ReactNode } from 'react';
import { StudyTabs } from '@/components/studies/study-tabs';
import { RememberWorkspace } from '@/components/workspace/remember-workspace';
import { Badge } from '@/components/ui/badge';
import { ReviewRights } from '@/components/review/review-rights';
import { canStudy } from '@/lib/auth/permissions';
import { ChangedSinceSignoff, STATUS_WORDS } from '@/components/review/review-banner';
import { getReviewState } from '@/lib/data/versions';
import { currentActor } from '@/lib/auth/session';
import { getStudy } from '@/lib/data/studies';
import { countOpenThreads } from '@/lib/data/threads';
import { getWorkspace } from '@/lib/data/workspaces';
import { load } from '@/lib/page-guard';

export default async function StudyLayout({ children, params }: { children: ReactNode; params: Promise<{ studyId: string }> }) {
  const { studyId } = await params;
  const actor = await currentActor();
  const study = await load(getStudy(actor, studyId), `/studies/${studyId}`);
  const [ws, openThreads, review] = await Promise.all([getWorkspace(actor, study.workspaceId), countOpenThreads(actor, study.id), getReviewState(actor, studyId)]);
  return (
    <div className="space-y-5">
      <RememberWorkspace id={ws.id} />
      <div>
        <p className="text-sm">
          <Link href={`/workspaces/${ws.id}`} className="text-brand underline">
            {ws.name}
          </Link>
        </p>
        <div className="mt-1 flex flex-wrap items-center gap-2">
          <h1 className="text-2xl font-bold">{study.title}</h1>
          <Badge tone="brand">Your role: {study.role}</Badge>
          {study.status === 'archived' ? (
            <Badge>Archived</Badge>
          ) : (
            <Link href={`/studies/${study.id}/review/versions`} className="rounded-md focus-visible:outline-2">
              <Badge tone={study.status === 'signed-off' ? 'ok' : study.status === 'in-review' ? 'caution' : 'neutral'}>Status: {STATUS_WORDS[study.status]}</Badge>
            </Link>
          )}
        </div>
      </div>
      <ChangedSinceSignoff studyId={study.id} review={review} />
      <StudyTabs studyId={study.id} openThreads={openThreads} />
      <ReviewRights canComment={canStudy(study.role, 'comment.create') && study.status !== 'archived'}>
        <div>{children}</div>
      </ReviewRights>
    </div>
  );
}
