import { formatDateTime } from '@/lib/format';
import type { Metadata } from 'next';
import { InvitationsList } from '@/components/members/invitations-list';
import { InviteForm } from '@/components/members/invite-form';
import { MembersList } from '@/components/members/members-list';
import { StudyDetails } from '@/components/studies/study-details';
import { DesignDiagram } from '@/components/design/design-diagram';
import { getDesign } from '@/lib/data/designs';
import Link from 'next/link';
import { ASSIGNABLE_STUDY_ROLES, canStudy, STUDY_ROLE_DESCRIPTIONS, STUDY_ROLE_LABELS } from '@/lib/auth/permissions';
import { currentActor } from '@/lib/auth/session';
import { getStudy, listStudyActivity } from '@/lib/data/studies';
import { load } from '@/lib/page-guard';
import { actorWords, describeActivity } from '@/lib/activity/words';

export const metadata: Metadata = { title: 'Study overview' };


export default async function StudyOverviewPage({ params }: { params: Promise<{ studyId: string }> }) {
  const { studyId } = await params;
  const actor = await currentActor();
  const study = await load(getStudy(actor, studyId), `/studies/${studyId}`);
  const [activity, designState] = await Promise.all([listStudyActivity(actor, studyId), getDesign(actor, studyId)]);
  const manage = canStudy(study.role, 'members.manage') && study.status !== 'archived';
  const roleOptions = ASSIGNABLE_STUDY_ROLES.map((r) => ({ value: r, label: STUDY_ROLE_LABELS[r], description: STUDY_ROLE_DESCRIPTIONS[r] }));

  return (
    <div className="grid gap-8 lg:grid-cols-[1fr_22rem]">
      <div className="space-y-8">
        <section aria-labelledby="about-heading" className="rounded-lg border border-line bg-white p-5">
          <h2 id="about-heading" className="mb-3 text-lg font-bold">
            About this study
          </h2>
          <StudyDetails
            study={study}
            canEdit={canStudy(study.role, 'study.update')}
            canArchive={canStudy(study.role, 'study.archive')}
          />
        </section>

        <section aria-labelledby="diagram-heading" className="rounded-lg border border-line bg-white p-5">
          <div className="mb-3 flex flex-wrap items-baseline justify-between gap-2">
            <h2 id="diagram-heading" className="text-lg font-bold">
              Design at a glance
            </h2>
            <Link href={`/studies/${study.id}/design`} className="text-sm font-semibold text-brand underline">
              Open the design
            </Link>
          </div>
          <DesignDiagram design={designState.design} id="overview-diagram" title={`Design of ${study.title}`} />
        </section>

        <section aria-labelledby="team-heading" className="space-y-3">
          <h2 id="team-heading" className="text-lg font-bold">
            Team
          </h2>
          <MembersList
            endpoint={`/api/v1/studies/${study.id}/members`}
            queryKey={['study-members', study.id]}
            canManage={manage}
            roleOptions={roleOptions}
            fixedRoles={['owner']}
            selfId={actor!.id}
          />
        </section>

        {manage && (
          <section aria-labelledby="invite-heading" className="space-y-3 rounded-lg border border-line bg-white p-5">
            <h2 id="invite-heading" className="text-lg font-bold">
              Invite to this study
            </h2>
            <InviteForm
              endpoint={`/api/v1/studies/${study.id}/invitations`}
              roles={roleOptions}
              defaultRole="consultant"
              queryKey={['study-invitations', study.id]}
            />
            <h3 className="pt-2 text-base font-bold">Invitations</h3>
            <InvitationsList endpoint={`/api/v1/studies/${study.id}/invitations`} queryKey={['study-invitations', study.id]} />
          </section>
        )}
      </div>

      <aside aria-labelledby="activity-heading" className="space-y-3">
        <div className="flex flex-wrap items-baseline justify-between gap-2">
          <h2 id="activity-heading" className="text-lg font-bold">
            Activity
          </h2>
          <Link href={`/studies/${study.id}/review/activity`} className="text-sm font-semibold text-brand underline">
            All activity
          </Link>
        </div>
        <ol className="space-y-2 text-sm">
          {activity.map((a) => (
            <li key={a.id} className="rounded-md border border-line bg-white px-3 py-2">
              <span className="font-semibold">{actorWords(a)}</span> {describeActivity(a)}
              <br />
              <time dateTime={a.createdAt.toISOString()} className="text-xs text-muted">
                {formatDateTime(a.createdAt)}
              </time>
            </li>
          ))}
        </ol>
      </aside>
    </div>
  );
}
