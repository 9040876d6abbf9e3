import type { Metadata } from 'next';
import { SignoffPanel, SignoffRecord } from '@/components/review/signoffs';
import { VersionHistory } from '@/components/review/version-history';
import { canStudy } from '@/lib/auth/permissions';
import { currentActor } from '@/lib/auth/session';
import { getStudy } from '@/lib/data/studies';
import { listSignoffs, listVersions } from '@/lib/data/versions';
import { plural } from '@/lib/format';
import { load } from '@/lib/page-guard';

export const metadata: Metadata = { title: 'Versions and sign-off' };

/**
 * Versions and sign-off: the design's history grouped into versions (a person's continuous
 * editing; every autosave is kept underneath), names, restores, comparison of any two, the
 * sign-off record and, for consultants, the sign-off panel.
 */
export default async function VersionsPage({ params }: { params: Promise<{ studyId: string }> }) {
  const { studyId } = await params;
  const actor = await currentActor();
  const [study, versions, signoffs] = await Promise.all([
    load(getStudy(actor, studyId), `/studies/${studyId}/review/versions`),
    load(listVersions(actor, studyId)),
    load(listSignoffs(actor, studyId)),
  ]);
  const active = study.status !== 'archived';
  return (
    <div className="space-y-5">
      <div>
        <h2 className="text-xl font-bold">Versions and sign-off</h2>
        <p className="mt-1 max-w-3xl text-sm text-muted">
          Every autosave is kept. A version is one person’s continuous editing: it closes after {plural(versions.idleMinutes, 'minute')} without a save, when someone else
          edits, when its author leaves the design, or when it is named or signed off. A closed version never changes.
        </p>
      </div>
      <div className="grid gap-5 lg:grid-cols-[1fr_26rem]">
        <VersionHistory studyId={studyId} versions={versions.items} canName={active && canStudy(study.role, 'version.name')} canRestore={active && canStudy(study.role, 'design.edit')} />
        <div className="space-y-5">
          {active && canStudy(study.role, 'study.signoff') && <SignoffPanel studyId={studyId} versions={versions.items} />}
          <SignoffRecord studyId={studyId} signoffs={signoffs.items} latestVersion={versions.review.latestVersion} canWithdraw={active && canStudy(study.role, 'study.signoff')} />
        </div>
      </div>
    </div>
  );
}
